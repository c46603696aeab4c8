package production

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"sheaf/render/feature"
	"sheaf/specs"
)

// resolveOut is the folder a build replaces: dir made absolute, and
// followed when it is a symbolic link, so that the link's target
// receives the output and the link stays a link. The root folder is
// refused: a build replaces its folder whole.
func resolveOut(dir string) (string, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return "", err
	}
	if fi, err := os.Lstat(abs); err == nil && fi.Mode()&fs.ModeSymlink != 0 {
		to, err := filepath.EvalSymlinks(abs)
		if err != nil {
			return "", specs.BadInput(fmt.Errorf("%s is a symbolic link that leads nowhere (%v); give a folder", dir, err))
		}
		if fi, err := os.Stat(to); err == nil && !fi.IsDir() {
			return "", specs.BadInput(&FolderError{Dir: dir, File: dir})
		}
		abs = to
	}
	if abs == filepath.Dir(abs) {
		return "", specs.BadInput(fmt.Errorf("%s is the root folder; a build replaces its output folder whole, so give a folder of its own, such as %s", dir, filepath.Join(abs, "out")))
	}
	return abs, nil
}

// checkTree looks, before anything is drawn, for what would stop the
// swap or the removal of the previous build after it: a parent folder
// or a folder inside DIR that this process may not change, and another
// file system mounted at or inside DIR (a build never crosses into one:
// removing the previous build would delete files there).
func checkTree(final string) error {
	root, err := os.Lstat(final)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	parent := filepath.Dir(final)
	if !writable(parent) {
		return specs.BadInput(fmt.Errorf("%s: sheaf cannot write in %s, where it prepares the build beside the output folder and swaps it in; make it writable or choose another output folder", final, parent))
	}
	dev, haveDev := device(root)
	if pfi, err := os.Stat(parent); err == nil && haveDev {
		if pdev, _ := device(pfi); pdev != dev {
			return specs.BadInput(fmt.Errorf("%s is a mount point; a build replaces its output folder whole, so give a folder inside it", final))
		}
	}
	return filepath.WalkDir(final, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return specs.BadInput(fmt.Errorf("%s: cannot look inside the output folder: %v", p, err))
		}
		if !d.IsDir() {
			return nil
		}
		fi, err := d.Info()
		if err != nil {
			return err
		}
		if d2, ok := device(fi); ok && haveDev && d2 != dev {
			return specs.BadInput(fmt.Errorf("%s is another file system mounted inside the output folder %s; a build replaces that folder whole and never crosses into another file system: unmount it or choose another output folder", p, final))
		}
		if !writable(p) {
			return specs.BadInput(fmt.Errorf("%s (mode %v) is not writable; a build replaces %s whole and could not remove the previous files from it after the swap: make it writable (chmod u+w) or move it out", p, fi.Mode().Perm(), final))
		}
		return nil
	})
}

// topNames are the names a build writes at the top of DIR, each with
// what writes it, for messages.
func (b *build) topNames(outs []*specs.Output) map[string]string {
	names := map[string]string{}
	for _, o := range outs {
		names[o.Name] = fmt.Sprintf("output %q (%s)", o.Name, b.j.Spec.Where("outputs."+o.Name))
	}
	if len(b.insertPreps) > 0 && (b.only == "" || feature.BorrowsOutput(b.j.Spec, b.only)) {
		names["inserts"] = fmt.Sprintf("the inserts (%s)", b.j.Spec.Where("inserts"))
	}
	return names
}

