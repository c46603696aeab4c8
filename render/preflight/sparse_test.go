package preflight

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestSparseCounts checks sparse-counts on testdata (README.md there):
// the median count over the years from a term's first occurrence to its
// last, hand-worked, against the default floor of 10 (common practice:
// Poisson noise 1/√10 ≈ 32 %).
//
//	boiler  50 40 20 30 20 10 → median (20+30)/2 = 25: not sparse
//	Maßstab  3  0  0  0  0  9 → median 0: sparse
//	flash    2  3 40  3  2  4 → median 3: sparse
//
// With a 5-year window (raw counts: pooled counts are window sums, the
// window cut at the ends, see series.Pool):
//
//	flash   45 48 50 52 49 9 → median 48.5: not sparse
//	Maßstab  3  3  3  9  9 9 → median 6: still sparse, "even pooled"
//
// and the spike in flash (40 against 4) is still found: spikes are
// judged on the yearly counts, not the smoothed line.
func TestSparseCounts(t *testing.T) {
	tests := []struct {
		name    string
		top     string
		sparse  map[string]string // term → message substring
		notTerm []string
		spike   bool
	}{
		{"yearly", "", map[string]string{
			"Maßstab": "its median yearly count is 0 (under 10)",
			"flash":   "its median yearly count is 3 (under 10): the line is mostly noise (about ±58 % a year); smooth it with scale.rolling",
		}, []string{"boiler", "silent"}, true},
		{"5-year window", "  rolling: {years: 5}\n", map[string]string{
			"Maßstab": "even pooled over 5 years its median count is 6 (under 10)",
		}, []string{"boiler", "flash", "silent"}, true},
		{"floor 30 catches boiler", "preflight: {min-count: 30}\n", map[string]string{
			"boiler": "median yearly count is 25 (under 30)",
		}, nil, true},
		{"off", "preflight: {min-count: 0}\n", nil, []string{"boiler", "flash", "Maßstab", "silent"}, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text := specText("", "")
			if tt.top != "" && tt.top[0] == ' ' {
				text = replaceOnce(text, "scale: {values: raw}\n", "scale:\n  values: raw\n"+tt.top)
			} else {
				text += tt.top
			}
			got := prepare(t, text)
			for term, msg := range tt.sparse {
				f, ok := has(got, IDSparse, term, 0)
				require.True(t, ok, "no sparse-counts for %s in\n%s", term, list(got))
				assert.Contains(t, f.Message, msg)
				assert.Equal(t, Review, f.Severity)
			}
			for _, term := range tt.notTerm {
				_, ok := has(got, IDSparse, term, 0)
				assert.False(t, ok, "unexpected sparse-counts for %s", term)
			}
			_, ok := has(got, IDSpike, "flash", 1902)
			assert.Equal(t, tt.spike, ok, "spike flash 1902")
		})
	}
}

func replaceOnce(s, old, new string) string {
	for i := 0; i+len(old) <= len(s); i++ {
		if s[i:i+len(old)] == old {
			return s[:i] + new + s[i+len(old):]
		}
	}
	return s
}

// TestMedianActive: hand-worked medians over a term's active years.
func TestMedianActive(t *testing.T) {
	nan := func() float64 { var z float64; return z / z }()
	tests := []struct {
		counts []float64
		want   float64
		ok     bool
	}{
		{[]float64{0, 0, 5, 1, 3, 0}, 3, true},            // active 5 1 3 → 3
		{[]float64{0, 2, 0, 0, 6, 0}, 1, true},            // active 2 0 0 6 → (0+2)/2
		{[]float64{0, 2, nan, 8, 0}, 5, true},             // gap left out: 2 8 → 5
		{[]float64{0, 0, 0}, 0, false},                    // never occurs
		{[]float64{12, 0, 0, 0, 0, 0, 0, 0, 14}, 0, true}, // long silence counts
	}
	for _, tt := range tests {
		got, ok := MedianActive(tt.counts, tt.counts)
		assert.Equal(t, tt.ok, ok, "%v", tt.counts)
		assert.Equal(t, tt.want, got, "%v", tt.counts)
	}
}
