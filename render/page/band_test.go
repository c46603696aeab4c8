package page

import (
	"image"
	"image/png"
	"math"
	"os"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/curve"
	"sheaf/specs"
	"sheaf/specs/series"
)

// rollingFeature is testdata/small's print output with a 3-year window
// and, when band > 0, an uncertainty band at that level.
func rollingFeature(t *testing.T, band float64) *Feature {
	t.Helper()
	s, err := specs.Load(smallSpec)
	require.NoError(t, err)
	s.Scale.Rolling = 3
	d, err := series.Load(s)
	require.NoError(t, err)
	out := s.Output("print")
	out.Band = band
	fs, err := fonts.Load(s, out)
	require.NoError(t, err)
	var groups []layout.Group
	for _, g := range d.Groups {
		groups = append(groups, layout.Group{Heading: g.Heading, Count: g.Count})
	}
	plan, err := layout.Solve(s, out, fs, groups)
	require.NoError(t, err)
	pal, err := palette.Default(float64(d.Span.From), float64(d.Span.To))
	require.NoError(t, err)
	return NewFeature(s, out, plan, d, pal, fs)
}

// TestBandDrawn: with a band the plot between the line and the band's
// lower limit is a tint of the era colour — lighter than the line's
// colour, darker than the paper, the same hue family —; without one it
// is paper. Tint = 20 % of the colour over the paper in linear light
// (BandStrength, this project's choice), checked against the palette
// colour at that year.
func TestBandDrawn(t *testing.T) {
	const dpi = 300
	with, without := rollingFeature(t, 0.95), rollingFeature(t, 0)
	// telegraph is the first panel (listed first); 1904 has a pooled count
	// of 90 in 280,000 words: 95 % limits 72.3–110.6 (Garwood), against a
	// line at 90 — the lower limit is 80 % of the line.
	var pn layout.Panel
	for _, p := range with.Plan.Pages[0].Panels {
		if with.Data.Series[p.Item].Term == "telegraph" {
			pn = p
		}
	}
	sr := &with.Data.Series[pn.Item]
	require.Equal(t, "telegraph", sr.Term)
	lo, hi := with.Band(pn.Item)
	require.NotNil(t, lo)
	j := 1904 - with.Data.Span.From
	assert.InDelta(t, 0.803, lo[j]/sr.Values[j], 0.002, "Garwood lower for 90: 72.29 (gonum χ²), /90")
	assert.InDelta(t, 1.229, hi[j]/sr.Values[j], 0.002, "Garwood upper for 90: 110.6, /90")
	m, err := with.PlotMap(pn)
	require.NoError(t, err)
	pt := m.Apply(1904.5, (sr.Values[j]+lo[j])/2) // between the line and its lower limit
	h := with.Plan.Pages[0].Media.H()
	got := at(proof(t, with, 0, dpi), h, dpi, pt.X, pt.Y)
	paper := at(proof(t, without, 0, dpi), h, dpi, pt.X, pt.Y)
	assert.Less(t, paper.DeltaE00(palette.FromRGB(palette.RGB{R: 1, G: 1, B: 1})), 1.0, "no band: paper")
	era := with.Palette.At(1904.5).RGB()
	want := TintStops([]palette.Stop{{Year: 1904.5, Color: era}}, palette.RGB{R: 1, G: 1, B: 1}, BandStrength)[0].Color
	assert.Less(t, got.DeltaE00(palette.FromRGB(want)), 3.0, "band is the tinted era colour: got %s want %s", got.Hex(), want.Hex())
	if dir := os.Getenv("SHEAF_LOOK"); dir != "" {
		f, _ := os.Create(dir + "/band-page.png")
		png.Encode(f, proof(t, with, 0, 200))
		f.Close()
	}
}

// TestBandClippedToPlot: limits above the panel's y-range top are drawn
// at the top; the band never leaves the plot.
func TestBandClippedToPlot(t *testing.T) {
	f := rollingFeature(t, 0.99)
	for _, pn := range f.Plan.Pages[0].Panels {
		sr := &f.Data.Series[pn.Item]
		m, err := f.PlotMap(pn)
		require.NoError(t, err)
		lo, hi := f.Band(pn.Item)
		var cb curve.Builder
		path, err := BandPath(&cb, f.Data.Years, lo, hi, sr.YMax, m, 1)
		require.NoError(t, err)
		b := path.Bounds()
		assert.GreaterOrEqual(t, b.Y0*72/25.4, m.Y(0)-1e-6, "%s: band below the baseline", sr.Term)
		assert.LessOrEqual(t, b.Y1*72/25.4, m.Y(sr.YMax)+1e-6, "%s: band above the top", sr.Term)
		assert.False(t, math.IsNaN(b.W()))
	}
}

// TestKeyNoteSaysRolling: the key's note says the smoothing and the band
// without the spec writing it.
func TestKeyNoteSaysRolling(t *testing.T) {
	f := rollingFeature(t, 0.95)
	notes := f.scaleNotes()
	assert.Equal(t, "3-year rolling share. Each panel runs from 0 to its own peak (per million words), printed beside the peak year; tint: 95% interval", notes[0])
	assert.Equal(t, "3-year rolling share", notes[len(notes)-1])
	plain := rollingFeature(t, 0)
	plain.Data.Rolling = 0
	assert.NotContains(t, plain.scaleNotes()[0], "rolling")
}

// at returns the proof's colour at page point (x, y) (points, y up).
func at(img *image.RGBA, pageH, dpi, x, y float64) palette.Color {
	k := dpi / 72
	c := img.RGBAAt(int(x*k), int((pageH-y)*k))
	return palette.FromRGB(palette.RGB{R: float64(c.R) / 255, G: float64(c.G) / 255, B: float64(c.B) / 255})
}
