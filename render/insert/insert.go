// Package insert draws an insert: a single graphic of one to four terms,
// at its own size, for an article page. With two or more terms it is a
// comparison panel, and every line keeps the era palette along its length
// — colour still means time. By default the terms stand in aligned rows,
// one strip per term under one shared x axis and one y-range, named at
// the left, so each line reads alone and the eye compares heights and
// years straight down the rows. Overlaid (specs.CompareOverlay) the terms
// share one plot and are told apart by their stroke (solid, dashed,
// dotted, dash-dot) and by a label at each line's end; labels that would
// collide are moved apart along the y axis by Spread.
//
// Like the page composer it draws in points with y up, converting to
// canvas's millimetres at the last moment, so the same drawing goes to
// the PDF writer, the rasterizer and SVG.
package insert

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/curve"
	"sheaf/render/draw"
	"sheaf/render/page"
	"sheaf/specs"
	"sheaf/specs/series"
)

// mm is millimetres per point.
const mm = specs.MmPerPt

// LineStyle is how one term's line is stroked in a comparison.
type LineStyle struct {
	Name   string
	Phrase specs.PhraseID // the style's name in the spec's language ("dotted line")
	// Dashes alternate dash and gap lengths in units of the line width
	// (canvas's convention, canvas.ScaleDash); empty is solid. With round
	// caps every dash grows by one line width, so a dash of 0.01 draws as
	// a round dot and gaps must be over 1 to show.
	Dashes []float64
}

// Styles are the line styles in the order terms get them: four patterns
// that stay apart at any length because their periods differ in kind,
// not only in scale.
var Styles = [4]LineStyle{
	{Name: "solid", Phrase: specs.PhraseLineSolid},
	{Name: "dashed", Phrase: specs.PhraseLineDashed, Dashes: []float64{5, 3.2}},
	{Name: "dotted", Phrase: specs.PhraseLineDotted, Dashes: []float64{0.01, 2.6}},
	{Name: "dash-dot", Phrase: specs.PhraseLineDashDot, Dashes: []float64{5, 2.8, 0.01, 2.8}},
}

// Ink colours, as on the pages.
var (
	ink      = color.RGBA{0x1a, 0x1a, 0x1a, 0xff}
	inkSoft  = color.RGBA{0x5c, 0x5c, 0x5c, 0xff}
	ruleGrey = color.RGBA{0xc8, 0xc8, 0xc8, 0xff}
	axisGrey = color.RGBA{0x9a, 0x9a, 0x9a, 0xff}
)

// Graphic is one insert, laid out and ready to draw.
type Graphic struct {
	Spec    *specs.Spec
	Insert  *specs.Insert
	Output  *specs.Output // the output whose type, fonts and line width it borrows
	Data    *series.Set   // the insert's terms, in the insert's order
	Palette palette.Scale
	Fonts   *fonts.Set

	w, h   float64 // size in points
	rule   float64
	pad    float64
	title  []string
	titleS float64
	keyY   float64 // baseline of the key caption
	plot   rectPt
	yMax   float64
	yTicks []float64
	labels []Label
	m      curve.Map
	stops  []palette.Stop

	rows      []Row             // aligned rows, top first (rows style only)
	notes     []draw.Note       // the annotations of its terms, placed
	scaleNote string            // what the values are, above the plot
	intervals *series.Intervals // the band's intervals; nil: no band
}

// Row is one term's strip in the aligned-rows style.
type Row struct {
	Term     string
	Plot     rectPt    // the strip: baseline at Y0, the y-range top at Y1
	Map      curve.Map // years and values to the strip
	Baseline float64   // of the term label at the left
	PeakLine float64   // baseline of the "peak YEAR" line under it; 0: none
}

type rectPt struct{ X0, Y0, X1, Y1 float64 }

func (r rectPt) W() float64 { return r.X1 - r.X0 }
func (r rectPt) H() float64 { return r.Y1 - r.Y0 }

func (r rectPt) layout() layout.Rect { return layout.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }

// Label is a term's label at its line's end.
type Label struct {
	Term     string
	Style    LineStyle
	EndX     float64 // where the line ends (points)
	EndY     float64
	Y        float64 // the label's placed centre
	Baseline float64
	X        float64 // left edge of the style sample
	Width    float64 // sample + gap + text
	Height   float64 // the line box the spacing keeps apart
}

