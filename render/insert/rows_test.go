package insert

import (
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/raster"
	"sheaf/specs"
)

// TestRowsLayout: by default a comparison stands in aligned rows — one
// strip per term in the listed order, top first, equally tall, not
// overlapping, all over the same x range and the same y-range (0 to the
// round top over every term: 4 for testSet, as overlaid) — and each term's
// label sits left of the strips, level with its own strip and clear of the
// others.
func TestRowsLayout(t *testing.T) {
	g := testInsertAs(t, specs.Screen, specs.Length(600*0.75), specs.Length(360*0.75), specs.CompareRows)
	require.True(t, g.Rowed())
	rows := g.Rows()
	require.Len(t, rows, 4)
	assert.Empty(t, g.Labels(), "no line-end labels in rows")
	assert.Equal(t, 4.0, g.YMax(), "shared y-range top, as overlaid")
	ls := g.Output.Type.Label.Pt()
	for i, r := range rows {
		assert.Equal(t, g.Data.Series[i].Term, r.Term, "listed order, top first")
		assert.InDelta(t, rows[0].Plot.H(), r.Plot.H(), 1e-9, "equal strips")
		assert.Equal(t, rows[0].Plot.X0, r.Plot.X0)
		assert.Equal(t, rows[0].Plot.X1, r.Plot.X1)
		// Same map from data to strip: the year 1903 at one x in every
		// row, the y-range top the same height above each baseline.
		assert.InDelta(t, rows[0].Map.X(1903), r.Map.X(1903), 1e-9)
		assert.InDelta(t, rows[0].Map.Y(4)-rows[0].Map.Y(0), r.Map.Y(4)-r.Map.Y(0), 1e-9)
		assert.GreaterOrEqual(t, r.Map.Y(0), r.Plot.Y0-1e-9)
		assert.LessOrEqual(t, r.Map.Y(4), r.Plot.Y1+1e-9)
		assert.True(t, r.Baseline > r.Plot.Y0 && r.Baseline < r.Plot.Y1, "%s: label level with its strip", r.Term)
		if i > 0 {
			assert.Less(t, r.Plot.Y1, rows[i-1].Plot.Y0, "strips do not overlap")
			assert.Less(t, rows[i-1].Baseline-r.Baseline, math.Inf(1))
			assert.Greater(t, rows[i-1].Baseline-r.Baseline, ls*1.15, "labels a line apart")
		}
		w := g.Fonts.Width(fonts.Bold, ls, r.Term)
		assert.GreaterOrEqual(t, r.Plot.X0-ls*0.8-w, g.pad-1e-9, "%s: label inside the left margin", r.Term)
	}
	_, desc := g.Describe()
	assert.Contains(t, desc, "one row each, top to bottom, on one scale")
	assert.NotContains(t, desc, "dotted line")
}

// TestRowsCurvesPassThroughValues: the drawn line of each row passes
// through every yearly value mapped into its own strip (the monotone
// cubic interpolates, render/curve), so rows compare like for like.
func TestRowsCurvesPassThroughValues(t *testing.T) {
	g := testInsertAs(t, specs.Screen, specs.Length(600*0.75), specs.Length(360*0.75), specs.CompareRows)
	for i, r := range g.Rows() {
		sr := g.Data.Series[i]
		for j, v := range sr.Values {
			if math.IsNaN(v) {
				continue
			}
			p := r.Map.Apply(g.Data.Years[j], v)
			assert.True(t, p.Y >= r.Plot.Y0-1e-9 && p.Y <= r.Plot.Y1+1e-9, "%s %v inside its strip", sr.Term, g.Data.Years[j])
		}
	}
}

// TestRowsTooSmall: rows that cannot be two label-lines tall are an
// error that says how much more room they need.
func TestRowsTooSmall(t *testing.T) {
	out := specs.DefaultOutput("web", specs.Screen)
	s := &specs.Spec{Title: "T"}
	in := &specs.Insert{Name: "flat", Output: "web", Size: specs.Size{W: 450, H: 110}, Compare: specs.CompareRows}
	fs, err := fonts.Load(s, &out)
	require.NoError(t, err)
	_, err = New(s, in, &out, testSet(), testPalette(t), fs)
	require.Error(t, err)
	assert.Contains(t, err.Error(), "make the insert larger")
}

// TestRowsDraw draws the rows into the rasterizer (and writes a PNG for
// a look with SHEAF_KEEP=dir); the peak dot takes the era colour of its
// year, not black.
func TestRowsDraw(t *testing.T) {
	g := testInsertAs(t, specs.Screen, specs.Length(600*0.75), specs.Length(360*0.75), specs.CompareRows)
	w, h := g.Size()
	const dpi = 192
	img, err := raster.Draw(w, h, dpi, g.Paper(), func(ctx *canvas.Context) error { return g.Draw(ctx) })
	require.NoError(t, err)
	r := g.Rows()[0]
	sr := g.Data.Series[0]
	pk := r.Map.Apply(float64(sr.PeakYear), sr.Peak)
	k := dpi / 72.0
	c := img.RGBAAt(int(pk.X*k), int((h-pk.Y)*k))
	want := rgba(g.Palette.At(float64(sr.PeakYear)).RGB()) // the era colour of the peak year
	assert.InDelta(t, float64(want.R), float64(c.R), 12, "peak dot red")
	assert.InDelta(t, float64(want.G), float64(c.G), 12, "peak dot green")
	assert.InDelta(t, float64(want.B), float64(c.B), 12, "peak dot blue")
	if dir := os.Getenv("SHEAF_KEEP"); dir != "" {
		f, _ := os.Create(filepath.Join(dir, "insert-rows.png"))
		raster.WritePNG(f, img)
		f.Close()
	}
}

func testPalette(t *testing.T) palette.Scale {
	pal, err := palette.NewScale("test", palette.DefaultAnchors(1900, 1905), nil)
	require.NoError(t, err)
	return pal
}

// TestNoteFits: the line above the plot says the unit, the smoothing and
// "the same scale in every row" when there is room, and drops parts from
// its end, never the unit, to stay inside the insert.
func TestNoteFits(t *testing.T) {
	wide := testInsertAs(t, specs.Screen, specs.Length(600*0.75), specs.Length(360*0.75), specs.CompareRows)
	assert.Equal(t, "per million words; the same scale in every row", wide.scaleNote)
	wide.Data.Rolling = 5
	assert.Equal(t, "per million words, 5-year rolling share; tint: 95% interval; the same scale in every row", wide.fitNote(1e6, "tint: 95% interval"))
	ts := wide.Output.Type.Ticks.Pt()
	for _, w := range []float64{300, 200, 120, 60} {
		note := wide.fitNote(w, "tint: 95% interval")
		assert.Contains(t, note, "per million words")
		if wide.Fonts.Width(fonts.Regular, ts, "per million words, 5-year rolling share") <= w {
			assert.LessOrEqual(t, wide.Fonts.Width(fonts.Regular, ts, note), w, "width %v: %q", w, note)
		}
	}
}
