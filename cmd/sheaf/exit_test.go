package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestExitCodes: the type of an error decides the exit status, not
// where it happens (README: 0 ok, 1 findings or failed build, 2 bad
// input or usage). The rule is this project's own.
func TestExitCodes(t *testing.T) {
	tests := []struct {
		name string
		err  error
		want int
	}{
		{"plain failure", errors.New("disk full"), exitFindings},
		{"bad input", specs.BadInput(errors.New("x.yaml:1:1: no")), exitBadInput},
		{"bad input, wrapped further", fmt.Errorf("output %q: %w", "print", specs.BadInput(errors.New("no"))), exitBadInput},
		{"bad input among others", errors.Join(errors.New("a"), specs.BadInput(errors.New("b"))), exitBadInput},
		{"a spec error not marked", &specs.Error{Msg: "unmarked"}, exitFindings},
	}
	for _, tt := range tests {
		var w bytes.Buffer
		assert.Equal(t, tt.want, report(&w, tt.err), tt.name)
		assert.Equal(t, tt.err.Error()+"\n", w.String(), tt.name)
	}
}

// TestPanicIsInternalError: a panic is a bug in sheaf, not bad input:
// exit 1 with "internal error"; the stack only with SHEAF_DEBUG=1.
func TestPanicIsInternalError(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	out := filepath.Join(t.TempDir(), "out")
	buildHooks.BeforeCommit = func(string) error { panic("injected panic") }
	t.Cleanup(func() { buildHooks.BeforeCommit = nil })
	for _, debug := range []string{"", "1"} {
		t.Setenv("SHEAF_DEBUG", debug)
		var o, e bytes.Buffer
		code := run([]string{"build", spec, "--out", out, "--quiet"}, &o, &e)
		require.Equal(t, exitFindings, code, "SHEAF_DEBUG=%q", debug)
		assert.Contains(t, e.String(), "sheaf: internal error: injected panic")
		if debug == "1" {
			assert.Contains(t, e.String(), "goroutine ", "the stack, with SHEAF_DEBUG=1")
		} else {
			assert.NotContains(t, e.String(), "goroutine ", "no stack without SHEAF_DEBUG")
		}
		noStages(t, out) // the stage is removed on the panic's way up
	}
}

// TestCtrlCDuringTallPNG: SIGINT (Ctrl-C) sent once the 2× PNG of a
// scrolling web page has begun ends the build with exit 1 and
// "interrupted", the output folder as it was. The signal goes to this
// process while run holds it (signal.NotifyContext), as a terminal's
// Ctrl-C would. How fast it stops is production's TestCancelDuringTallPNG
// and raster's TestDrawStopsWhenCancelled.
func TestCtrlCDuringTallPNG(t *testing.T) {
	spec := newJob(t, jobSpec("")+"  web:\n    kind: screen\n    trim: 1200px\n")
	out := filepath.Join(t.TempDir(), "out")
	var once sync.Once
	buildHooks.BeforeRaster = func(file string) error {
		if strings.HasSuffix(file, filepath.Join("web", "page-001@2x.png")) {
			once.Do(func() { require.NoError(t, syscall.Kill(os.Getpid(), syscall.SIGINT)) })
		}
		return nil
	}
	t.Cleanup(func() { buildHooks.BeforeRaster = nil })
	var o, e bytes.Buffer
	code := run([]string{"build", spec, "--out", out, "--no-proofs", "--quiet"}, &o, &e)
	assert.Equal(t, exitFindings, code)
	assert.Contains(t, e.String(), "sheaf build: interrupted; "+out+" is as it was before the build")
	assert.NoDirExists(t, out, "a first build interrupted leaves no folder")
	noStages(t, out)
}

// TestSchemaCommand: `sheaf schema` prints the schema the repository
// keeps for editors, and takes no arguments.
func TestSchemaCommand(t *testing.T) {
	var o, e bytes.Buffer
	require.Equal(t, exitOK, run([]string{"schema"}, &o, &e), e.String())
	file, err := os.ReadFile("../../specs/sheaf.schema.json")
	require.NoError(t, err)
	assert.Equal(t, string(file), o.String())
	o.Reset()
	assert.Equal(t, exitBadInput, run([]string{"schema", "extra"}, &o, &e))
	assert.Zero(t, o.Len())
}
