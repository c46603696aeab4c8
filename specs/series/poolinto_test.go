package series

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestPoolIntoReusedSlices: pooling into slices left over from a longer
// series, full of its values, gives exactly what Pool gives into new ones
// (Pool is checked against the NIST/SEMATECH worked example in
// TestPoolMovingAverage).
func TestPoolIntoReusedSlices(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	var p, e []float64
	for trial := range 2000 {
		n := 1 + r.IntN(60)
		counts, exposure := make([]float64, n), make([]float64, n)
		for j := range n {
			counts[j], exposure[j] = float64(r.IntN(50)), 1+float64(r.IntN(1000))
			if r.IntN(10) == 0 {
				counts[j] = math.NaN()
			}
		}
		years := 1 + 2*r.IntN(4)
		wantP, wantE := Pool(counts, exposure, years)
		p, e = PoolInto(p[:cap(p)], e[:cap(e)], counts, exposure, years)
		require.Len(t, p, n)
		for j := range n {
			require.True(t, wantP[j] == p[j] || math.IsNaN(wantP[j]) && math.IsNaN(p[j]), "trial %d year %d", trial, j)
			require.True(t, wantE[j] == e[j] || math.IsNaN(wantE[j]) && math.IsNaN(e[j]), "trial %d year %d", trial, j)
		}
	}
}

// TestYearlyIntoReusedSlice: a reused slice holding another series'
// values gives exactly Yearly's values (a new slice), shares and raw
// counts alike.
func TestYearlyIntoReusedSlice(t *testing.T) {
	totals := []float64{1000, 2000, math.NaN(), 4000}
	sr := Series{Counts: []float64{1, 0, math.NaN(), 7}}
	for _, set := range []*Set{{totals: totals, unitFactor: 1e6}, {unitFactor: 1}} {
		want := set.Yearly(&sr)
		v := set.YearlyInto(&sr, []float64{9, 9, 9, 9, 9, 9})
		require.Len(t, v, 4)
		for j := range want {
			require.True(t, want[j] == v[j] || math.IsNaN(want[j]) && math.IsNaN(v[j]), "year %d: %v vs %v", j, want, v)
		}
	}
}