// checkCollisions refuses, before the build starts, a file or folder in
// DIR that sheaf did not write (the last manifest does not list it) and
// whose name an output or the inserts must take. When DIR has a
// manifest.json that cannot be read, what is sheaf's is not known and the
// check is left out (the build warns of the manifest).
func (b *build) checkCollisions(outs []*specs.Output) error {
	if b.prev == nil {
		if _, err := os.Lstat(filepath.Join(b.final, ManifestFile)); err == nil {
			return nil
		}
	}
	claimed := map[string]bool{}
	if b.prev != nil {
		for _, f := range b.prev.Files {
			top, _, _ := strings.Cut(f.Path, "/")
			claimed[top] = true
		}
	}
	names := b.topNames(outs)
	keys := make([]string, 0, len(names))
	for k := range names {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, name := range keys {
		p := filepath.Join(b.final, name)
		fi, err := os.Lstat(p)
		if err != nil || claimed[name] {
			continue
		}
		return specs.BadInput(fmt.Errorf("%s: %s is not sheaf's (no manifest in %s lists it), but %s writes there; move it away or choose another output folder", names[name], p+kindSuffix(fi.Mode()), b.final, names[name]))
	}
	return nil
}

func kindSuffix(m fs.FileMode) string {
	if m.IsDir() {
		return "/"
	}
	return ""
}

// carryInside carries into the stage what sheaf did not write inside the
// folders the last build wrote (a note for the printer beside the PDF):
// every entry the last manifest does not list, as it is. One that this
// build wrote under the same name is an error, naming both, and nothing is
// changed. It runs after the manifest is made, so what it carries is never
// listed as sheaf's.
func (b *build) carryInside() error {
	if b.prev == nil {
		return nil
	}
	ours := map[string]bool{}    // files the last build wrote
	oursDir := map[string]bool{} // folders holding them
	for _, f := range b.prev.Files {
		ours[f.Path] = true
		for d := f.Path; ; {
			i := strings.LastIndexByte(d, '/')
			if i < 0 {
				break
			}
			d = d[:i]
			oursDir[d] = true
		}
	}
	entries, err := os.ReadDir(b.final)
	if err != nil {
		return nil // no DIR: nothing to carry
	}
	for _, e := range entries {
		if e.IsDir() && oursDir[e.Name()] {
			if err := b.carryDir(e.Name(), ours, oursDir); err != nil {
				return err
			}
		}
	}
	return nil
}

// carryDir carries the foreign entries of the folder rel (slash path
// from DIR) that the last build wrote into.
func (b *build) carryDir(rel string, ours, oursDir map[string]bool) error {
	src := filepath.Join(b.final, filepath.FromSlash(rel))
	dst := filepath.Join(b.stage.dir, filepath.FromSlash(rel))
	entries, err := os.ReadDir(src)
	if err != nil {
		return err
	}
	for _, e := range entries {
		r := rel + "/" + e.Name()
		s, d := filepath.Join(src, e.Name()), filepath.Join(dst, e.Name())
		if e.IsDir() && oursDir[r] {
			if err := b.carryDir(r, ours, oursDir); err != nil {
				return err
			}
			continue
		}
		if ours[r] {
			continue // the last build's: this build decides
		}
		sfi, err := os.Lstat(s)
		if err != nil {
			return err
		}
		if dfi, err := os.Lstat(d); err == nil {
			if os.SameFile(sfi, dfi) || strings.HasPrefix(e.Name(), ".") {
				continue // carried already (--only), or a hidden file of sheaf's
			}
			return specs.BadInput(fmt.Errorf("%s is not sheaf's (the last manifest does not list it), but this build writes a file of that name; move it away and build again", s))
		}
		if err := os.MkdirAll(dst, 0o755); err != nil {
			return err
		}
		if e.IsDir() {
			err = linkTree(s, d)
		} else {
			err = linkOne(s, d, sfi.Mode().Type())
		}
		if err != nil {
			return err
		}
	}
	// The folder keeps its mode, if this build did not remove it.
	if fi, err := os.Stat(src); err == nil {
		if dfi, err := os.Stat(dst); err == nil && dfi.Mode().Perm() != fi.Mode().Perm() {
			return os.Chmod(dst, fi.Mode().Perm())
		}
	}
	return nil
}
