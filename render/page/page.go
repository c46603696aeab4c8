// Package page draws one page of a feature with canvas: the header or
// running head, the colour key, group headings, every panel (label, curve
// stroked with the era palette, baseline, ticks, peak) and the footer. It
// draws in points with y up, the origin at the MediaBox's lower-left
// corner — the coordinates the layout package computes — so the same
// drawing goes to the PDF writer, the proof rasterizer and SVG.
package page

import (
	"fmt"
	"image/color"
	"math"
	"strconv"
	"sync"

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/curve"
	"sheaf/render/draw"
	"sheaf/render/slug"
	"sheaf/specs"
	"sheaf/specs/series"
)

// Feature is everything a page needs: what was asked, where it goes, the
// data and the colours.
type Feature struct {
	Spec    *specs.Spec
	Output  *specs.Output
	Plan    *layout.Plan
	Data    *series.Set
	Palette palette.Scale
	Fonts   *fonts.Set
	Stops   []palette.Stop // the palette as gradient stops over the span

	labelsOnce sync.Once
	labels     []Label

	// intervals memoizes the band's Poisson intervals (nil: no band).
	intervals *series.Intervals
	slugsOnce sync.Once
	slugs     []string
}

// Slug is the name of item's term in ids and file names: slug.Of made
// unique over the feature's terms in panel order. It does not depend on
// where the panel is, so a reflow leaves a term's SVG ids alone.
func (f *Feature) Slug(item int) string {
	f.slugsOnce.Do(func() {
		terms := make([]string, len(f.Data.Series))
		for i := range f.Data.Series {
			terms[i] = f.Data.Series[i].Term
		}
		f.slugs = slug.All(terms)
	})
	return f.slugs[item]
}

// NewFeature computes what all pages share. Labels are fitted when first
// asked for, so that a caller can fill the fonts' width cache first.
func NewFeature(s *specs.Spec, out *specs.Output, plan *layout.Plan, data *series.Set, pal palette.Scale, fs *fonts.Set) *Feature {
	f := &Feature{Spec: s, Output: out, Plan: plan, Data: data, Palette: pal, Fonts: fs,
		Stops: pal.Stops(float64(data.Span.From), float64(data.Span.To), 0)}
	if out.Band > 0 {
		f.intervals = series.NewIntervals(out.Band)
	}
	return f
}

// Band returns the limits of a panel's uncertainty band (see
// series.Set.Band), or nil when the output draws none.
func (f *Feature) Band(item int) (lo, hi []float64) {
	if f.intervals == nil || item < 0 || item >= len(f.Data.Series) {
		return nil, nil
	}
	return f.Data.Band(&f.Data.Series[item], f.intervals)
}

// band fills the uncertainty band behind a panel's line with a tint of
// the era palette.
func (f *Feature) band(p pen, b *curve.Builder, pn layout.Panel, m curve.Map) error {
	lo, hi := f.Band(pn.Item)
	if lo == nil {
		return nil
	}
	sr := &f.Data.Series[pn.Item]
	path, err := BandPath(b, f.Data.Years, lo, hi, sr.YMax, m, f.Output.Line.Pt()*2)
	if err != nil {
		return fmt.Errorf("panel %q: band: %w", sr.Term, err)
	}
	if path.Empty() {
		return nil
	}
	pr := pn.Plot
	g := p.gradient(pr.X0, pr.X1, pr.Y0)
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	AddStops(g, TintStops(f.Stops, ColorOf(f.Spec.Palette.Paper).RGB(), BandStrength), from, to)
	p.ctx.ResetStyle()
	p.ctx.SetStrokeColor(canvas.Transparent)
	p.ctx.SetFillGradient(g)
	p.ctx.DrawPath(0, 0, path)
	return nil
}

// Grouper is implemented by renderers that keep structure, such as SVG:
// the page calls BeginGroup before a panel's drawing and EndGroup after,
// with a short title and a description for assistive technology.
type Grouper interface {
	BeginGroup(id, title, desc string)
	EndGroup()
}

// Describe returns a panel's title and description: the term, the span
// and the peak, in the spec's words (text.describe).
func (f *Feature) Describe(item int) (title, desc string) {
	sr := &f.Data.Series[item]
	return sr.Term, DescribeTerm(f.Spec, f.Data, sr)
}

// DescribeTerm is the description of one term's line for assistive
// technology: the term, the span, the unit (and smoothing) and the peak
// year, in the spec's phrase for it (text.describe or the language's).
func DescribeTerm(s *specs.Spec, d *series.Set, sr *series.Series) string {
	return specs.Fill(s.Phrase(specs.PhraseDescribe), "term", s.Quote(sr.Term), "span", SpanText(d.Span),
		"unit", UnitText(s, d), "peak", strconv.Itoa(sr.PeakYear))
}