// New lays out an insert of data's series (one to four, in order).
func New(s *specs.Spec, in *specs.Insert, out *specs.Output, data *series.Set, pal palette.Scale, fs *fonts.Set) (*Graphic, error) {
	where := func() string { return fmt.Sprintf("%s: insert %q", s.Where("inserts."+in.Name), in.Name) }
	if n := len(data.Series); n < 1 || n > len(Styles) {
		return nil, fmt.Errorf("%s: an insert shows 1 to %d terms, not %d", where(), len(Styles), n)
	}
	if len(data.Years) < 2 {
		return nil, fmt.Errorf("%s: the span has %d year(s); a line needs two", where(), len(data.Years))
	}
	g := &Graphic{Spec: s, Insert: in, Output: out, Data: data, Palette: pal, Fonts: fs,
		w: in.Size.W.Pt(), h: in.Size.H.Pt()}
	if !(g.w > 0 && g.h > 0) {
		return nil, fmt.Errorf("%s: size %s × %s has no area", where(), out.Describe(in.Size.W), out.Describe(in.Size.H))
	}
	from, to := float64(data.Span.From), float64(data.Span.To)
	g.stops = pal.Stops(from, to, 0)
	if err := g.layout(); err != nil {
		var nr *noRoom
		if errors.As(err, &nr) {
			return nil, fmt.Errorf("%s: %s", where(), nr.advice(g))
		}
		return nil, fmt.Errorf("%s: %v", where(), err)
	}
	// Placed once: the drawing of each file and the report ask again.
	g.notes = g.placeNotes()
	return g, nil
}

// noRoom is layout's error when the plot is under its floor; New then
// measures how much more room the insert needs (README promises it).
type noRoom struct {
	plot string // "the plot would be W × H[, n rows h tall each]"
	rows bool
}

func (e *noRoom) Error() string { return e.plot + "; make the insert larger or its title shorter" }

// advice says how much wider and taller g must be for its layout to fit.
// The shortfall is not the plot's: the padding grows with the size and
// the title and notes rewrap with the width, so it is measured by laying
// the insert out again, bisecting first the width (with room to spare in
// height), then the height at that width.
func (e *noRoom) advice(g *Graphic) string {
	fits := func(w, h float64) bool {
		c := *g // layout writes only g's own fields
		c.w, c.h = w, h
		return c.layout() == nil
	}
	tall := 4*(g.w+g.h) + 1000
	least := func(ok func(extra float64) bool) (float64, bool) {
		if ok(0) {
			return 0, true
		}
		lo, hi := 0.0, 1.0
		for !ok(hi) {
			if hi > 1e5 { // 35 m: something other than room is wrong
				return 0, false
			}
			lo, hi = hi, hi*2
		}
		for hi-lo > 0.005 { // 0.005 pt: under the 0.01 px the message shows
			if mid := (lo + hi) / 2; ok(mid) {
				hi = mid
			} else {
				lo = mid
			}
		}
		return hi, true
	}
	dw, okW := least(func(x float64) bool { return fits(g.w+x, g.h+tall) })
	dh, okH := least(func(x float64) bool { return fits(g.w+dw, g.h+x) })
	if !okW || !okH {
		return e.Error()
	}
	more := g.Output.Describe(specs.Length(dw)) + " × " + g.Output.Describe(specs.Length(dh)) + " more"
	if e.rows {
		more = g.Output.Describe(specs.Length(dw)) + " wider and " + g.Output.Describe(specs.Length(dh)) + " taller"
	}
	return e.plot + "; make the insert larger (at least about " + more + ") or its title shorter"
}

// Size is the insert's size in points.
func (g *Graphic) Size() (w, h float64) { return g.w, g.h }

// Labels returns the line-end labels as placed.
func (g *Graphic) Labels() []Label { return g.labels }

// YMax is the top of the shared y-range.
func (g *Graphic) YMax() float64 { return g.yMax }

// Rows returns the strips of the aligned-rows style, top first; nil when
// the terms are overlaid or alone.
func (g *Graphic) Rows() []Row { return g.rows }

// Rowed reports whether the insert shows its terms in aligned rows: two or
// more terms, unless the spec asks for them overlaid.
func (g *Graphic) Rowed() bool {
	return len(g.Data.Series) > 1 && g.Insert.Compare != specs.CompareOverlay
}

func (g *Graphic) leading() float64 {
	if l := g.Output.Type.Leading; l > 0 {
		return l
	}
	return 1.2
}

// Title is the insert's title: as given, or the terms listed.
func (g *Graphic) Title() string {
	if g.Insert.Title != "" {
		return g.Insert.Title
	}
	var terms []string
	for _, sr := range g.Data.Series {
		terms = append(terms, sr.Term)
	}
	return g.Spec.List(terms)
}

// Describe returns the insert's title and a description for assistive
// technology: the terms, their line styles, the span, the scale and the
// peaks — every word the spec's (text.describe, text.describe-compare, or
// the language's), every number in the language's form.
func (g *Graphic) Describe() (title, desc string) {
	d, s := g.Data, g.Spec
	if len(d.Series) == 1 {
		return g.Title(), page.DescribeTerm(s, d, &d.Series[0])
	}
	var parts, peaks []string
	for i, sr := range d.Series {
		if g.Rowed() {
			parts = append(parts, s.Quote(sr.Term))
		} else {
			parts = append(parts, specs.Fill(s.Phrase(specs.PhraseStyledTerm), "term", s.Quote(sr.Term), "line", s.Phrase(Styles[i].Phrase)))
		}
		peaks = append(peaks, specs.Fill(s.Phrase(specs.PhrasePeakOf), "term", s.Quote(sr.Term), "year", strconv.Itoa(sr.PeakYear)))
	}
	how := s.Phrase(specs.PhraseOneScale)
	if g.Rowed() {
		how = s.Phrase(specs.PhraseRowsOneScale)
	}
	return g.Title(), specs.Fill(s.Phrase(specs.PhraseDescribeCompare), "terms", s.List(parts), "span", page.SpanText(d.Span),
		"how", how, "unit", page.UnitText(s, d), "max", g.formatValue(g.yMax), "peaks", s.List(peaks))
}

