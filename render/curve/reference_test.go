package curve_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/interp"

	"sheaf/render/curve"
)

// Sources cited in the tables below.
const (
	srcWorked = "testdata/print-facts.md, Monotone cubic interpolation [COMPUTED with gonum FritschButland, agreed to 12 digits by an independent implementation]"
	srcGonum  = "gonum.org/v1/gonum/interp v0.17.0 FritschButland Fit/Predict/PredictDerivative [LIB]"
	srcFC     = "Fritsch & Carlson (1980) SIAM J. Numer. Anal. 17(2):238–246"
	srcFB     = "Fritsch & Butland (1984) SIAM J. Sci. Stat. Comput. 5(2):300–304"
)

func mustMap(t testing.TB, dx0, dx1, dy0, dy1, px0, px1, py0, py1 float64) curve.Map {
	t.Helper()
	m, err := curve.NewMap(dx0, dx1, dy0, dy1, px0, px1, py0, py1)
	require.NoError(t, err)
	return m
}

// identity maps data to plot unchanged, so plot values read as data values.
func identity(t testing.TB) curve.Map { return mustMap(t, 0, 1, 0, 1, 0, 1, 0, 1) }

func TestSlopesWorked(t *testing.T) {
	tests := []struct {
		name   string
		xs, ys []float64
		want   []float64
		tol    float64 // the source prints six decimals
		source string
	}{
		{"uneven rise", []float64{0, 2, 3, 4, 5, 6}, []float64{0, 1, 1.5, 2.5, 3, 4},
			[]float64{0.5, 0.5, 0.666667, 0.666667, 0.666667, 1.25}, 1e-6, srcWorked},
		{"plateaus", []float64{1, 2, 3, 4, 5}, []float64{0, 0, 1, 4, 4},
			[]float64{0, 0, 1.5, 0, 0}, 1e-6, srcWorked},
		// Δ_k = 0 ⇒ d_k = d_k+1 = 0.
		{"flat", []float64{1, 2, 3, 4}, []float64{7, 7, 7, 7},
			[]float64{0, 0, 0, 0}, 0, srcFC + " (Δ_k = 0 ⇒ d_k = d_k+1 = 0), via print-facts.md"},
		// Two points: the secant at both ends, as gonum does for n = 2.
		{"two points", []float64{1900, 1904}, []float64{10, 2},
			[]float64{-2, -2}, 0, srcGonum + " (n = 2 branch)"},
		// One point: no slope to take; 0 so that a dot is flat.
		{"one point", []float64{1900}, []float64{10}, []float64{0}, 0, "package contract (doc.go)"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := curve.Slopes(tt.xs, tt.ys, nil)
			require.NoError(t, err)
			require.Len(t, got, len(tt.want), "len = %d, want %d", len(got), len(tt.want))
			for i := range got {
				assert.InDelta(t, tt.want[i], got[i], tt.tol, "d[%d] (%s)", i, tt.source)
			}
		})
	}
}

func TestYAtWorked(t *testing.T) {
	rise := []float64{0, 2, 3, 4, 5, 6}
	riseY := []float64{0, 1, 1.5, 2.5, 3, 4}
	plat := []float64{1, 2, 3, 4, 5}
	platY := []float64{0, 0, 1, 4, 4}
	tests := []struct {
		xs, ys  []float64
		x, want float64
		tol     float64 // half a unit in the last printed digit
		source  string
	}{
		{rise, riseY, 2.5, 1.2291667, 5e-8, srcWorked},
		{rise, riseY, 3.5, 2, 5e-8, srcWorked},
		{rise, riseY, 5.5, 3.4270833, 5e-8, srcWorked},
		{plat, platY, 2.5, 0.3125, 5e-8, srcWorked},
		{plat, platY, 3.5, 2.6875, 5e-8, srcWorked},
	}
	// The same values must come out of a y-up (PDF) and a y-down (SVG)
	// panel once mapped; the slope rule must not care.
	maps := map[string]curve.Map{
		"identity": identity(t),
		"pdf":      mustMap(t, 0, 6, 0, 4, 72, 144, 500, 560),
		"svg":      mustMap(t, 0, 6, 0, 4, 10.5, 90, 300, 210),
	}
	for name, m := range maps {
		for _, tt := range tests {
			runs, err := curve.Build(tt.xs, tt.ys, m, nil)
			require.NoError(t, err)
			require.Len(t, runs, 1, "%s: %d runs, want 1", name, len(runs))
			got, ok := runs[0].YAt(m.X(tt.x))
			_, sy := m.Scale()
			assert.True(t, ok, "%s: YAt(%v) not ok", name, tt.x)
			assert.InDelta(t, m.Y(tt.want), got, tt.tol*math.Abs(sy), "%s: y(%v) in plot units (%s)", name, tt.x, tt.source)
		}
	}
}

