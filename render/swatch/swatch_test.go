package swatch

import (
	"bytes"
	"flag"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/palette"
)

var look = flag.String("look", "", "also write the default sheet as PNG to this path, to inspect by eye")

func sheet(t testing.TB, eras []float64, paperHex string, width float64) (palette.Scale, palette.Report) {
	t.Helper()
	s, err := palette.NewScale(palette.DefaultName, palette.DefaultAnchors(1868, 2025), eras)
	require.NoError(t, err)
	paper, err := palette.ParseHex(paperHex)
	require.NoError(t, err)
	r, err := palette.Check(s, paper, width, palette.Print, palette.DefaultThresholds())
	require.NoError(t, err)
	return s, r
}

func render(t testing.TB, s palette.Scale, r palette.Report, dpi float64) (image.Image, []byte) {
	t.Helper()
	var buf bytes.Buffer
	require.NoError(t, WritePNG(&buf, s, r, dpi))
	img, err := png.Decode(bytes.NewReader(buf.Bytes()))
	require.NoError(t, err)
	return img, buf.Bytes()
}

// px returns the pixel at (x, y) mm from the top-left.
func px(img image.Image, dpi, xmm, ymm float64) palette.Color {
	k := dpi / 25.4
	return at(img, int(xmm*k), int(ymm*k))
}

func at(img image.Image, x, y int) palette.Color {
	c := color.NRGBAModel.Convert(img.At(x, y)).(color.NRGBA)
	return palette.FromRGB(palette.RGB{R: float64(c.R) / 255, G: float64(c.G) / 255, B: float64(c.B) / 255})
}

// Strip geometry as laid out in Draw.
const (
	mainStripY = margin + 5 + 5.5 + 9 + 2.5 + 4.5 // mid-height of the main strip
	cvdStripY  = margin + 5 + 5.5 + 9 + 2.5 + 9 + 7 + 22 + 10 + 2.5 + 3.5
)

func TestSheetShowsThePalette(t *testing.T) {
	const dpi = 150
	s, r := sheet(t, nil, "#fbf8f1", 0.75)
	img, data := render(t, s, r, dpi)
	wantW, wantH := math.Round(Width*dpi/25.4), math.Round(Height*dpi/25.4)
	assert.Equal(t, [2]float64{wantW, wantH}, [2]float64{float64(img.Bounds().Dx()), float64(img.Bounds().Dy())}, "image size in px")
	if *look != "" {
		require.NoError(t, os.WriteFile(*look, data, 0o644))
	}
	// Paper colour in the corner, exactly.
	assert.Equal(t, "#fbf8f1", px(img, dpi, 2, 2).Hex(), "paper")
	// The key strip shows the scale's colour at each year (slices are
	// 0.5 mm, under half a year, so within ΔE00 1 of the exact colour).
	for _, year := range []float64{1870, 1900, 1946.5, 2000, 2023} {
		x := margin + inner*(year-1868)/(2025-1868)
		got := px(img, dpi, x, mainStripY)
		assert.LessOrEqual(t, got.DeltaE00(s.At(year).Clip()), 1.0, "strip at %v: %s, scale %s (ΔE00)", year, got.Hex(), s.At(year).Hex())
		// Each deficiency column shows the simulated colour.
		for i, def := range palette.Deficiencies() {
			cx := margin + float64(i)*(colWidth+gap) + colWidth*(year-1868)/(2025-1868)
			got := px(img, dpi, cx, cvdStripY)
			want := palette.Simulate(s.At(year), def)
			assert.LessOrEqual(t, got.DeltaE00(want), 1.0, "%v strip at %v: %s, simulation %s (ΔE00)", def, year, got.Hex(), want.Hex())
		}
	}
}

func TestErasAreFlat(t *testing.T) {
	const dpi = 100
	s, r := sheet(t, []float64{1868, 1900, 1945, 1990, 2025}, "#ffffff", 1)
	img, _ := render(t, s, r, dpi)
	for _, e := range s.Eras() {
		mid := (e.From + e.To) / 2
		x := margin + inner*(mid-1868)/(2025-1868)
		assert.Equal(t, e.Color.Hex(), px(img, dpi, x, mainStripY).Hex(), "era %s drawn", e.Label())
	}
}

func TestDeterministic(t *testing.T) {
	s, r := sheet(t, nil, "#ffffff", 0.5)
	_, a := render(t, s, r, 72)
	_, b := render(t, s, r, 72)
	assert.True(t, bytes.Equal(a, b), "two renders differ")
}

// The sample curves are stroked at the report's line width: at 600 dpi
// a 2 pt line is 16.7 px wide. Measure the thickest vertical run of ink in
// a column through the flat start of the first chart (curve 0 starts
// almost horizontal).
func TestCurveLineWidth(t *testing.T) {
	const dpi = 600
	for _, width := range []float64{1, 2} {
		s, r := sheet(t, []float64{1868, 2025}, "#ffffff", width)
		img, _ := render(t, s, r, dpi)
		k := dpi / 25.4
		col := int((margin + 2) * k)
		top, bottom := int((margin+5+5.5+9+2.5+9+7)*k), int((margin+5+5.5+9+2.5+9+7+22-0.5)*k)
		ink := s.Eras()[0].Color.Hex()
		run, best := 0, 0
		for y := top; y < bottom; y++ {
			if at(img, col, y).Hex() == ink {
				run++
				best = max(best, run)
			} else {
				run = 0
			}
		}
		want := width * 25.4 / 72 * k
		t.Logf("%v pt: %d px solid, nominal %.1f", width, best, want)
		// Solid core of an anti-aliased, slightly sloped stroke: within 2 px
		// below and 15% above the nominal width.
		assert.True(t, float64(best) >= want-2 && float64(best) <= want*1.15+0.5, "%v pt line: %d px of solid ink, want about %.1f", width, best, want)
	}
}

func TestDrawErrors(t *testing.T) {
	s, r := sheet(t, nil, "#ffffff", 1)
	assert.ErrorContains(t, Draw(canvas.New(100, 100), s, r), "smaller than the sheet", "small canvas")
	assert.ErrorContains(t, Draw(canvas.New(Width, Height), palette.Scale{}, r), "no span", "empty scale")
	assert.ErrorContains(t, Draw(canvas.New(Width, Height), s, palette.Report{}), "run palette.Check", "empty report")
	for _, dpi := range []float64{0, -1, math.NaN(), 1e6} {
		assert.ErrorContains(t, WritePNG(&bytes.Buffer{}, s, r, dpi), "dpi", "dpi %v", dpi)
	}
}

func BenchmarkWritePNG150(b *testing.B) {
	s, r := sheet(b, nil, "#ffffff", 0.75)
	for b.Loop() {
		var buf bytes.Buffer
		require.NoError(b, WritePNG(&buf, s, r, 150))
	}
}
