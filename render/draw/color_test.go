package draw_test

import (
	"image/color"
	"math"
	"testing"

	colorful "github.com/lucasb-eyer/go-colorful"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/palette"
	"sheaf/render/draw"
)

// TestRGBAAgainstGoColorful: a palette colour becomes the 8-bit sRGB
// colour go-colorful gives for the same components clamped to [0, 1]
// (Color.Clamped, Color.RGB255: round to nearest), fully opaque.
func TestRGBAAgainstGoColorful(t *testing.T) {
	def, err := palette.Default(1868, 2025)
	require.NoError(t, err)
	tests := []struct {
		name string
		c    palette.RGB
		src  string
	}{
		{"black", palette.RGB{R: 0, G: 0, B: 0}, "go-colorful RGB255"},
		{"white", palette.RGB{R: 1, G: 1, B: 1}, "go-colorful RGB255"},
		{"half", palette.RGB{R: 0.5, G: 0.5, B: 0.5}, "go-colorful RGB255: 127.5 rounds up to 128"},
		{"just under half a step", palette.RGB{R: 0.5 / 255 * 0.999, G: 1.5 / 255 * 0.999, B: 254.5 / 255 * 0.999}, "go-colorful RGB255: rounds down"},
		{"components", palette.RGB{R: 0.2, G: 0.4, B: 0.6}, "go-colorful RGB255"},
		{"outside sRGB", palette.RGB{R: -0.2, G: 1.3, B: 0.5}, "go-colorful Clamped, then RGB255"},
		{"far outside", palette.RGB{R: 7, G: -3, B: 1.0001}, "go-colorful Clamped, then RGB255"},
		{"palette 1868", def.At(1868).RGB(), "go-colorful Clamped, then RGB255"},
		{"palette 1946.5", def.At(1946.5).RGB(), "go-colorful Clamped, then RGB255"},
		{"palette 2025", def.At(2025).RGB(), "go-colorful Clamped, then RGB255"},
	}
	for _, tc := range tests {
		ref := colorful.Color{R: tc.c.R, G: tc.c.G, B: tc.c.B}.Clamped()
		r, g, b := ref.RGB255()
		got := draw.RGBA(tc.c)
		// image/color: RGBA is alpha-premultiplied; alpha 0xff is opaque,
		// so the components are the sRGB bytes themselves.
		assert.Equal(t, color.RGBA{r, g, b, 0xff}, got, "%s %+v (%s)", tc.name, tc.c, tc.src)
		// Read back the way any image/color consumer does: go-colorful's
		// MakeColor sees the same colour.
		back, ok := colorful.MakeColor(got)
		if assert.True(t, ok, "%s: MakeColor says transparent", tc.name) {
			assert.Equal(t, ref.Hex(), back.Hex(), "%s: read back through image/color (%s)", tc.name, tc.src)
		}
	}
	// Palette's own contract, no outside source: a NaN component is 0
	// (palette.RGB.Clip), never a random byte.
	assert.Equal(t, color.RGBA{0, 0xff, 0, 0xff}, draw.RGBA(palette.RGB{R: math.NaN(), G: 2, B: -1}), "NaN component")
}

// TestRGBAEveryByte: every byte value v/255 comes out as v, as it does
// from go-colorful's RGB255.
func TestRGBAEveryByte(t *testing.T) {
	for v := 0; v < 256; v++ {
		c := palette.RGB{R: float64(v) / 255, G: float64(255-v) / 255, B: float64(v) / 255}
		r, g, b := colorful.Color{R: c.R, G: c.G, B: c.B}.RGB255()
		require.Equal(t, color.RGBA{r, g, b, 0xff}, draw.RGBA(c), "byte %d", v)
		require.Equal(t, [3]uint8{uint8(v), uint8(255 - v), uint8(v)}, [3]uint8{r, g, b}, "go-colorful round trip of byte %d", v)
	}
}
