package production

import (
	"context"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/render/tooltest"
	"sheaf/specs"
)

// Issue 20: files sheaf did not write are carried over exactly, names
// sheaf must take are refused before the build starts, the output folder
// is checked before the swap, and what happens after the swap is
// reported as it is. These are this project's own rules (README,
// Production).

// build runs a quick build (no proofs) of j into dir.
func quickBuild(t *testing.T, j *feature.Job, dir string, opts Options) (*Result, error) {
	t.Helper()
	opts.Dir, opts.NoProofs = dir, true
	return Build(context.Background(), j, opts)
}

// mode is a file's type and permissions, after no link.
func mode(t *testing.T, p string) fs.FileMode {
	t.Helper()
	fi, err := os.Lstat(p)
	require.NoError(t, err)
	return fi.Mode()
}

func TestForeignFilesCarriedExactly(t *testing.T) {
	j := demoJob(t, "")
	out := filepath.Join(t.TempDir(), "out")
	_, err := quickBuild(t, j, out, Options{})
	require.NoError(t, err)

	// What the user adds: a note beside the PDF, a private folder with a
	// read-only file, a FIFO and a socket-free symlink, and modes of
	// their own on the output folder and on the print folder.
	note := filepath.Join(out, "print", "note-for-printer.txt")
	require.NoError(t, os.WriteFile(note, []byte("trim to A5"), 0o600))
	priv := filepath.Join(out, "print", "private")
	require.NoError(t, os.Mkdir(priv, 0o700))
	require.NoError(t, os.WriteFile(filepath.Join(priv, "keep.txt"), []byte("k"), 0o400))
	fifo := filepath.Join(out, "print", "pipe")
	require.NoError(t, syscall.Mkfifo(fifo, 0o640))
	link := filepath.Join(out, "latest.pdf")
	require.NoError(t, os.Symlink("print/print.pdf", link))
	top := filepath.Join(out, "notes")
	require.NoError(t, os.Mkdir(top, 0o750))
	require.NoError(t, os.WriteFile(filepath.Join(top, "a.txt"), []byte("a"), 0o644))
	require.NoError(t, os.Chmod(out, 0o750))
	require.NoError(t, os.Chmod(filepath.Join(out, "print"), 0o770))

	check := func(t *testing.T) {
		b, err := os.ReadFile(note)
		require.NoError(t, err)
		assert.Equal(t, "trim to A5", string(b))
		assert.Equal(t, fs.FileMode(0o600), mode(t, note))
		assert.Equal(t, fs.ModeDir|0o700, mode(t, priv))
		assert.Equal(t, fs.FileMode(0o400), mode(t, filepath.Join(priv, "keep.txt")))
		assert.Equal(t, fs.ModeNamedPipe|0o640, mode(t, fifo))
		to, err := os.Readlink(link)
		require.NoError(t, err)
		assert.Equal(t, "print/print.pdf", to)
		assert.Equal(t, fs.ModeDir|0o750, mode(t, top))
		assert.Equal(t, fs.ModeDir|0o750, mode(t, out))
		assert.Equal(t, fs.ModeDir|0o770, mode(t, filepath.Join(out, "print")))
		m, err := ReadManifest(out)
		require.NoError(t, err)
		for _, f := range m.Files {
			assert.NotContains(t, []string{"print/note-for-printer.txt", "print/private/keep.txt", "print/pipe", "latest.pdf", "notes/a.txt"}, f.Path, "listed as sheaf's")
		}
	}
	for _, o := range []Options{{}, {Full: true}, {Only: "print"}, {}} {
		_, err = quickBuild(t, j, out, o)
		require.NoError(t, err)
		check(t)
	}
}

// TestNameTakenBeforeTheBuild: a folder or file of the user's where an
// output must go is refused before anything is written, naming both.
func TestNameTakenBeforeTheBuild(t *testing.T) {
	for _, kind := range []string{"file", "folder"} {
		t.Run(kind, func(t *testing.T) {
			j := demoJob(t, "")
			parent := t.TempDir()
			out := filepath.Join(parent, "out")
			require.NoError(t, os.MkdirAll(out, 0o755))
			p := filepath.Join(out, "print")
			if kind == "file" {
				require.NoError(t, os.WriteFile(p, []byte("mine"), 0o644))
			} else {
				require.NoError(t, os.Mkdir(p, 0o755))
				require.NoError(t, os.WriteFile(filepath.Join(p, "print.pdf"), []byte("mine"), 0o644))
			}
			_, err := quickBuild(t, j, out, Options{})
			require.Error(t, err)
			assert.True(t, specs.IsBadInput(err))
			assert.Contains(t, err.Error(), p)
			assert.Contains(t, err.Error(), `output "print" (`)
			entries, _ := os.ReadDir(parent)
			assert.Len(t, entries, 1, "a stage was left")
			entries, _ = os.ReadDir(out)
			assert.Len(t, entries, 1, "something was written")
		})
	}
}

