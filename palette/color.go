package palette

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/lucasb-eyer/go-colorful"
)

// RGB is a gamma-encoded sRGB colour (IEC 61966-2-1), components nominally
// in [0, 1]. Components outside that range mean the colour lies outside the
// sRGB gamut.
type RGB struct{ R, G, B float64 }

// LinearRGB is linear-light sRGB: the encoded components with the sRGB
// transfer function removed.
type LinearRGB struct{ R, G, B float64 }

// XYZ is CIE 1931 XYZ scaled so that the reference white has Y = 1.
type XYZ struct{ X, Y, Z float64 }

// Lab is CIELAB (CIE 15), L* in [0, 100].
type Lab struct{ L, A, B float64 }

// LCh is CIELAB in polar form: chroma C*ab and hue angle h in degrees [0, 360).
type LCh struct{ L, C, H float64 }

// OKLab is Ottosson's (2020) perceptual space, L in [0, 1].
type OKLab struct{ L, A, B float64 }

// OKLCh is OKLab in polar form, hue in degrees [0, 360).
type OKLCh struct{ L, C, H float64 }

// Color is one colour, held as OKLab coordinates because that is the space
// the era palette interpolates in. The zero value is black. Color is a
// plain comparable value; it may lie outside the sRGB gamut.
type Color struct{ ok OKLab }

// The D65 white of CIELAB here is the XYZ of sRGB white (1,1,1) under the
// sRGB matrix, i.e. CIE x,y = 0.3127, 0.3290 (CSS Color 4). Using the
// matrix's own white keeps neutral greys at a* = b* = 0 exactly;
// go-colorful's ASTM white (0.95047, 1, 1.08883) would put b* of sRGB white
// at about -0.014.
var (
	whiteD65 = XYZ{0.3127 / 0.3290, 1, (1 - 0.3127 - 0.3290) / 0.3290}
	whiteD50 = XYZ{0.3457 / 0.3585, 1, (1 - 0.3457 - 0.3585) / 0.3585}
)

// bradfordD65toD50 is the chromatic adaptation matrix of CSS Color 4's
// sample code (Bradford, D65 → D50).
var bradfordD65toD50 = [3][3]float64{
	{1.0479297925449969, 0.022946870601609652, -0.05019226628920524},
	{0.02962780877005599, 0.9904344267538799, -0.017073799063418826},
	{-0.009243040646204504, 0.015055191490298152, 0.7518742814281371},
}

// CIE constants as exact rationals (CIE 15; CSS Color 4): ε = (6/29)³, κ = (29/3)³.
const (
	labEpsilon = 216.0 / 24389.0
	labKappa   = 24389.0 / 27.0
)

// ParseHex reads "#rrggbb" or "#rgb" (the leading # is optional).
func ParseHex(s string) (Color, error) {
	rgb, err := parseHexRGB(s)
	if err != nil {
		return Color{}, err
	}
	return FromRGB(rgb), nil
}

func parseHexRGB(s string) (RGB, error) {
	h := strings.TrimPrefix(strings.TrimSpace(s), "#")
	var digits [3]string
	switch len(h) {
	case 3:
		digits = [3]string{h[0:1] + h[0:1], h[1:2] + h[1:2], h[2:3] + h[2:3]}
	case 6:
		digits = [3]string{h[0:2], h[2:4], h[4:6]}
	default:
		return RGB{}, fmt.Errorf("palette: colour %q: want #rrggbb or #rgb", s)
	}
	var v [3]float64
	for i, d := range digits {
		n, err := strconv.ParseUint(d, 16, 8)
		if err != nil {
			return RGB{}, fmt.Errorf("palette: colour %q: %q is not a hex byte", s, d)
		}
		v[i] = float64(n) / 255
	}
	return RGB{v[0], v[1], v[2]}, nil
}

// FromRGB makes a Color from encoded sRGB.
func FromRGB(c RGB) Color { return Color{c.Linear().OKLab()} }

// FromXYZ makes a Color from D65 XYZ.
func FromXYZ(c XYZ) Color { return Color{c.LinearRGB().OKLab()} }

// FromLab makes a Color from CIELAB (D65).
func FromLab(c Lab) Color { return FromXYZ(c.XYZ()) }

// FromOKLab makes a Color from OKLab coordinates.
func FromOKLab(c OKLab) Color { return Color{c} }

// FromOKLCh makes a Color from OKLCh coordinates (hue in degrees).
func FromOKLCh(c OKLCh) Color { return Color{c.OKLab()} }

// OKLab returns the OKLab coordinates.
func (c Color) OKLab() OKLab { return c.ok }

// OKLCh returns the OKLCh coordinates.
func (c Color) OKLCh() OKLCh { return c.ok.OKLCh() }

// XYZ returns D65 XYZ.
func (c Color) XYZ() XYZ { return c.ok.LinearRGB().XYZ() }

// Lab returns CIELAB relative to D65.
func (c Color) Lab() Lab { return c.XYZ().Lab() }

// LCh returns CIELAB LCh(ab) relative to D65.
func (c Color) LCh() LCh { return c.Lab().LCh() }

// LabD50 returns CIELAB relative to D50, after Bradford adaptation from D65
// (the convention of ICC profiles and CSS Color 4's lab()).
func (c Color) LabD50() Lab { return c.XYZ().adaptD50().labWhite(whiteD50) }

