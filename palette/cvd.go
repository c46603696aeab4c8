package palette

import "fmt"

// Deficiency names a colour-vision deficiency simulated at full severity
// (dichromacy).
type Deficiency int

const (
	Protanopia   Deficiency = iota // missing L cones ("red-blind")
	Deuteranopia                   // missing M cones ("green-blind")
	Tritanopia                     // missing S cones ("blue-blind")
)

// Deficiencies lists every Deficiency in display order.
func Deficiencies() [3]Deficiency { return [3]Deficiency{Protanopia, Deuteranopia, Tritanopia} }

func (d Deficiency) String() string {
	switch d {
	case Protanopia:
		return "protanopia"
	case Deuteranopia:
		return "deuteranopia"
	case Tritanopia:
		return "tritanopia"
	}
	return fmt.Sprintf("Deficiency(%d)", int(d))
}

// machado holds the severity-1.0 matrices of Machado, Oliveira & Fernandes
// (2009), IEEE TVCG 15(6), authors' pre-computed table; they act on linear
// sRGB. Tests compare them with testdata/machado2009_cvd_matrices.tsv.
var machado = [3][3][3]float64{
	Protanopia: {
		{0.152286, 1.052583, -0.204868},
		{0.114503, 0.786281, 0.099216},
		{-0.003882, -0.048116, 1.051998},
	},
	Deuteranopia: {
		{0.367322, 0.860646, -0.227968},
		{0.280085, 0.672501, 0.047413},
		{-0.011820, 0.042940, 0.968881},
	},
	Tritanopia: {
		{1.255528, -0.076749, -0.178779},
		{-0.078411, 0.930809, 0.147602},
		{0.004733, 0.691367, 0.303900},
	},
}

// Simulate returns how c appears under deficiency d (Machado et al. 2009,
// severity 1.0). The colour is clipped to sRGB first and the result clipped
// again, as a display would show it. An unknown d returns c clipped.
func Simulate(c Color, d Deficiency) Color {
	lin := c.RGB().Clip().Linear()
	if d < 0 || int(d) >= len(machado) {
		return FromRGB(lin.RGB())
	}
	m := machado[d]
	out := LinearRGB{
		m[0][0]*lin.R + m[0][1]*lin.G + m[0][2]*lin.B,
		m[1][0]*lin.R + m[1][1]*lin.G + m[1][2]*lin.B,
		m[2][0]*lin.R + m[2][1]*lin.G + m[2][2]*lin.B,
	}
	return FromRGB(out.RGB().Clip())
}
