package preflight

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestMedianBySelection: the median found by selection is the very value
// a sort gives (the middle value, or the mean of the two middle values
// for an even count: the textbook definition), on random series with
// ties, zeros, gaps and leading or trailing inactive years, with the
// scratch buffer reused from series to series as preflight reuses it.
func TestMedianBySelection(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	var buf []float64
	for trial := range 20000 {
		n := 1 + r.IntN(40)
		counts, values := make([]float64, n), make([]float64, n)
		for j := range n {
			switch r.IntN(6) {
			case 0:
				counts[j] = 0
			case 1:
				counts[j] = math.NaN()
			default:
				counts[j] = float64(r.IntN(8))
			}
			values[j] = float64(r.IntN(12)) / 4 // ties are common
			if r.IntN(15) == 0 {
				values[j] = math.NaN()
			}
		}
		// the reference: sort the active, non-gap values
		first, last := -1, -1
		for j, c := range counts {
			if c > 0 {
				if first < 0 {
					first = j
				}
				last = j
			}
		}
		var got float64
		var ok bool
		got, ok, buf = medianActive(counts, values, buf)
		if first < 0 {
			require.False(t, ok, "trial %d", trial)
			continue
		}
		var xs []float64
		for j := first; j <= last; j++ {
			if !math.IsNaN(counts[j]) && !math.IsNaN(values[j]) {
				xs = append(xs, values[j])
			}
		}
		if len(xs) == 0 {
			require.False(t, ok, "trial %d", trial)
			continue
		}
		sort.Float64s(xs)
		var want float64
		if k := len(xs); k%2 == 1 {
			want = xs[k/2]
		} else {
			want = (xs[k/2-1] + xs[k/2]) / 2
		}
		require.True(t, ok, "trial %d", trial)
		require.Equal(t, want, got, "trial %d: counts %v values %v", trial, counts, values)
	}
}
