package raster_test

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/render/raster"
)

// mm converts points to the millimetres a canvas context works in.
const mm = 25.4 / 72

var (
	white = color.RGBA{0xff, 0xff, 0xff, 0xff}
	black = color.RGBA{0x00, 0x00, 0x00, 0xff}
	teal  = color.RGBA{0x12, 0x5a, 0x7e, 0xff}
	coral = color.RGBA{0xe9, 0x61, 0x63, 0xff}
)

// rect fills the rectangle (x0, y0)–(x1, y1), in points with y up.
func rect(ctx *canvas.Context, x0, y0, x1, y1 float64, col color.Color) {
	ctx.ResetStyle()
	ctx.SetStrokeColor(canvas.Transparent)
	ctx.SetFillColor(col)
	ctx.DrawPath(x0*mm, y0*mm, canvas.Rectangle((x1-x0)*mm, (y1-y0)*mm))
}

// rgba reads a pixel as 8-bit channels.
func rgba(img image.Image, x, y int) color.RGBA {
	return color.RGBAModel.Convert(img.At(x, y)).(color.RGBA)
}

// TestRectLandsOnPixels fills a rectangle whose edges fall on pixel
// boundaries and checks that exactly the expected pixels are inked, for a
// whole page (Draw) and for regions of it (DrawRegion). The expected
// pixels are worked by hand from the PDF convention: user space has y up
// from the page's lower-left corner, 72 units an inch (ISO 32000-1 §8.3.2.3),
// and a raster has rows down from the top, so the row of page y is
// (pageH − y)·dpi/72 and a region starting at (r.X, r.Y) shifts it by
// (−r.X, −r.Y) — the crop pdftoppm's -x -y -W -H makes (pdftoppm(1),
// poppler-utils).
func TestRectLandsOnPixels(t *testing.T) {
	type box struct{ x0, y0, x1, y1 float64 }
	tests := []struct {
		name       string
		w, h, dpi  float64
		fill       box             // points, y up
		region     *raster.Region  // nil: the whole page
		want       image.Rectangle // inked pixels in the image
		wantBounds image.Rectangle
	}{
		// 72 dpi: one pixel a point. Rows 80−50 = 30 to 80−20 = 60.
		{"72 dpi page", 100, 80, 72, box{10, 20, 40, 50}, nil,
			image.Rect(10, 30, 40, 60), image.Rect(0, 0, 100, 80)},
		// 144 dpi: two pixels a point.
		{"144 dpi page", 100, 80, 144, box{10, 20, 40, 50}, nil,
			image.Rect(20, 60, 80, 120), image.Rect(0, 0, 200, 160)},
		// 100 dpi: 0.72 pt a pixel; 7.2 pt → 10 px, 72 − 57.6 = 14.4 pt → 20 px.
		{"100 dpi page", 72, 72, 100, box{7.2, 14.4, 36, 57.6}, nil,
			image.Rect(10, 20, 50, 80), image.Rect(0, 0, 100, 100)},
		// A page 80 pt = 111.1 px tall: 111 rows, and the top edge stays
		// row 0, so 80 − 65.6 = 14.4 pt → row 20 (not 19.9).
		{"100 dpi page, height not whole pixels", 72, 80, 100, box{7.2, 22.4, 36, 65.6}, nil,
			image.Rect(10, 20, 50, 80), image.Rect(0, 0, 100, 111)},
		// The region's origin is subtracted: columns 10−5, rows 30−25.
		{"72 dpi region inside", 100, 80, 72, box{10, 20, 40, 50}, &raster.Region{X: 5, Y: 25, W: 50, H: 50},
			image.Rect(5, 5, 35, 35), image.Rect(0, 0, 50, 50)},
		// A region that cuts the rectangle keeps only its part of it.
		{"72 dpi region cuts", 100, 80, 72, box{10, 20, 40, 50}, &raster.Region{X: 20, Y: 40, W: 30, H: 30},
			image.Rect(0, 0, 20, 20), image.Rect(0, 0, 30, 30)},
		// 144 dpi region: page pixels (20,60)–(80,120) less (30, 70).
		{"144 dpi region", 100, 80, 144, box{10, 20, 40, 50}, &raster.Region{X: 30, Y: 70, W: 100, H: 60},
			image.Rect(0, 0, 50, 50), image.Rect(0, 0, 100, 60)},
		// 100 dpi region: page pixels (10,20)–(50,80) less (7, 3).
		{"100 dpi region", 72, 72, 100, box{7.2, 14.4, 36, 57.6}, &raster.Region{X: 7, Y: 3, W: 80, H: 90},
			image.Rect(3, 17, 43, 77), image.Rect(0, 0, 80, 90)},
		// A region wholly outside the rectangle shows paper only.
		{"region misses", 100, 80, 72, box{10, 20, 40, 50}, &raster.Region{X: 60, Y: 0, W: 40, H: 80},
			image.Rectangle{}, image.Rect(0, 0, 40, 80)},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			draw := func(ctx *canvas.Context) error {
				rect(ctx, tc.fill.x0, tc.fill.y0, tc.fill.x1, tc.fill.y1, teal)
				return nil
			}
			var img *image.RGBA
			var err error
			if tc.region == nil {
				img, err = raster.Draw(tc.w, tc.h, tc.dpi, white, draw)
			} else {
				img, err = raster.DrawRegion(tc.h, tc.dpi, *tc.region, white, draw)
			}
			require.NoError(t, err)
			require.Equal(t, tc.wantBounds, img.Bounds(), "image bounds %v, want %v", img.Bounds(), tc.wantBounds)
			bad := 0
			var first []string // the first few, to say where
			for y := img.Bounds().Min.Y; y < img.Bounds().Max.Y; y++ {
				for x := img.Bounds().Min.X; x < img.Bounds().Max.X; x++ {
					want := white
					if image.Pt(x, y).In(tc.want) {
						want = teal
					}
					if got := rgba(img, x, y); got != want {
						if bad < 5 {
							first = append(first, fmt.Sprintf("(%d, %d) = %v, want %v", x, y, got, want))
						}
						bad++
					}
				}
			}
			assert.Zero(t, bad, "pixels wrong, first %v", first)
		})
	}
}

