package production

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"sheaf/specs"
)

// stage is the folder a build writes into: a sibling of the final folder
// DIR named .DIR.stage-PID-RANDOM, so both are on one file system and the
// finished stage can be swapped in with one rename. Until then DIR is
// untouched: an error, Ctrl-C or kill leaves the previous outputs and
// manifest as they were.
type stage struct {
	dir   string
	final string
	// carried are the top-level names linked in from DIR because this
	// build did not make them: outputs not built (--only) and, in
	// foreign, files sheaf did not write (a palette swatch folder, notes).
	carried map[string]bool
	foreign map[string]bool
	mode    fs.FileMode // the final folder's permissions, set at commit
}

// StageMark is in the name of every stage folder: .DIR.stage-PID-RANDOM.
const StageMark = ".stage-"

// newStage makes a stage beside final, after removing stages left by
// builds that were killed outright (their process is gone).
func newStage(final string) (*stage, error) {
	abs, err := filepath.Abs(final)
	if err != nil {
		return nil, err
	}
	if fi, err := os.Stat(abs); err == nil && !fi.IsDir() {
		return nil, fmt.Errorf("%s is a file, not a folder", final)
	}
	parent, base := filepath.Dir(abs), filepath.Base(abs)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, err
	}
	removeStaleStages(parent, base)
	dir, err := os.MkdirTemp(parent, "."+base+StageMark+strconv.Itoa(os.Getpid())+"-")
	if err != nil {
		return nil, err
	}
	mode := fs.FileMode(0o755)
	if fi, err := os.Stat(abs); err == nil {
		mode = fi.Mode().Perm() // the folder keeps the mode it had
	}
	if err := os.Chmod(dir, mode|0o700); err != nil {
		os.RemoveAll(dir)
		return nil, err
	}
	return &stage{dir: dir, final: abs, mode: mode, carried: map[string]bool{}, foreign: map[string]bool{}}, nil
}

// removeStaleStages removes .BASE.stage-PID-* folders whose process no
// longer runs. A stage of a running build (another sheaf into the same
// DIR) is left alone.
func removeStaleStages(parent, base string) {
	entries, err := os.ReadDir(parent)
	if err != nil {
		return
	}
	prefix := "." + base + StageMark
	for _, e := range entries {
		name := e.Name()
		if !e.IsDir() || !strings.HasPrefix(name, prefix) {
			continue
		}
		pidText, _, _ := strings.Cut(strings.TrimPrefix(name, prefix), "-")
		pid, err := strconv.Atoi(pidText)
		if err != nil || pid <= 0 || processAlive(pid) {
			continue
		}
		os.RemoveAll(filepath.Join(parent, name))
	}
}

// abort removes the stage.
func (s *stage) abort() { os.RemoveAll(s.dir) }

// commit puts the stage in place of the final folder: an atomic exchange
// where the system has one, else the old folder is renamed aside first.
// The old folder is removed afterwards. err is set only when the swap
// failed and the final folder is as it was; left is set when the new
// build is in place but the previous one could not be removed whole (what
// checkTree looks for before the build should make that rare).
func (s *stage) commit() (left *LeftError, err error) {
	if err := os.Chmod(s.dir, s.mode); err != nil {
		return nil, err
	}
	if _, err := os.Lstat(s.final); errors.Is(err, fs.ErrNotExist) {
		return nil, os.Rename(s.dir, s.final)
	}
	old := s.dir
	if err := exchange(s.dir, s.final); err != nil {
		old = s.dir + "-old"
		if err := os.Rename(s.final, old); err != nil {
			return nil, fmt.Errorf("moving the previous %s aside: %w", s.final, err)
		}
		if err := os.Rename(s.dir, s.final); err != nil {
			// Put the old one back: DIR must never be left missing.
			if rerr := os.Rename(old, s.final); rerr != nil {
				return &LeftError{Dir: s.final, Left: old, Err: rerr}, fmt.Errorf("moving the new build in: %v; the previous build is at %s", err, old)
			}
			return nil, fmt.Errorf("moving the new build in: %w", err)
		}
	}
	// old now holds the previous build: the new one is in place.
	if err := os.RemoveAll(old); err != nil {
		return &LeftError{Dir: s.final, Left: old, Err: err}, nil
	}
	return nil, nil
}

// LeftError says that a build is in place but the previous build's
// folder could not be removed after the swap. Build reports it in
// Result.Left, not as its error: the build succeeded.
type LeftError struct {
	Dir  string // the output folder, holding the new build
	Left string // what is left of the previous build
	Err  error  // why it could not be removed
}