// layout places the title, the key, the plot and the labels.
func (g *Graphic) layout() error {
	t := g.Output.Type
	fs := g.Fonts
	g.rule = page.Hairline
	if g.Output.Kind == specs.Screen {
		g.rule = page.ScreenRule
	}
	lead := g.leading()
	g.pad = math.Max(t.Label.Pt()*1.1, math.Min(g.w, g.h)*0.035)
	inner := g.w - 2*g.pad
	top := g.h - g.pad

	// Title, wrapped to the width.
	g.titleS = math.Max(t.Heading.Pt(), t.Dek.Pt()) * 1.1
	g.title = fs.Wrap(fonts.Bold, g.titleS, g.Title(), inner)
	top -= float64(len(g.title)) * g.titleS * lead

	// Key: caption and strip on one line.
	ks := t.Key.Pt()
	top -= ks * 0.6
	g.keyY = top - fs.Metrics(fonts.Bold, ks).Ascent
	top -= ks*lead + t.Ticks.Pt()*lead + ks*0.6

	// Bottom: the source line, then the year ticks.
	bottom := g.pad
	if g.Spec.Source != "" {
		bottom += t.Notes.Pt() * lead * float64(len(fs.Wrap(fonts.Regular, t.Notes.Pt(), g.Spec.Source, inner)))
		bottom += t.Notes.Pt() * 0.6
	}
	ts := t.Ticks.Pt()
	bottom += ts*lead + ts*0.5

	// Shared y-range: the largest value of any term, up to a round tick.
	peak := 0.0
	for _, sr := range g.Data.Series {
		peak = math.Max(peak, sr.Peak)
	}
	if !(peak > 0) {
		peak = 1
	}
	g.yTicks, g.yMax = niceTicks(peak, 4)
	// Overlaid bands would hide each other: a band in rows or alone.
	band := ""
	if g.Output.Band > 0 && (g.Rowed() || len(g.Data.Series) == 1) {
		g.intervals = series.NewIntervals(g.Output.Band)
		band = specs.Fill(g.Spec.Phrase(specs.PhraseBandTint), "level", g.Spec.FormatSignificant(g.Output.Band*100))
	}
	g.scaleNote = g.fitNote(inner, band)
	if g.Rowed() {
		return g.layoutRows(top, bottom)
	}

	// Left: the y labels; right: the line-end labels.
	left := 0.0
	for _, v := range g.yTicks {
		left = math.Max(left, fs.Width(fonts.Figures, ts, g.formatValue(v)))
	}
	ls := t.Label.Pt()
	right := 0.0
	for _, sr := range g.Data.Series {
		right = math.Max(right, fs.Width(fonts.Bold, ls, sr.Term))
	}
	sample := g.sampleLen()
	right += sample + ls*0.4 + ls*0.5
	single := len(g.Data.Series) == 1
	if single { // the title names the term; no label column
		right = ts * 0.5
	}
	g.plot = rectPt{X0: g.pad + left + ts*0.6, Y0: bottom, X1: g.w - g.pad - right, Y1: top - ts*lead - ts*0.7}
	floorW, floorH := 6*ls, 4*ls
	if g.plot.W() < floorW || g.plot.H() < floorH {
		return &noRoom{plot: fmt.Sprintf("the plot would be %s × %s",
			g.Output.Describe(specs.Length(math.Max(g.plot.W(), 0))), g.Output.Describe(specs.Length(math.Max(g.plot.H(), 0))))}
	}

	lw := g.Output.Line.Pt()
	years := g.Data.Years
	m, err := curve.NewMap(years[0], years[len(years)-1], 0, g.yMax, g.plot.X0, g.plot.X1, g.plot.Y0+lw/2, g.plot.Y1)
	if err != nil {
		return err
	}
	g.m = m

	// Line ends and their labels.
	g.labels = nil
	if single {
		return nil
	}
	lineH := ls * 1.15
	var want []float64
	for i := range g.Data.Series {
		sr := &g.Data.Series[i]
		k := len(sr.Values) - 1
		for k >= 0 && math.IsNaN(sr.Values[k]) {
			k--
		}
		if k < 0 {
			return fmt.Errorf("term %q has no values in the span", sr.Term)
		}
		end := m.Apply(years[k], sr.Values[k])
		want = append(want, end.Y)
		g.labels = append(g.labels, Label{Term: sr.Term, Style: Styles[i], EndX: end.X, EndY: end.Y,
			Width: sample + ls*0.4 + fs.Width(fonts.Bold, ls, sr.Term), Height: lineH})
	}
	placed, err := Spread(want, lineH, g.plot.Y0+lineH*0.4, g.plot.Y1)
	if err != nil {
		return fmt.Errorf("line-end labels: %v; make the insert taller", err)
	}
	capH := fs.Metrics(fonts.Bold, ls).CapHeight
	for i := range g.labels {
		l := &g.labels[i]
		l.Y = placed[i]
		l.Baseline = l.Y - capH/2
		l.X = g.plot.X1 + ls*0.5
	}
	return nil
}

