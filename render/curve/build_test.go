package curve_test

import (
	"math"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/curve"
)

const srcContract = "package contract (doc.go)"

var nan = math.NaN()

func same(a, b curve.Point) bool {
	return math.Float64bits(a.X) == math.Float64bits(b.X) && math.Float64bits(a.Y) == math.Float64bits(b.Y)
}

func TestEndPointsExact(t *testing.T) {
	// Segment ends are m.Apply of the data, bit for bit; a run's segments
	// join exactly (srcContract; the curve interpolates: srcFB).
	r := rand.New(rand.NewPCG(3, 5))
	maps := []curve.Map{
		mustMap(t, 1800, 2000, 0, 250, 14.17, 155.9, 400.3, 470.8),
		mustMap(t, 1800, 2000, 0, 250, 14.17, 155.9, 470.8, 400.3),
	}
	for trial := range 100 {
		xs, ys := randomSeries(r, 2+r.IntN(150), trial%2 == 0)
		for i := range ys {
			if r.IntN(10) == 0 {
				ys[i] = nan
			}
		}
		for _, m := range maps {
			runs, err := curve.Build(xs, ys, m, nil)
			require.NoError(t, err)
			for _, run := range runs {
				require.True(t, same(run.Start, m.Apply(xs[run.First], ys[run.First])), "run at %d starts at %v, want %v", run.First, run.Start, m.Apply(xs[run.First], ys[run.First]))
				for k, bz := range run.Beziers {
					i := run.First + k
					require.True(t, same(bz.P0, m.Apply(xs[i], ys[i])) && same(bz.P3, m.Apply(xs[i+1], ys[i+1])),
						"segment %d ends %v–%v, want %v–%v bit for bit", i, bz.P0, bz.P3, m.Apply(xs[i], ys[i]), m.Apply(xs[i+1], ys[i+1]))
					// Control points at thirds in x: x(t) linear (srcContract).
					h := bz.P3.X - bz.P0.X
					require.InDelta(t, bz.P0.X+h/3, bz.P1.X, 1e-12*bz.P3.X, "segment %d: first control x at a third of [%v, %v]", i, bz.P0.X, bz.P3.X)
					require.InDelta(t, bz.P3.X-h/3, bz.P2.X, 1e-12*bz.P3.X, "segment %d: second control x at two thirds of [%v, %v]", i, bz.P0.X, bz.P3.X)
					y, ok := run.YAt(bz.P3.X)
					require.True(t, ok, "YAt(%v) reported not ok", bz.P3.X)
					require.Equal(t, bz.P3.Y, y, "YAt(%v) exactly", bz.P3.X)
				}
			}
		}
	}
}

func TestGaps(t *testing.T) {
	type shape struct{ first, points int }
	tests := []struct {
		name   string
		ys     []float64
		want   []shape
		source string
	}{
		{"no gap", []float64{1, 2, 3, 4}, []shape{{0, 4}}, srcContract},
		{"empty", []float64{}, nil, srcContract},
		{"all missing", []float64{nan, nan, nan}, nil, srcContract},
		{"one value is a dot", []float64{5}, []shape{{0, 1}}, srcContract},
		{"leading gap", []float64{nan, nan, 1, 2, 3}, []shape{{2, 3}}, srcContract},
		{"trailing gap", []float64{1, 2, 3, nan}, []shape{{0, 3}}, srcContract},
		{"gap splits", []float64{1, 2, nan, 3, 4, 5}, []shape{{0, 2}, {3, 3}}, srcContract},
		{"wide gap", []float64{1, 2, 3, nan, nan, nan, 4, 5}, []shape{{0, 3}, {6, 2}}, srcContract},
		{"isolated value", []float64{1, 2, nan, 7, nan, 3, 4}, []shape{{0, 2}, {3, 1}, {5, 2}}, srcContract},
		{"dots at both ends", []float64{1, nan, 2, 3, nan, 4}, []shape{{0, 1}, {2, 2}, {5, 1}}, srcContract},
	}
	m := mustMap(t, 1900, 1910, 0, 10, 0, 100, 100, 0)
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			xs := make([]float64, len(tt.ys))
			for i := range xs {
				xs[i] = 1900 + float64(i)
			}
			runs, err := curve.Build(xs, tt.ys, m, nil)
			require.NoError(t, err)
			var got []shape
			for _, r := range runs {
				got = append(got, shape{r.First, r.Points()})
				assert.Equal(t, r.Points() == 1, r.IsDot(), "run at %d: IsDot %v with %d points", r.First, r.IsDot(), r.Points())
				assert.True(t, !r.IsDot() || same(r.Start, m.Apply(xs[r.First], tt.ys[r.First])), "dot at %v, want %v bit for bit", r.Start, m.Apply(xs[r.First], tt.ys[r.First]))
			}
			assert.Equal(t, tt.want, got, "runs (first, points) = %v, want %v (%s)", got, tt.want, tt.source)
			// A run ignores the data across a gap: built alone, it is the
			// same bit for bit (local rule, srcFB).
			for _, r := range runs {
				alone, err := curve.Build(xs[r.First:r.First+r.Points()], tt.ys[r.First:r.First+r.Points()], m, nil)
				require.NoError(t, err)
				assert.False(t, len(alone) != 1 || !reflect.DeepEqual(alone[0].Beziers, r.Beziers) || !same(alone[0].Start, r.Start), "run at %d differs from the same points built alone", r.First)
			}
		})
	}
}