// SpanText writes a span of years with an en dash (years are never
// grouped: 1868–2025 in every language).
func SpanText(sp specs.Span) string { return strconv.Itoa(sp.From) + "–" + strconv.Itoa(sp.To) }

// UnitText is the unit of the plotted values and, with a rolling window,
// the smoothing, in the spec's language: "per million words, 5-year
// rolling share".
func UnitText(s *specs.Spec, d *series.Set) string {
	if n := s.Smoothing(d.Rolling); n != "" {
		return d.Unit + ", " + n
	}
	return d.Unit
}

// Ink colours of the furniture. Text and rules are one ink (black or a
// tint of it) so they never misregister on press.
var (
	ink      = color.RGBA{0x1a, 0x1a, 0x1a, 0xff}
	inkSoft  = color.RGBA{0x5c, 0x5c, 0x5c, 0xff}
	ruleGrey = color.RGBA{0x9a, 0x9a, 0x9a, 0xff}
)

// Hairline is the thinnest rule drawn: 0.25 pt, the usual floor for
// print rules (common practice; thinner lines may break up on press).
const Hairline = 0.25

// ScreenRule is the thinnest rule on screen: one CSS px (0.75 pt), the
// finest line a display draws crisply at 1× (CSS Values and Units Level 3
// §5.2 defines 1 px = 0.75 pt).
const ScreenRule = 0.75

// Rule is the width of baselines, ticks and rules in points: Hairline in
// print, ScreenRule on screen.
func (f *Feature) Rule() float64 {
	if f.Output.Kind == specs.Screen {
		return ScreenRule
	}
	return Hairline
}

// Draw draws page index i of the plan.
// The context's units are canvas's millimetres.
func (f *Feature) Draw(ctx *canvas.Context, i int) error { return f.DrawSome(ctx, i, nil) }

// DrawSome is Draw with only the panels for which keep is true (all when
// keep is nil), and everything else on the page: a renderer that shows
// part of a tall page need not stroke the panels outside it.
func (f *Feature) DrawSome(ctx *canvas.Context, i int, keep func(layout.Panel) bool) error {
	p := pen{ctx: ctx, fonts: f.Fonts}
	if i < 0 || i >= len(f.Plan.Pages) {
		return fmt.Errorf("page %d does not exist (the output has %d)", i+1, len(f.Plan.Pages))
	}
	if err := f.Fonts.Ready(); err != nil { // canvas's fonts, parsed on first use
		return err
	}
	pg := &f.Plan.Pages[i]
	f.paper(p, pg)
	f.placed(p, pg)
	for _, k := range pg.Keys() {
		f.key(p, k)
	}
	for _, h := range pg.Headings {
		f.heading(p, h)
	}
	var b curve.Builder
	for _, pn := range pg.Panels {
		if keep != nil && !keep(pn) {
			continue
		}
		if err := f.groupedPanel(p, &b, pn); err != nil {
			return err
		}
	}
	return nil
}

// DrawPanel draws one panel alone, as placed on its page, for a file of
// its own; set pn.ShowTicks and pn.Ticks to give it year ticks.
// The context's units are canvas's millimetres.
func (f *Feature) DrawPanel(ctx *canvas.Context, pn layout.Panel) error {
	if pn.Item < 0 || pn.Item >= len(f.Data.Series) {
		return fmt.Errorf("panel for item %d does not exist (the output has %d terms)", pn.Item, len(f.Data.Series))
	}
	if err := f.Fonts.Ready(); err != nil {
		return err
	}
	var b curve.Builder
	return f.groupedPanel(pen{ctx: ctx, fonts: f.Fonts}, &b, pn)
}

// groupedPanel draws a panel inside a group with its title and
// description when the renderer keeps structure (Grouper).
func (f *Feature) groupedPanel(p pen, b *curve.Builder, pn layout.Panel) error {
	g, grouping := p.ctx.Renderer.(Grouper)
	if grouping {
		title, desc := f.Describe(pn.Item)
		g.BeginGroup("panel-"+f.Slug(pn.Item), title, desc)
	}
	err := f.panel(p, b, pn)
	if grouping {
		g.EndGroup()
	}
	return err
}

// paper fills the bleed box when the paper is not white, so a colour
// field that touches the trim runs into the bleed.
func (f *Feature) paper(p pen, pg *layout.Page) {
	if pp := f.Spec.Palette.Paper; pp.Space == specs.SpaceSRGB && pp.V == [3]float64{1, 1, 1} {
		return
	}
	r := pg.Bleed
	p.fillRect(r.X0, r.Y0, r.X1, r.Y1, f.PaperColor(), nil)
}

// PaperColor is the colour of the paper (the page background).
func (f *Feature) PaperColor() color.RGBA {
	return rgba(ColorOf(f.Spec.Palette.Paper).RGB())
}

