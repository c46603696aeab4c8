package shape

import (
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// randomShapes are smooth-ish random walks in 0…1, some of them near
// copies of others so that close pairs exist.
func randomShapes(r *rand.Rand, n, y int) [][]float64 {
	out := make([][]float64, n)
	for i := range out {
		s := make([]float64, y)
		if i > 0 && r.IntN(4) == 0 {
			src := out[r.IntN(i)]
			for t := range s {
				s[t] = math.Max(0, src[t]+0.05*r.NormFloat64())
			}
		} else {
			v := r.Float64()
			for t := range s {
				v = math.Min(1, math.Max(0, v+0.08*r.NormFloat64()))
				s[t] = v
			}
		}
		out[i] = s
	}
	return out
}

// The pruned search must give exactly what measuring every pair gives:
// the bound of Keogh et al. (2001) never exceeds the true distance, so
// nothing is lost (checked against brute force).
func TestSimilarEqualsBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	for _, tc := range []struct{ n, y, top, per int }{{2, 20, 1, 0}, {60, 30, 10, 0}, {300, 90, 25, 0}, {300, 90, 25, 2}, {500, 175, 40, 3}} {
		shapes := randomShapes(r, tc.n, tc.y)
		var all []Pair
		for i := range shapes {
			for j := range i {
				all = append(all, Pair{A: j, B: i, Distance: Distance(Signature(shapes[i]), Signature(shapes[j]))})
			}
		}
		slices.SortFunc(all, worsePair)
		want := limitPerTerm(all[:min(len(all), keepOf(tc.top, tc.per))], tc.top, tc.per, func(p Pair) (int, int) { return p.A, p.B })
		got := Similar(shapes, tc.top, tc.per)
		require.Len(t, got, len(want), "%+v", tc)
		for k := range want {
			assert.Equal(t, [2]int{want[k].A, want[k].B}, [2]int{got[k].A, got[k].B}, "%+v rank %d", tc, k)
			assert.InDelta(t, want[k].Distance, got[k].Distance, 1e-12)
		}
	}
}

// The pruned hand-over search against scoring every ordered pair.
func TestHandOversEqualBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(21, 22))
	for _, tc := range []struct{ n, y, top, per int }{{40, 40, 5, 0}, {300, 120, 20, 0}, {400, 175, 30, 2}} {
		shapes := randomShapes(r, tc.n, tc.y)
		fl, ok := newFalls(shapes)
		require.True(t, ok)
		pre := make([][]float64, tc.n)
		for i, sh := range shapes {
			pre[i] = make([]float64, tc.y+1)
			for t, v := range sh {
				pre[i][t+1] = pre[i][t] + v
			}
		}
		var all []HandOver
		for a := range shapes {
			for b := range shapes {
				if a == b {
					continue
				}
				if s, c, ok := fl.strength(shapes, pre, a, b); ok {
					all = append(all, HandOver{Falling: a, Rising: b, Strength: s, Split: c})
				}
			}
		}
		slices.SortFunc(all, weakerHO)
		want := limitPerTerm(all[:min(len(all), keepOf(tc.top, tc.per))], tc.top, tc.per, func(h HandOver) (int, int) { return h.Falling, h.Rising })
		got := HandOvers(shapes, tc.top, tc.per)
		require.Len(t, got, len(want), "%+v", tc)
		for k := range want {
			assert.Equal(t, [3]int{want[k].Falling, want[k].Rising, want[k].Split}, [3]int{got[k].Falling, got[k].Rising, got[k].Split}, "%+v rank %d", tc, k)
		}
	}
}

// A worked hand-over: a step down at year 60 and a step up at year 60
// over 100 years; both change by 1, the split is at 60 and the smoothed
// lines cross there (a centred 9-year mean of two steps at the same
// year crosses at the step: by hand).
func TestHandOverWorked(t *testing.T) {
	fall, rise, flat := make([]float64, 100), make([]float64, 100), make([]float64, 100)
	for t := range 100 {
		if t < 60 {
			fall[t] = 1
		} else {
			rise[t] = 1
		}
		flat[t] = 0.5
	}
	got := HandOvers([][]float64{flat, rise, fall}, 5, 0)
	require.NotEmpty(t, got)
	assert.Equal(t, 2, got[0].Falling)
	assert.Equal(t, 1, got[0].Rising)
	assert.InDelta(t, 1, got[0].Strength, 1e-12, "means 1 → 0 and 0 → 1 (by hand)")
	assert.Equal(t, 60, got[0].Split)
	assert.Equal(t, 60, got[0].Crossing)
	for _, h := range got {
		assert.NotEqual(t, [2]int{1, 2}, [2]int{h.Falling, h.Rising}, "a rise is not a fall")
	}
}

// keepOf is how many of the best the per-term limit picks from: 4·top
// with a limit (Similar's and HandOvers' documented rule).
func keepOf(top, per int) int {
	if per > 0 {
		return 4 * top
	}
	return top
}

// The answer does not depend on how many cores share the rows.
func TestPairsIndependentOfCores(t *testing.T) {
	shapes := randomShapes(rand.New(rand.NewPCG(5, 5)), 700, 120)
	prev := runtime.GOMAXPROCS(1)
	s1, h1 := Similar(shapes, 20, 1), HandOvers(shapes, 20, 1)
	runtime.GOMAXPROCS(4)
	s4, h4 := Similar(shapes, 20, 1), HandOvers(shapes, 20, 1)
	runtime.GOMAXPROCS(prev)
	assert.Equal(t, s1, s4)
	assert.Equal(t, h1, h4)
}
