package page

import (
	"strconv"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/specs"
)

// key draws the colour key on every page: the era palette as a strip
// with year labels, so a reader never has to turn back to decode colour,
// and a note on what the panels' heights mean.
func (f *Feature) key(p pen, pg *layout.Page) {
	r, strip, ticks := pg.Key, pg.KeyStrip, pg.KeyTicks
	if r.H() <= 0 || strip.W() <= 0 {
		return
	}
	size := f.Output.Type.Key.Pt()
	caption := "Colour shows the year"
	capW := f.Fonts.Width(fonts.Bold, size, caption)
	x0 := strip.X0 + capW + size*0.8
	x1 := strip.X1
	if x1-x0 < strip.W()/2 { // a narrow page: caption above the strip instead
		x0 = strip.X0
	}
	mid := (strip.Y0 + strip.Y1) / 2
	m := f.Fonts.Metrics(fonts.Bold, size)
	capBase := mid - (m.CapHeight)/2
	if x0 == strip.X0 {
		capBase = strip.Y1 + m.Descent + size*0.2
	}
	p.text(fonts.Bold, size, ink, strip.X0, capBase, canvas.Left, caption)
	p.fillRect(x0, strip.Y0, x1, strip.Y1, nil, f.gradient(p, x0, x1, strip.Y1))

	tsize := f.Output.Type.Ticks.Pt()
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	tick := tsize * 0.3
	base := ticks.Y1 - tick - f.Fonts.Metrics(fonts.Regular, tsize).Ascent - tsize*0.1
	years := f.tickYears(x1-x0, tsize)
	for _, y := range years {
		x := x0 + (float64(y)-from)/(to-from)*(x1-x0)
		p.line(x, strip.Y0, x, strip.Y0-tick, f.Rule(), ruleGrey)
		p.text(fonts.Regular, tsize, inkSoft, x, base, canvas.Center, strconv.Itoa(y))
	}
	// What the height means, right-aligned in the band, level with the strip.
	p.text(fonts.Regular, size, inkSoft, r.X1, mid-m.CapHeight/2, canvas.Right, f.scaleNote())
}

// scaleNote says what a panel's height means.
func (f *Feature) scaleNote() string {
	s := f.Spec.Scale
	switch {
	case s.Mode == specs.ScaleOwnPeak:
		return "Each line is scaled to its own peak year (dot)"
	case s.YRange == specs.YShared:
		return "Panel height: 0 to " + formatValue(f.Data.YMax) + " " + f.Data.Unit + ", the same on every panel"
	default:
		return "Each panel runs from 0 to its own peak (" + f.Data.Unit + ", value beside the peak year)"
	}
}