// layoutRows places one strip per term between top and bottom: term
// labels in a column at the left, the shared y-range's top and zero at the
// right of the first strip, the year ticks under the last.
func (g *Graphic) layoutRows(top, bottom float64) error {
	t := g.Output.Type
	fs := g.Fonts
	lead := g.leading()
	ls, ts := t.Label.Pt(), t.Ticks.Pt()
	left := 0.0
	for _, sr := range g.Data.Series {
		left = math.Max(left, fs.Width(fonts.Bold, ls, sr.Term))
		left = math.Max(left, fs.Width(fonts.Regular, ts, g.peakText(sr.PeakYear)))
	}
	right := 0.0
	for _, v := range []float64{0, g.yMax} {
		right = math.Max(right, fs.Width(fonts.Regular, ts, g.formatValue(v)))
	}
	x0 := g.pad + left + ls*0.8
	x1 := g.w - g.pad - right - ts*0.5
	y1 := top - ts*lead - ts*0.7 // room for the scale note above
	n := len(g.Data.Series)
	gap := math.Max(ls*0.6, (y1-bottom)*0.06)
	stripH := (y1 - bottom - float64(n-1)*gap) / float64(n)
	floorW, floorH := 6*ls, 2.2*ls
	if x1-x0 < floorW || stripH < floorH {
		return &noRoom{rows: true, plot: fmt.Sprintf("the plot would be %s × %s, %d rows %s tall each",
			g.Output.Describe(specs.Length(math.Max(x1-x0, 0))), g.Output.Describe(specs.Length(math.Max(y1-bottom, 0))), n,
			g.Output.Describe(specs.Length(math.Max(stripH, 0))))}
	}
	g.plot = rectPt{X0: x0, Y0: bottom, X1: x1, Y1: y1}
	lw := g.Output.Line.Pt()
	years := g.Data.Years
	capH := fs.Metrics(fonts.Bold, ls).CapHeight
	g.rows = nil
	for i, sr := range g.Data.Series {
		ry1 := y1 - float64(i)*(stripH+gap)
		r := rectPt{X0: x0, Y0: ry1 - stripH, X1: x1, Y1: ry1}
		m, err := curve.NewMap(years[0], years[len(years)-1], 0, g.yMax, x0, x1, r.Y0+lw/2, r.Y1-g.dotRadius())
		if err != nil {
			return err
		}
		row := Row{Term: sr.Term, Plot: r, Map: m}
		// The term sits level with the middle of its strip; the peak year
		// under it when the strip has room for both lines.
		mid := (r.Y0 + r.Y1) / 2
		row.Baseline = mid - capH/2
		if stripH >= ls*lead+ts*lead {
			row.Baseline = mid + (ls*lead-ts*lead)/2 - capH/2 + ts*lead/2
			row.PeakLine = row.Baseline - ts*lead - ts*0.1
		}
		g.rows = append(g.rows, row)
	}
	g.m = g.rows[0].Map // every row maps years alike (colorAt uses it)
	return nil
}

// fitNote is the line above the plot that says what the values are: the
// unit, the smoothing, the band and (in rows) that every row has one
// scale — the longest of those wordings, dropping parts from the end,
// that fits width.
func (g *Graphic) fitNote(width float64, band string) string {
	ts := g.Output.Type.Ticks.Pt()
	unit := page.UnitText(g.Spec, g.Data)
	parts := []string{unit}
	if band != "" {
		parts = append(parts, band)
	}
	if g.Rowed() {
		parts = append(parts, g.Spec.Phrase(specs.PhraseSameScale))
	}
	for n := len(parts); n > 1; n-- {
		if note := strings.Join(parts[:n], "; "); g.Fonts.Width(fonts.Regular, ts, note) <= width {
			return note
		}
	}
	return unit
}

// dotRadius is the radius of the dot that marks a row's peak, as on the
// pages: a little wider than the line.
func (g *Graphic) dotRadius() float64 { return math.Max(g.Output.Line.Pt()*1.5, 1.0) }

// peakText is the line under a row's term: "peak 1926".
func (g *Graphic) peakText(year int) string {
	return specs.Fill(g.Spec.Phrase(specs.PhrasePeakLabel), "year", strconv.Itoa(year))
}

// sampleLen is the length of the line-style sample before a label: long
// enough to show a whole dash-dot period.
func (g *Graphic) sampleLen() float64 {
	return math.Max(g.Output.Line.Pt()*15, g.Output.Type.Label.Pt()*1.6)
}

