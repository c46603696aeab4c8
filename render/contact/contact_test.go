package contact

import (
	"image"
	"image/color"
	"image/draw"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// solid is a w × h image of one colour whose bounds start at min, so
// code that assumes (0, 0) is caught.
func solid(w, h int, c color.RGBA, min image.Point) *image.RGBA {
	img := image.NewRGBA(image.Rectangle{Min: min, Max: min.Add(image.Pt(w, h))})
	draw.Draw(img, img.Bounds(), image.NewUniform(c), image.Point{}, draw.Src)
	return img
}

var (
	red  = color.RGBA{0xc0, 0x20, 0x20, 0xff}
	blue = color.RGBA{0x20, 0x40, 0xc0, 0xff}
)

// TestThumbnailKeepsProportions scales page proofs to a width and checks
// the height keeps the page's proportions, rounded down, at least one
// pixel. The A-series ratio 1 : √2 is ISO 216's; the rest are invented.
func TestThumbnailKeepsProportions(t *testing.T) {
	tests := []struct {
		name  string
		w, h  int
		width int
		wantH int
	}{
		// A5 at 100 dpi: 148 × 210 mm → 583 × 827 px; 240 · 827 / 583 = 340.4.
		{"A5 proof", 583, 827, 240, 340},
		// A4 landscape at 72 dpi: 842 × 595 px; 240 · 595 / 842 = 169.6.
		{"A4 landscape", 842, 595, 240, 169},
		{"square", 500, 500, 240, 240},
		{"upscaled", 60, 90, 240, 360},
		{"a thin strip keeps a row", 2000, 3, 240, 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			img := solid(tc.w, tc.h, red, image.Pt(7, 11))
			th := Thumbnail(img, tc.width)
			require.Equal(t, image.Rect(0, 0, tc.width, tc.wantH), th.Bounds(), "thumbnail bounds")
			// A one-colour page stays that colour (interpolation of equal
			// values is the value).
			for _, p := range []image.Point{{0, 0}, {tc.width / 2, tc.wantH / 2}, {tc.width - 1, tc.wantH - 1}} {
				assert.Equal(t, red, th.RGBAAt(p.X, p.Y), "thumbnail pixel %v", p)
			}
		})
	}
}

// TestThumbnailBadWidth checks that a width under one pixel gives an
// image, not a panic (project rule: bad input never panics).
func TestThumbnailBadWidth(t *testing.T) {
	for _, w := range []int{0, -5} {
		th := Thumbnail(solid(100, 140, red, image.Point{}), w)
		assert.GreaterOrEqual(t, th.Bounds().Dx(), 1, "width of Thumbnail(width %d)", w)
		assert.GreaterOrEqual(t, th.Bounds().Dy(), 1, "height of Thumbnail(width %d)", w)
	}
	assert.False(t, Thumbnail(image.NewRGBA(image.Rect(0, 0, 0, 10)), 240).Bounds().Empty(), "Thumbnail of an empty image is empty")
}

// TestSheetSize checks the sheet's pixel size against the layout worked
// by hand: margins of 32 px, gaps of 24 px between cells, 18 px under
// each thumbnail for its number, cells as large as the largest thumbnail,
// no more columns than thumbnails (values set by this package, invented).
func TestSheetSize(t *testing.T) {
	tests := []struct {
		name         string
		n, cols      int
		tw, th       int
		wantW, wantH int
	}{
		// 4 columns: 2·32 + 4·240 + 3·24 = 1096; 2 rows: 2·32 + 2·(340+18) + 24 = 804.
		{"8 pages in 4 columns", 8, 4, 240, 340, 1096, 804},
		// 5 pages in 4 columns: still 2 rows.
		{"5 pages in 4 columns", 5, 4, 240, 340, 1096, 804},
		// 3 pages, 4 columns asked: 3 columns, 2·32 + 3·240 + 2·24 = 832; 1 row: 64 + 358 = 422.
		{"fewer pages than columns", 3, 4, 240, 340, 832, 422},
		// 1 column: 64 + 240 = 304; 3 rows: 64 + 3·358 + 2·24 = 1186.
		{"one column", 3, 1, 240, 340, 304, 1186},
		// Columns under 1 mean one column.
		{"zero columns", 2, 0, 100, 50, 164, 64 + 2*68 + 24},
		{"negative columns", 2, -3, 100, 50, 164, 64 + 2*68 + 24},
		// No pages: the bare margins (a one-pixel cell wide).
		{"no pages", 0, 4, 0, 0, 65, 64},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var thumbs []image.Image
			for range tc.n {
				thumbs = append(thumbs, solid(tc.tw, tc.th, red, image.Point{}))
			}
			s := Sheet(thumbs, tc.cols)
			assert.Equal(t, image.Rect(0, 0, tc.wantW, tc.wantH), s.Bounds(), "sheet bounds")
		})
	}
}

// TestSheetPlacesThumbnails checks where thumbnails land, that a nil
// thumbnail (a page that failed) leaves its cell empty board, that cells
// take the largest thumbnail's size, and that every page is numbered
// under its own cell.
func TestSheetPlacesThumbnails(t *testing.T) {
	thumbs := []image.Image{
		solid(100, 140, red, image.Pt(3, 4)),
		nil,
		solid(80, 100, blue, image.Point{}),
		solid(100, 140, blue, image.Point{}),
		solid(100, 140, red, image.Point{}),
	}
	const cols = 3
	s := Sheet(thumbs, cols)
	cellW, cellH := 100, 140
	origin := func(i int) image.Point {
		return image.Pt(margin+(i%cols)*(cellW+gap), margin+(i/cols)*(cellH+label+gap))
	}
	for i, th := range thumbs {
		o := origin(i)
		numberArea := image.Rect(o.X, o.Y+cellH, o.X+cellW, o.Y+cellH+label)
		if th == nil {
			for _, p := range []image.Point{o, o.Add(image.Pt(cellW/2, cellH/2))} {
				assert.Equal(t, board, s.RGBAAt(p.X, p.Y), "empty cell %d: pixel %v, want the board", i, p)
			}
			assert.False(t, inked(s, numberArea), "empty cell %d has a number under it", i)
			continue
		}
		b := th.Bounds()
		want := th.At(b.Min.X, b.Min.Y)
		for _, p := range []image.Point{o, o.Add(image.Pt(b.Dx()-1, b.Dy()-1))} {
			assert.Equal(t, want, s.At(p.X, p.Y), "cell %d: pixel %v, want the thumbnail's", i, p)
		}
		if b.Dx() < cellW {
			assert.Equal(t, board, s.RGBAAt(o.X+b.Dx()+5, o.Y+5), "cell %d: right of a narrower thumbnail, want the board", i)
		}
		assert.True(t, inked(s, image.Rect(o.X, o.Y+b.Dy(), o.X+b.Dx(), o.Y+b.Dy()+label)), "cell %d has no page number under it", i)
	}
}

// inked reports whether any pixel in r is darker than the board: the
// number's ink.
func inked(img *image.RGBA, r image.Rectangle) bool {
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			if c := img.RGBAAt(x, y); c.R < board.R/2 {
				return true
			}
		}
	}
	return false
}