// TestNameTakenInsideAFolder: a file of the user's inside an output's
// folder that the build now writes is refused, naming it, and the
// output folder is as it was.
func TestNameTakenInsideAFolder(t *testing.T) {
	j := demoJob(t, "")
	out := filepath.Join(t.TempDir(), "out")
	_, err := quickBuild(t, j, out, Options{}) // no proofs
	require.NoError(t, err)
	mine := filepath.Join(out, "print", "contact.png") // the contact sheet, written with proofs
	require.NoError(t, os.WriteFile(mine, []byte("mine"), 0o644))
	_, err = Build(context.Background(), j, Options{Dir: out})
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), mine)
	b, err := os.ReadFile(mine)
	require.NoError(t, err)
	assert.Equal(t, "mine", string(b))
}

// TestOutSymlinkFollowed: an output folder given as a symbolic link
// stays a link; its target receives the build.
func TestOutSymlinkFollowed(t *testing.T) {
	j := demoJob(t, "")
	parent := t.TempDir()
	target := filepath.Join(parent, "real")
	require.NoError(t, os.Mkdir(target, 0o755))
	link := filepath.Join(parent, "out")
	require.NoError(t, os.Symlink("real", link))
	for range 2 {
		res, err := quickBuild(t, j, link, Options{})
		require.NoError(t, err)
		assert.Equal(t, fs.ModeSymlink, mode(t, link).Type())
		_, err = os.Stat(filepath.Join(target, ManifestFile))
		require.NoError(t, err)
		assert.Equal(t, filepath.Join(link, "print", "print.pdf"), res.Files[0])
	}
}

// TestRootRefused: the root folder is refused as bad input before
// anything is read.
func TestRootRefused(t *testing.T) {
	j := demoJob(t, "")
	_, err := quickBuild(t, j, "/", Options{})
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), "/ is the root folder")
}

// TestMountInsideRefused: another file system mounted inside the output
// folder is refused before the build, and its files are untouched. It
// needs root (mount); it is skipped otherwise.
func TestMountInsideRefused(t *testing.T) {
	j := demoJob(t, "")
	out := filepath.Join(t.TempDir(), "out")
	_, err := quickBuild(t, j, out, Options{})
	require.NoError(t, err)
	mnt := filepath.Join(out, "print", "shared")
	require.NoError(t, os.Mkdir(mnt, 0o755))
	if err := syscall.Mount("tmpfs", mnt, "tmpfs", 0, "size=1m"); err != nil {
		t.Skipf("cannot mount a tmpfs here (needs root): %v", err)
	}
	defer syscall.Unmount(mnt, 0)
	precious := filepath.Join(mnt, "precious.txt")
	require.NoError(t, os.WriteFile(precious, []byte("p"), 0o644))
	_, err = quickBuild(t, j, out, Options{})
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), mnt+" is another file system mounted inside the output folder")
	_, err = os.Stat(precious)
	assert.NoError(t, err)
}

// TestReadOnlyFolderRefused: a folder inside the output folder that this
// user may not change is refused before the build. Root may change any,
// so under root the test runs itself again as the user nobody.
func TestReadOnlyFolderRefused(t *testing.T) {
	if os.Geteuid() == 0 {
		asNobody(t)
		return
	}
	j := demoJob(t, "")
	out := filepath.Join(t.TempDir(), "out")
	_, err := quickBuild(t, j, out, Options{})
	require.NoError(t, err)
	ro := filepath.Join(out, "print", "locked")
	require.NoError(t, os.Mkdir(ro, 0o755))
	require.NoError(t, os.WriteFile(filepath.Join(ro, "f"), nil, 0o644))
	require.NoError(t, os.Chmod(ro, 0o555))
	defer os.Chmod(ro, 0o755)
	_, err = quickBuild(t, j, out, Options{})
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), ro+" (mode -r-xr-xr-x) is not writable")
}

