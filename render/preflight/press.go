package preflight

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"sheaf/palette"
	"sheaf/specs"
)

// Ids of the press findings.
const (
	IDRGB          = "rgb-output"    // a print output with no printing condition
	IDInkLimit     = "ink-limit"     // a converted colour over the press's total ink
	IDPressGamut   = "press-gamut"   // a year's colour moves visibly on press
	IDPressPalette = "press-palette" // the palette checks, redone on the press's colours
)

// press checks a print output against its printing condition: each year's
// colour as the press prints it (total ink, shift from the intended colour)
// and the palette's checks on the printed colours. Without a condition it
// says the file is RGB.
func (c *checker) press() {
	if c.in.Output.Kind != specs.Print {
		return
	}
	cond := c.in.Press
	if cond == nil {
		c.add(Finding{ID: IDRGB, Severity: Info, At: c.in.Spec.Where("outputs." + c.out).String(),
			Message: "RGB file with no printing condition; the printer converts it; give press.profile for a CMYK PDF/X-4"})
		return
	}
	if c.in.Scale == nil {
		return
	}
	p := c.in.Output.Press
	at := c.in.Spec.Where(c.path("press")).String()
	limit, maxShift := cond.InkLimit, float64(specs.DefaultMaxShift)
	if p != nil {
		maxShift = p.MaxShift
	}
	span := c.in.Data.Span
	var over, shifted []int
	worstInk, worstInkYear, worstShift, worstShiftYear := 0.0, 0, 0.0, 0
	var anchors []palette.Anchor
	for y := span.From; y <= span.To; y++ {
		rgb := c.in.Scale.At(float64(y)).RGB()
		ink, _ := cond.Ink(rgb)
		if t := pressTotal(ink); t > limit+0.05 {
			over = append(over, y)
			if t > worstInk {
				worstInk, worstInkYear = t, y
			}
		}
		if d := cond.Shift(rgb); d > maxShift {
			shifted = append(shifted, y)
			if d > worstShift {
				worstShift, worstShiftYear = d, y
			}
		}
		anchors = append(anchors, palette.Anchor{Year: float64(y), Color: palette.FromRGB(cond.Proof(ink))})
	}
	if len(over) > 0 {
		c.add(Finding{ID: IDInkLimit, Severity: Warning, Year: worstInkYear, At: at,
			Message: fmt.Sprintf("%s print with more than the %.0f%% ink limit (up to %.0f%% in %d); the press may not dry or hold them — ask the printer, or darken less",
				yearRanges(over), limit, worstInk, worstInkYear)})
	}
	if len(shifted) > 0 {
		c.add(Finding{ID: IDPressGamut, Severity: Warning, Year: worstShiftYear, At: at,
			Message: fmt.Sprintf("%s move more than ΔE00 %g on press (up to %.1f in %d): the press cannot print those colours; check a proof or choose colours the press holds",
				yearRanges(shifted), maxShift, worstShift, worstShiftYear)})
	}
	c.pressPalette(anchors, at)
}

// pressPalette runs the palette's own checks (steps, span, contrast,
// colour-vision simulation) on the colours as printed.
func (c *checker) pressPalette(anchors []palette.Anchor, at string) {
	r := c.in.Palette
	if r == nil || len(anchors) < 2 {
		return
	}
	s, err := palette.NewScale(c.in.Scale.Name()+" on press", anchors, nil)
	if err != nil {
		return
	}
	if c.in.Scale.Discrete() {
		var bounds []float64
		for _, e := range c.in.Scale.Eras()[1:] {
			bounds = append(bounds, e.From)
		}
		if s2, err := palette.NewScale(s.Name(), anchors, bounds); err == nil {
			s = s2
		}
	}
	rep, err := palette.Check(s, r.Paper, r.LineWidthPt, r.Medium, r.Thresholds)
	if err != nil {
		return
	}
	for _, f := range rep.Findings {
		if f.Severity == palette.Info {
			continue
		}
		year := 0
		if !math.IsNaN(f.Year) && f.Label != "" {
			year = int(math.Round(f.Year))
		}
		c.add(Finding{ID: IDPressPalette, Severity: Warning, Year: year, At: at, Message: "on press, " + f.Check + ": " + f.Message})
	}
}

func pressTotal(ink []float64) float64 {
	t := 0.0
	for _, v := range ink {
		t += v
	}
	return 100 * t
}

// yearRanges writes years compactly: "1868–1871, 1903, 1990–2025".
func yearRanges(ys []int) string {
	var parts []string
	for i := 0; i < len(ys); {
		j := i
		for j+1 < len(ys) && ys[j+1] == ys[j]+1 {
			j++
		}
		if j > i {
			parts = append(parts, strconv.Itoa(ys[i])+"–"+strconv.Itoa(ys[j]))
		} else {
			parts = append(parts, strconv.Itoa(ys[i]))
		}
		i = j + 1
	}
	what := "year "
	if len(ys) > 1 {
		what = "years "
	}
	return what + strings.Join(parts, ", ")
}