// niceTicks returns about n round tick values from 0 covering peak, and
// the top tick: steps of 1, 2, 2.5 or 5 times a power of ten.
func niceTicks(peak float64, n int) ([]float64, float64) {
	raw := peak / float64(n)
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	step := 10 * p
	for _, f := range []float64{1, 2, 2.5, 5, 10} {
		if f*p >= raw {
			step = f * p
			break
		}
	}
	top := math.Ceil(peak/step-1e-9) * step
	var ticks []float64
	for k := 0; float64(k)*step <= top+step*1e-9; k++ {
		ticks = append(ticks, float64(k)*step)
	}
	return ticks, top
}

// formatValue writes a tick value (a round number: a step of 1, 2, 2.5
// or 5 times a power of ten) with no more digits than it needs, in the
// language's form (decimal comma in German and Spanish).
func (g *Graphic) formatValue(v float64) string { return g.Spec.FormatSignificant(v) }

// Paper is the background colour.
func (g *Graphic) Paper() color.RGBA { return rgba(page.ColorOf(g.Spec.Palette.Paper).RGB()) }

// Draw draws the insert; the context's units are canvas's millimetres
// with the origin at the insert's lower-left corner.
func (g *Graphic) Draw(ctx *canvas.Context) error {
	t := g.Output.Type
	fs := g.Fonts
	if err := fs.Ready(); err != nil { // canvas's fonts, parsed on first use
		return err
	}
	lead := g.leading()
	paper := g.Paper()
	if paper != (color.RGBA{0xff, 0xff, 0xff, 0xff}) {
		fillRect(ctx, 0, 0, g.w, g.h, paper, nil)
	}
	// Title.
	y := g.h - g.pad
	for _, line := range g.title {
		base := fs.Baseline(fonts.Bold, g.titleS, lead, y)
		text(ctx, fs, fonts.Bold, g.titleS, ink, g.pad, base, canvas.Left, line)
		y -= g.titleS * lead
	}
	g.key(ctx)
	if g.Rowed() {
		if err := g.drawRows(ctx); err != nil {
			return err
		}
		g.source(ctx)
		return nil
	}

	// A highlighted term alone: the tint behind the plot and the rule
	// over its name (the title), as its panel has on the pages.
	ts := t.Ticks.Pt()
	pr := g.plot
	if len(g.Data.Series) == 1 && g.Spec.Highlighted(g.Data.Series[0].Term) {
		fillRect(ctx, pr.X0, pr.Y0, pr.X1, pr.Y1, draw.HighlightTint, nil)
		ry := g.titleRule()
		line(ctx, g.pad, ry, g.w-g.pad, ry, draw.HighlightRule(g.rule), ink, nil)
	}

	// Grid: a rule at every y tick, labelled on the left.
	for i, v := range g.yTicks {
		yy := g.m.Y(v)
		col := ruleGrey
		if i == 0 {
			col = axisGrey
		}
		line(ctx, pr.X0, yy, pr.X1, yy, g.rule, col, nil)
		mt := fs.Metrics(fonts.Regular, ts)
		text(ctx, fs, fonts.Figures, ts, inkSoft, pr.X0-ts*0.6, yy-mt.CapHeight/2, canvas.Right, g.formatValue(v))
	}
	// What the values are, above the y labels.
	text(ctx, fs, fonts.Regular, ts, inkSoft, g.pad, pr.Y1+ts*1.1, canvas.Left, g.scaleNote)

	// Year ticks.
	tick := ts * 0.35
	base := pr.Y0 - tick - fs.Metrics(fonts.Regular, ts).Ascent - ts*0.15
	for _, yr := range tickYears(fs, g.Data.Span, pr.W(), ts) {
		x := g.m.X(float64(yr))
		line(ctx, x, pr.Y0, x, pr.Y0-tick, g.rule, axisGrey, nil)
		text(ctx, fs, fonts.Figures, ts, inkSoft, x, base, canvas.Center, strconv.Itoa(yr))
	}

	// The lines, first term on top: drawn last; a single term's band
	// behind its line.
	var b curve.Builder
	if g.intervals != nil {
		if err := g.band(ctx, &b, &g.Data.Series[0], g.m, g.plot.Y0); err != nil {
			return err
		}
	}
	for i := len(g.Data.Series) - 1; i >= 0; i-- {
		b.Reset()
		if err := g.stroke(ctx, &b, &g.Data.Series[i], g.m, &Styles[i]); err != nil {
			return err
		}
	}

	g.pen(ctx).Notes(g.noteStyle(), g.Notes())

	// Labels at the line ends, with a leader where a label had to move; a
	// highlighted term's label on the highlight's tint.
	ls := t.Label.Pt()
	lw := g.Output.Line.Pt()
	sample := g.sampleLen()
	for _, l := range g.labels {
		if g.Spec.Highlighted(l.Term) {
			b := g.labelTint(l)
			fillRect(ctx, b.X0, b.Y0, b.X1, b.Y1, draw.HighlightTint, nil)
		}
	}
	for _, l := range g.labels {
		if math.Abs(l.Y-l.EndY) > ls*0.25 {
			line(ctx, l.EndX+lw, l.EndY, l.X-ls*0.15, l.Y, g.rule, axisGrey, nil)
		}
		line(ctx, l.X, l.Y, l.X+sample, l.Y, lw, inkSoft, &l.Style)
		text(ctx, fs, fonts.Bold, ls, ink, l.X+sample+ls*0.4, l.Baseline, canvas.Left, l.Term)
	}

	g.source(ctx)
	return nil
}