// randomSeries makes a seeded series shaped like yearly word counts:
// uneven x spacing, plateaus, rises and falls, never negative.
func randomSeries(r *rand.Rand, n int, wholeYears bool) (xs, ys []float64) {
	x := 1800.0
	y := r.Float64() * 100
	for range n {
		xs = append(xs, x)
		ys = append(ys, y)
		if wholeYears {
			x += float64(1 + r.IntN(4))
		} else {
			x += 0.05 + 3*r.Float64()
		}
		if r.IntN(5) > 0 { // else a plateau
			y = max(0, y+r.NormFloat64()*20)
		}
	}
	return xs, ys
}

func TestAgainstGonum(t *testing.T) {
	// Source: srcGonum, on seeded random data; tolerance 1e-9 from the brief.
	const tol = 1e-9
	r := rand.New(rand.NewPCG(1984, 300))
	m := mustMap(t, 1700, 2500, -50, 400, 36, 200, 700, 600) // y down, uneven scales
	_, sy := m.Scale()
	var b curve.Builder
	for trial := range 200 {
		n := 2 + r.IntN(60)
		xs, ys := randomSeries(r, n, trial%2 == 0)
		var ref interp.FritschButland
		require.NoError(t, ref.Fit(xs, ys))
		d, err := curve.Slopes(xs, ys, nil)
		require.NoError(t, err)
		for i, x := range xs {
			want := ref.PredictDerivative(x)
			require.InDelta(t, want, d[i], tol*max(1, math.Abs(want)), "trial %d: d[%d] against gonum (%s)", trial, i, srcGonum)
		}
		b.Reset()
		runs, err := b.Build(xs, ys, m, nil)
		require.NoError(t, err)
		require.Len(t, runs, 1, "trial %d: runs", trial)
		require.Equal(t, n, runs[0].Points(), "trial %d: points in the run", trial)
		for k := 0; k+1 < n; k++ {
			h := xs[k+1] - xs[k]
			for j := 1; j <= 9; j++ {
				x := xs[k] + float64(j)*h/10
				got, ok := runs[0].YAt(m.X(x))
				want := m.Y(ref.Predict(x))
				require.True(t, ok, "trial %d: YAt(%v) not ok", trial, x)
				require.InDelta(t, want, got, tol*math.Abs(sy)*max(1, math.Abs(ref.Predict(x))), "trial %d: y(%v) against gonum (%s)", trial, x, srcGonum)
			}
		}
	}
}

// inRegionM reports whether (α, β) lies in Fritsch & Carlson's region of
// monotonicity M. The conditions are quoted from memory of the paper
// (Lemma 2 and Theorem 2); the disc α²+β² ≤ 9 ⊂ M is in print-facts.md.
func inRegionM(a, b float64) bool {
	if a < 0 || b < 0 {
		return false
	}
	if a+b-2 <= 0 || 2*a+b-3 <= 0 || a+2*b-3 <= 0 {
		return true
	}
	return a-(2*a+b-3)*(2*a+b-3)/(3*(a+b-2)) >= 0
}

func TestRegionMHelper(t *testing.T) {
	// The checker must be able to fail: points known in and out of M.
	tests := []struct {
		a, b   float64
		want   bool
		source string
	}{
		{1, 1, true, srcFC + " (α+β ≤ 2)"},
		{2.9, 0.5, true, srcFC + " (inside the disc α²+β² ≤ 9)"},
		{3, 3, true, srcFC + " (corner of the square [0,3]², on the boundary φ = 0)"},
		{4, 4, false, srcFC + " (φ(4,4) = 4 − 81/18 < 0) [from memory]"},
		{5, 0.1, false, srcFC + " (φ(5,0.1) < 0) [from memory]"},
		{-0.1, 1, false, srcFC + " (a slope against the data's direction)"},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, inRegionM(tt.a, tt.b), "inRegionM(%v, %v) (%s)", tt.a, tt.b, tt.source)
	}
}

