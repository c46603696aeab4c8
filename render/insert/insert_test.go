package insert

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/raster"
	"sheaf/render/svg"
	"sheaf/specs"
	"sheaf/specs/series"
)

// TestSpreadWorked checks Spread against placements worked by hand from
// the definition (least squares under order and gap constraints; pooled
// blocks sit at the mean of their wanted positions, Barlow et al. 1972,
// ch. 1).
func TestSpreadWorked(t *testing.T) {
	cases := []struct {
		name        string
		want        []float64
		gap, lo, hi float64
		placed      []float64
	}{
		// Far apart: nothing moves.
		{"apart", []float64{10, 50, 90}, 10, 0, 100, []float64{10, 50, 90}},
		// Two labels 4 apart, gap 10: each moves 3 away from their mean 12.
		{"pair", []float64{10, 14}, 10, 0, 100, []float64{7, 17}},
		// Three at one spot: a block centred on 50, input order kept.
		{"stack", []float64{50, 50, 50}, 10, 0, 100, []float64{40, 50, 60}},
		// Pair near the floor: the block 0…10 would start at −3, clipped
		// to the floor 0 (bounded isotonic regression clips).
		{"floor", []float64{1, 5}, 10, 0, 100, []float64{0, 10}},
		// Near the ceiling likewise: 95 and 99 → 90 and 100.
		{"ceiling", []float64{99, 95}, 10, 0, 100, []float64{100, 90}},
		// A pooled pair then a third that joins it: z = 20, 21−10, 23−20
		// = 20, 11, 3 → pooled mean 34/3; y = 11.33, 21.33, 31.33.
		{"cascade", []float64{20, 21, 23}, 10, 0, 100, []float64{34.0 / 3, 34.0/3 + 10, 34.0/3 + 20}},
		// Exactly the room there is.
		{"full", []float64{5, 5, 5}, 5, 0, 10, []float64{0, 5, 10}},
	}
	for _, c := range cases {
		got, err := Spread(c.want, c.gap, c.lo, c.hi)
		if assert.NoError(t, err, c.name) {
			assert.InDeltaSlice(t, c.placed, got, 1e-9, "%s: Spread(%v)", c.name, c.want)
		}
	}
}

// TestSpreadProperties checks random cases for what any placement must
// satisfy (no two labels closer than the gap, order kept, inside the
// bounds) and that none of a set of feasible alternatives does better in
// the least-squares sense (local optimality, common practice for checking
// a convex optimum).
func TestSpreadProperties(t *testing.T) {
	seed := uint32(11)
	rnd := func() float64 { seed = seed*1664525 + 1013904223; return float64(seed>>8) / (1 << 24) }
	for k := 0; k < 2000; k++ {
		n := 1 + int(rnd()*4)
		gap := 1 + rnd()*10
		lo, hi := 0.0, float64(n-1)*gap+rnd()*80
		want := make([]float64, n)
		for i := range want {
			want[i] = lo - 10 + rnd()*(hi-lo+20)
		}
		got, err := Spread(want, gap, lo, hi)
		require.NoError(t, err)
		idx := make([]int, n)
		for i := range idx {
			idx[i] = i
		}
		sort.SliceStable(idx, func(a, b int) bool { return want[idx[a]] < want[idx[b]] })
		for j := 0; j < n; j++ {
			y := got[idx[j]]
			require.True(t, y >= lo-1e-9 && y <= hi+1e-9, "case %d: %v placed outside [%v, %v]: %v", k, want, lo, hi, got)
			require.False(t, j > 0 && y-got[idx[j-1]] < gap-1e-9, "case %d: labels %v closer than %v (or out of order): %v", k, want, gap, got)
		}
		cost := func(ys []float64) float64 {
			s := 0.0
			for i := range ys {
				s += (ys[i] - want[i]) * (ys[i] - want[i])
			}
			return s
		}
		best := cost(got)
		// Move every label together, or one label alone, a little: any
		// feasible move must not cost less.
		for _, d := range []float64{-0.01, 0.01} {
			for who := -1; who < n; who++ {
				alt := append([]float64(nil), got...)
				for i := range alt {
					if who < 0 || i == who {
						alt[i] += d
					}
				}
				ok := true
				for j := 0; j < n; j++ {
					y := alt[idx[j]]
					if y < lo || y > hi || j > 0 && y-alt[idx[j-1]] < gap-1e-12 {
						ok = false
					}
				}
				require.False(t, ok && cost(alt) < best-1e-9, "case %d: want %v gap %v: %v costs %v, moving gives %v at %v", k, want, gap, got, best, cost(alt), alt)
			}
		}
	}
}

