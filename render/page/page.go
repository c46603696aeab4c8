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

	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/curve"
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
}

// NewFeature computes what all pages share.
func NewFeature(s *specs.Spec, out *specs.Output, plan *layout.Plan, data *series.Set, pal palette.Scale, fs *fonts.Set) *Feature {
	return &Feature{Spec: s, Output: out, Plan: plan, Data: data, Palette: pal, Fonts: fs,
		Stops: pal.Stops(float64(data.Span.From), float64(data.Span.To), 0)}
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

// Draw draws page index i of the plan.
// The context's units are canvas's millimetres.
func (f *Feature) Draw(ctx *canvas.Context, i int) error {
	p := pen{ctx: ctx, fonts: f.Fonts}
	if i < 0 || i >= len(f.Plan.Pages) {
		return fmt.Errorf("page %d does not exist (the output has %d)", i+1, len(f.Plan.Pages))
	}
	pg := &f.Plan.Pages[i]
	f.paper(p, pg)
	f.placed(p, pg)
	f.key(p, pg)
	for _, h := range pg.Headings {
		f.heading(p, h)
	}
	var b curve.Builder
	for _, pn := range pg.Panels {
		if err := f.panel(p, &b, pn); err != nil {
			return err
		}
	}
	return nil
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

func rgba(c palette.RGB) color.RGBA {
	r, g, b := c.Clip().RGB8()
	return color.RGBA{r, g, b, 0xff}
}

func (f *Feature) leading() float64 {
	if l := f.Output.Type.Leading; l > 0 {
		return l
	}
	return 1.2
}

// placed draws the text lines the layout measured and placed: title, dek,
// running head, source, notes, folio.
func (f *Feature) placed(p pen, pg *layout.Page) {
	for _, t := range pg.Text {
		col := ink
		switch t.Role {
		case layout.RoleSource, layout.RoleNote, layout.RoleRunning:
			col = inkSoft
		}
		p.text(t.Style, t.Size, col, t.X, t.Baseline, canvas.Left, t.Text)
	}
}

func (f *Feature) heading(p pen, h layout.Heading) {
	size := f.Output.Type.Heading.Pt()
	p.text(fonts.Bold, size, ink, h.Box.X0, h.Baseline, canvas.Left, h.Text)
	p.line(h.Box.X0, h.Box.Y0, h.Box.X1, h.Box.Y0, Hairline, ruleGrey)
}

// gradient returns the era palette as a horizontal gradient from x0 to x1.
func (f *Feature) gradient(p pen, x0, x1, y float64) *canvas.LinearGradient {
	g := p.gradient(x0, x1, y)
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	for _, s := range f.Stops {
		g.Add((s.Year-from)/(to-from), rgba(s.Color))
	}
	return g
}

// tickYears chooses year ticks whose labels never collide: the smallest
// round step whose spacing leaves a label's width plus an em between
// labels.
func (f *Feature) tickYears(width, size float64) []int {
	span := f.Data.Span
	label := f.Fonts.Width(fonts.Regular, size, "0000") + size
	perYear := width / float64(span.To-span.From)
	step := 0
	for _, s := range []int{5, 10, 20, 25, 50, 100, 200, 250, 500, 1000} {
		if float64(s)*perYear >= label {
			step = s
			break
		}
	}
	if step == 0 {
		return nil
	}
	var ys []int
	for y := (span.From + step - 1) / step * step; y <= span.To; y += step {
		ys = append(ys, y)
	}
	return ys
}

func (f *Feature) panel(p pen, b *curve.Builder, pn layout.Panel) error {
	sr := &f.Data.Series[pn.Item]
	t := f.Output.Type
	out := f.Output
	// Label: the term on the left, the peak year on the right.
	lsize := t.Label.Pt()
	base := pn.LabelBaseline
	peak := strconv.Itoa(sr.PeakYear)
	if f.Spec.Scale.YRange == specs.YOwn && f.Spec.Scale.Mode != specs.ScaleOwnPeak {
		peak += " · " + formatValue(sr.Peak)
	}
	tsize := t.Ticks.Pt()
	peakW := f.Fonts.Width(fonts.Regular, tsize, peak)
	room := pn.Label.W() - peakW - tsize*0.8
	term := f.fit(sr.Term, lsize, room)
	p.text(fonts.Bold, lsize, ink, pn.Label.X0, base, canvas.Left, term)
	p.text(fonts.Regular, tsize, inkSoft, pn.Label.X1, base, canvas.Right, peak)

	pr := pn.Plot
	// Baseline: the zero line, a hairline.
	p.line(pr.X0, pr.Y0, pr.X1, pr.Y0, Hairline, ruleGrey)

	if pn.ShowTicks {
		f.ticks(p, pn)
	}
	// The curve: monotone cubic through every year, inset by half the line
	// width so the stroke stays inside the plot rectangle.
	lw := out.Line.Pt()
	inset := lw / 2
	m, err := curve.NewMap(f.Data.Years[0], f.Data.Years[len(f.Data.Years)-1], 0, sr.YMax,
		pr.X0, pr.X1, pr.Y0+inset, pr.Y1-inset)
	if err != nil {
		return fmt.Errorf("panel %q: %w", sr.Term, err)
	}
	b.Reset()
	runs, err := b.Build(f.Data.Years, sr.Values, m, nil)
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
		p.strokeGradient(path, f.gradient(p, pr.X0, pr.X1, pr.Y0), lw)
	}
	for _, d := range dots {
		p.dot(d.X, d.Y, lw/2, f.colorAt(m, d.X), nil, 0)
	}
	if out.PeakDot && sr.Peak > 0 {
		pk := m.Apply(float64(sr.PeakYear), sr.Peak)
		p.dot(pk.X, pk.Y, math.Max(lw*1.1, 1.0), f.colorAt(m, pk.X), f.PaperColor(), Hairline)
	}
	return nil
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
	from, to := float64(f.Data.Span.From), float64(f.Data.Span.To)
	tick := size * 0.35
	base := pn.Ticks.Y1 - tick - f.Fonts.Metrics(fonts.Regular, size).Ascent - size*0.15
	for _, y := range years {
		x := pr.X0 + (float64(y)-from)/(to-from)*pr.W()
		p.line(x, pr.Y0, x, pr.Y0-tick, Hairline, ruleGrey)
	}
	for _, y := range years {
		x := pr.X0 + (float64(y)-from)/(to-from)*pr.W()
		p.text(fonts.Regular, size, inkSoft, x, base, canvas.Center, strconv.Itoa(y))
	}
}

// fit shortens a label to width: first by shrinking the type down to 80 %
// of its size (not done here: layout keeps one size per output so panels
// read alike), then with an ellipsis. It returns the text to draw.
func (f *Feature) fit(s string, size, width float64) string {
	if f.Fonts.Width(fonts.Bold, size, s) <= width {
		return s
	}
	r := []rune(s)
	for n := len(r) - 1; n > 0; n-- {
		t := string(r[:n]) + "…"
		if f.Fonts.Width(fonts.Bold, size, t) <= width {
			return t
		}
	}
	return "…"
}

// formatValue prints a value with three significant digits.
func formatValue(v float64) string {
	switch {
	case v >= 100:
		return strconv.FormatFloat(v, 'f', 0, 64)
	case v >= 10:
		return strconv.FormatFloat(v, 'f', 1, 64)
	}
	return strconv.FormatFloat(v, 'g', 3, 64)
}
