package palette

import "fmt"

// DefaultName is the name of the built-in era palette.
const DefaultName = "Daybreak"

// DefaultMaxSpan20 is the longest span, in years, over which the built-in
// palette keeps any two colours 20 years apart at least ΔE00 10 apart
// (the palette is spread over the whole span, so a longer span puts more
// years on the same colours). Tested in default_test.go.
const DefaultMaxSpan20 = 170

// defaultKeys is the design of the built-in palette, in OKLCh: key
// colours at places t along the curve (0 = first year, 1 = last), with
// lightness rising linearly from the first key to the last, hue turning
// steadily one way between keys (the h values are unwrapped: -167 is
// 193°), and chroma linear between keys but capped at 92% of the sRGB
// gamut boundary —
//
//	deep red   L 0.465  C 0.12   h  23°   (oldest, darkest)
//	crimson           C 0.21   h   8°
//	magenta           C 0.13   h 321°
//	violet            C 0.095  h 309°
//	sea blue   L 0.64   C 0.14   h 193°   (newest, lightest)
//
// The curve is sampled at 13 evenly spaced points, each then placed at its
// share of the curve's CIEDE2000 arc length so that equal spans of years
// look equally different (defaultTable; TestDefaultTableFollowsDesign
// rebuilds it from these keys).
//
// Why this shape (issue 12): thin lines (0.75 pt) must stay coloured and
// survive press. So no year is darker than CIELAB L* 36 or greyer than
// C* 31, and none lighter than L* 60 (WCAG 3.2:1 on white, SC 1.4.11's 3:1
// with a margin); in that narrow lightness band (L* 36 → 60, rising, so
// the newest years are the lightest) hue has to carry most of the
// difference, turning from deep red through crimson, magenta, violet and
// blue to a light sea blue. It skips the oranges, browns and yellows
// (CIELAB h 30°–110°), which muddy or vanish as thin lines, and keeps
// chroma inside what Ghostscript's generic coated CMYK profile
// (default_cmyk.icc) can print. The keys were found by a numeric search
// over these constraints, maximising the smallest ΔE00 between colours
// 20 years apart over 1868–2025 (palette/internal/designsearch; README,
// "The built-in palette").
var defaultKeys = []struct{ t, l, c, h float64 }{
	{0, 0.465, 0.12, 23},
	{0.38, 0.465 + 0.38*(0.64-0.465), 0.21, 8},
	{0.65, 0.465 + 0.65*(0.64-0.465), 0.13, -39},
	{0.72, 0.465 + 0.72*(0.64-0.465), 0.095, -51},
	{1, 0.64, 0.14, -167},
}

// defaultTable is the built-in palette: each anchor's place along the
// span (0 = first year, 1 = last) and its OKLCh colour, from defaultKeys.
var defaultTable = [...]struct {
	at    float64
	color OKLCh
}{
	{0.0000, OKLCh{0.4650, 0.1200, 23.00}},  // #913838
	{0.0328, OKLCh{0.4796, 0.1397, 19.71}},  // #9d333c
	{0.0652, OKLCh{0.4942, 0.1595, 16.42}},  // #a92d41
	{0.0974, OKLCh{0.5088, 0.1792, 13.13}},  // #b52447
	{0.1275, OKLCh{0.5233, 0.1926, 9.84}},   // #be1e50
	{0.1875, OKLCh{0.5379, 0.1991, 1.62}},   // #c22066
	{0.2766, OKLCh{0.5525, 0.1744, 347.11}}, // #b63c85
	{0.3500, OKLCh{0.5671, 0.1498, 332.60}}, // #a8509c
	{0.4188, OKLCh{0.5817, 0.1217, 318.14}}, // #9962a9
	{0.5085, OKLCh{0.5962, 0.0998, 296.57}}, // #8572b4
	{0.6622, OKLCh{0.6108, 0.1132, 262.05}}, // #5d82c7
	{0.8234, OKLCh{0.6254, 0.1117, 227.52}}, // #2494bc
	{1.0000, OKLCh{0.6400, 0.1008, 193.00}}, // #269f9d
}

// DefaultAnchors places the built-in anchors proportionally across the
// years from to to. It does not check the years; NewScale does.
func DefaultAnchors(from, to float64) []Anchor {
	out := make([]Anchor, len(defaultTable))
	for i, a := range defaultTable {
		out[i] = Anchor{Year: from + a.at*(to-from), Color: FromOKLCh(a.color)}
	}
	// Pin the ends exactly: from + 1·(to-from) can miss to by an ulp.
	out[0].Year, out[len(out)-1].Year = from, to
	return out
}

// Default returns the continuous built-in scale over the years from to
// to (from < to, both finite).
func Default(from, to float64) (Scale, error) {
	if !finite(from) || !finite(to) || !(from < to) {
		return Scale{}, fmt.Errorf("palette %s: span %v–%v: need finite years, first before last", DefaultName, from, to)
	}
	return NewScale(DefaultName, DefaultAnchors(from, to), nil)
}
