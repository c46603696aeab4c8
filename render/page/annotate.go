package page

import (
	"image/color"
	"math"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/render/curve"
	"sheaf/specs"
	"sheaf/specs/series"
)

// The editor's layer on the page: annotations pinned to a term and years,
// highlighted terms, labelled periods on the key and behind the plots, the
// baseline that shows absence (runs of zeros, gap years).

// Tints of the one ink behind a plot (black at a few per cent, so they
// never misregister on press).
var (
	bandTint      = color.RGBA{0xf0, 0xf0, 0xf0, 0xff} // a period's band, 6 % ink
	highlightTint = color.RGBA{0xe9, 0xe9, 0xe9, 0xff} // a highlighted panel's plot, 9 % ink
	bandOnTint    = color.RGBA{0xdc, 0xdc, 0xdc, 0xff} // a period's band on a highlighted plot
)

// Note is where an annotation landed on one panel: its mark on the line,
// its text and the leader between them. Rectangles are [x0, y0, x1, y1]
// in points, y up, as the layout's.
type Note struct {
	Index    int             `json:"index"` // into the spec's annotations
	Term     string          `json:"term"`
	From     int             `json:"from"`
	To       int             `json:"to"`
	Text     string          `json:"text"`
	Page     int             `json:"page"` // 1-based; 0 on a panel drawn alone
	Item     int             `json:"item"`
	Placed   bool            `json:"placed"`
	Why      string          `json:"why,omitempty"` // why it could not be placed
	Mark     layout.Rect     `json:"mark"`
	Box      layout.Rect     `json:"box,omitzero"` // the text's box (ascent to descent)
	X        float64         `json:"x,omitempty"`  // the text's start
	Baseline float64         `json:"baseline,omitempty"`
	Leader   [2]layout.Point `json:"leader,omitzero"` // from the mark to the text; zero when the text touches the mark
	Size     float64         `json:"size"`
	Lines    []string        `json:"lines,omitempty"` // the text as set: one line, or two when one found no room
}

// noteSize is the annotations' type size: the tick labels' size.
func (f *Feature) noteSize() float64 { return f.Output.Type.Ticks.Pt() }

// notePad is the clear space kept around an annotation's text.
func (f *Feature) notePad() float64 { return math.Max(1, f.noteSize()*0.2) }

// NoteRoom is the widest an annotation's text may be in this output: the
// plot's width less the clear space on both sides.
func (f *Feature) NoteRoom() float64 {
	if f.Plan == nil {
		return 0
	}
	return f.Plan.PanelW - 2*f.notePad() - f.peakInset()*2
}

// NoteWidth is the width of an annotation's text.
func (f *Feature) NoteWidth(text string) float64 {
	return f.Fonts.Width(fonts.Regular, f.noteSize(), text)
}

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

// segment is a piece of the plotted polyline; the monotone cubic through
// its two ends stays inside their bounding box (Fritsch–Butland slopes
// never overshoot), so boxes against boxes is a safe collision test.
type segment struct{ a, b curve.Point }