// TestRegionOf checks the pixel box of a rectangle against values worked
// by hand (the row rule of TestRectLandsOnPixels, edges rounded to the
// nearest pixel).
func TestRegionOf(t *testing.T) {
	tests := []struct {
		name           string
		pageH, dpi     float64
		x0, y0, x1, y1 float64
		want           raster.Region
	}{
		{"72 dpi", 80, 72, 10, 20, 40, 50, raster.Region{X: 10, Y: 30, W: 30, H: 30}},
		{"144 dpi", 80, 144, 10, 20, 40, 50, raster.Region{X: 20, Y: 60, W: 60, H: 60}},
		// 100 dpi: 10 pt → 13.89 → 14 px; 40 pt → 55.56 → 56; rows
		// (80−50)·100/72 = 41.67 → 42 and (80−20)·100/72 = 83.33 → 83.
		{"100 dpi rounds", 80, 100, 10, 20, 40, 50, raster.Region{X: 14, Y: 42, W: 42, H: 41}},
		// An A5 trim (ISO 216: 148 × 210 mm = 419.528 × 595.276 pt) with
		// 9 mm (25.512 pt) of bleed and slug on every side (common
		// practice for bleed plus marks): media height 646.299 pt.
		// 100 dpi: 25.512 → 35.43 → 35; 445.039 → 618.11 → 618; rows
		// 646.299 − 620.787 = 25.512 → 35 and 620.787 → 862.2 → 862.
		{"A5 trim in its media", 646.299, 100, 25.512, 25.512, 445.039, 620.787,
			raster.Region{X: 35, Y: 35, W: 583, H: 827}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := raster.RegionOf(tc.pageH, tc.dpi, tc.x0, tc.y0, tc.x1, tc.y1)
			assert.Equal(t, tc.want, got, "RegionOf = %+v, want %+v", got, tc.want)
		})
	}
}

// TestBadPage checks that impossible sizes are errors, not panics
// (project rule: bad input returns an error).
func TestBadPage(t *testing.T) {
	tests := []struct {
		name      string
		w, h, dpi float64
	}{
		{"zero width", 0, 100, 100},
		{"negative height", 100, -1, 100},
		{"zero dpi", 100, 100, 0},
		{"NaN", math.NaN(), 100, 100},
		{"infinite", math.Inf(1), 100, 100},
		{"too many pixels", 14400, 14400, 2400},
		{"under a pixel", 0.1, 0.1, 72},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := raster.Draw(tc.w, tc.h, tc.dpi, white, func(*canvas.Context) error { return nil })
			assert.Error(t, err, "Draw(%g, %g, %g dpi)", tc.w, tc.h, tc.dpi)
		})
	}
	_, err := raster.DrawRegion(100, 72, raster.Region{W: 0, H: 10}, white, func(*canvas.Context) error { return nil })
	assert.Error(t, err, "DrawRegion of an empty region")
}