func TestSpreadBadInput(t *testing.T) {
	for _, tc := range []struct {
		name        string
		want        []float64
		gap, lo, hi float64
	}{
		{"three labels 10 apart cannot fit in 15", []float64{1, 2, 3}, 10, 0, 15},
		{"NaN position", []float64{math.NaN()}, 1, 0, 10},
		{"negative gap", []float64{1}, -1, 0, 10},
	} {
		_, err := Spread(tc.want, tc.gap, tc.lo, tc.hi)
		assert.Error(t, err, tc.name)
	}
	got, err := Spread(nil, 1, 0, 10)
	assert.NoError(t, err, "no labels")
	assert.Nil(t, got, "no labels")
}

// testSet builds a four-term set by hand whose lines all end at the same
// value, so the labels must be spread.
func testSet() *series.Set {
	years := []float64{1900, 1901, 1902, 1903, 1904, 1905}
	mk := func(term string, vs ...float64) series.Series {
		peak, py := 0.0, 1900
		for i, v := range vs {
			if v > peak {
				peak, py = v, 1900+i
			}
		}
		return series.Series{Term: term, Values: vs, Peak: peak, PeakYear: py, YMax: peak}
	}
	nan := math.NaN()
	return &series.Set{
		Span:  specs.Span{From: 1900, To: 1905},
		Years: years,
		Series: []series.Series{
			mk("telegraph", 1, 3, 2, 1, 0.5, 0.4),
			mk("telephone", 0, 0.5, 1, 2, 1, 0.4),
			mk("wireless", 0, 0, nan, 1, 4, 0.4),
			mk("Maßstab", 0.2, 0.2, 0.2, 0.3, 0.35, 0.4),
		},
		Unit: "per million words",
	}
}

func testInsert(t testing.TB, kind specs.Kind, w, h specs.Length) *Graphic {
	return testInsertAs(t, kind, w, h, specs.CompareOverlay)
}

func testInsertAs(t testing.TB, kind specs.Kind, w, h specs.Length, compare specs.Compare) *Graphic {
	t.Helper()
	out := specs.DefaultOutput("web", kind)
	s := &specs.Spec{Title: "T", Source: "Source: invented test data."}
	s.Palette.Paper = specs.Color{Space: specs.SpaceSRGB, V: [3]float64{1, 1, 1}}
	in := &specs.Insert{Name: "cmp", Output: "web", Size: specs.Size{W: w, H: h}, Compare: compare}
	fs, err := fonts.Load(s, &out)
	require.NoError(t, err)
	pal, err := palette.NewScale("test", palette.DefaultAnchors(1900, 1905), nil)
	require.NoError(t, err)
	g, err := New(s, in, &out, testSet(), pal, fs)
	require.NoError(t, err)
	return g
}

