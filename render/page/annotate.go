package page

import (
	"math"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/render/curve"
	"sheaf/render/draw"
	"sheaf/specs/series"
)

// The editor's layer on the page: annotations pinned to a term and years,
// highlighted terms, labelled periods on the key and behind the plots, the
// baseline that shows absence (runs of zeros, gap years).

// Tints of the one ink behind a plot (see draw).
var (
	bandTint      = draw.BandTint
	highlightTint = draw.HighlightTint
	bandOnTint    = draw.BandOnTint
)

// Note is where an annotation landed on one panel (draw.Note).
type Note = draw.Note

// noteStyle is how this output sets annotations: in the tick labels' size.
func (f *Feature) noteStyle() draw.NoteStyle {
	return draw.NoteStyle{Fonts: f.Fonts, Size: f.Output.Type.Ticks.Pt(), Leading: f.leading(), Rule: f.Rule(), Line: f.Output.Line.Pt()}
}

// NoteRoom is the widest an annotation's text may be in this output: the
// plot's width less the clear space on both sides.
func (f *Feature) NoteRoom() float64 {
	if f.Plan == nil {
		return 0
	}
	return f.Plan.PanelW - 2*f.noteStyle().Pad() - f.peakInset()*2
}

// NoteWidth is the width of an annotation's text.
func (f *Feature) NoteWidth(text string) float64 { return f.noteStyle().Width(text) }

// Notes places every annotation on every panel of every page that shows
// its term, in page order.
func (f *Feature) Notes() []Note {
	if len(f.Spec.Annotations) == 0 || f.Plan == nil {
		return nil
	}
	var all []Note
	for i := range f.Plan.Pages {
		for _, pn := range f.Plan.Pages[i].Panels {
			ns := f.placeNotes(pn)
			for k := range ns {
				ns[k].Page = i + 1
			}
			all = append(all, ns...)
		}
	}
	return all
}

// placeNotes places the annotations of a panel's term (draw.PlaceNotes):
// clear of the curve as drawn and of the peak dot, inside the plot.
func (f *Feature) placeNotes(pn layout.Panel) []Note {
	sr := &f.Data.Series[pn.Item]
	var idx []int
	for i, a := range f.Spec.Annotations {
		if a.Term == sr.Term {
			idx = append(idx, i)
		}
	}
	if len(idx) == 0 {
		return nil
	}
	m, err := f.PlotMap(pn)
	if err != nil {
		return nil
	}
	p := draw.NotePlot{Plot: pn.Plot, Map: m, Years: f.Data.Years, Terms: []string{sr.Term}, Lines: [][]float64{f.plotted(sr)}}
	if f.Output.PeakDot && sr.Peak > 0 {
		pk := m.Apply(float64(sr.PeakYear), sr.Peak)
		p.Dots = []draw.Dot{{X: pk.X, Y: pk.Y, R: f.peakRadius() + f.Rule()}}
	}
	ns := draw.PlaceNotes(f.noteStyle(), p, f.Spec.Annotations, idx)
	for k := range ns {
		ns[k].Item = pn.Item
	}
	return ns
}

// drawNotes draws a panel's annotations: marks, leaders, texts.
func (f *Feature) drawNotes(p pen, pn layout.Panel) {
	draw.Pen{Ctx: p.ctx, Fonts: f.Fonts}.Notes(f.noteStyle(), f.placeNotes(pn))
}

// Overlaps reports whether two rectangles share area.
func Overlaps(a, b layout.Rect) bool { return draw.Overlaps(a, b) }

// Highlighted reports whether the spec highlights a term.
func (f *Feature) Highlighted(term string) bool { return f.Spec.Highlighted(term) }

// underPlot draws what lies behind a panel's plot: a highlighted term's
// tint and rule, the periods' bands.
func (f *Feature) underPlot(p pen, pn layout.Panel, m curve.Map) {
	sr := &f.Data.Series[pn.Item]
	hi := f.Highlighted(sr.Term)
	pr := pn.Plot
	if hi {
		p.fillRect(pr.X0, pr.Y0, pr.X1, pr.Y1, highlightTint, nil)
		// A rule over the label marks the panel at a glance, also in grey.
		// It stands on the label's first line, not over an empty line of
		// the label band when the label did not wrap.
		y := f.LabelTop(pn, f.Labels()[pn.Item])
		p.line(pn.Label.X0, y, pn.Label.X1, y, draw.HighlightRule(f.Rule()), ink)
	}
	if !f.Spec.PeriodBands {
		return
	}
	tint := bandTint
	if hi {
		tint = bandOnTint
	}
	half := (m.X(1) - m.X(0)) / 2
	for _, pd := range f.Spec.Periods {
		x0 := math.Max(pr.X0, m.X(float64(pd.From))-half)
		x1 := math.Min(pr.X1, m.X(float64(pd.To))+half)
		p.fillRect(x0, pr.Y0, x1, pr.Y1, tint, nil)
	}
}

