package swatch

import (
	"bytes"
	"image/png"
	"os"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/palette"
	"sheaf/palette/icc"
	"sheaf/palette/press"
	"sheaf/render/tooltest"
)

// With a printing condition the sheet is PressBand taller and shows, on
// its right, the palette as the press prints it: the strip's colour at a
// year is the soft proof of that year's colour (press.Condition.Proof),
// and differs from the screen colour on its left by what the press
// cannot reach.
func TestPressBand(t *testing.T) {
	b, err := os.ReadFile(tooltest.ICCProfile(t, "default_cmyk.icc"))
	require.NoError(t, err)
	cond, err := press.New(b, press.Settings{Condition: "Generic coated", Intent: icc.RelativeColorimetric})
	require.NoError(t, err)
	s, err := palette.Default(1868, 2025)
	require.NoError(t, err)
	r, err := palette.Check(s, palette.FromRGB(palette.RGB{R: 1, G: 1, B: 1}), 0.75, palette.Print, palette.DefaultThresholds())
	require.NoError(t, err)
	w, h := SizeFor(cond)
	assert.Equal(t, Width, w)
	assert.Equal(t, Height+PressBand, h)

	var buf bytes.Buffer
	const dpi = 150
	require.NoError(t, WritePNGFor(&buf, s, r, dpi, cond))
	img, err := png.Decode(&buf)
	require.NoError(t, err)
	assert.Equal(t, int(h*dpi/25.4+0.5), img.Bounds().Dy())

	// The press band starts at y = margin+5+5.5+9+2.5+9+7+22+10 mm (the
	// header, normal-vision strip and charts above it); its strips are 2.5
	// mm lower, 7 mm tall. Sample the middle of the strips, on both
	// halves, at the year the press moves most.
	y0 := margin + 5 + 5.5 + 9 + 2.5 + 9 + 7 + 22 + 10 + 2.5 + 3.5
	half := (inner - gap) / 2
	year, shift := 1868.0, 0.0
	for y := 1868.0; y <= 2025; y++ {
		if d := cond.Shift(s.At(y).RGB()); d > shift {
			year, shift = y, d
		}
	}
	at := func(x float64) palette.Color {
		c := img.At(int(x*dpi/25.4), int(y0*dpi/25.4))
		rr, gg, bb, _ := c.RGBA()
		return palette.FromRGB(palette.RGB{R: float64(rr) / 65535, G: float64(gg) / 65535, B: float64(bb) / 65535})
	}
	frac := (year - 1868) / (2025 - 1868)
	screen := at(margin + frac*half)
	proofed := at(margin + half + gap + frac*half)
	want := s.At(year)
	ink, _ := cond.Ink(want.RGB())
	wantProof := palette.FromRGB(cond.Proof(ink))
	assert.Less(t, screen.DeltaE00(want), 2.0, "left: the screen colour")
	assert.Less(t, proofed.DeltaE00(wantProof), 2.0, "right: the soft proof")
	assert.InDelta(t, want.DeltaE00(wantProof), screen.DeltaE00(proofed), 2.0, "the sheet shows the press's shift in %.0f", year)
}
