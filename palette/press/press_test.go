package press_test

import (
	"math"
	"os"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/palette"
	"sheaf/palette/icc"
	"sheaf/palette/press"
	"sheaf/render/tooltest"
)

func coated(t testing.TB) []byte {
	b, err := os.ReadFile(tooltest.ICCProfile(t, "default_cmyk.icc"))
	require.NoError(t, err)
	return b
}

func condition(t testing.TB) *press.Condition {
	c, err := press.New(coated(t), press.Settings{Registry: "http://www.color.org", InkLimit: 300, Intent: icc.RelativeColorimetric})
	require.NoError(t, err)
	return c
}

func TestNew(t *testing.T) {
	c := condition(t)
	assert.True(t, c.CMYK())
	assert.Equal(t, 4, c.Components())
	assert.NotEmpty(t, c.Identifier, "from the profile's desc tag")
	_, err := press.New(icc.SRGBBytes(), press.Settings{})
	require.ErrorIs(t, err, press.ErrNotOutput, "a display profile is not a printing condition")
	_, err = press.New([]byte("nonsense"), press.Settings{})
	var fe *icc.FormatError
	require.ErrorAs(t, err, &fe)
}

// Greys print in black ink alone, with the grey's L* through the profile
// (common practice: type and rules on one plate).
func TestNeutralIsBlackOnly(t *testing.T) {
	c := condition(t)
	for _, hex := range []string{"#1a1a1a", "#5c5c5c", "#9a9a9a", "#ffffff", "#000000"} {
		col, err := palette.ParseHex(hex)
		require.NoError(t, err)
		ink, black := c.Ink(col.RGB())
		require.True(t, black, hex)
		assert.Equal(t, []float64{0, 0, 0}, ink[:3], "%s: no C, M or Y", hex)
		want := c.Intended(col.RGB()).L
		got := c.Printed(ink).L
		kMax := c.Printed([]float64{0, 0, 0, 1}).L
		if want > kMax {
			assert.InDelta(t, want, got, 0.05, "%s: L* matched", hex)
		} else {
			assert.Equal(t, 1.0, ink[3], "%s: darker than solid K → 100 %% K", hex)
		}
	}
	ink, black := c.Ink(palette.RGB{R: 0.6, G: 0.2, B: 0.1})
	assert.False(t, black)
	assert.Greater(t, ink[1], 0.3, "a red has magenta")
}

// A gradient converted with Ramp stays, at every year of the demo span,
// within ΔE00 1 of converting that year's palette colour directly (the
// issue's requirement), with linear interpolation of ink between stops as
// a PDF axial shading does (ISO 32000-1 §8.7.4.5.3, Type 2 function with
// N = 1).
func TestRampFollowsThePalette(t *testing.T) {
	c := condition(t)
	scale, err := palette.Default(1868, 2025)
	require.NoError(t, err)
	var in []press.RGBStop
	for _, s := range scale.Stops(1868, 2025, 0) {
		in = append(in, press.RGBStop{Offset: (s.Year - 1868) / (2025 - 1868), RGB: s.Color})
	}
	out := c.Ramp(in)
	require.GreaterOrEqual(t, len(out), len(in))
	worst := 0.0
	for y := 1868.0; y <= 2025; y += 0.5 {
		tt := (y - 1868) / (2025 - 1868)
		want := c.Printed(c.Convert(scale.At(y).RGB()))
		got := c.Printed(inkAt(out, tt))
		worst = math.Max(worst, palette.DeltaE00(want, got))
	}
	t.Logf("%d sRGB stops → %d ink stops; worst ΔE00 %.3f", len(in), len(out), worst)
	assert.LessOrEqual(t, worst, 1.0)
}

func inkAt(stops []press.Stop, t float64) []float64 {
	for i := 1; i < len(stops); i++ {
		a, b := stops[i-1], stops[i]
		if t <= b.Offset {
			f := 0.0
			if b.Offset > a.Offset {
				f = (t - a.Offset) / (b.Offset - a.Offset)
			}
			v := make([]float64, len(a.Ink))
			for k := range v {
				v[k] = a.Ink[k] + f*(b.Ink[k]-a.Ink[k])
			}
			return v
		}
	}
	return stops[len(stops)-1].Ink
}

func TestTotal(t *testing.T) {
	assert.InDelta(t, 297.0, press.Total([]float64{0.74, 0.68, 0.66, 0.89}), 1e-9, "the issue's #1a1a1a measurement: C74 M68 Y66 K90 ≈ 297 %")
}

// The soft proof of a colour is the press's CIELAB shown in sRGB: for an
// in-gamut colour it comes back close to where it started.
func TestProof(t *testing.T) {
	c := condition(t)
	mid := palette.RGB{R: 0.55, G: 0.5, B: 0.45}
	p := c.Proof(c.Convert(mid))
	assert.Less(t, palette.DeltaE00(c.Intended(mid), c.Intended(p)), 3.0)
}

// A gradient with few, far-apart stops (saturated orange to blue): ink
// values interpolated straight between the two converted ends would stray
// far from the colours between them converted directly; Ramp adds stops
// until every point is within MaxRampError (checked at 200 points, not
// only at the midpoints Ramp itself tests).
func TestRampRefinesSparseGradients(t *testing.T) {
	c := condition(t)
	a, b := palette.RGB{R: 0.95, G: 0.45, B: 0.05}, palette.RGB{R: 0.1, G: 0.2, B: 0.85}
	out := c.Ramp([]press.RGBStop{{Offset: 0, RGB: a}, {Offset: 1, RGB: b}})
	straight := []press.Stop{{Offset: 0, Ink: c.Convert(a)}, {Offset: 1, Ink: c.Convert(b)}}
	worst, worstStraight := 0.0, 0.0
	for i := 0; i <= 200; i++ {
		tt := float64(i) / 200
		rgb := palette.RGB{R: a.R + tt*(b.R-a.R), G: a.G + tt*(b.G-a.G), B: a.B + tt*(b.B-a.B)}
		want := c.Printed(c.Convert(rgb))
		worst = math.Max(worst, palette.DeltaE00(want, c.Printed(inkAt(out, tt))))
		worstStraight = math.Max(worstStraight, palette.DeltaE00(want, c.Printed(inkAt(straight, tt))))
	}
	t.Logf("2 stops → %d; worst ΔE00 %.2f (straight between the ends: %.1f)", len(out), worst, worstStraight)
	assert.Greater(t, worstStraight, 2.0, "the test gradient must need refining")
	assert.LessOrEqual(t, worst, 1.0)
	assert.Greater(t, len(out), 2)
}
