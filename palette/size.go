package palette

import (
	"fmt"
	"math"

	"sheaf/specs"
)

// Medium says how a chart is looked at, which sets the viewing distance
// for visual angles.
type Medium int

const (
	// Print is a page held at a reading distance of 35 cm (common practice).
	Print Medium = iota
	// Screen is a display seen at the CSS reference distance: 1 px =
	// 1/96 in at 28 in (CSS Values 4, "reference pixel", ≈ 0.0213°).
	Screen
)

func (m Medium) String() string {
	switch m {
	case Print:
		return "print"
	case Screen:
		return "screen"
	}
	return fmt.Sprintf("Medium(%d)", int(m))
}

// ViewingDistanceMM is the eye-to-mark distance assumed for m, in mm:
// 350 for Print, 28 in = 711.2 for Screen. An unknown medium gives 0.
func ViewingDistanceMM(m Medium) float64 {
	switch m {
	case Print:
		return 350
	case Screen:
		return 28 * 25.4
	}
	return 0
}

// VisualAngle is the angle in degrees that a mark widthPt points wide
// subtends in medium m. On screen a CSS point is 4/3 CSS px, each px
// subtending the reference pixel's angle.
func VisualAngle(widthPt float64, m Medium) float64 {
	d := ViewingDistanceMM(m)
	if d == 0 {
		return math.NaN()
	}
	w := widthPt * specs.MmPerPt
	return 2 * math.Atan(w/(2*d)) * 180 / math.Pi
}

// Stone, Szafir & Setlur (2014) fitted ND(p, s) = p·(A + B/s) per CIELAB
// axis for marks of visual angle s from 1/3° to 6°. A and B as given by two
// independent public implementations citing the paper (the paper's text
// was not available to us): see testdata/stone2014_jnd_guidance.csv.
var (
	stoneA = Lab{10.16, 10.68, 10.70}
	stoneB = Lab{1.50, 3.08, 5.74}
)

// Range of mark sizes, in degrees, the Stone et al. (2014) model was fitted on.
const (
	StoneMinAngle = 1.0 / 3
	StoneMaxAngle = 6.0
)

// NoticeableDifference returns, per CIELAB axis, the difference that a
// fraction p of viewers notice between two marks of visual angle
// angleDeg (Stone, Szafir & Setlur 2014). Outside 1/3°–6° the model is
// extrapolated; treat the numbers as guidance.
func NoticeableDifference(p, angleDeg float64) Lab {
	return Lab{
		p * (stoneA.L + stoneB.L/angleDeg),
		p * (stoneA.A + stoneB.A/angleDeg),
		p * (stoneA.B + stoneB.B/angleDeg),
	}
}

// Noticeable reports whether x and y differ by at least nd on some CIELAB
// axis, the per-axis reading of the Stone et al. model.
func Noticeable(x, y, nd Lab) bool {
	return math.Abs(x.L-y.L) >= nd.L || math.Abs(x.A-y.A) >= nd.A || math.Abs(x.B-y.B) >= nd.B
}
