package preflight

import (
	"bytes"
	"testing"

	"github.com/stretchr/testify/assert"
)

// The findings table: a count line, then a row a finding with its place
// and the spec position that set the value; past the limit, one row says
// how many more. Severities are counted one by one (the count line is
// the project's own wording); columns two spaces apart.
func TestWriteTable(t *testing.T) {
	fs := []Finding{
		{ID: "type-floor", Severity: Error, Output: "print", Page: 2, Term: "boiler", At: "spec.yaml:9:5", Message: "5.5 pt type"},
		{ID: "sparse-counts", Severity: Review, Output: "print", Page: 1, Term: "steam", Message: "noisy"},
		{ID: "rgb-output", Severity: Info, Output: "print", Message: "RGB"},
		{ID: "palette", Severity: Info, Output: "web", Message: "passes"},
	}
	assert.Equal(t, "preflight: 1 errors, 0 warnings, 1 for review, 2 notes", CountLine(fs))
	for _, tc := range []struct {
		limit int
		want  string
	}{
		{0, "preflight: 1 errors, 0 warnings, 1 for review, 2 notes\n" +
			"  error   type-floor     print p. 2 \"boiler\"  5.5 pt type (spec.yaml:9:5)\n" +
			"  review  sparse-counts  print p. 1 \"steam\"   noisy\n" +
			"  info    rgb-output     print                RGB\n" +
			"  info    palette        web                  passes\n"},
		{2, "preflight: 1 errors, 0 warnings, 1 for review, 2 notes\n" +
			"  error   type-floor                                 print p. 2 \"boiler\"  5.5 pt type (spec.yaml:9:5)\n" +
			"  review  sparse-counts                              print p. 1 \"steam\"   noisy\n" +
			"  …       2 more: sheaf check --json lists them all                       \n"},
	} {
		var b bytes.Buffer
		WriteTable(&b, fs, tc.limit)
		assert.Equal(t, tc.want, b.String(), "limit %d", tc.limit)
	}
	var b bytes.Buffer
	WriteTable(&b, nil, 0)
	assert.Empty(t, b.String(), "no findings, no table")
}
