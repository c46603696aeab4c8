package contact

import (
	"image"
	"image/color"
	"image/draw"
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestPair: facing pages as a bound book shows them (common practice:
// page 1 is a right-hand page alone; each left page faces the next right).
func TestPair(t *testing.T) {
	tests := []struct {
		name  string
		right []bool
		want  []Spread
	}{
		{"first page right, 8 pages", []bool{true, false, true, false, true, false, true, false},
			[]Spread{{-1, 0}, {1, 2}, {3, 4}, {5, 6}, {7, -1}}},
		{"first page left, 4 pages", []bool{false, true, false, true}, []Spread{{0, 1}, {2, 3}}},
		{"one page", []bool{true}, []Spread{{-1, 0}}},
		{"none", nil, nil},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, Pair(tt.right), tt.name)
	}
}

// TestSpreadsTouchAtSpine: the two pages of a spread are drawn side by
// side with no board between them; a right-hand page alone stands on the
// right half of its spread.
func TestSpreadsTouchAtSpine(t *testing.T) {
	page := func(c color.RGBA) image.Image {
		img := image.NewRGBA(image.Rect(0, 0, 20, 30))
		draw.Draw(img, img.Bounds(), image.NewUniform(c), image.Point{}, draw.Src)
		return img
	}
	red, blue, green := color.RGBA{255, 0, 0, 255}, color.RGBA{0, 0, 255, 255}, color.RGBA{0, 255, 0, 255}
	s := Spreads([]image.Image{page(red), page(blue), page(green)}, []bool{true, false, true}, 2)
	y := margin + 10
	// Spread 1: empty left half, page 1 on the right half.
	assert.Equal(t, board, s.RGBAAt(margin+5, y), "empty left side")
	assert.Equal(t, red, s.RGBAAt(margin+20+5, y), "page 1 on the right")
	// Spread 2: pages 2 and 3 touch at the spine.
	x := margin + 2*20 + gap
	assert.Equal(t, blue, s.RGBAAt(x+19, y), "page 2's last column")
	assert.Equal(t, green, s.RGBAAt(x+20, y), "page 3's first column, next to it")
}
