// Package tooltest lets tests use outside programs (poppler, qpdf,
// Ghostscript, LittleCMS, librsvg, Chromium) when they are installed.
//
// A plain `go test ./...` skips a test whose tool is missing, with a message
// naming the Debian package. CI sets SHEAF_REQUIRE_TOOLS=1 so a missing tool
// fails the test instead: CI must always run these checks.
package tooltest

import (
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// EnvRequire is the environment variable that turns a skip into a failure.
const EnvRequire = "SHEAF_REQUIRE_TOOLS"

// Require returns the path of program, or skips (fails under
// SHEAF_REQUIRE_TOOLS=1) when it is not on PATH. debianPackage names the
// package that provides it, for the message.
func Require(t testing.TB, program, debianPackage string) string {
	t.Helper()
	path, err := exec.LookPath(program)
	if err == nil {
		return path
	}
	msg := program + " not found; install Debian package " + debianPackage
	if os.Getenv(EnvRequire) == "1" {
		t.Fatalf("%s (required because %s=1)", msg, EnvRequire)
	}
	t.Skip(msg)
	return ""
}

// RequireFile returns path when it names a readable regular file, or skips
// (fails under SHEAF_REQUIRE_TOOLS=1) when it does not: for data that a
// Debian package installs, such as wamerican's /usr/share/dict/words.
// debianPackage names the package that provides it, for the message.
func RequireFile(t testing.TB, path, debianPackage string) string {
	t.Helper()
	f, err := os.Open(path)
	if err == nil {
		fi, serr := f.Stat()
		f.Close()
		if serr == nil && fi.Mode().IsRegular() {
			return path
		}
		if serr == nil {
			err = errNotRegular
		} else {
			err = serr
		}
	}
	msg := path + " not readable (" + err.Error() + "); install Debian package " + debianPackage
	if os.Getenv(EnvRequire) == "1" {
		t.Fatalf("%s (required because %s=1)", msg, EnvRequire)
	}
	t.Skip(msg)
	return ""
}

var errNotRegular = errors.New("not a regular file")

// ICCProfile returns the path of one of the ICC profiles Debian's
// ghostscript installs (package libgs-common: default_cmyk.icc,
// ps_cmyk.icc, …; not ours to commit), or skips (fails under
// SHEAF_REQUIRE_TOOLS=1) when it is missing.
func ICCProfile(t testing.TB, name string) string {
	t.Helper()
	candidates := []string{"/usr/share/color/icc/ghostscript/" + name}
	if m, _ := filepath.Glob("/usr/share/ghostscript/*/iccprofiles/" + name); len(m) > 0 {
		candidates = append(candidates, m...)
	}
	for _, p := range candidates {
		if st, err := os.Stat(p); err == nil && st.Mode().IsRegular() {
			return p
		}
	}
	return RequireFile(t, candidates[0], "libgs-common (comes with ghostscript)")
}