// noteStyle is how the insert sets annotations: as the pages of the
// output it borrows do (the tick labels' size, its rules and line).
func (g *Graphic) noteStyle() draw.NoteStyle {
	return draw.NoteStyle{Fonts: g.Fonts, Size: g.Output.Type.Ticks.Pt(), Leading: g.leading(), Rule: g.rule, Line: g.Output.Line.Pt()}
}

// Notes are the spec's annotations of the insert's terms, as placed
// (draw.PlaceNotes): on the plot, clear of every line drawn on it; in
// rows, on the term's own strip, clear of its line and peak dot. Item is
// the term's place in the insert; Page is 0.
func (g *Graphic) Notes() []draw.Note { return g.notes }

func (g *Graphic) placeNotes() []draw.Note {
	anns := g.Spec.Annotations
	if len(anns) == 0 {
		return nil
	}
	var out []draw.Note
	place := func(p draw.NotePlot, first int) {
		var idx []int
		for i, a := range anns {
			if slices.Contains(p.Terms, a.Term) {
				idx = append(idx, i)
			}
		}
		ns := draw.PlaceNotes(g.noteStyle(), p, anns, idx)
		for k := range ns {
			ns[k].Item = first + slices.Index(p.Terms, ns[k].Term)
		}
		out = append(out, ns...)
	}
	if g.Rowed() {
		for i, r := range g.rows {
			sr := &g.Data.Series[i]
			p := draw.NotePlot{Plot: r.Plot.layout(), Map: r.Map, Years: g.Data.Years, Terms: []string{sr.Term}, Lines: [][]float64{sr.Values}}
			if sr.Peak > 0 {
				pk := r.Map.Apply(float64(sr.PeakYear), sr.Peak)
				p.Dots = []draw.Dot{{X: pk.X, Y: pk.Y, R: g.dotRadius() + g.rule}}
			}
			place(p, i)
		}
		return out
	}
	p := draw.NotePlot{Plot: g.plot.layout(), Map: g.m, Years: g.Data.Years}
	for i := range g.Data.Series {
		p.Terms = append(p.Terms, g.Data.Series[i].Term)
		p.Lines = append(p.Lines, g.Data.Series[i].Values)
	}
	place(p, 0)
	return out
}

// titleRule is the height of the highlight's rule over the title of a
// single term's insert: just above the title's first line.
func (g *Graphic) titleRule() float64 {
	return g.h - g.pad + draw.HighlightRule(g.rule)/2 + g.titleS*0.1
}

// rowRule is the highlight's rule over a row's term (a line: Y0 = Y1),
// as wide as the term.
func (g *Graphic) rowRule(r Row) rectPt {
	ls := g.Output.Type.Label.Pt()
	x1 := r.Plot.X0 - ls*0.8
	y := r.Baseline + g.Fonts.Metrics(fonts.Bold, ls).CapHeight + ls*0.35
	return rectPt{X0: x1 - g.Fonts.Width(fonts.Bold, ls, r.Term), Y0: y, X1: x1, Y1: y}
}

// labelTint is the tint behind a highlighted term's label at its line's
// end: the sample and the term, inside the line box Spread keeps apart
// (a little short of it, so two highlighted labels side by side stay
// two).
func (g *Graphic) labelTint(l Label) rectPt {
	ls := g.Output.Type.Label.Pt()
	return rectPt{X0: l.X - ls*0.25, Y0: l.Y - l.Height/2 + ls*0.06, X1: l.X + l.Width + ls*0.25, Y1: l.Y + l.Height/2 - ls*0.06}
}

func (g *Graphic) pen(ctx *canvas.Context) draw.Pen { return draw.Pen{Ctx: ctx, Fonts: g.Fonts} }

// source draws the source line at the foot.
func (g *Graphic) source(ctx *canvas.Context) {
	if g.Spec.Source == "" {
		return
	}
	fs, lead := g.Fonts, g.leading()
	ns := g.Output.Type.Notes.Pt()
	lines := fs.Wrap(fonts.Regular, ns, g.Spec.Source, g.w-2*g.pad)
	for i, s := range lines {
		by := g.pad + float64(len(lines)-1-i)*ns*lead + fs.Metrics(fonts.Regular, ns).Descent
		text(ctx, fs, fonts.Regular, ns, inkSoft, g.pad, by, canvas.Left, s)
	}
}