// placeNotes places the annotations of a panel's term: each text at the
// free spot nearest its mark, clear of the curve, the peak dot, the other
// notes' marks, texts and leaders, inside the plot.
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
	vals := f.plotted(sr)
	years := f.Data.Years
	var segs []segment
	var pts []curve.Point
	for i := range vals {
		if math.IsNaN(vals[i]) {
			continue
		}
		pt := m.Apply(years[i], vals[i])
		pts = append(pts, pt)
		if i > 0 && !math.IsNaN(vals[i-1]) {
			segs = append(segs, segment{m.Apply(years[i-1], vals[i-1]), pt})
		}
	}
	lw := f.Output.Line.Pt()
	clear := lw/2 + f.notePad()
	pr := pn.Plot
	inner := layout.Rect{X0: pr.X0 + f.notePad()/2, Y0: pr.Y0 + f.Rule() + f.notePad()/2, X1: pr.X1 - f.notePad()/2, Y1: pr.Y1 - f.notePad()/2}
	var obstacles []layout.Rect
	for _, s := range segs {
		obstacles = append(obstacles, grow(bbox(s.a, s.b), clear))
	}
	for _, p := range pts { // lone points are dots
		obstacles = append(obstacles, grow(bbox(p, p), clear))
	}
	if f.Output.PeakDot && sr.Peak > 0 {
		pk := m.Apply(float64(sr.PeakYear), sr.Peak)
		r := f.peakRadius() + f.Rule()
		obstacles = append(obstacles, grow(bbox(pk, pk), r+f.notePad()))
	}
	// solid are what a leader must not cross either: the peak dot, the
	// other notes' marks and texts.
	solid := append([]layout.Rect(nil), obstacles[len(segs)+len(pts):]...)
	size := f.noteSize()
	met := f.Fonts.Metrics(fonts.Regular, size)
	var out []Note
	var leaders []segment
	// Every mark first, so no text lands on a mark placed after it.
	anchors := make([]curve.Point, len(idx))
	marks := make([]layout.Rect, len(idx))
	for k, i := range idx {
		anchors[k], marks[k] = f.noteMark(m, vals, f.Spec.Annotations[i], pr)
		obstacles = append(obstacles, grow(marks[k], f.notePad()))
		solid = append(solid, marks[k]) // leaders keep off the marks
	}
	step := math.Max(0.5, size*0.15) // candidate spots: a fine grid
	for k, i := range idx {
		a := f.Spec.Annotations[i]
		n := Note{Index: i, Term: a.Term, From: a.From, To: a.To, Text: a.Text, Item: pn.Item, Size: size}
		anchor := anchors[k]
		n.Mark = marks[k]
		lh := size * f.leading()
		minLead := math.Max(2, size*0.4) // a leader always shows which mark a text belongs to
		best, bestScore, bestLines := layout.Rect{}, math.Inf(1), []string(nil)
		for k, lines := range noteShapes(f, a.Text) {
			w := 0.0
			for _, l := range lines {
				w = math.Max(w, f.NoteWidth(l))
			}
			h := met.Ascent + met.Descent + float64(len(lines)-1)*lh
			penalty := float64(k) * 3 // one line is better than two
			for y0 := inner.Y0; y0+h <= inner.Y1+1e-9; y0 += step {
				for x0 := inner.X0; x0+w <= inner.X1+1e-9; x0 += step {
					box := layout.Rect{X0: x0, Y0: y0, X1: x0 + w, Y1: y0 + h}
					near := nearest(box, anchor)
					d := math.Hypot(near.X-anchor.X, near.Y-anchor.Y)
					if d < minLead || d+penalty >= bestScore || hitsAny(box, obstacles) {
						continue
					}
					ld := segment{anchor, near}
					if crossesCurve(ld, segs, anchor, f.notePad()+clear) || crossesAny(ld, leaders) || segHitsAny(shorten(ld, minLead/2), solid) {
						continue
					}
					best, bestScore, bestLines = box, d+penalty, lines
				}
			}
		}
		if bestLines == nil {
			n.Why = "no free spot in the plot clear of the line, the peak dot and the other notes"
			out = append(out, n)
			continue
		}
		n.Placed, n.Box, n.Lines = true, best, bestLines
		n.X, n.Baseline = best.X0, best.Y1-met.Ascent
		near := nearest(best, anchor)
		n.Leader = [2]layout.Point{{X: anchor.X, Y: anchor.Y}, {X: near.X, Y: near.Y}}
		leaders = append(leaders, segment{anchor, near})
		obstacles = append(obstacles, grow(best, f.notePad()))
		solid = append(solid, best)
		out = append(out, n)
	}
	return out
}

