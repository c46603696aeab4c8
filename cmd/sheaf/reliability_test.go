package main

// Issue 20 at the command line: exit statuses and messages for the
// output folder, endless inputs and sizes build cannot draw. The rules are
// this project's own (README, Production).

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/tooltest"
)

func sheaf(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	done := make(chan int, 1)
	go func() { done <- run(args, &o, &e) }()
	select {
	case code = <-done:
	case <-time.After(60 * time.Second): // a hang check, not a speed one
		require.Failf(t, "hang", "sheaf %v still running after 60 s", args)
	}
	return code, o.String(), e.String()
}

func TestOutRootIsBadInput(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	code, _, stderr := sheaf(t, "build", spec, "--out", "/", "--quiet")
	assert.Equal(t, exitBadInput, code)
	assert.Contains(t, stderr, "/ is the root folder")
	assert.NotContains(t, stderr, "mkdirtemp")
	assert.NotContains(t, stderr, "preflight:", "refused before anything is prepared")
}

func TestEndlessInputsAreBadInput(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	dir := filepath.Dir(spec)
	fifo := filepath.Join(dir, "fifo.yaml")
	require.NoError(t, syscall.Mkfifo(fifo, 0o644))
	counts := filepath.Join(dir, "data", "counts.csv")
	require.NoError(t, os.Remove(counts))
	require.NoError(t, os.Symlink("/dev/zero", counts))
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"check", fifo}, fifo + ": is a named pipe (FIFO), not a regular file"},
		{[]string{"check", spec}, "is a character device, not a regular file"},
		{[]string{"build", spec, "--quiet"}, "is a character device, not a regular file"},
	} {
		code, _, stderr := sheaf(t, c.args...)
		assert.Equal(t, exitBadInput, code, c.args)
		assert.Contains(t, stderr, c.want, c.args)
	}
}

// TestCheckRefusesWhatBuildCannotDraw: sizes build cannot draw fail
// check at their spec line (ISO 32000-1 Annex C.2 for PDF pages; the
// 100-million-pixel image bound is this project's own).
func TestCheckRefusesWhatBuildCannotDraw(t *testing.T) {
	for _, c := range []struct{ extra, want string }{
		{"  web: {kind: screen, trim: 1e20px}\n", "outputs.web.trim: 1e20px is larger than a screen page may be"},
		{"  web: {kind: screen, trim: 1e9mm}\n", "outputs.web.trim: 1e9mm is larger than a screen page may be"},
		{"inserts:\n  big: {output: print, size: 1e9mm x 45mm, terms: [steam]}\n", "inserts.big.size: 1e9mm x 45mm is larger than the largest PDF page"},
		{"  web: {kind: screen, trim: 1200px}\ninserts:\n  huge: {output: web, size: 14000pt x 14000pt, terms: [steam]}\n", "inserts.huge.size: its 2× PNG would be 1394 million pixels"},
	} {
		spec := newJob(t, jobSpec(c.extra))
		code, _, stderr := sheaf(t, "check", spec)
		assert.Equal(t, exitBadInput, code, c.extra)
		assert.Contains(t, stderr, spec+":", c.extra)
		assert.Contains(t, stderr, c.want, c.extra)
	}
}

// TestLeftoverAfterSwapIsSuccess: when the previous build cannot be
// removed after the swap, the build is in place: exit 0, its files on
// stdout, a warning naming what was left, never "nothing was changed".
// Needs chattr +i (e2fsprogs, an ext4/xfs/btrfs temporary folder, root).
func TestLeftoverAfterSwapIsSuccess(t *testing.T) {
	tooltest.Require(t, "chattr", "e2fsprogs")
	spec := newJob(t, jobSpec(""))
	out := filepath.Join(filepath.Dir(spec), "out")
	code, _, stderr := sheaf(t, "build", spec, "--out", out, "--quiet", "--no-proofs")
	require.Equal(t, exitOK, code, stderr)
	stuck := filepath.Join(out, "notes", "stuck.txt")
	require.NoError(t, os.MkdirAll(filepath.Dir(stuck), 0o755))
	require.NoError(t, os.WriteFile(stuck, []byte("s"), 0o644))
	if b, err := exec.Command("chattr", "+i", stuck).CombinedOutput(); err != nil {
		t.Skipf("chattr +i: %v %s", err, b)
	}
	defer func() {
		exec.Command("chattr", "-R", "-i", filepath.Dir(spec)).Run()
	}()
	code, stdout, stderr := sheaf(t, "build", spec, "--out", out, "--quiet", "--no-proofs", "--full")
	assert.Equal(t, exitOK, code, stderr)
	assert.Contains(t, stdout, filepath.Join(out, "print", "print.pdf"))
	assert.Contains(t, stderr, "the new build is in place in "+out)
	assert.NotContains(t, stderr, "nothing was changed")
	matches, _ := filepath.Glob(filepath.Join(filepath.Dir(spec), ".out.stage-*"))
	require.NotEmpty(t, matches)
	assert.True(t, strings.Contains(stderr, matches[0]), "the warning names %s:\n%s", matches[0], stderr)
}

// TestAbsurdLengthsWrittenShort: an aspect of 1e-300 makes a row need a
// length of 1e301 mm; the message writes it with an exponent, not 300
// digits.
func TestAbsurdLengthsWrittenShort(t *testing.T) {
	spec := newJob(t, strings.Replace(jobSpec(""), "    columns: 4\n", "    columns: 4\n    panel: {aspect: 1e-300}\n", 1))
	code, _, stderr := sheaf(t, "check", spec)
	assert.Equal(t, exitBadInput, code)
	assert.Contains(t, stderr, "e+301 mm")
	assert.NotRegexp(t, `[0-9]{20}`, stderr)
}
