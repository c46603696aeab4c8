package specs

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestLinesKeys checks scale.rolling, outputs.*.band, inserts.*.compare
// and preflight.min-count: values, defaults and bad input at its place.
// Positions are counted by hand in the inline text (line:col, 1-based).
// The min-count default 10 is common practice: Poisson noise is 1/√k,
// about 32 % at k = 10.
func TestLinesKeys(t *testing.T) {
	const withInsert = printOut + "inserts:\n  m:\n    output: print\n    size: 60mm x 40mm\n    terms: [a, b]\n"
	tests := []struct {
		name  string
		text  string
		check func(t *testing.T, s *Spec)
		err   string // "line:col: message substring"
	}{
		{"defaults", withInsert, func(t *testing.T, s *Spec) {
			assert.Equal(t, 0, s.Scale.Rolling)
			assert.Equal(t, 0.0, s.Outputs[0].Band)
			assert.Equal(t, CompareRows, s.Inserts[0].Compare)
			assert.Equal(t, 10.0, s.Preflight.MinCount)
		}, ""},
		{"rolling 5", printOut + "scale:\n  rolling: {years: 5}\n", func(t *testing.T, s *Spec) {
			assert.Equal(t, 5, s.Scale.Rolling)
		}, ""},
		{"rolling 1 is none", printOut + "scale:\n  rolling: {years: 1}\n", func(t *testing.T, s *Spec) {
			assert.Equal(t, 0, s.Scale.Rolling)
		}, ""},
		{"rolling even", printOut + "scale:\n  rolling: {years: 4}\n", nil, "8:12: scale.rolling.years: a centred window needs an odd number of years (3 or 5), not 4"},
		{"rolling zero", printOut + "scale:\n  rolling: {years: 0}\n", nil, "8:20: scale.rolling.years must be between 1 and 99"},
		{"rolling no years", printOut + "scale:\n  rolling: {}\n", nil, "8:12: scale.rolling.years is missing"},
		{"rolling scalar", printOut + "scale:\n  rolling: 5\n", nil, `8:12: scale.rolling must be a mapping of keys to values, not "5"`},
		{"band 95%", printOut + "    band: 95%\n", func(t *testing.T, s *Spec) {
			assert.InDelta(t, 0.95, s.Outputs[0].Band, 1e-15)
		}, ""},
		{"band none", printOut + "    band: none\n", func(t *testing.T, s *Spec) {
			assert.Equal(t, 0.0, s.Outputs[0].Band)
		}, ""},
		{"band bare number", printOut + "    band: 0.95\n", nil, `7:11: outputs.print.band must be a confidence level such as 95% (or none), not "0.95"`},
		{"band too high", printOut + "    band: 100%\n", nil, "7:11: outputs.print.band must be between 50% and 99.9%"},
		{"compare overlay", strings.Replace(withInsert, "terms: [a, b]", "terms: [a, b]\n    compare: overlay", 1), func(t *testing.T, s *Spec) {
			assert.Equal(t, CompareOverlay, s.Inserts[0].Compare)
		}, ""},
		{"compare unknown", strings.Replace(withInsert, "terms: [a, b]", "terms: [a, b]\n    compare: stacked", 1), nil, `12:14: inserts.m.compare must be one of rows, overlay, not "stacked"`},
		{"min-count", printOut + "preflight:\n  min-count: 25\n", func(t *testing.T, s *Spec) {
			assert.Equal(t, 25.0, s.Preflight.MinCount)
		}, ""},
		{"min-count off", printOut + "preflight:\n  min-count: 0\n", func(t *testing.T, s *Spec) {
			assert.Equal(t, 0.0, s.Preflight.MinCount)
		}, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s, err := Parse("p.yaml", []byte(tt.text))
			if tt.err != "" {
				require.Error(t, err)
				assert.Contains(t, err.Error(), "p.yaml:"+tt.err)
				return
			}
			require.NoError(t, err)
			tt.check(t, s)
		})
	}
}