func TestMonotoneOnMonotoneData(t *testing.T) {
	r := rand.New(rand.NewPCG(1980, 238))
	m := mustMap(t, 0, 1, 0, 1, 0, 1, 0, 1)
	for trial := range 300 {
		n := 3 + r.IntN(40)
		xs := make([]float64, n)
		ys := make([]float64, n)
		dir := 1.0
		if trial%2 == 1 {
			dir = -1
		}
		for i := 1; i < n; i++ {
			xs[i] = xs[i-1] + 0.1 + 5*r.Float64()
			if r.IntN(4) > 0 {
				ys[i] = ys[i-1] + dir*r.ExpFloat64()*math.Pow(10, float64(r.IntN(5)-2))
			} else {
				ys[i] = ys[i-1]
			}
		}
		d, err := curve.Slopes(xs, ys, nil)
		require.NoError(t, err)
		for k := 0; k+1 < n; k++ {
			delta := (ys[k+1] - ys[k]) / (xs[k+1] - xs[k])
			if delta == 0 {
				require.Equal(t, [2]float64{0, 0}, [2]float64{d[k], d[k+1]}, "trial %d: slopes of flat interval %d (%s)", trial, k, srcFC)
				continue
			}
			a, b := d[k]/delta, d[k+1]/delta
			require.True(t, (a*a+b*b <= 9 || inRegionM(a, b)), "trial %d: interval %d: (α, β) = (%v, %v) outside M (%s)", trial, k, a, b, srcFC)
			// Fritsch–Butland slopes lie in [0, 3] × [0, 3], which puts the
			// Bézier control points between the end heights.
			require.True(t, a >= 0 && b >= 0 && a <= 3+1e-12 && b <= 3+1e-12, "trial %d: interval %d: (α, β) = (%v, %v) outside [0,3]² (%s)", trial, k, a, b, srcFB)
		}
		// Independently of the region test: sampled values must move
		// one way only.
		runs, err := curve.Build(xs, ys, m, nil)
		require.NoError(t, err)
		for k, bz := range runs[0].Beziers {
			prev := bz.P0.Y
			for j := 1; j <= 64; j++ {
				y := bz.At(float64(j) / 64).Y
				require.GreaterOrEqual(t, dir*(y-prev), -1e-12*max(1, math.Abs(y)), "trial %d: segment %d turns back at t=%v: %v after %v (%s)", trial, k, float64(j)/64, y, prev, srcFC)
				prev = y
			}
		}
	}
}

func TestStaysBetweenKnots(t *testing.T) {
	// Any data, monotone or not: no sample between two years leaves the
	// range of those two years' values (Fritsch & Carlson 1980: a
	// monotone interpolant, so no invented peak or dip).
	r := rand.New(rand.NewPCG(7, 11))
	maps := []curve.Map{
		mustMap(t, 1800, 2100, 0, 300, 0, 100, 0, 60),    // y up
		mustMap(t, 1800, 2100, 0, 300, 0, 100, 60, 0),    // y down
		mustMap(t, 1800, 2100, -1, 1, 5, 500.5, 33, 700), // odd scales
	}
	for trial := range 200 {
		xs, ys := randomSeries(r, 2+r.IntN(100), trial%3 != 0)
		for mi, m := range maps {
			runs, err := curve.Build(xs, ys, m, nil)
			require.NoError(t, err)
			for k, bz := range runs[0].Beziers {
				lo, hi := min(bz.P0.Y, bz.P3.Y), max(bz.P0.Y, bz.P3.Y)
				slack := 4 * ulp(max(math.Abs(lo), math.Abs(hi))) // rounding in At
				for j := 0; j <= 100; j++ {
					y := bz.At(float64(j) / 100).Y
					require.True(t, y >= lo-slack && y <= hi+slack, "trial %d map %d segment %d: y(t=%v) = %v outside [%v, %v] (%s)", trial, mi, k, float64(j)/100, y, lo, hi, srcFC)
				}
			}
		}
	}
}

func ulp(v float64) float64 { return math.Nextafter(v, math.Inf(1)) - v }

func TestNaturalCubicOvershoots(t *testing.T) {
	// Contrast (why not a natural spline): on the plateau data of
	// print-facts.md the natural cubic spline leaves [0, 4] between knots;
	// ours stays in each interval's range. Reference: gonum NaturalCubic
	// [LIB]; cubic splines are not monotone in general: srcFC §1.
	xs := []float64{1, 2, 3, 4, 5}
	ys := []float64{0, 0, 1, 4, 4}
	var nc interp.NaturalCubic
	require.NoError(t, nc.Fit(xs, ys))
	runs, err := curve.Build(xs, ys, identity(t), nil)
	require.NoError(t, err)
	lowNC, highNC := math.Inf(1), math.Inf(-1)
	for k := 0; k+1 < len(xs); k++ {
		lo, hi := min(ys[k], ys[k+1]), max(ys[k], ys[k+1])
		for j := 1; j < 100; j++ {
			x := xs[k] + float64(j)/100
			v := nc.Predict(x)
			lowNC, highNC = min(lowNC, v), max(highNC, v)
			got, _ := runs[0].YAt(x)
			assert.True(t, got >= lo && got <= hi, "ours: y(%v) = %v outside [%v, %v]", x, got, lo, hi)
		}
	}
	assert.True(t, lowNC < 0 || highNC > 4, "natural cubic stayed in [0, 4] (min %v, max %v); the contrast no longer shows", lowNC, highNC)
	t.Logf("natural cubic spans [%.4f, %.4f] on data in [0, 4]", lowNC, highNC)
}