func TestTwoPointsStraight(t *testing.T) {
	// Two points give a straight segment: control points on the chord at
	// its thirds (srcGonum n = 2 branch: both slopes are the secant).
	m := mustMap(t, 1950, 1960, 0, 40, 10, 110, 90, 10)
	runs, err := curve.Build([]float64{1951, 1957}, []float64{3, 29}, m, nil)
	require.NoError(t, err)
	bz := runs[0].Beziers[0]
	third := curve.Point{X: bz.P0.X + (bz.P3.X-bz.P0.X)/3, Y: bz.P0.Y + (bz.P3.Y-bz.P0.Y)/3}
	twoThirds := curve.Point{X: bz.P3.X - (bz.P3.X-bz.P0.X)/3, Y: bz.P3.Y - (bz.P3.Y-bz.P0.Y)/3}
	assert.LessOrEqual(t, dist(bz.P1, third)+dist(bz.P2, twoThirds), 1e-12, "control points %v, %v; want %v, %v", bz.P1, bz.P2, third, twoThirds)
	for _, u := range []float64{0.1, 0.37, 0.5, 0.9} {
		x := bz.P0.X + u*(bz.P3.X-bz.P0.X)
		y, _ := runs[0].YAt(x)
		assert.InDelta(t, bz.P0.Y+u*(bz.P3.Y-bz.P0.Y), y, 1e-12, "y(%v) on the chord", x)
	}
}

func dist(a, b curve.Point) float64 { return math.Hypot(a.X-b.X, a.Y-b.Y) }

func TestFlatStaysFlat(t *testing.T) {
	// Δ_k = 0 ⇒ d_k = d_k+1 = 0 (srcFC, print-facts.md): every control
	// point of a flat interval has exactly the interval's height, and so
	// does every sample.
	xs := []float64{1800, 1801, 1803, 1804, 1807, 1808, 1809}
	ys := []float64{0, 0, 5, 5, 5, 2, 2}
	for _, m := range []curve.Map{
		mustMap(t, 1800, 1810, 0, 6, 0, 90, 0, 30),
		mustMap(t, 1800, 1810, 0, 6, 0, 90, 30.3, 0.7),
	} {
		runs, err := curve.Build(xs, ys, m, nil)
		require.NoError(t, err)
		for k, bz := range runs[0].Beziers {
			if ys[k] != ys[k+1] {
				continue
			}
			assert.Equal(t, [3]float64{bz.P0.Y, bz.P0.Y, bz.P0.Y}, [3]float64{bz.P1.Y, bz.P2.Y, bz.P3.Y}, "flat interval %d: heights of P1, P2, P3", k)
			for j := 0; j <= 20; j++ {
				assert.Equal(t, bz.P0.Y, bz.At(float64(j)/20).Y, "flat interval %d: y(t=%v)", k, float64(j)/20)
			}
		}
	}
}

