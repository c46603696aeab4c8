package feature

import (
	"bytes"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// The summary of the small feature, as `sheaf check` prints it: its
// counts are testdata/small/counts.csv's (three terms, eight rows; no
// totals row for 1903, so a gap); A5 is 148 × 210 mm (ISO 216).
func TestWriteText(t *testing.T) {
	j, err := Load("../../testdata/small/spec.yaml")
	require.NoError(t, err)
	rep, err := j.Summarize()
	require.NoError(t, err)
	var b bytes.Buffer
	rep.WriteText(&b)
	got := b.String()
	for _, line := range []string{
		"../../testdata/small/spec.yaml: \"A small test feature\"\n",
		"  terms:   3 selected of 3 in the data (8 rows), order listed\n",
		"  years:   1900–1905 (6 years; gaps: 1903)\n",
		"  output print (print): 148.0 × 210.0 mm + 3.0 mm bleed\n",
		"    RGB PDF (no printing condition)\n",
	} {
		assert.Contains(t, got, line)
	}
}
