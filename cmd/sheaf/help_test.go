package main

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestHelpSame: `sheaf COMMAND -h` prints exactly what `sheaf help
// COMMAND` prints, on stdout, with flags spelled --flag as README writes
// them.
func TestHelpSame(t *testing.T) {
	for _, c := range commands() {
		if c.run == nil {
			continue
		}
		var o1, e1, o2, e2 bytes.Buffer
		require.Equal(t, exitOK, run([]string{"help", c.name}, &o1, &e1), c.name)
		for _, h := range []string{"-h", "--help"} {
			o2.Reset()
			e2.Reset()
			require.Equal(t, exitOK, run([]string{c.name, h}, &o2, &e2), c.name)
			assert.Equal(t, o1.String(), o2.String(), "sheaf %s %s", c.name, h)
			assert.Empty(t, e2.String(), "sheaf %s %s: nothing on stderr", c.name, h)
		}
		if strings.Contains(o1.String(), "\nFlags:") {
			assert.Regexp(t, `(?m)^  --[a-z]`, o1.String(), c.name)
		}
		assert.NotRegexp(t, regexp.MustCompile(`(?m)^\s+-[a-z]`), o1.String(), "%s: no single-dash flags", c.name)
	}
}

// TestHelpNoTrailingSpace: no line of `sheaf help` or of a command's help
// ends in a space or tab (the usage line of a command with no arguments,
// `sheaf schema`, once did).
func TestHelpNoTrailingSpace(t *testing.T) {
	texts := map[string]string{}
	var o, e bytes.Buffer
	require.Equal(t, exitOK, run([]string{"help"}, &o, &e), "sheaf help")
	texts["sheaf help"] = o.String()
	for _, c := range commands() {
		if c.run == nil { // help itself: its text is sheaf help's
			continue
		}
		o.Reset()
		require.Equal(t, exitOK, run([]string{"help", c.name}, &o, &e), "sheaf help %s", c.name)
		texts["sheaf help "+c.name] = o.String()
	}
	// The help line lists `sheaf help [COMMAND]`, and help is a command.
	o.Reset()
	require.Equal(t, exitOK, run([]string{"help", "help"}, &o, &e), "sheaf help help")
	assert.Equal(t, texts["sheaf help"], o.String(), "sheaf help help is sheaf help")
	for what, text := range texts {
		require.NotEmpty(t, text, what)
		for i, line := range strings.Split(text, "\n") {
			assert.Equal(t, strings.TrimRight(line, " \t"), line, "%s, line %d ends in a space", what, i+1)
		}
	}
}