func TestMirror(t *testing.T) {
	// A y-down map gives the mirror image of a y-up map over the same
	// rectangle: same x (bit for bit), y reflected. Affine maps commute
	// with Bézier evaluation (common practice: affine invariance).
	r := rand.New(rand.NewPCG(9, 9))
	up := mustMap(t, 1800, 2000, 0, 200, 20, 220, 100, 180)
	down := mustMap(t, 1800, 2000, 0, 200, 20, 220, 180, 100)
	for trial := range 50 {
		xs, ys := randomSeries(r, 2+r.IntN(80), trial%2 == 0)
		ru, err := curve.Build(xs, ys, up, nil)
		require.NoError(t, err)
		rd, err := curve.Build(xs, ys, down, nil)
		require.NoError(t, err)
		for k := range ru[0].Beziers {
			bu, bd := ru[0].Beziers[k], rd[0].Beziers[k]
			pu := [4]curve.Point{bu.P0, bu.P1, bu.P2, bu.P3}
			pd := [4]curve.Point{bd.P0, bd.P1, bd.P2, bd.P3}
			for i := range pu {
				require.Equal(t, pu[i].X, pd[i].X, "trial %d segment %d point %d: x up and down", trial, k, i)
				require.InDelta(t, 280, pu[i].Y+pd[i].Y, 1e-10, "trial %d segment %d point %d: up %v, down %v; want mirror about y = 140", trial, k, i, pu[i], pd[i])
			}
			for _, tt := range []float64{0.25, 0.5, 0.8} {
				a, b := bu.At(tt), bd.At(tt)
				require.Equal(t, a.X, b.X, "trial %d segment %d: At(%v) x up and down", trial, k, tt)
				require.InDelta(t, 280, a.Y+b.Y, 1e-10, "trial %d segment %d: At(%v) up %v, down %v; want mirror about y = 140", trial, k, tt, a, b)
			}
		}
	}
}

func TestSplit(t *testing.T) {
	// de Casteljau subdivision reproduces the curve on each part (common
	// practice; e.g. Farin, Curves and Surfaces for CAGD, ch. 4 — from
	// memory).
	m := mustMap(t, 1800, 1900, 0, 10, 0, 300, 200, 0)
	xs := []float64{1800, 1803, 1810, 1811, 1830}
	ys := []float64{1, 4, 2, 9, 9.5}
	runs, err := curve.Build(xs, ys, m, nil)
	require.NoError(t, err)
	for k, bz := range runs[0].Beziers {
		for _, s := range []float64{0.2, 0.5, 0.71} {
			l, r := bz.Split(s)
			assert.False(t, !same(l.P3, r.P0) || !same(l.P0, bz.P0) || !same(r.P3, bz.P3), "segment %d Split(%v): parts do not join or keep the ends", k, s)
			for _, u := range []float64{0, 0.3, 0.6, 1} {
				assert.LessOrEqual(t, dist(l.At(u), bz.At(s*u)), 1e-10, "segment %d Split(%v): left.At(%v) off the curve", k, s, u)
				assert.LessOrEqual(t, dist(r.At(u), bz.At(s+(1-s)*u)), 1e-10, "segment %d Split(%v): right.At(%v) off the curve", k, s, u)
			}
		}
		// Split at a year between the segment's years: the cut lands on the
		// mapped year exactly and on the curve.
		year := (xs[k] + xs[k+1]) / 2
		x := m.X(year)
		l, r := bz.SplitAtX(x)
		assert.False(t, l.P3.X != x || r.P0.X != x || !same(l.P3, r.P0), "segment %d SplitAtX(%v): cut at %v / %v", k, x, l.P3, r.P0)
		y, _ := runs[0].YAt(x)
		assert.InDelta(t, y, l.P3.Y, 1e-10, "segment %d SplitAtX(%v): cut y against the curve's", k, x)
		// x stays linear in t on both parts, so they can be cut again.
		for _, part := range []curve.Bezier{l, r} {
			h := part.P3.X - part.P0.X
			assert.InDelta(t, part.P0.X+h/3, part.P1.X, 1e-10, "segment %d: part %+v: first control x at a third", k, part)
			assert.InDelta(t, part.P3.X-h/3, part.P2.X, 1e-10, "segment %d: part %+v: second control x at two thirds", k, part)
		}
		// Outside the segment: clamped to an end.
		l, r = bz.SplitAtX(bz.P0.X - 5)
		assert.True(t, same(l.P0, bz.P0) && same(l.P3, bz.P0) && same(r.P3, bz.P3), "segment %d SplitAtX before start: %v, %v", k, l, r)
		l, r = bz.SplitAtX(bz.P3.X + 5)
		assert.True(t, same(l.P3, bz.P3) && same(r.P0, bz.P3), "segment %d SplitAtX after end: %v, %v", k, l, r)
	}
	_, ok := runs[0].YAt(m.X(1799))
	assert.False(t, ok, "YAt before the run reported ok")
	_, ok = runs[0].YAt(m.X(1831))
	assert.False(t, ok, "YAt after the run reported ok")
}

