package page

import (
	"image"
	"image/png"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
)

// pixelBox is r (layout points, y up from the MediaBox's lower-left
// corner) in the pixels of a proof of a page of height h at dpi, grown by
// grow points on every side.
func pixelBox(r layout.Rect, h, dpi, grow float64) image.Rectangle {
	s := dpi / 72
	return image.Rect(int((r.X0-grow)*s), int((h-r.Y1-grow)*s), int((r.X1+grow)*s+0.999), int((h-r.Y0+grow)*s+0.999))
}

// chroma is an 8-bit pixel's max − min channel: 0 for white, black and
// the greys the page draws its type and rules in; the era colours of the
// lines are far from grey (Daybreak keeps CIELAB C* ≥ 31, README).
func chroma(img *image.RGBA, x, y int) int {
	i := img.PixOffset(x, y)
	r, g, b := int(img.Pix[i]), int(img.Pix[i+1]), int(img.Pix[i+2])
	return max(r, g, b) - min(r, g, b)
}

// darkness is how dark a pixel is: 255 − its lightest channel.
func darkness(img *image.RGBA, x, y int) int {
	i := img.PixOffset(x, y)
	return 255 - max(int(img.Pix[i]), int(img.Pix[i+1]), int(img.Pix[i+2]))
}

// TestDrawSmallLandsInItsBoxes draws every page of the small feature at
// 150 dpi and checks that what is drawn lands where the layout put it:
// every coloured pixel is inside a panel's plot (grown by half the line,
// the peak dot's radius and one pixel of antialiasing) or the key strip,
// every panel with data has its line inside its plot, and every panel's
// label has type in its label box. The geometry is the plan's
// (layout.Panel.Plot, .Label; layout.Page.KeyStrip).
func TestDrawSmallLandsInItsBoxes(t *testing.T) {
	const dpi = 150
	const colour = 40 // max − min channel that counts as coloured, of 255
	f := smallFeature(t, nil)
	require.NotEmpty(t, f.Plan.Pages)
	grow := f.Output.Line.Pt()/2 + f.peakRadius() + Hairline/2 + 72.0/dpi
	for i, pg := range f.Plan.Pages {
		img := proof(t, f, i, dpi)
		if dir := os.Getenv("SHEAF_KEEP"); dir != "" {
			out, err := os.Create(filepath.Join(dir, "small-page.png"))
			require.NoError(t, err)
			require.NoError(t, png.Encode(out, img))
			out.Close()
		}
		h := pg.Media.H()
		var allowed []image.Rectangle
		for _, pn := range pg.Panels {
			allowed = append(allowed, pixelBox(pn.Plot, h, dpi, grow))
		}
		allowed = append(allowed, pixelBox(pg.KeyStrip, h, dpi, 72.0/dpi))
		for _, kb := range pg.KeyRepeats {
			allowed = append(allowed, pixelBox(kb.Strip, h, dpi, 72.0/dpi))
		}
		stray, coloured := 0, 0
		var strays []image.Point // the first few, to say where
		b := img.Bounds()
		for y := b.Min.Y; y < b.Max.Y; y++ {
			for x := b.Min.X; x < b.Max.X; x++ {
				if chroma(img, x, y) < colour {
					continue
				}
				coloured++
				in := false
				for _, a := range allowed {
					if image.Pt(x, y).In(a) {
						in = true
						break
					}
				}
				if !in {
					if stray < 5 {
						strays = append(strays, image.Pt(x, y))
					}
					stray++
				}
			}
		}
		assert.Zero(t, stray, "page %d: coloured pixels outside the plots and the key, first at %v", i+1, strays)
		require.NotZero(t, coloured, "page %d: nothing coloured drawn", i+1)

		for _, pn := range pg.Panels {
			sr := f.Data.Series[pn.Item]
			plot := pixelBox(pn.Plot, h, dpi, grow)
			n := 0
			for y := plot.Min.Y; y < plot.Max.Y; y++ {
				for x := plot.Min.X; x < plot.Max.X; x++ {
					if chroma(img, x, y) >= colour {
						n++
					}
				}
			}
			if sr.Peak > 0 {
				// A line across the plot at 150 dpi covers at least its
				// width in pixels.
				assert.GreaterOrEqual(t, n, plot.Dx(), "page %d %q: its line is not in its plot %v", i+1, sr.Term, pn.Plot)
			}
			label := pixelBox(pn.Label, h, dpi, 0)
			dark := 0
			for y := label.Min.Y; y < label.Max.Y; y++ {
				for x := label.Min.X; x < label.Max.X; x++ {
					if darkness(img, x, y) > 128 {
						dark++
					}
				}
			}
			assert.Greater(t, dark, 20, "page %d %q: no type in its label box %v", i+1, sr.Term, pn.Label)
		}
	}
}