// drawRows draws the aligned rows: faint year rules through every strip
// (so an event lines up down the rows), each strip's baseline and a faint
// rule at the shared top, the band, the line in the era palette and its
// peak dot, the term and its peak year at the left, the scale at the
// right of the first strip, the year ticks under the last.
func (g *Graphic) drawRows(ctx *canvas.Context) error {
	fs := g.Fonts
	t := g.Output.Type
	ls, ts := t.Label.Pt(), t.Ticks.Pt()
	pr := g.plot
	// What the values are, above the rows, at the left edge.
	text(ctx, fs, fonts.Regular, ts, inkSoft, g.pad, pr.Y1+ts*1.1, canvas.Left, g.scaleNote)
	// A highlighted term, as on the pages: a tint behind its strip (under
	// the year rules) and a rule over its name.
	for _, r := range g.rows {
		if g.Spec.Highlighted(r.Term) {
			fillRect(ctx, r.Plot.X0, r.Plot.Y0, r.Plot.X1, r.Plot.Y1, draw.HighlightTint, nil)
			rr := g.rowRule(r)
			line(ctx, rr.X0, rr.Y0, rr.X1, rr.Y0, draw.HighlightRule(g.rule), ink, nil)
		}
	}
	years := tickYears(fs, g.Data.Span, pr.W(), ts)
	first, last := g.rows[0], g.rows[len(g.rows)-1]
	for _, yr := range years {
		x := first.Map.X(float64(yr))
		line(ctx, x, last.Plot.Y0, x, first.Plot.Y1, g.rule, ruleGrey, nil)
	}
	mt := fs.Metrics(fonts.Regular, ts)
	text(ctx, fs, fonts.Regular, ts, inkSoft, pr.X1+ts*0.5, first.Map.Y(g.yMax)-mt.CapHeight/2, canvas.Left, g.formatValue(g.yMax))
	text(ctx, fs, fonts.Regular, ts, inkSoft, pr.X1+ts*0.5, first.Map.Y(0)-mt.CapHeight/2, canvas.Left, "0")
	var b curve.Builder
	for i, r := range g.rows {
		sr := &g.Data.Series[i]
		line(ctx, r.Plot.X0, r.Map.Y(g.yMax), r.Plot.X1, r.Map.Y(g.yMax), g.rule, ruleGrey, nil)
		line(ctx, r.Plot.X0, r.Plot.Y0, r.Plot.X1, r.Plot.Y0, g.rule, axisGrey, nil)
		b.Reset()
		if g.intervals != nil {
			if err := g.band(ctx, &b, sr, r.Map, r.Plot.Y0); err != nil {
				return err
			}
		}
		if err := g.stroke(ctx, &b, sr, r.Map, nil); err != nil {
			return err
		}
		if sr.Peak > 0 {
			pk := r.Map.Apply(float64(sr.PeakYear), sr.Peak)
			circle(ctx, pk.X, pk.Y, g.dotRadius(), g.colorAt(pk.X)) // no ring: see page's peak dot
		}
		text(ctx, fs, fonts.Bold, ls, ink, r.Plot.X0-ls*0.8, r.Baseline, canvas.Right, sr.Term)
		if r.PeakLine != 0 {
			text(ctx, fs, fonts.Regular, ts, inkSoft, r.Plot.X0-ls*0.8, r.PeakLine, canvas.Right, g.peakText(sr.PeakYear))
		}
	}
	g.pen(ctx).Notes(g.noteStyle(), g.Notes())
	tick := ts * 0.35
	base := last.Plot.Y0 - tick - mt.Ascent - ts*0.15
	for _, yr := range years {
		x := last.Map.X(float64(yr))
		line(ctx, x, last.Plot.Y0, x, last.Plot.Y0-tick, g.rule, axisGrey, nil)
		text(ctx, fs, fonts.Regular, ts, inkSoft, x, base, canvas.Center, strconv.Itoa(yr))
	}
	return nil
}

// band fills a term's uncertainty band through m with a tint of the era
// palette (as the pages do, page.BandPath).
func (g *Graphic) band(ctx *canvas.Context, b *curve.Builder, sr *series.Series, m curve.Map, y float64) error {
	lo, hi := g.Data.Band(sr, g.intervals)
	if lo == nil {
		return nil
	}
	path, err := page.BandPath(b, g.Data.Years, lo, hi, g.yMax, m, g.Output.Line.Pt()*2)
	if err != nil {
		return fmt.Errorf("insert %q, term %q: band: %w", g.Insert.Name, sr.Term, err)
	}
	if path.Empty() {
		return nil
	}
	gr := canvas.NewLinearGradient(canvas.Point{X: g.plot.X0 * mm, Y: y * mm}, canvas.Point{X: g.plot.X1 * mm, Y: y * mm})
	page.AddStops(gr, page.TintStops(g.stops, page.ColorOf(g.Spec.Palette.Paper).RGB(), page.BandStrength),
		float64(g.Data.Span.From), float64(g.Data.Span.To))
	ctx.ResetStyle()
	ctx.SetStrokeColor(canvas.Transparent)
	ctx.SetFillGradient(gr)
	ctx.DrawPath(0, 0, path)
	return nil
}

