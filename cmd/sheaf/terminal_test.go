package main

// A quiet terminal (issue 15, item 4): a build on a terminal prints a
// short summary instead of every path; nothing changed is one line; the
// preflight table is printed once per set of findings.

import (
	"bytes"
	"io"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestBuildOnTerminal(t *testing.T) {
	spec := newJob(t, jobSpec(""))
	out := filepath.Join(filepath.Dir(spec), "out")
	terminal := true
	stdoutIsTerminal = func(io.Writer) bool { return terminal }
	t.Cleanup(func() { stdoutIsTerminal = isTerminal })
	build := func(flags ...string) (string, string) {
		var o, e bytes.Buffer
		code := run(append([]string{"build", spec, "--out", out, "--quiet"}, flags...), &o, &e)
		require.Equal(t, exitOK, code, e.String())
		return o.String(), e.String()
	}

	stdout, stderr := build()
	assert.NotContains(t, stdout, filepath.Join(out, "print", "print.pdf"), "no paths on a terminal")
	assert.Contains(t, stdout, "first build: ")
	assert.Contains(t, stdout, "  print: ")
	assert.Contains(t, stdout, filepath.Join(out, "changes.txt"))
	assert.LessOrEqual(t, strings.Count(stdout, "\n"), 5, stdout)
	table := strings.Count(stderr, "\n")
	require.Contains(t, stderr, "preflight: ", "the demo's palette warns at its line width")
	require.Greater(t, table, 1, "the findings table")

	// Nothing changed: one line; the findings not again.
	stdout, stderr = build()
	assert.Equal(t, 1, strings.Count(stdout, "\n"), stdout)
	assert.True(t, strings.HasPrefix(stdout, "nothing changed since the last build ("), stdout)
	assert.Equal(t, 1, strings.Count(stderr, "\n"), stderr)
	assert.Contains(t, stderr, "as in the last build")

	// A change: the summary line first, then the work, no paths.
	m := loadManifest(t, out)
	nudgeCount(t, spec, m.Output("print").Pages[1].Terms[0])
	stdout, _ = build()
	r := loadChanges(t, out)
	assert.True(t, strings.HasPrefix(stdout, r.Summary+"\n"), stdout)
	assert.Regexp(t, `  print: \d+ pages, \d+ drawn, \d+ reused`, stdout)
	assert.NotContains(t, stdout, ".png\n")

	// --paths: every path on stdout, as without a terminal.
	stdout, _ = build("--paths")
	assert.Contains(t, stdout, filepath.Join(out, "print", "print.pdf")+"\n")
	terminal = false
	stdout, _ = build()
	assert.Contains(t, stdout, filepath.Join(out, "print", "print.pdf")+"\n")
}