func TestErrors(t *testing.T) {
	m := mustMap(t, 0, 10, 0, 10, 0, 100, 0, 100)
	inf := math.Inf(1)
	tests := []struct {
		name   string
		xs, ys []float64
		m      curve.Map
		want   string
	}{
		{"length mismatch", []float64{1, 2, 3}, []float64{1, 2}, m, "3 x values but 2 y values"},
		{"x repeats", []float64{1, 2, 2, 3}, []float64{1, 2, 3, 4}, m, "x[2] = 2 does not exceed x[1] = 2"},
		{"x decreases", []float64{1, 3, 2}, []float64{1, 2, 3}, m, "x[2] = 2 does not exceed x[1] = 3"},
		{"x NaN", []float64{1, nan, 3}, []float64{1, 2, 3}, m, "x[1] = NaN is not finite"},
		{"x NaN at a gap", []float64{1, nan, 3}, []float64{1, nan, 3}, m, "x[1] = NaN is not finite"},
		{"y infinite", []float64{1, 2, 3}, []float64{1, inf, 3}, m, "y[1] = +Inf is infinite"},
		{"zero map", []float64{1, 2}, []float64{1, 2}, curve.Map{}, "map is not set up"},
		{"maps to Inf", []float64{1, 2}, []float64{1, 1e308}, m, "point 1 (2, 1e+308) maps outside"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dst := []curve.Run{{First: 42}}
			got, err := curve.Build(tt.xs, tt.ys, tt.m, dst)
			require.ErrorContains(t, err, tt.want)
			if assert.Len(t, got, 1, "dst changed on error") {
				assert.Equal(t, 42, got[0].First, "dst changed on error")
			}
		})
	}

	slopeTests := []struct {
		name   string
		xs, ys []float64
		want   string
	}{
		{"length mismatch", []float64{1}, nil, "1 x values but 0 y values"},
		{"gap", []float64{1, 2}, []float64{1, nan}, "y[1] = NaN is not finite"},
		{"x repeats", []float64{1, 1}, []float64{1, 2}, "x[1] = 1 does not exceed x[0] = 1"},
	}
	for _, tt := range slopeTests {
		_, err := curve.Slopes(tt.xs, tt.ys, nil)
		assert.ErrorContains(t, err, tt.want, "Slopes %s", tt.name)
	}

	mapTests := []struct {
		name string
		v    [8]float64
		want string
	}{
		{"data x empty", [8]float64{5, 5, 0, 1, 0, 1, 0, 1}, "data x range [5, 5] must increase"},
		{"data x reversed", [8]float64{6, 5, 0, 1, 0, 1, 0, 1}, "data x range [6, 5] must increase"},
		{"plot x reversed", [8]float64{0, 1, 0, 1, 1, 0, 0, 1}, "plot x range [1, 0] must increase"},
		{"data y empty", [8]float64{0, 1, 3, 3, 0, 1, 0, 1}, "data y range [3, 3] is empty"},
		{"plot y empty", [8]float64{0, 1, 0, 1, 0, 1, 2, 2}, "plot y range [2, 2] is empty"},
		{"NaN", [8]float64{0, 1, 0, nan, 0, 1, 0, 1}, "dataY1 = NaN is not finite"},
		{"Inf", [8]float64{0, 1, 0, 1, 0, 1, 0, inf}, "plotY1 = +Inf is not finite"},
		{"scale overflows", [8]float64{0, 1e-300, 0, 1, 0, 1e300, 0, 1}, "out of floating-point range"},
	}
	for _, tt := range mapTests {
		v := tt.v
		_, err := curve.NewMap(v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7])
		assert.ErrorContains(t, err, tt.want, "NewMap %s", tt.name)
	}
}

