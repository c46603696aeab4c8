package main

import (
	"bytes"
	"errors"
	"fmt"
	"path/filepath"
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