// baseline draws the zero line, broken at every gap year, so a year with
// no data reads the same on every panel whatever the line does there.
func (f *Feature) baseline(p pen, pn layout.Panel, m curve.Map) {
	pr := pn.Plot
	years := f.Data.Years
	half := (m.X(1) - m.X(0)) / 2
	x := pr.X0
	for i, v := range f.gapMask() {
		if !v {
			continue
		}
		gx0, gx1 := m.X(years[i])-half, m.X(years[i])+half
		if gx0 > x {
			p.line(x, pr.Y0, gx0, pr.Y0, f.Rule(), ruleGrey)
		}
		x = math.Max(x, gx1)
	}
	if x < pr.X1 {
		p.line(x, pr.Y0, pr.X1, pr.Y0, f.Rule(), ruleGrey)
	}
}

// gapMask marks the years of the span the data has no total for.
func (f *Feature) gapMask() []bool {
	mask := make([]bool, len(f.Data.Years))
	for _, g := range f.Data.Gaps {
		if i := g - f.Data.Span.From; i >= 0 && i < len(mask) {
			mask[i] = true
		}
	}
	return mask
}

// plotted is what the curve draws: the values, with every zero that has
// no non-zero neighbour left out, so a run of zeros is not drawn in the
// palette's colour as if it were data — it lies on the grey baseline, and
// reads as absence. The zeros next to a non-zero year stay, so the line
// still comes down to the baseline and rises from it.
func (f *Feature) plotted(sr *series.Series) []float64 {
	v := sr.Values
	out := make([]float64, len(v))
	nonzero := func(i int) bool { return i >= 0 && i < len(v) && !math.IsNaN(v[i]) && v[i] != 0 }
	for i, x := range v {
		out[i] = x
		if x == 0 && !nonzero(i-1) && !nonzero(i+1) {
			out[i] = math.NaN()
		}
	}
	return out
}

// periodsRow draws the labelled periods under the key's year labels: a
// bracket over each span and its label, centred, moved right where it
// would run into the one before and left out when it would leave the key.
func (f *Feature) periodsRow(p pen, key, ticks layout.Rect, x0, x1 float64) {
	if len(f.Spec.Periods) == 0 {
		return
	}
	size := f.Output.Type.Ticks.Pt()
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	xOf := func(y float64) float64 { return x0 + (y-from)/(to-from)*(x1-x0) }
	row := layout.PeriodRow(size, f.leading())
	base := ticks.Y0 + f.Fonts.Metrics(fonts.Regular, size).Descent + size*0.1
	top := ticks.Y0 + row - size*0.2
	last := math.Inf(-1)
	for _, pd := range f.Spec.Periods {
		a, b := xOf(float64(pd.From)), xOf(float64(pd.To))
		if b-a < 1 {
			a, b = a-0.5, b+0.5
		}
		p.line(a, top, b, top, f.Rule(), ink)
		p.line(a, top, a, top-size*0.3, f.Rule(), ink)
		p.line(b, top, b, top-size*0.3, f.Rule(), ink)
		label := pd.Label
		w := f.Fonts.Width(fonts.Regular, size, label)
		lx := math.Max((a+b)/2-w/2, last+size*0.6)
		if lx+w > key.X1 { // it would leave the key: left out (preflight cannot miss it: the key says so in check --json)
			continue
		}
		p.text(fonts.Regular, size, ink, lx, base, canvas.Left, label)
		last = lx + w
	}
}

// peakInset is how far the curve's first and last years stay inside the
// plot's sides, so a peak dot or a line's end dot there never leaves it.
func (f *Feature) peakInset() float64 {
	r := f.Output.Line.Pt() / 2
	if f.Output.PeakDot {
		r = math.Max(r, f.peakRadius()+f.Rule())
	}
	return r
}

// leading is the output's line height as a multiple of the type size.
func (f *Feature) leading() float64 {
	if l := f.Output.Type.Leading; l > 0 {
		return l
	}
	return 1.2
}