// noteMark is the mark of an annotation on the line: a short tick across
// the line at a year; a bracket above the line over a span. It returns
// where the leader starts and the mark's box.
func (f *Feature) noteMark(m curve.Map, vals []float64, a specs.Annotation, pr layout.Rect) (curve.Point, layout.Rect) {
	from := f.Data.Span.From
	val := func(y int) float64 {
		if y-from < 0 || y-from >= len(vals) {
			return 0 // the spec's check keeps notes inside the span
		}
		if v := vals[y-from]; !math.IsNaN(v) {
			return v
		}
		return 0
	}
	tick := math.Max(2.5, f.noteSize()*0.45)
	if !a.Span() {
		// A tick rising from the line, or hanging from it when the line is
		// near the plot's top.
		p := m.Apply(float64(a.From), val(a.From))
		lw := f.Output.Line.Pt()
		y0, y1 := p.Y-lw/2, p.Y+lw/2+tick
		if y1 > pr.Y1 {
			y0, y1 = p.Y-lw/2-tick, p.Y+lw/2
			return curve.Point{X: p.X, Y: y0}, layout.Rect{X0: p.X - f.Rule(), Y0: y0, X1: p.X + f.Rule(), Y1: y1}
		}
		return curve.Point{X: p.X, Y: y1}, layout.Rect{X0: p.X - f.Rule(), Y0: y0, X1: p.X + f.Rule(), Y1: y1}
	}
	top := pr.Y0
	for y := a.From; y <= a.To; y++ {
		top = math.Max(top, m.Y(val(y)))
	}
	yb := math.Min(pr.Y1, top+f.Output.Line.Pt()/2+1.5)
	x0, x1 := m.X(float64(a.From)), m.X(float64(a.To))
	return curve.Point{X: (x0 + x1) / 2, Y: yb}, layout.Rect{X0: x0, Y0: yb - 1.5, X1: x1, Y1: yb}
}

// drawNotes draws a panel's annotations: marks, leaders, texts.
func (f *Feature) drawNotes(p pen, pn layout.Panel) {
	for _, n := range f.placeNotes(pn) {
		r := n.Mark
		if n.From == n.To {
			x := (r.X0 + r.X1) / 2
			p.line(x, r.Y0, x, r.Y1, f.Rule()*2, ink)
		} else {
			p.line(r.X0, r.Y1, r.X1, r.Y1, f.Rule(), ink)
			p.line(r.X0, r.Y0, r.X0, r.Y1, f.Rule(), ink)
			p.line(r.X1, r.Y0, r.X1, r.Y1, f.Rule(), ink)
		}
		if !n.Placed {
			continue
		}
		p.line(n.Leader[0].X, n.Leader[0].Y, n.Leader[1].X, n.Leader[1].Y, f.Rule(), inkSoft)
		for i, l := range n.Lines {
			p.text(fonts.Regular, n.Size, ink, n.X, n.Baseline-float64(i)*n.Size*f.leading(), canvas.Left, l)
		}
	}
}

func bbox(a, b curve.Point) layout.Rect {
	return layout.Rect{X0: math.Min(a.X, b.X), Y0: math.Min(a.Y, b.Y), X1: math.Max(a.X, b.X), Y1: math.Max(a.Y, b.Y)}
}

func grow(r layout.Rect, d float64) layout.Rect {
	return layout.Rect{X0: r.X0 - d, Y0: r.Y0 - d, X1: r.X1 + d, Y1: r.Y1 + d}
}

// Overlaps reports whether two rectangles share area.
func Overlaps(a, b layout.Rect) bool {
	return a.X0 < b.X1 && b.X0 < a.X1 && a.Y0 < b.Y1 && b.Y0 < a.Y1
}

func hitsAny(r layout.Rect, os []layout.Rect) bool {
	for _, o := range os {
		if Overlaps(r, o) {
			return true
		}
	}
	return false
}