// TestCleanupFailureAfterSwap: when the previous build cannot be removed
// after the swap (here a file made immutable with chattr +i, which even
// root cannot unlink), the build succeeded: no error, Result.Left names
// what is left, and the output folder holds the new build. Needs chattr
// and a file system with the immutable flag (ext4, xfs, btrfs).
func TestCleanupFailureAfterSwap(t *testing.T) {
	tooltest.Require(t, "chattr", "e2fsprogs")
	j := demoJob(t, "")
	out := filepath.Join(t.TempDir(), "out")
	_, err := quickBuild(t, j, out, Options{})
	require.NoError(t, err)
	stuck := filepath.Join(out, "notes", "stuck.txt")
	require.NoError(t, os.MkdirAll(filepath.Dir(stuck), 0o755))
	require.NoError(t, os.WriteFile(stuck, []byte("s"), 0o644))
	if b, err := exec.Command("chattr", "+i", stuck).CombinedOutput(); err != nil {
		t.Skipf("chattr +i: %v %s", err, b)
	}
	var left string
	defer func() {
		exec.Command("chattr", "-i", stuck).Run()
		if left != "" {
			exec.Command("chattr", "-R", "-i", left).Run()
			os.RemoveAll(left)
		}
	}()
	before, err := os.Stat(filepath.Join(out, ManifestFile))
	require.NoError(t, err)
	time.Sleep(10 * time.Millisecond)
	res, err := quickBuild(t, j, out, Options{Full: true})
	require.NoError(t, err, "the build is in place: it must not report failure")
	require.NotNil(t, res.Left)
	left = res.Left.Left
	assert.Contains(t, res.Left.Error(), "the new build is in place in "+out)
	after, err := os.Stat(filepath.Join(out, ManifestFile))
	require.NoError(t, err)
	assert.False(t, os.SameFile(before, after), "the manifest is the new build's")
	b, err := os.ReadFile(filepath.Join(out, "notes", "stuck.txt"))
	require.NoError(t, err)
	assert.Equal(t, "s", string(b))
}

// TestBuildDoesNotWaitOnData: a counts table that is a FIFO is refused
// and Build returns at once: it used to hash the data file whole after
// the error and block forever.
func TestBuildDoesNotWaitOnData(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, syscall.Mkfifo(filepath.Join(dir, "counts.csv"), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "totals.csv"), []byte("year,total\n1900,5\n"), 0o644))
	spec := filepath.Join(dir, "spec.yaml")
	require.NoError(t, os.WriteFile(spec, []byte("title: T\ndata: {counts: counts.csv, totals: totals.csv}\nyears: {from: 1900, to: 1901}\nterms: {top: 5}\noutputs: {print: {kind: print, trim: A5}}\n"), 0o644))
	s, err := specs.Load(spec)
	require.NoError(t, err)
	done := make(chan error, 1)
	go func() {
		_, err := Build(context.Background(), &feature.Job{Spec: s}, Options{Dir: filepath.Join(dir, "out")})
		done <- err
	}()
	select {
	case err := <-done:
		require.Error(t, err)
		assert.True(t, specs.IsBadInput(err))
		assert.Contains(t, err.Error(), "named pipe")
	case <-time.After(20 * time.Second): // a hang check, not a speed one
		require.FailNow(t, "Build still running after 20 s")
	}
}

// asNobody runs the calling test again in a copy of the test binary as
// the user nobody (uid 65534), in a folder everyone may write, and fails
// when it fails. It skips when that cannot be arranged.
func asNobody(t *testing.T) {
	t.Helper()
	dir, err := os.MkdirTemp("", "sheaf-nobody-")
	require.NoError(t, err)
	defer os.RemoveAll(dir)
	require.NoError(t, os.Chmod(dir, 0o777))
	self, err := os.Executable()
	require.NoError(t, err)
	bin := filepath.Join(dir, "test.bin")
	b, err := os.ReadFile(self)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(bin, b, 0o755))
	wd, err := os.Getwd()
	require.NoError(t, err)
	cmd := exec.Command(bin, "-test.run", "^"+t.Name()+"$", "-test.v")
	cmd.Dir = wd
	cmd.Env = append(os.Environ(), "TMPDIR="+dir, "HOME="+dir)
	cmd.SysProcAttr = &syscall.SysProcAttr{Credential: &syscall.Credential{Uid: 65534, Gid: 65534}}
	out, err := cmd.CombinedOutput()
	if err != nil && len(out) == 0 {
		t.Skipf("cannot run the test as nobody: %v", err)
	}
	require.NoError(t, err, "as nobody:\n%s", out)
	require.Contains(t, string(out), "--- PASS: "+t.Name())
}
