// Package palette holds sheaf's colour science: the era palette that
// encodes time along every line, and the checks that prove it readable.
//
// # Colour spaces
//
// Colours convert between encoded sRGB (IEC 61966-2-1), linear sRGB, CIE
// XYZ (D65), CIELAB and LCh(ab) (D65; D50 via the Bradford matrix of CSS
// Color 4), and OKLab/OKLCh (Ottosson 2020). A Color holds OKLab
// coordinates, the space the palette is built in.
//
// From github.com/lucasb-eyer/go-colorful we use the sRGB transfer
// function and the sRGB↔XYZ matrices, which match the IEC 61966-2-1 and
// CSS Color 4 values (tested). We write our own where go-colorful is
// missing or off for our needs:
//   - CIELAB: go-colorful's D65 white (0.95047, 1, 1.08883) is not the
//     white of its own sRGB matrix, so sRGB white gets b* ≈ -0.014; ours
//     uses the matrix's white (CIE x,y 0.3127, 0.3290), neutrals stay
//     neutral. It also scales L* to 0–1; ours is 0–100.
//   - OKLab: go-colorful converts through XYZ with Ottosson's first M1
//     matrix and round-trips white to blue = 1.00035; ours uses his
//     higher-precision linear-sRGB constants (2021-01-25).
//   - CIEDE2000: go-colorful's takes sRGB colours, not Lab values.
//   - D50 adaptation, WCAG 2.1 luminance and contrast, and the Machado,
//     Oliveira & Fernandes (2009) deficiency simulation are not in it.
//
// # Era palette
//
// A Scale runs through Anchors (year, colour). Between anchors it
// interpolates on straight lines in OKLab: OKLab is built so that equal
// distances look about equally different and so that hue holds along a
// line of constant hue angle; in CIELAB a mix toward blue bends toward
// purple, and equal steps in L* look unequal across hues. Cartesian OKLab
// (rather than OKLCh) also leaves no choice of which way round the hue
// circle to turn: the anchors decide. A Scale may instead be cut into
// discrete eras, each coloured at its mid-year. Stops turns a scale into
// gradient stops a PDF or SVG renderer can draw.
//
// Default gives the built-in palette, Tidewater: coral through violet and
// steel teal to deep green, lightest in the oldest years. It is our own
// design (see default.go for the anchors and the reasons).
//
// # Checks
//
// Check measures a scale as drawn (clipped to sRGB) against Thresholds:
// monotone lightness, adjacent steps (ΔE00 ≥ 5, a heuristic), whole span
// (ΔE00 ≥ 30), WCAG 2.1 contrast against the paper (≥ 3:1, SC 1.4.11),
// sRGB gamut, order under simulated protanopia, deuteranopia and
// tritanopia, and, as guidance, the size-dependent noticeable difference
// of Stone, Szafir & Setlur (2014) for the line width at its viewing
// distance. Report.WriteTable prints the result for people.
package palette
