package palette

import "math"

// OKLab by Ottosson (2020), using the constants of his linear-sRGB code
// (the 2021-01-25 higher-precision version). Ours, not go-colorful's:
// go-colorful goes through XYZ with the post's M1, which maps sRGB white to
// b ≈ -1.2e-4 and round-trips white to blue = 1.00035, out of gamut.
var (
	oklabFromLinear = [3][3]float64{ // linear sRGB → LMS
		{0.4122214708, 0.5363325363, 0.0514459929},
		{0.2119034982, 0.6806995451, 0.1073969566},
		{0.0883024619, 0.2817188376, 0.6299787005},
	}
	oklabM2 = [3][3]float64{ // cube-rooted LMS → OKLab
		{0.2104542553, 0.7936177850, -0.0040720468},
		{1.9779984951, -2.4285922050, 0.4505937099},
		{0.0259040371, 0.7827717662, -0.8086757660},
	}
	oklabM2Inv = [3][3]float64{ // OKLab → cube-rooted LMS
		{1, 0.3963377774, 0.2158037573},
		{1, -0.1055613458, -0.0638541728},
		{1, -0.0894841775, -1.2914855480},
	}
	oklabToLinear = [3][3]float64{ // LMS → linear sRGB
		{4.0767416621, -3.3077115913, 0.2309699292},
		{-1.2684380046, 2.6097574011, -0.3413193965},
		{-0.0041960863, -0.7034186147, 1.7076147010},
	}
)

func mul(m [3][3]float64, x, y, z float64) (float64, float64, float64) {
	return m[0][0]*x + m[0][1]*y + m[0][2]*z,
		m[1][0]*x + m[1][1]*y + m[1][2]*z,
		m[2][0]*x + m[2][1]*y + m[2][2]*z
}

// OKLab converts linear sRGB to OKLab.
func (c LinearRGB) OKLab() OKLab {
	l, m, s := mul(oklabFromLinear, c.R, c.G, c.B)
	L, a, b := mul(oklabM2, math.Cbrt(l), math.Cbrt(m), math.Cbrt(s))
	return OKLab{L, a, b}
}

// LinearRGB converts OKLab to linear sRGB (unclipped).
func (c OKLab) LinearRGB() LinearRGB {
	l, m, s := mul(oklabM2Inv, c.L, c.A, c.B)
	r, g, b := mul(oklabToLinear, l*l*l, m*m*m, s*s*s)
	return LinearRGB{r, g, b}
}