// ColorOf converts a spec colour to a palette colour.
func ColorOf(c specs.Color) palette.Color {
	switch c.Space {
	case specs.SpaceLab:
		return palette.FromLab(palette.Lab{L: c.V[0], A: c.V[1], B: c.V[2]})
	case specs.SpaceOKLCh:
		return palette.FromOKLCh(palette.OKLCh{L: c.V[0], C: c.V[1], H: c.V[2]})
	}
	return palette.FromRGB(palette.RGB{R: c.V[0], G: c.V[1], B: c.V[2]})
}

func rgba(c palette.RGB) color.RGBA { return draw.RGBA(c) }

// placed draws the text lines the layout measured and placed: title, dek,
// running head, source, notes, folio.
func (f *Feature) placed(p pen, pg *layout.Page) {
	for _, t := range pg.Text {
		col := ink
		switch t.Role {
		case layout.RoleSource, layout.RoleNote, layout.RoleRunning, layout.RoleGapNote:
			col = inkSoft
		}
		p.text(t.Style, t.Size, col, t.X, t.Baseline, canvas.Left, t.Text)
	}
}

func (f *Feature) heading(p pen, h layout.Heading) {
	size := f.Output.Type.Heading.Pt()
	p.text(fonts.Bold, size, ink, h.Box.X0, h.Baseline, canvas.Left, h.Text)
	// The rule runs above the heading, where it separates the groups; below
	// it, it would sit on the labels' ascenders.
	p.line(h.Box.X0, h.Box.Y1, h.Box.X1, h.Box.Y1, f.Rule(), ruleGrey)
}

// gradient returns the era palette as a horizontal gradient from x0 to x1.
func (f *Feature) gradient(p pen, x0, x1, y float64) *canvas.LinearGradient {
	g := p.gradient(x0, x1, y)
	AddStops(g, f.Stops, float64(f.Data.Span.From), float64(f.Data.Span.To))
	return g
}

// AddStops puts the palette's stops for the years from–to on a gradient.
// A stepped palette has two stops at each era boundary (the colour before
// and after); canvas's Stops.Add would keep only one of a pair and blend
// the eras, so the stops are appended as they are, in year order.
func AddStops(g *canvas.LinearGradient, stops []palette.Stop, from, to float64) {
	for _, s := range stops {
		t := math.Min(math.Max((s.Year-from)/(to-from), 0), 1)
		g.Stops = append(g.Stops, canvas.Stop{Offset: t, Color: rgba(s.Color)})
	}
}

// tickYears chooses year ticks whose labels never collide (see
// draw.TickYears).
func (f *Feature) tickYears(width, size float64) []int {
	return draw.TickYears(f.Fonts, f.Data.Span, width, size)
}

func (f *Feature) panel(p pen, b *curve.Builder, pn layout.Panel) error {
	sr := &f.Data.Series[pn.Item]
	out := f.Output
	// Label: the term on the left, the peak year on the right.
	f.drawLabel(p, pn, f.Labels()[pn.Item], f.peakText(sr))

	pr := pn.Plot
	lw := out.Line.Pt()
	m, err := f.PlotMap(pn)
	if err != nil {
		return err
	}
	f.underPlot(p, pn, m)
	// Baseline: the zero line, a hairline, broken at gap years.
	f.baseline(p, pn, m)

	if pn.ShowTicks {
		f.ticks(p, pn)
	}
	// The curve: monotone cubic through every year; runs of zeros lie on
	// the baseline (plotted).
	b.Reset()
	if err := f.band(p, b, pn, m); err != nil {
		return err
	}
	runs, err := b.Build(f.Data.Years, f.plotted(sr), m, nil)
	if err != nil {
		return fmt.Errorf("panel %q: %w", sr.Term, err)
	}
	path := &canvas.Path{}
	var dots []curve.Point
	for _, r := range runs {
		if r.IsDot() {
			dots = append(dots, r.Start)
			continue
		}
		path.MoveTo(r.Start.X*mm, r.Start.Y*mm)
		for _, z := range r.Beziers {
			path.CubeTo(z.P1.X*mm, z.P1.Y*mm, z.P2.X*mm, z.P2.Y*mm, z.P3.X*mm, z.P3.Y*mm)
		}
	}
	if !path.Empty() {
		p.strokeGradient(path, f.gradient(p, m.X(f.Data.Years[0]), m.X(f.Data.Years[len(f.Data.Years)-1]), pr.Y0), lw)
	}
	for _, d := range dots {
		p.dot(d.X, d.Y, lw/2, f.colorAt(m, d.X), nil, 0)
	}
	if out.PeakDot && sr.Peak > 0 {
		pk := m.Apply(float64(sr.PeakYear), sr.Peak)
		// No paper-coloured ring: on screen a ring as wide as a rule cut
		// the line on both sides and read as a break in it at 1×.
		p.dot(pk.X, pk.Y, f.peakRadius(), f.colorAt(m, pk.X), nil, 0)
	}
	f.drawNotes(p, pn)
	return nil
}