func (e *LeftError) Error() string {
	return fmt.Sprintf("the new build is in place in %s, but the previous build could not be removed whole: %s is left (%v); remove it by hand (the next build also tries)", e.Dir, e.Left, e.Err)
}

// carry links into the stage what the final folder has and this build
// did not make: with --only, the other outputs' folders and cached
// pages; always, folders and files sheaf did not write (those the last
// manifest does not list). Outputs the spec no longer has are dropped.
func (b *build) carry() error {
	s := b.stage
	entries, err := os.ReadDir(s.final)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	claimed := map[string]string{} // top-level name → output ("" for none)
	if b.prev != nil {
		for _, f := range b.prev.Files {
			top, _, _ := strings.Cut(f.Path, "/")
			claimed[top] = f.Output
		}
	}
	for _, e := range entries {
		name := e.Name()
		switch name {
		case ManifestFile, ChangesJSON, ChangesText:
			continue
		case CacheDir:
			if err := b.carryCache(); err != nil {
				return err
			}
			continue
		}
		if strings.Contains(name, StageMark) {
			continue
		}
		if _, err := os.Lstat(filepath.Join(s.dir, name)); err == nil {
			continue // this build wrote it
		}
		out, ours := claimed[name]
		switch {
		case !ours:
			s.foreign[name] = true
		case b.only == "":
			continue // a whole build: what it did not make is gone
		case out != "" && b.j.Spec.Output(out) == nil:
			continue // the output left the spec
		default:
			s.carried[out] = true
		}
		if err := linkTree(filepath.Join(s.final, name), filepath.Join(s.dir, name)); err != nil {
			return err
		}
	}
	return nil
}

// carryCache links the cached pages of outputs this build did not make
// (--only) and still in the spec.
func (b *build) carryCache() error {
	if b.only == "" {
		return nil
	}
	for _, o := range b.j.Spec.Outputs {
		if o.Name == b.only {
			continue
		}
		src := filepath.Join(b.final, CacheDir, o.Name)
		if _, err := os.Stat(src); err != nil {
			continue
		}
		if err := linkTree(src, filepath.Join(b.stage.dir, CacheDir, o.Name)); err != nil {
			return err
		}
	}
	return nil
}

// linkTree recreates the tree at src under dst with hard links (copies
// where links fail), folders with their modes. Symbolic links are
// recreated as they are; named pipes, sockets and devices are hard-linked
// (the same file, so exactly as they were).
func linkTree(src, dst string) error {
	var dirs []string // relative, parents first
	err := filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		r, err := filepath.Rel(src, p)
		if err != nil {
			return err
		}
		target := filepath.Join(dst, r)
		if d.IsDir() {
			dirs = append(dirs, r)
			return os.MkdirAll(target, 0o700)
		}
		return linkOne(p, target, d.Type())
	})
	if err != nil {
		return err
	}
	// Modes last, deepest first: a read-only folder is filled before it
	// becomes read-only.
	for i := len(dirs) - 1; i >= 0; i-- {
		fi, err := os.Stat(filepath.Join(src, dirs[i]))
		if err != nil {
			return err
		}
		if err := os.Chmod(filepath.Join(dst, dirs[i]), fi.Mode().Perm()|fi.Mode()&(fs.ModeSticky|fs.ModeSetgid|fs.ModeSetuid)); err != nil {
			return err
		}
	}
	return nil
}

// linkOne carries one entry that is not a folder from src to dst.
func linkOne(src, dst string, t fs.FileMode) error {
	switch {
	case t&fs.ModeSymlink != 0:
		to, err := os.Readlink(src)
		if err != nil {
			return err
		}
		return os.Symlink(to, dst)
	case t.IsRegular():
		return linkOrCopy(src, dst)
	}
	if err := os.Link(src, dst); err != nil {
		return fmt.Errorf("carrying %s (not sheaf's, %s) over: %w", src, specs.FileKind(t), err)
	}
	return nil
}

// linkOrCopy makes dst the same file as src: a hard link, or a copy
// where the file system has none. Files are only ever replaced by
// rename, never written in place, so sharing them is safe.
func linkOrCopy(src, dst string) error {
	if err := os.Link(src, dst); err == nil {
		return nil
	}
	in, err := os.Open(src)
	if err != nil {
		return err
	}
	defer in.Close()
	fi, err := in.Stat()
	if err != nil {
		return err
	}
	if err := WriteAtomic(dst, func(w io.Writer) error {
		_, err := io.Copy(w, in)
		return err
	}); err != nil {
		return err
	}
	return os.Chmod(dst, fi.Mode().Perm()) // the copy keeps the mode
}