// RGB returns encoded sRGB, unclipped: out-of-gamut colours have components
// outside [0, 1].
func (c Color) RGB() RGB { return c.ok.LinearRGB().RGB() }

// InGamut reports whether the colour lies inside the sRGB gamut, allowing
// half a step of 16-bit precision for rounding.
func (c Color) InGamut() bool {
	const tol = 0.5 / 65535
	r := c.RGB()
	for _, v := range [3]float64{r.R, r.G, r.B} {
		if !(v >= -tol && v <= 1+tol) {
			return false
		}
	}
	return true
}

// Clip returns the colour with its sRGB components clamped to [0, 1].
// Clamping is what a renderer does with an out-of-gamut colour anyway;
// Check reports how far that moves the colour.
func (c Color) Clip() Color { return FromRGB(c.RGB().Clip()) }

// Hex formats the clipped sRGB colour as "#rrggbb".
func (c Color) Hex() string { return c.RGB().Hex() }

// String returns Hex.
func (c Color) String() string { return c.Hex() }

// Linear removes the sRGB transfer function (IEC 61966-2-1).
func (c RGB) Linear() LinearRGB {
	r, g, b := colorful.Color{R: c.R, G: c.G, B: c.B}.LinearRgb()
	return LinearRGB{r, g, b}
}

// Clip clamps each component to [0, 1]; NaN becomes 0.
func (c RGB) Clip() RGB { return RGB{clamp01(c.R), clamp01(c.G), clamp01(c.B)} }

// Hex formats the clipped colour as "#rrggbb".
func (c RGB) Hex() string {
	k := c.Clip()
	return fmt.Sprintf("#%02x%02x%02x", to8(k.R), to8(k.G), to8(k.B))
}

// RGB8 returns the clipped colour as 8-bit components.
func (c RGB) RGB8() (r, g, b uint8) {
	k := c.Clip()
	return to8(k.R), to8(k.G), to8(k.B)
}

func to8(v float64) uint8 { return uint8(math.Round(v * 255)) }

func clamp01(v float64) float64 {
	if !(v > 0) { // also catches NaN
		return 0
	}
	return math.Min(v, 1)
}

// RGB applies the sRGB transfer function.
func (c LinearRGB) RGB() RGB {
	k := colorful.LinearRgb(c.R, c.G, c.B)
	return RGB{k.R, k.G, k.B}
}

// XYZ converts with the sRGB primaries and D65 white.
func (c LinearRGB) XYZ() XYZ {
	x, y, z := colorful.LinearRgbToXyz(c.R, c.G, c.B)
	return XYZ{x, y, z}
}

// LinearRGB converts D65 XYZ to linear sRGB.
func (c XYZ) LinearRGB() LinearRGB {
	r, g, b := colorful.XyzToLinearRgb(c.X, c.Y, c.Z)
	return LinearRGB{r, g, b}
}

// Lab converts D65 XYZ to CIELAB with the D65 white.
func (c XYZ) Lab() Lab { return c.labWhite(whiteD65) }

func (c XYZ) labWhite(w XYZ) Lab {
	fx, fy, fz := labF(c.X/w.X), labF(c.Y/w.Y), labF(c.Z/w.Z)
	return Lab{116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)}
}

func (c XYZ) adaptD50() XYZ {
	m := bradfordD65toD50
	return XYZ{
		m[0][0]*c.X + m[0][1]*c.Y + m[0][2]*c.Z,
		m[1][0]*c.X + m[1][1]*c.Y + m[1][2]*c.Z,
		m[2][0]*c.X + m[2][1]*c.Y + m[2][2]*c.Z,
	}
}

func labF(t float64) float64 {
	if t > labEpsilon {
		return math.Cbrt(t)
	}
	return (labKappa*t + 16) / 116
}

func labFInv(f float64) float64 {
	if f3 := f * f * f; f3 > labEpsilon {
		return f3
	}
	return (116*f - 16) / labKappa
}

// XYZ converts CIELAB (D65) back to XYZ.
func (c Lab) XYZ() XYZ {
	fy := (c.L + 16) / 116
	fx := fy + c.A/500
	fz := fy - c.B/200
	w := whiteD65
	return XYZ{w.X * labFInv(fx), w.Y * labFInv(fy), w.Z * labFInv(fz)}
}

// LCh returns the polar form.
func (c Lab) LCh() LCh {
	ch, h := polar(c.A, c.B)
	return LCh{c.L, ch, h}
}

// OKLCh returns the polar form.
func (c OKLab) OKLCh() OKLCh {
	ch, h := polar(c.A, c.B)
	return OKLCh{c.L, ch, h}
}

// OKLab returns the Cartesian form.
func (c OKLCh) OKLab() OKLab {
	s, co := math.Sincos(c.H * math.Pi / 180)
	return OKLab{c.L, c.C * co, c.C * s}
}

// polar returns chroma and hue in degrees [0, 360).
func polar(a, b float64) (c, h float64) {
	c = math.Hypot(a, b)
	h = math.Atan2(b, a) * 180 / math.Pi
	if h < 0 {
		h += 360
	}
	return c, h
}
