package specs

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestUSTrimBleed: a US trim with no bleed given gets 0.125 in, what
// North American printers usually ask (common practice); a metric trim
// keeps 3 mm; a bleed written out is kept.
func TestUSTrimBleed(t *testing.T) {
	for _, c := range []struct {
		out  string
		want Length
	}{
		{"trim: Letter", Length(0.125 * PtPerIn)},            // common practice (North America)
		{"trim: Tabloid landscape", Length(0.125 * PtPerIn)}, // common practice
		{"trim: 8.5in x 11in", Length(0.125 * PtPerIn)},      // inches: a US job
		{"trim: A4", Length(3 * PtPerMm)},                    // common practice (Europe)
		{"trim: 230mm x 300mm", Length(3 * PtPerMm)},         // metric
		{"{trim: Letter, bleed: 3mm}", Length(3 * PtPerMm)},  // given: kept
		{"{trim: Letter, bleed: 0mm}", 0},                    // given: kept
	} {
		out := "{kind: print, " + c.out + "}"
		if c.out[0] == '{' {
			out = "{kind: print, " + c.out[1:]
		}
		s := loadText(t, "title: t\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1900, to: 1910}\noutputs:\n  print: "+out+"\n")
		assert.InDelta(t, float64(c.want), float64(s.Outputs[0].Bleed), 1e-9, c.out)
	}
}

// TestUnitlessSuggestsKindUnits: a length without a unit suggests px on
// a screen output, mm or pt on a print one.
func TestUnitlessSuggestsKindUnits(t *testing.T) {
	for _, c := range []struct{ out, want string }{
		{"{kind: screen, trim: 800}", `"800" has no unit; write it with one, like 800px`},
		{"{kind: screen, gutter: 20}", `"20" has no unit; write it with one, like 20px`},
		{"{kind: print, gutter: 4}", `"4" has no unit; write it with one, like 4mm or 4pt`},
	} {
		_, err := loadErr(t, "title: t\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1900, to: 1910}\noutputs:\n  o: "+c.out+"\n")
		require.Error(t, err, c.out)
		assert.Contains(t, err.Error(), c.want)
	}
}

func loadErr(t *testing.T, text string) (*Spec, error) {
	path := filepath.Join(t.TempDir(), "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(text), 0o644))
	return Load(path)
}

func loadText(t *testing.T, text string) *Spec {
	s, err := loadErr(t, text)
	require.NoError(t, err)
	return s
}
