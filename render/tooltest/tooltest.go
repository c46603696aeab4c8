// Package tooltest lets tests use outside programs (poppler, qpdf,
// Ghostscript, LittleCMS, librsvg, Chromium) when they are installed.
//
// A plain `go test ./...` skips a test whose tool is missing, with a message
// naming the Debian package. CI sets SHEAF_REQUIRE_TOOLS=1 so a missing tool
// fails the test instead: CI must always run these checks.
package tooltest

import (
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"testing"
)

// skips counts the checks skipped for want of an outside program, by
// Debian package, with the programs or files missing.
var skips = struct {
	sync.Mutex
	n       int
	missing map[string]map[string]bool // package → programs and files
}{missing: map[string]map[string]bool{}}

func skipped(what, debianPackage string) {
	skips.Lock()
	defer skips.Unlock()
	skips.n++
	if skips.missing[debianPackage] == nil {
		skips.missing[debianPackage] = map[string]bool{}
	}
	skips.missing[debianPackage][what] = true
}

// Main runs a package's tests and then, when some were skipped for want
// of an outside program, says so in one line: how many, and which
// programs are missing from which Debian packages. A package whose tests
// call Require has a TestMain that calls it:
//
//	func TestMain(m *testing.M) { tooltest.Main(m) }
//
// `go test ./...` shows a passing package's output only with -v, so
// without -v the line goes to the terminal (/dev/tty) when there is one:
// the person who ran the tests sees it beside the package's "ok" line.
// Without a terminal (CI, where SHEAF_REQUIRE_TOOLS=1 fails instead) it
// goes to the test output.
func Main(m *testing.M) {
	code := m.Run()
	var w io.Writer = os.Stdout
	if !testing.Verbose() {
		if tty, err := os.OpenFile("/dev/tty", os.O_WRONLY, 0); err == nil {
			defer tty.Close()
			w = tty
		}
	}
	Report(w)
	if f, ok := w.(*os.File); ok && f != os.Stdout {
		f.Close()
	}
	os.Exit(code)
}

// Report writes the one line Main prints (nothing when no check was
// skipped).
func Report(w io.Writer) {
	skips.Lock()
	defer skips.Unlock()
	if skips.n == 0 {
		return
	}
	var pkgs []string
	for p, what := range skips.missing {
		var ws []string
		for x := range what {
			ws = append(ws, x)
		}
		sort.Strings(ws)
		pkgs = append(pkgs, p+" ("+strings.Join(ws, ", ")+")")
	}
	sort.Strings(pkgs)
	checks := "checks"
	if skips.n == 1 {
		checks = "check"
	}
	fmt.Fprintf(w, "tooltest: %d outside %s skipped; missing: %s; install them with the apt-get line in README (Tests)\n", skips.n, checks, strings.Join(pkgs, ", "))
}

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
	skipped(program, debianPackage)
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
	skipped(path, debianPackage)
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
