package draw

import (
	"image/color"
	"math"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/render/curve"
	"sheaf/specs"
)

// Annotations, as pages and inserts place and draw them: a mark on the
// line, the text at the free spot nearest it, a hairline leader between.
// The placement is pure geometry in points, y up, so `check --json` can
// report it and tests can check it without drawing.

// Ink colours of type and rules: one ink (black or a tint of it), so they
// never misregister on press.
var (
	Ink     = color.RGBA{0x1a, 0x1a, 0x1a, 0xff}
	InkSoft = color.RGBA{0x5c, 0x5c, 0x5c, 0xff}
)

// Tints of the one ink behind a plot (black at a few per cent, so they
// never misregister on press).
var (
	BandTint      = color.RGBA{0xf0, 0xf0, 0xf0, 0xff} // a period's band, 6 % ink
	HighlightTint = color.RGBA{0xe9, 0xe9, 0xe9, 0xff} // a highlighted term's plot, 9 % ink
	BandOnTint    = color.RGBA{0xdc, 0xdc, 0xdc, 0xff} // a period's band on a highlighted plot
)

// HighlightRule is the width of the ink rule that marks a highlighted
// term's label: a point, or two hairlines where the hairline is wider.
func HighlightRule(hairline float64) float64 { return math.Max(1, 2*hairline) }