// TestComparisonLabels: four lines ending at one value get four labels,
// one per line style, none overlapping, each within the plot's height.
func TestComparisonLabels(t *testing.T) {
	g := testInsert(t, specs.Screen, specs.Length(600*0.75), specs.Length(360*0.75))
	ls := g.Labels()
	require.Len(t, ls, 4, "%d labels, want 4", len(ls))
	styles := map[string]bool{}
	for i, a := range ls {
		styles[a.Style.Name] = true
		assert.True(t, a.Y >= g.plot.Y0 && a.Y <= g.plot.Y1, "label %q at %v, outside the plot %v–%v", a.Term, a.Y, g.plot.Y0, g.plot.Y1)
		for _, b := range ls[i+1:] {
			assert.GreaterOrEqual(t, math.Abs(a.Y-b.Y), a.Height-1e-9, "labels %q and %q overlap: centres %v and %v, line height %v", a.Term, b.Term, a.Y, b.Y, a.Height)
		}
	}
	assert.Len(t, styles, 4, "line styles %v; want four different", styles)
	assert.Equal(t, 4.0, g.YMax(), "shared y-range top %v, want 4 (the largest value of any term, a round number)", g.YMax())
	title, desc := g.Describe()
	assert.False(t, title != "telegraph, telephone, wireless and Maßstab" || !bytes.Contains([]byte(desc), []byte(`‘wireless’ (dotted line)`)), "Describe() = %q, %q", title, desc)
}

// TestNiceTicks: steps of 1, 2, 2.5 or 5 × 10^k (common practice for
// axis labels).
func TestNiceTicks(t *testing.T) {
	for _, c := range []struct {
		peak float64
		top  float64
		n    int
	}{{1, 1, 5}, {4, 4, 5}, {0.37, 0.4, 5}, {137, 150, 4}, {9.5, 10, 5}} {
		ticks, top := niceTicks(c.peak, 4)
		assert.InDelta(t, c.top, top, 1e-9, "niceTicks(%v): top", c.peak)
		assert.Len(t, ticks, c.n, "niceTicks(%v)", c.peak)
	}
}

// TestTooSmall: an insert with no room for a plot is an error that says
// how much more it needs (README, Inserts); TestTooSmallSaysHowMuchMore
// checks the amounts are the real shortfall.
func TestTooSmall(t *testing.T) {
	out := specs.DefaultOutput("web", specs.Screen)
	s := &specs.Spec{Title: "T"}
	in := &specs.Insert{Name: "tiny", Output: "web", Size: specs.Size{W: 60, H: 40}, Compare: specs.CompareOverlay}
	fs, err := fonts.Load(s, &out)
	require.NoError(t, err)
	pal, err := palette.NewScale("test", palette.DefaultAnchors(1900, 1905), nil)
	require.NoError(t, err)
	_, err = New(s, in, &out, testSet(), pal, fs)
	require.Error(t, err, "a 80 × 53 px comparison should not fit")
	assert.Regexp(t, `insert "tiny": the plot would be 0 px × 0 px; make the insert larger \(at least about [0-9.]+ px × [0-9.]+ px more\) or its title shorter$`, err.Error())
}

// TestDrawSVGAndRaster draws the comparison into the SVG writer and the
// rasterizer, and writes both for a look with SHEAF_KEEP=dir.
func TestDrawSVGAndRaster(t *testing.T) {
	g := testInsert(t, specs.Screen, specs.Length(600*0.75), specs.Length(360*0.75))
	w, h := g.Size()
	doc, err := svg.New(w, h, svg.Options{Title: "t"})
	require.NoError(t, err)
	require.NoError(t, g.Draw(canvas.NewContext(doc)))
	var buf bytes.Buffer
	_, err = doc.WriteTo(&buf)
	require.NoError(t, err)
	// Styles × the 1.75 px line, rounded to 0.1 px: each pattern on its
	// line and on its label's sample.
	for _, dash := range []string{`stroke-dasharray="8\.[78] 5\.6"`, `stroke-dasharray="0 4\.[56]"`, `stroke-dasharray="8\.[78] 4\.9 0 4\.9"`} {
		assert.Equal(t, 2, len(regexp.MustCompile(dash).FindAll(buf.Bytes(), -1)), "%s: strokes (line and label sample)", dash)
	}
	img, err := raster.Draw(w, h, 96, g.Paper(), func(ctx *canvas.Context) error { return g.Draw(ctx) })
	require.NoError(t, err)
	if dir := os.Getenv("SHEAF_KEEP"); dir != "" {
		os.WriteFile(filepath.Join(dir, "insert.svg"), buf.Bytes(), 0o644)
		f, _ := os.Create(filepath.Join(dir, "insert.png"))
		raster.WritePNG(f, img)
		f.Close()
	}
}
