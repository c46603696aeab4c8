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