// stroke draws one term's line through m in the era palette, with a
// dash pattern when st is not nil; isolated years become dots.
func (g *Graphic) stroke(ctx *canvas.Context, b *curve.Builder, sr *series.Series, m curve.Map, st *LineStyle) error {
	lw := g.Output.Line.Pt()
	runs, err := b.Build(g.Data.Years, sr.Values, m, nil)
	if err != nil {
		return fmt.Errorf("insert %q, term %q: %w", g.Insert.Name, sr.Term, err)
	}
	path := &canvas.Path{}
	for _, r := range runs {
		if r.IsDot() {
			circle(ctx, r.Start.X, r.Start.Y, lw/2, g.colorAt(r.Start.X))
			continue
		}
		path.MoveTo(r.Start.X*mm, r.Start.Y*mm)
		for _, z := range r.Beziers {
			path.CubeTo(z.P1.X*mm, z.P1.Y*mm, z.P2.X*mm, z.P2.Y*mm, z.P3.X*mm, z.P3.Y*mm)
		}
	}
	if path.Empty() {
		return nil
	}
	ctx.ResetStyle()
	ctx.SetFillColor(canvas.Transparent)
	ctx.SetStrokeGradient(g.gradient(g.plot.X0, g.plot.X1, g.plot.Y0))
	ctx.SetStrokeWidth(lw * mm)
	ctx.SetStrokeCapper(canvas.RoundCap)
	ctx.SetStrokeJoiner(canvas.RoundJoin)
	if st != nil {
		ctx.SetDashes(0, st.Dashes...)
	}
	ctx.DrawPath(0, 0, path)
	return nil
}

// key draws the key's caption ("Colour shows the year") and the era strip with its first and
// last years, so the insert reads on its own.
func (g *Graphic) key(ctx *canvas.Context) {
	fs := g.Fonts
	ks := g.Output.Type.Key.Pt()
	ts := g.Output.Type.Ticks.Pt()
	caption := g.Spec.Phrase(specs.PhraseKeyTitle)
	capW := fs.Width(fonts.Bold, ks, caption)
	text(ctx, fs, fonts.Bold, ks, ink, g.pad, g.keyY, canvas.Left, caption)
	x0 := g.pad + capW + ks*0.8
	x1 := math.Min(g.w-g.pad, x0+math.Max(capW*2.2, (g.w-2*g.pad)*0.45))
	mt := fs.Metrics(fonts.Bold, ks)
	sy0, sy1 := g.keyY, g.keyY+mt.CapHeight
	fillRect(ctx, x0, sy0, x1, sy1, nil, g.gradient(x0, x1, sy0))
	base := sy0 - ts*0.3 - fs.Metrics(fonts.Regular, ts).Ascent
	text(ctx, fs, fonts.Regular, ts, inkSoft, x0, base, canvas.Left, strconv.Itoa(g.Data.Span.From))
	text(ctx, fs, fonts.Regular, ts, inkSoft, x1, base, canvas.Right, strconv.Itoa(g.Data.Span.To))
}

// gradient is the era palette from x0 to x1.
func (g *Graphic) gradient(x0, x1, y float64) *canvas.LinearGradient {
	gr := canvas.NewLinearGradient(canvas.Point{X: x0 * mm, Y: y * mm}, canvas.Point{X: x1 * mm, Y: y * mm})
	page.AddStops(gr, g.stops, float64(g.Data.Span.From), float64(g.Data.Span.To))
	return gr
}

// colorAt is the palette's colour at plot x.
func (g *Graphic) colorAt(x float64) color.RGBA {
	from, to := float64(g.Data.Span.From), float64(g.Data.Span.To)
	year := from + (x-g.m.X(from))/(g.m.X(to)-g.m.X(from))*(to-from)
	return rgba(g.Palette.At(year).RGB())
}

// tickYears picks round years whose labels leave an em between them.
func tickYears(fs *fonts.Set, span specs.Span, width, size float64) []int {
	return draw.TickYears(fs, span, width, size)
}

func rgba(c palette.RGB) color.RGBA { return draw.RGBA(c) }

// The drawing helpers of package draw, with the context and fonts passed.

func text(ctx *canvas.Context, fs *fonts.Set, st fonts.Style, size float64, col color.Color, x, y float64, align canvas.TextAlign, s string) {
	draw.Pen{Ctx: ctx, Fonts: fs}.Text(st, size, col, x, y, align, s)
}

// line strokes a straight line; with a style, dashed and round-capped.
func line(ctx *canvas.Context, x0, y0, x1, y1, width float64, col color.Color, st *LineStyle) {
	if st != nil {
		draw.Pen{Ctx: ctx}.StyledLine(x0, y0, x1, y1, width, col, st.Dashes...)
		return
	}
	draw.Pen{Ctx: ctx}.Line(x0, y0, x1, y1, width, col)
}

func fillRect(ctx *canvas.Context, x0, y0, x1, y1 float64, col color.Color, g *canvas.LinearGradient) {
	draw.Pen{Ctx: ctx}.FillRect(x0, y0, x1, y1, col, g)
}

func circle(ctx *canvas.Context, x, y, r float64, col color.Color) {
	draw.Pen{Ctx: ctx}.Dot(x, y, r, col, nil, 0)
}