// Note is where an annotation landed on one plot: its mark on the line,
// its text and the leader between them. Rectangles are [x0, y0, x1, y1]
// in points, y up, as the layout's.
type Note struct {
	Index    int             `json:"index"` // into the spec's annotations
	Term     string          `json:"term"`
	From     int             `json:"from"`
	To       int             `json:"to"`
	Text     string          `json:"text"`
	Page     int             `json:"page"` // 1-based; 0 on a panel drawn alone and on an insert
	Item     int             `json:"item"` // the panel's item; on an insert, the term's place in the insert
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

// NoteStyle is how an output sets its annotations.
type NoteStyle struct {
	Fonts   *fonts.Set
	Size    float64 // the text's type size (the tick labels')
	Leading float64 // line height as a multiple of Size
	Rule    float64 // hairline width: leaders, brackets, the plot's baseline
	Line    float64 // the chart line's width
}

// Pad is the clear space kept around an annotation's text.
func (st NoteStyle) Pad() float64 { return math.Max(1, st.Size*0.2) }

// Width is the width of an annotation's text.
func (st NoteStyle) Width(text string) float64 { return st.Fonts.Width(fonts.Regular, st.Size, text) }

// Dot is a filled circle drawn on a plot (a peak dot, with its ring).
type Dot struct{ X, Y, R float64 }

// NotePlot is one plot annotations are placed on: a page's panel, an
// insert's plot or one of its rows.
type NotePlot struct {
	Plot  layout.Rect // the texts stay inside it, above its baseline
	Map   curve.Map   // years and values to the plot
	Years []float64   // the years of the lines, one a year from the span's first
	// Terms are the terms drawn on the plot (one, or the overlaid terms of
	// an insert) and Lines their values as drawn (NaN: no point): an
	// annotation's mark sits on its term's line; texts keep clear of every
	// line and leaders cross none.
	Terms []string
	Lines [][]float64
	Dots  []Dot // dots on the plot the texts and leaders keep clear of
}

// segment is a piece of a plotted polyline; the monotone cubic through
// its two ends stays inside their bounding box (Fritsch–Butland slopes
// never overshoot), so boxes against boxes is a safe collision test.
type segment struct{ a, b curve.Point }

// polyline is the points and segments of a line as drawn on p.
func (p NotePlot) polyline(vals []float64) (segs []segment, pts []curve.Point) {
	for i := range vals {
		if math.IsNaN(vals[i]) {
			continue
		}
		pt := p.Map.Apply(p.Years[i], vals[i])
		pts = append(pts, pt)
		if i > 0 && !math.IsNaN(vals[i-1]) {
			segs = append(segs, segment{p.Map.Apply(p.Years[i-1], vals[i-1]), pt})
		}
	}
	return segs, pts
}

// PlaceNotes places annotations (given by their index into anns, each of
// one of the plot's terms) on a plot: every mark first, then each text at the free spot
// nearest its mark, searched on a fine grid over the plot — inside it,
// clear of the lines (by half their width and a margin), of the dots, of
// every mark and of the texts placed before; its leader crosses no line
// (away from its own mark), no other leader, dot, mark or text. One line
// first, two (broken at the best space) only when one finds no room. An
// annotation with no free spot keeps its mark, with Why.
func PlaceNotes(st NoteStyle, p NotePlot, anns []specs.Annotation, index []int) []Note {
	if len(index) == 0 {
		return nil
	}
	pad := st.Pad()
	clear := st.Line/2 + pad
	pr := p.Plot
	inner := layout.Rect{X0: pr.X0 + pad/2, Y0: pr.Y0 + st.Rule + pad/2, X1: pr.X1 - pad/2, Y1: pr.Y1 - pad/2}
	var obstacles []layout.Rect
	var lines []segment // what a leader must not cross (away from its mark)
	addLine := func(segs []segment, pts []curve.Point) {
		for _, s := range segs {
			obstacles = append(obstacles, grow(bbox(s.a, s.b), clear))
		}
		for _, q := range pts { // lone points are dots
			obstacles = append(obstacles, grow(bbox(q, q), clear))
		}
		lines = append(lines, segs...)
	}
	for _, l := range p.Lines {
		addLine(p.polyline(l))
	}
	// solid are what a leader must not cross either: the dots, the marks
	// and the texts.
	var solid []layout.Rect
	for _, d := range p.Dots {
		c := curve.Point{X: d.X, Y: d.Y}
		obstacles = append(obstacles, grow(bbox(c, c), d.R+pad))
		solid = append(solid, grow(bbox(c, c), d.R+pad))
	}
	met := st.Fonts.Metrics(fonts.Regular, st.Size)
	var out []Note
	var leaders []segment
	// Every mark first, so no text lands on a mark placed after it.
	anchors := make([]curve.Point, len(index))
	marks := make([]layout.Rect, len(index))
	for k, i := range index {
		anchors[k], marks[k] = st.mark(p, anns[i])
		obstacles = append(obstacles, grow(marks[k], pad))
		solid = append(solid, marks[k]) // leaders keep off the marks
	}
	step := math.Max(0.5, st.Size*0.15) // candidate spots: a fine grid
	minLead := math.Max(2, st.Size*0.4) // a leader always shows which mark a text belongs to
	lh := st.Size * st.Leading
	for k, i := range index {
		a := anns[i]
		n := Note{Index: i, Term: a.Term, From: a.From, To: a.To, Text: a.Text, Size: st.Size, Mark: marks[k]}
		anchor := anchors[k]
		far := awayFrom(lines, anchor, pad+clear) // the same for every spot tried
		best, bestScore, bestLines := layout.Rect{}, math.Inf(1), []string(nil)
		for shape, ls := range st.shapes(a.Text) {
			w := 0.0
			for _, l := range ls {
				w = math.Max(w, st.Width(l))
			}
			h := met.Ascent + met.Descent + float64(len(ls)-1)*lh
			penalty := float64(shape) * 3 // one line is better than two
			for y0 := inner.Y0; y0+h <= inner.Y1+1e-9; y0 += step {
				for x0 := inner.X0; x0+w <= inner.X1+1e-9; x0 += step {
					box := layout.Rect{X0: x0, Y0: y0, X1: x0 + w, Y1: y0 + h}
					near := nearest(box, anchor)
					d := math.Hypot(near.X-anchor.X, near.Y-anchor.Y)
					if d < minLead || d+penalty >= bestScore || hitsAny(box, obstacles) {
						continue
					}
					ld := segment{anchor, near}
					if crossesAny(ld, far) || crossesAny(ld, leaders) || segHitsAny(shorten(ld, minLead/2), solid) {
						continue
					}
					best, bestScore, bestLines = box, d+penalty, ls
				}
			}
		}
		if bestLines == nil {
			n.Why = p.why()
			out = append(out, n)
			continue
		}
		n.Placed, n.Box, n.Lines = true, best, bestLines
		n.X, n.Baseline = best.X0, best.Y1-met.Ascent
		near := nearest(best, anchor)
		n.Leader = [2]layout.Point{{X: anchor.X, Y: anchor.Y}, {X: near.X, Y: near.Y}}
		leaders = append(leaders, segment{anchor, near})
		obstacles = append(obstacles, grow(best, pad))
		solid = append(solid, best)
		out = append(out, n)
	}
	return out
}

// why says what an unplaced note could not keep clear of.
func (p NotePlot) why() string {
	what := "the line"
	if len(p.Lines) > 1 {
		what = "the lines"
	}
	if len(p.Dots) > 0 {
		what += ", the peak dot"
	}
	return "no free spot in the plot clear of " + what + " and the other notes"
}

// mark is an annotation's mark on the line: a short tick rising from the
// line at a year (hanging from it near the plot's top); a bracket above
// the line over a span. It returns where the leader starts and the mark's
// box.
func (st NoteStyle) mark(p NotePlot, a specs.Annotation) (curve.Point, layout.Rect) {
	var line []float64
	for i, t := range p.Terms {
		if t == a.Term && i < len(p.Lines) {
			line = p.Lines[i]
		}
	}
	from := int(p.Years[0])
	val := func(y int) float64 {
		if y-from < 0 || y-from >= len(line) {
			return 0 // the spec's check keeps notes inside the span
		}
		if v := line[y-from]; !math.IsNaN(v) {
			return v
		}
		return 0
	}
	pr, m := p.Plot, p.Map
	tick := math.Max(2.5, st.Size*0.45)
	if !a.Span() {
		q := m.Apply(float64(a.From), val(a.From))
		y0, y1 := q.Y-st.Line/2, q.Y+st.Line/2+tick
		if y1 > pr.Y1 {
			y0, y1 = q.Y-st.Line/2-tick, q.Y+st.Line/2
			return curve.Point{X: q.X, Y: y0}, layout.Rect{X0: q.X - st.Rule, Y0: y0, X1: q.X + st.Rule, Y1: y1}
		}
		return curve.Point{X: q.X, Y: y1}, layout.Rect{X0: q.X - st.Rule, Y0: y0, X1: q.X + st.Rule, Y1: y1}
	}
	top := pr.Y0
	for y := a.From; y <= a.To; y++ {
		top = math.Max(top, m.Y(val(y)))
	}
	yb := math.Min(pr.Y1, top+st.Line/2+1.5)
	x0, x1 := m.X(float64(a.From)), m.X(float64(a.To))
	return curve.Point{X: (x0 + x1) / 2, Y: yb}, layout.Rect{X0: x0, Y0: yb - 1.5, X1: x1, Y1: yb}
}

// Notes draws placed annotations: marks (also of the unplaced), leaders,
// texts.
func (p Pen) Notes(st NoteStyle, notes []Note) {
	for _, n := range notes {
		r := n.Mark
		if n.From == n.To {
			x := (r.X0 + r.X1) / 2
			p.Line(x, r.Y0, x, r.Y1, st.Rule*2, Ink)
		} else {
			p.Line(r.X0, r.Y1, r.X1, r.Y1, st.Rule, Ink)
			p.Line(r.X0, r.Y0, r.X0, r.Y1, st.Rule, Ink)
			p.Line(r.X1, r.Y0, r.X1, r.Y1, st.Rule, Ink)
		}
		if !n.Placed {
			continue
		}
		p.Line(n.Leader[0].X, n.Leader[0].Y, n.Leader[1].X, n.Leader[1].Y, st.Rule, InkSoft)
		for i, l := range n.Lines {
			p.Text(fonts.Regular, n.Size, Ink, n.X, n.Baseline-float64(i)*n.Size*st.Leading, canvas.Left, l)
		}
	}
}

// shapes are the ways a note may be set: on one line, then on two
// (broken at the space that makes the longer line shortest).
func (st NoteStyle) shapes(text string) [][]string {
	shapes := [][]string{{text}}
	best, bestW := -1, math.Inf(1)
	for i, r := range text {
		if r != ' ' {
			continue
		}
		w := math.Max(st.Width(text[:i]), st.Width(text[i+1:]))
		if w < bestW {
			best, bestW = i, w
		}
	}
	if best > 0 {
		shapes = append(shapes, []string{text[:best], text[best+1:]})
	}
	return shapes
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

// awayFrom is the segments of the lines a leader from anchor must not
// cross: all but those within skip of the anchor at both ends, where the
// leader leaves the line. It depends on the anchor only, so it is found
// once per note, not for every spot tried.
func awayFrom(segs []segment, anchor curve.Point, skip float64) []segment {
	var far []segment
	for _, s := range segs {
		if math.Hypot(s.a.X-anchor.X, s.a.Y-anchor.Y) < skip && math.Hypot(s.b.X-anchor.X, s.b.Y-anchor.Y) < skip {
			continue
		}
		far = append(far, s)
	}
	return far
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