// nearest is the point of r nearest to p.
func nearest(r layout.Rect, p curve.Point) curve.Point {
	return curve.Point{X: math.Min(math.Max(p.X, r.X0), r.X1), Y: math.Min(math.Max(p.Y, r.Y0), r.Y1)}
}

// crossesCurve reports whether a leader meets the curve away from its own
// start (within skip of the anchor the leader leaves the line).
func crossesCurve(l segment, segs []segment, anchor curve.Point, skip float64) bool {
	for _, s := range segs {
		if math.Hypot(s.a.X-anchor.X, s.a.Y-anchor.Y) < skip && math.Hypot(s.b.X-anchor.X, s.b.Y-anchor.Y) < skip {
			continue
		}
		if intersects(l, s) {
			return true
		}
	}
	return false
}

func crossesAny(l segment, ls []segment) bool {
	for _, o := range ls {
		if intersects(l, o) {
			return true
		}
	}
	return false
}

// intersects reports whether two segments cross (proper or touching).
func intersects(p, q segment) bool {
	o := func(a, b, c curve.Point) float64 { return (b.X-a.X)*(c.Y-a.Y) - (b.Y-a.Y)*(c.X-a.X) }
	d1, d2 := o(q.a, q.b, p.a), o(q.a, q.b, p.b)
	d3, d4 := o(p.a, p.b, q.a), o(p.a, p.b, q.b)
	return (d1*d2 < 0) && (d3*d4 < 0)
}

// Highlighted reports whether the spec highlights a term.
func (f *Feature) Highlighted(term string) bool {
	for _, h := range f.Spec.Highlights {
		if h == term {
			return true
		}
	}
	return false
}

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
		p.line(pn.Label.X0, y, pn.Label.X1, y, math.Max(1, 2*f.Rule()), ink)
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

// noteShapes are the ways a note may be set: on one line, then on two
// (broken at the space that makes the longer line shortest).
func noteShapes(f *Feature, text string) [][]string {
	shapes := [][]string{{text}}
	best, bestW := -1, math.Inf(1)
	for i, r := range text {
		if r != ' ' {
			continue
		}
		w := math.Max(f.NoteWidth(text[:i]), f.NoteWidth(text[i+1:]))
		if w < bestW {
			best, bestW = i, w
		}
	}
	if best > 0 {
		shapes = append(shapes, []string{text[:best], text[best+1:]})
	}
	return shapes
}

// shorten drops the first d of a segment (the part at the anchor).
func shorten(s segment, d float64) segment {
	l := math.Hypot(s.b.X-s.a.X, s.b.Y-s.a.Y)
	if l <= d {
		return segment{s.b, s.b}
	}
	t := d / l
	return segment{curve.Point{X: s.a.X + t*(s.b.X-s.a.X), Y: s.a.Y + t*(s.b.Y-s.a.Y)}, s.b}
}

// segHitsAny reports whether a segment passes through any rectangle
// (Liang–Barsky clipping).
func segHitsAny(s segment, rs []layout.Rect) bool {
	for _, r := range rs {
		t0, t1 := 0.0, 1.0
		dx, dy := s.b.X-s.a.X, s.b.Y-s.a.Y
		ok := true
		for _, c := range [4][2]float64{{-dx, s.a.X - r.X0}, {dx, r.X1 - s.a.X}, {-dy, s.a.Y - r.Y0}, {dy, r.Y1 - s.a.Y}} {
			p, q := c[0], c[1]
			if p == 0 {
				if q < 0 {
					ok = false
					break
				}
				continue
			}
			t := q / p
			if p < 0 {
				t0 = math.Max(t0, t)
			} else {
				t1 = math.Min(t1, t)
			}
			if t0 > t1 {
				ok = false
				break
			}
		}
		if ok {
			return true
		}
	}
	return false
}

// leading is the output's line height as a multiple of the type size.
func (f *Feature) leading() float64 {
	if l := f.Output.Type.Leading; l > 0 {
		return l
	}
	return 1.2
}
