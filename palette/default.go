package palette

import "fmt"

// DefaultName is the name of the built-in era palette.
const DefaultName = "Tidewater"

// tidewater is the built-in palette: each anchor's place along the span
// (0 = first year, 1 = last) and its OKLCh colour.
//
// Design, all in OKLCh: a curve through four key colours, with hue turning
// steadily one way (decreasing, 237° in all) and lightness falling
// linearly between them —
//
//	coral      L 0.665  C 0.17  h  22°   (oldest)
//	violet     L 0.51   C 0.18  h 292°
//	steel teal L 0.43   C 0.12  h 225°
//	deep green L 0.31   C 0.11  h 145°   (newest)
//
// with chroma capped at 92% of the sRGB gamut boundary (dark teals cannot
// be more colourful than that), sampled at 13 evenly spaced points, each
// then placed at its share of the curve's CIEDE2000 arc length so that
// equal spans of years look equally different.
//
// Why this shape: the oldest years are the lightest, as if faded, and the
// newest the darkest and strongest, so recent data read first. CIELAB L*
// runs 58.8 → 21.0, so even the lightest colour keeps a WCAG contrast of
// 3.3:1 on white paper (SC 1.4.11 asks 3:1 for graphics); hue carries the
// rest of the distance (first to last ΔE00 ≈ 64, arc ≈ 106). The path
// avoids yellows and browns, which vanish or muddy as thin lines on white.
// Every decade of a span up to about 180 years differs by ΔE00 ≥ 5; for
// longer spans prefer eras or a lower Thresholds.MinStep.
var tidewater = [...]struct {
	at    float64
	color OKLCh
}{
	{0.0000, OKLCh{0.6650, 0.1700, 22.00}},  // #e96163 coral
	{0.1123, OKLCh{0.6342, 0.1720, 4.14}},   // #db547e
	{0.2056, OKLCh{0.6035, 0.1740, 346.29}}, // #c74d96
	{0.2868, OKLCh{0.5727, 0.1760, 328.43}}, // #ad4aab
	{0.3604, OKLCh{0.5420, 0.1779, 310.57}}, // #8f49ba
	{0.4278, OKLCh{0.5112, 0.1799, 292.71}}, // #6d49c2 violet
	{0.5006, OKLCh{0.4887, 0.1640, 274.13}}, // #4752bb
	{0.5826, OKLCh{0.4664, 0.1440, 255.52}}, // #1258a8
	{0.6635, OKLCh{0.4442, 0.0891, 236.91}}, // #125a7e
	{0.7491, OKLCh{0.4171, 0.0683, 216.43}}, // #105564 steel teal
	{0.8303, OKLCh{0.3814, 0.0602, 192.62}}, // #0d4d4b
	{0.9033, OKLCh{0.3457, 0.0638, 168.81}}, // #0a4433
	{1.0000, OKLCh{0.3100, 0.0897, 145.00}}, // #073b0f deep green
}

// DefaultAnchors places the Tidewater anchors proportionally across the
// years from to to. It does not check the years; NewScale does.
func DefaultAnchors(from, to float64) []Anchor {
	out := make([]Anchor, len(tidewater))
	for i, a := range tidewater {
		out[i] = Anchor{Year: from + a.at*(to-from), Color: FromOKLCh(a.color)}
	}
	// Pin the ends exactly: from + 1·(to-from) can miss to by an ulp.
	out[0].Year, out[len(out)-1].Year = from, to
	return out
}

// Default returns the continuous Tidewater scale over the years from to
// to (from < to, both finite).
func Default(from, to float64) (Scale, error) {
	if !finite(from) || !finite(to) || !(from < to) {
		return Scale{}, fmt.Errorf("palette %s: span %v–%v: need finite years, first before last", DefaultName, from, to)
	}
	return NewScale(DefaultName, DefaultAnchors(from, to), nil)
}