// peakRadius is the radius of the dot that marks a line's peak: three line
// widths across, so it reads as a bead on the line without a halo, and
// never under 2 pt across in print.
func (f *Feature) peakRadius() float64 { return math.Max(f.Output.Line.Pt()*1.5, 1.0) }

// PlotMap is the map from a panel's data (years, 0 to its y-range top) to
// its plot rectangle. The rectangle is inset by half the line width, and
// at the top and the sides by the peak dot's radius, so neither stroke nor
// dot leaves the plot and touches the label above it.
func (f *Feature) PlotMap(pn layout.Panel) (curve.Map, error) {
	sr := &f.Data.Series[pn.Item]
	pr := pn.Plot
	lw := f.Output.Line.Pt()
	top := lw / 2
	if f.Output.PeakDot {
		top = math.Max(top, f.peakRadius()+f.Rule())
	}
	in := f.peakInset()
	m, err := curve.NewMap(f.Data.Years[0], f.Data.Years[len(f.Data.Years)-1], 0, sr.YMax,
		pr.X0+in, pr.X1-in, pr.Y0+lw/2, pr.Y1-top)
	if err != nil {
		return m, fmt.Errorf("panel %q: %w", sr.Term, err)
	}
	return m, nil
}

// colorAt is the palette's colour at plot x.
func (f *Feature) colorAt(m curve.Map, x float64) color.RGBA {
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	x0, x1 := m.X(from), m.X(to)
	year := from + (x-x0)/(x1-x0)*(to-from)
	return rgba(f.Palette.At(year).RGB())
}

func (f *Feature) ticks(p pen, pn layout.Panel) {
	size := f.Output.Type.Ticks.Pt()
	pr := pn.Plot
	years := f.tickYears(pr.W(), size)
	m, err := f.PlotMap(pn)
	if err != nil {
		return
	}
	tick := size * 0.35
	base := pn.Ticks.Y1 - tick - f.Fonts.Metrics(fonts.Regular, size).Ascent - size*0.15
	for _, y := range years {
		x := m.X(float64(y))
		p.line(x, pr.Y0, x, pr.Y0-tick, f.Rule(), ruleGrey)
	}
	for _, l := range f.tickLabels(pn, m) {
		p.text(fonts.Figures, size, inkSoft, (l.X0+l.X1)/2, base, canvas.Center, l.Text)
	}
}

// tickLabel is a year label under a panel, centred on its tick.
type tickLabel struct {
	Text   string
	X0, X1 float64
}

// tickLabels are the year labels a panel shows: every tick's, less those
// that would reach past tickLabelRoom, where they could run into the
// neighbouring panel's.
func (f *Feature) tickLabels(pn layout.Panel, m curve.Map) []tickLabel {
	size := f.Output.Type.Ticks.Pt()
	lo, hi := f.tickLabelRoom(pn.Plot)
	var out []tickLabel
	for _, y := range f.tickYears(pn.Plot.W(), size) {
		x := m.X(float64(y))
		t := strconv.Itoa(y)
		w := f.Fonts.Width(fonts.Figures, size, t)
		if x-w/2 < lo || x+w/2 > hi {
			continue
		}
		out = append(out, tickLabel{t, x - w/2, x + w/2})
	}
	return out
}

// tickLabelRoom is how far a panel's tick labels may reach: into half the
// gutter on each side less half an em, so labels of neighbouring panels
// always keep at least an em of clear space between them (common
// practice: word space or more between separate numbers).
func (f *Feature) tickLabelRoom(pr layout.Rect) (lo, hi float64) {
	size := f.Output.Type.Ticks.Pt()
	g := 0.0
	if f.Plan != nil {
		g = f.Plan.Gutter
	}
	reach := math.Max(0, g/2-size/2)
	return pr.X0 - reach, pr.X1 + reach
}

// labelFloor is the smallest a label may shrink to: 85 % of its size, but
// never under the preflight type floor (5 pt print, 10 px = 7.5 pt
// screen, common practice for figure text).
func (f *Feature) labelFloor() float64 {
	size := f.Output.Type.Label.Pt()
	floor := 5.0
	if f.Output.Kind == specs.Screen {
		floor = 7.5
	}
	return min(size, max(size*0.85, floor))
}

// peakText is what stands right of the term: the peak year, and with
// each panel on its own y-range, the peak value.
func (f *Feature) peakText(sr *series.Series) string {
	peak := strconv.Itoa(sr.PeakYear)
	if f.Spec.Scale.YRange == specs.YOwn && f.Spec.Scale.Mode != specs.ScaleOwnPeak {
		peak += " · " + f.Spec.FormatSignificant(sr.Peak)
	}
	return peak
}