func TestMapCorners(t *testing.T) {
	// The data rectangle's corners land exactly on the plot rectangle's
	// (srcContract), whichever way y points.
	for _, v := range [][8]float64{
		{1800, 2008, 0, 3.7e-6, 14.173, 155.906, 400.1, 470.3},
		{1800, 2008, 0, 3.7e-6, 14.173, 155.906, 470.3, 400.1},
		{-3, 0.1, -7, 11, 0.3, 0.7, 0.9, 0.1},
	} {
		m := mustMap(t, v[0], v[1], v[2], v[3], v[4], v[5], v[6], v[7])
		assert.Equal(t, [4]float64{v[4], v[5], v[6], v[7]}, [4]float64{m.X(v[0]), m.X(v[1]), m.Y(v[2]), m.Y(v[3])}, "map %v: corners (x0, x1, y0, y1)", v)
	}
}

func TestBuilderReuse(t *testing.T) {
	// Runs handed out stay valid until Reset, and a warmed-up Builder
	// allocates nothing per series (brief: no allocation per point).
	r := rand.New(rand.NewPCG(4, 4))
	m := mustMap(t, 1800, 2000, 0, 300, 0, 100, 60, 0)
	var b curve.Builder
	var all [][]curve.Run
	var series [][2][]float64
	for range 30 {
		xs, ys := randomSeries(r, 2+r.IntN(120), true)
		if r.IntN(2) == 0 {
			ys[r.IntN(len(ys))] = nan
		}
		runs, err := b.Build(xs, ys, m, nil)
		require.NoError(t, err)
		all = append(all, runs)
		series = append(series, [2][]float64{xs, ys})
	}
	for i, s := range series {
		want, err := curve.Build(s[0], s[1], m, nil)
		require.NoError(t, err)
		require.Equal(t, want, all[i], "series %d: runs changed after later builds", i)
	}

	xs, ys := randomSeries(r, 175, true)
	ys[40] = nan
	dst := make([]curve.Run, 0, 8)
	allocs := testing.AllocsPerRun(100, func() {
		b.Reset()
		var err error
		dst, err = b.Build(xs, ys, m, dst[:0])
		require.NoError(t, err)
	})
	assert.Zero(t, allocs, "warm Builder: %v allocations per series, want 0", allocs)
}

// BenchmarkBuild: one op is a page-sized job, 4,000 series of 175 yearly
// points (brief: under 50 ms on one core).
func BenchmarkBuild(b *testing.B) {
	const series, points = 4000, 175
	r := rand.New(rand.NewPCG(2024, 175))
	data := make([][2][]float64, series)
	for i := range data {
		xs, ys := randomSeries(r, points, true)
		if i%10 == 0 {
			ys[r.IntN(points)] = nan
		}
		data[i] = [2][]float64{xs, ys}
	}
	m := mustMap(b, 1800, 2600, 0, 400, 0, 100, 60, 0)
	// A renderer that keeps every series' runs until the page is done.
	b.Run("Builder", func(b *testing.B) {
		var bl curve.Builder
		dst := make([]curve.Run, 0, 4)
		b.ReportAllocs()
		for b.Loop() {
			bl.Reset()
			for _, d := range data {
				var err error
				dst, err = bl.Build(d[0], d[1], m, dst[:0])
				require.NoError(b, err)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(series*points), "ns/point")
	})
	// A renderer that draws each series before building the next.
	b.Run("BuilderStreaming", func(b *testing.B) {
		var bl curve.Builder
		dst := make([]curve.Run, 0, 4)
		b.ReportAllocs()
		for b.Loop() {
			for _, d := range data {
				bl.Reset()
				var err error
				dst, err = bl.Build(d[0], d[1], m, dst[:0])
				require.NoError(b, err)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(series*points), "ns/point")
	})
	b.Run("Build", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			for _, d := range data {
				_, err := curve.Build(d[0], d[1], m, nil)
				require.NoError(b, err)
			}
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(series*points), "ns/point")
	})
}
