// Package swatch draws the proof sheet of an era palette: the palette as a
// key strip with year labels, sample curves at the chart's real line
// width coloured year by year, and the same strip and curves as seen with
// simulated protanopia, deuteranopia and tritanopia, with the check
// findings underneath.
//
// Draw works on any *canvas.Canvas, so the sheet can go to PNG (WritePNG)
// or to a vector writer. Lengths here are millimetres, canvas's unit.
package swatch

import (
	"fmt"
	"image/color"
	"image/png"
	"io"
	"math"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/dejavu/dejavusanscondensedbold"
	"github.com/tdewolff/canvas"
	"github.com/tdewolff/canvas/renderers/rasterizer"

	"sheaf/palette"
	"sheaf/palette/press"
	"sheaf/specs"
)

const mmPerPt = specs.MmPerPt

// Sheet geometry, mm.
const (
	Width  = 190.0
	Height = 170.0

	margin   = 10.0
	inner    = Width - 2*margin
	gap      = 6.0                 // between the three deficiency columns
	colWidth = (inner - 2*gap) / 3 // one deficiency column
)

// PressBand is how much taller the sheet is with a printing condition:
// the room for the screen and soft-proof colours side by side.
const PressBand = 44.0

// Size returns the sheet's width and height in millimetres.
func Size() (w, h float64) { return Width, Height }

// SizeFor is the sheet's size with a printing condition (nil: Size).
func SizeFor(cond *press.Condition) (w, h float64) {
	if cond == nil {
		return Size()
	}
	return Width, Height + PressBand
}

// New returns a canvas of Size with the sheet drawn on it.
func New(s palette.Scale, r palette.Report) (*canvas.Canvas, error) { return NewFor(s, r, nil) }

// NewFor is New with a printing condition (see DrawFor).
func NewFor(s palette.Scale, r palette.Report, cond *press.Condition) (*canvas.Canvas, error) {
	w, h := SizeFor(cond)
	c := canvas.New(w, h)
	if err := DrawFor(c, s, r, cond); err != nil {
		return nil, err
	}
	return c, nil
}

// WritePNG draws the sheet and writes it to w as a PNG at dpi dots per
// inch. The rasteriser blends the encoded sRGB values directly (canvas's
// LinearColorSpace), as PDF viewers and browsers do, and flat colours come
// out with exactly the palette's 8-bit values.
func WritePNG(w io.Writer, s palette.Scale, r palette.Report, dpi float64) error {
	return WritePNGFor(w, s, r, dpi, nil)
}

// WritePNGFor is WritePNG with a printing condition (see DrawFor).
func WritePNGFor(w io.Writer, s palette.Scale, r palette.Report, dpi float64, cond *press.Condition) error {
	if !(dpi >= 10 && dpi <= 2400) {
		return fmt.Errorf("swatch: resolution %v dpi: want 10 to 2400", dpi)
	}
	c, err := NewFor(s, r, cond)
	if err != nil {
		return err
	}
	img := rasterizer.Draw(c, canvas.DPI(dpi), canvas.LinearColorSpace{})
	if err := png.Encode(w, img); err != nil {
		return fmt.Errorf("swatch: writing PNG: %w", err)
	}
	return nil
}

// Draw draws the sheet for scale s and its report r (from palette.Check,
// which also gives the paper colour and line width) onto c, whose size
// must be at least Size. It returns an error, drawing nothing, when c is
// too small or the report does not belong to a usable scale.
func Draw(c *canvas.Canvas, s palette.Scale, r palette.Report) error { return DrawFor(c, s, r, nil) }

// DrawFor is Draw with a printing condition: the sheet (SizeFor tall) has
// a band more, the strip and sample curves as on screen and, beside them,
// as the press prints them (soft proof: each colour through the profile
// and back, press.Condition.Proof), so a designer sees what the printer
// sees.
func DrawFor(c *canvas.Canvas, s palette.Scale, r palette.Report, cond *press.Condition) error {
	wantW, wantH := SizeFor(cond)
	if c.W < wantW-1e-9 || c.H < wantH-1e-9 {
		return fmt.Errorf("swatch: canvas %.1f × %.1f mm is smaller than the sheet's %.0f × %.0f mm", c.W, c.H, wantW, wantH)
	}
	from, to := s.Span()
	if len(s.Anchors()) == 0 || !(to > from) {
		return fmt.Errorf("swatch: palette %q has no span to draw", s.Name())
	}
	if !(r.LineWidthPt > 0) || len(r.Rows) == 0 {
		return fmt.Errorf("swatch: palette %q: report has no rows or line width; run palette.Check first", s.Name())
	}
	f, err := loadFonts()
	if err != nil {
		return err
	}
	ctx := canvas.NewContext(c)
	ctx.SetCoordSystem(canvas.CartesianIV) // y grows downwards, like the layout
	d := drawer{ctx: ctx, f: f, s: s, r: r, from: from, to: to, height: wantH,
		ink: rgba(contrasting(r.Paper)), soft: rgba(mix(contrasting(r.Paper), r.Paper, 0.45))}

	d.fill(rgba(r.Paper), 0, 0, c.W, c.H)
	y := margin + 5
	d.text(f.bold, 13, d.ink, margin, y, canvas.Left, fmt.Sprintf("Palette %s, %s–%s", s.Name(), yearText(from), yearText(to)))
	verdict := "passes every check"
	if n := r.Warnings(); n > 0 {
		verdict = fmt.Sprintf("no check fails, %d %s (see below)", n, map[bool]string{true: "warning", false: "warnings"}[n == 1])
	}
	if r.Failed() {
		verdict = "FAILS a check (see below)"
	}
	// The size-aware count, on a line of its own, so the sheet never reads
	// as a clean pass when the lines are too thin for the key's eras.
	classes := fmt.Sprintf("%d distinguishable %s at this line width (Stone, Szafir & Setlur 2014); the key labels %d eras",
		r.Classes, map[bool]string{true: "class", false: "classes"}[r.Classes == 1], r.KeyEras)
	kind := "continuous"
	if s.Discrete() {
		kind = fmt.Sprintf("%d eras", len(s.Eras()))
	}
	y += 5.5
	d.text(f.regular, 8, d.soft, margin, y, canvas.Left, fmt.Sprintf("%s; lines %.2f pt on paper %s, %s at %.0f cm; %s",
		kind, r.LineWidthPt, r.Paper.Hex(), r.Medium, palette.ViewingDistanceMM(r.Medium)/10, verdict))
	y += 4
	d.text(f.regular, 8, d.soft, margin, y, canvas.Left, classes)

	// Normal vision: wide strip and four sample charts.
	y += 6.5
	d.text(f.bold, 9, d.ink, margin, y, canvas.Left, "Normal vision")
	y += 2.5
	ident := func(c palette.Color) palette.Color { return c }
	d.strip(ident, margin, y, inner, 9, 8)
	y += 9 + 7
	cell := (inner - 3*4) / 4
	for i := range 4 {
		d.chart(ident, margin+float64(i)*(cell+4), y, cell, 22, []int{i})
	}
	y += 22 + 10

	if cond != nil {
		y = d.press(cond, y)
	}

	// The three deficiencies side by side.
	for i, def := range palette.Deficiencies() {
		sim := func(c palette.Color) palette.Color { return palette.Simulate(c, def) }
		x := margin + float64(i)*(colWidth+gap)
		d.text(f.bold, 9, d.ink, x, y, canvas.Left, title(def))
		d.strip(sim, x, y+2.5, colWidth, 7, 4)
		d.chart(sim, x, y+2.5+7+6, colWidth, 24, []int{0, 2})
	}
	y += 2.5 + 7 + 6 + 24 + 9

	d.findings(y)
	return nil
}

type fonts struct{ regular, bold *canvas.FontFamily }

func loadFonts() (fonts, error) {
	// The built-in face of every output (layout/fonts): DejaVu Sans
	// Condensed.
	reg := canvas.NewFontFamily("DejaVu Sans Condensed")
	if err := reg.LoadFont(dejavusanscondensed.TTF, 0, canvas.FontRegular); err != nil {
		return fonts{}, fmt.Errorf("swatch: loading DejaVu Sans Condensed: %w", err)
	}
	bold := canvas.NewFontFamily("DejaVu Sans Condensed Bold")
	if err := bold.LoadFont(dejavusanscondensedbold.TTF, 0, canvas.FontRegular); err != nil {
		return fonts{}, fmt.Errorf("swatch: loading DejaVu Sans Condensed Bold: %w", err)
	}
	return fonts{reg, bold}, nil
}

type drawer struct {
	ctx       *canvas.Context
	f         fonts
	s         palette.Scale
	r         palette.Report
	from, to  float64
	height    float64
	ink, soft color.RGBA
}

// press draws the screen and soft-proof colours side by side from y and
// returns the y below them.
func (d drawer) press(cond *press.Condition, y float64) float64 {
	screen := func(c palette.Color) palette.Color { return c }
	proof := func(c palette.Color) palette.Color {
		ink, _ := cond.Ink(c.RGB())
		return palette.FromRGB(cond.Proof(ink))
	}
	half := (inner - gap) / 2
	for i, side := range []struct {
		title string
		see   func(palette.Color) palette.Color
	}{{"On screen (sRGB)", screen}, {"On press (soft proof): " + cond.Identifier, proof}} {
		x := margin + float64(i)*(half+gap)
		d.text(d.f.bold, 9, d.ink, x, y, canvas.Left, clip(side.title, 58))
		d.strip(side.see, x, y+2.5, half, 7, 4)
		d.chart(side.see, x, y+2.5+7+6, half, 20, []int{0, 2})
	}
	return y + 2.5 + 7 + 6 + 20 + 8.5
}

func clip(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}

func (d drawer) fill(col color.RGBA, x, y, w, h float64) {
	d.ctx.Push()
	d.ctx.SetFillColor(col)
	d.ctx.SetStrokeColor(canvas.Transparent)
	d.ctx.DrawPath(x, y, canvas.Rectangle(w, h))
	d.ctx.Pop()
}

func (d drawer) text(fam *canvas.FontFamily, sizePt float64, col color.RGBA, x, y float64, align canvas.TextAlign, s string) {
	d.ctx.DrawText(x, y, canvas.NewTextLine(fam.Face(sizePt, col), s, align))
}

func (d drawer) xOf(year, x, w float64) float64 { return x + w*(year-d.from)/(d.to-d.from) }

// strip draws the key: thin slices for a continuous scale (each slice runs
// on under the next, so no seams show between them), one block per era
// otherwise, then about ticks year labels underneath.
func (d drawer) strip(see func(palette.Color) palette.Color, x, y, w, h float64, ticks int) {
	if eras := d.s.Eras(); len(eras) > 0 {
		for i, e := range eras {
			x0, x1 := d.xOf(math.Max(e.From, d.from), x, w), d.xOf(math.Min(e.To, d.to), x, w)
			if i+1 < len(eras) {
				x1 += 0.3 // under the next block: no anti-aliasing seam
			}
			d.fill(rgba(see(e.Color)), x0, y, x1-x0, h)
		}
	} else {
		const slice = 0.5
		n := int(math.Ceil(w / slice))
		for i := range n {
			x0 := x + float64(i)*w/float64(n)
			year := d.from + (d.to-d.from)*(float64(i)+0.5)/float64(n)
			d.fill(rgba(see(d.s.At(year))), x0, y, math.Min(2*w/float64(n), x+w-x0), h)
		}
	}
	for _, year := range tickYears(d.from, d.to, ticks) {
		tx := d.xOf(year, x, w)
		if year != d.from && year != d.to && (tx-x < 10 || x+w-tx < 10) {
			continue // would crowd an end label
		}
		d.ctx.Push()
		d.ctx.SetStrokeColor(d.soft)
		d.ctx.SetStrokeWidth(0.25 * mmPerPt * 2)
		d.ctx.DrawPath(0, 0, canvas.Line(0, 1.2).Translate(tx, y+h))
		d.ctx.Pop()
		align := canvas.Center
		switch {
		case tx-x < 4:
			align = canvas.Left
		case x+w-tx < 4:
			align = canvas.Right
		}
		d.text(d.f.regular, 6.5, d.soft, tx, y+h+4, align, yearText(year))
	}
}

// chart draws a small-multiple cell with sample curves, each segment
// coloured by its year, stroked at the report's line width.
func (d drawer) chart(see func(palette.Color) palette.Color, x, y, w, h float64, curves []int) {
	d.ctx.Push()
	d.ctx.SetStrokeColor(d.soft)
	d.ctx.SetStrokeWidth(0.3 * mmPerPt)
	d.ctx.DrawPath(x, y+h, canvas.Line(w, 0))
	d.ctx.Pop()
	years := int(math.Ceil(d.to - d.from))
	for _, k := range curves {
		for i := range years {
			y0, y1 := d.from+float64(i), math.Min(d.from+float64(i+1), d.to)
			p := &canvas.Path{}
			p.MoveTo(d.xOf(y0, x, w), y+h*(1-sample(k, (y0-d.from)/(d.to-d.from))))
			p.LineTo(d.xOf(y1, x, w), y+h*(1-sample(k, (y1-d.from)/(d.to-d.from))))
			d.ctx.Push()
			d.ctx.SetFillColor(canvas.Transparent)
			d.ctx.SetStrokeColor(rgba(see(d.s.At((y0 + y1) / 2))))
			d.ctx.SetStrokeWidth(d.r.LineWidthPt * mmPerPt)
			d.ctx.SetStrokeCapper(canvas.RoundCap) // covers the joints between segments
			d.ctx.DrawPath(0, 0, p)
			d.ctx.Pop()
		}
	}
}

// sample is one of four invented word-frequency shapes over t in [0, 1],
// values within [0.05, 0.95]: a rise, a fall, a mid-span peak, a revival.
func sample(k int, t float64) float64 {
	switch k % 4 {
	case 0:
		return 0.08 + 0.84/(1+math.Exp(-10*(t-0.55))) + 0.03*math.Sin(31*t)
	case 1:
		return 0.9 - 0.75*t*t + 0.04*math.Sin(23*t)
	case 2:
		return 0.1 + 0.8*math.Exp(-sq((t-0.45)/0.13)) + 0.03*math.Sin(41*t)
	}
	return 0.5 + 0.3*math.Cos(2*math.Pi*t) + 0.08*math.Sin(17*t)
}

func sq(v float64) float64 { return v * v }

// findings lists the failures and warnings (information lines only when
// room is left), clipped to the space below y.
func (d drawer) findings(y float64) {
	var lines []palette.Finding
	for _, sev := range []palette.Severity{palette.Fail, palette.Warn, palette.Info} {
		for _, f := range d.r.Findings {
			if f.Severity == sev {
				lines = append(lines, f)
			}
		}
	}
	d.text(d.f.bold, 9, d.ink, margin, y, canvas.Left, "Findings")
	y += 1
	if len(lines) == 0 {
		d.text(d.f.regular, 7, d.soft, margin, y+4, canvas.Left, "none")
		return
	}
	face := d.f.regular.Face(6.5, d.ink)
	for i, f := range lines {
		box := canvas.NewTextBox(face, f.String(), inner, 0, canvas.Left, canvas.Top, nil)
		_, h := box.Size()
		if y+h > d.height-margin/2 {
			d.text(d.f.regular, 6.5, d.soft, margin, y+3, canvas.Left, fmt.Sprintf("… and %d more: see the table", len(lines)-i))
			return
		}
		d.ctx.DrawText(margin, y+0.5, box)
		y += h + 0.8
	}
}

func title(d palette.Deficiency) string {
	switch d {
	case palette.Protanopia:
		return "Protanopia (simulated)"
	case palette.Deuteranopia:
		return "Deuteranopia (simulated)"
	case palette.Tritanopia:
		return "Tritanopia (simulated)"
	}
	return d.String()
}

// tickYears picks about n round years in [from, to], always both ends;
// the strip drops those too close to an end to label.
func tickYears(from, to float64, n int) []float64 {
	span := to - from
	step := 1.0
	for _, s := range []float64{1, 2, 5, 10, 20, 25, 50, 100, 200, 250, 500, 1000} {
		step = s
		if span/s <= float64(n) {
			break
		}
	}
	out := []float64{from}
	for y := math.Ceil(from/step) * step; y < to; y += step {
		if y > from {
			out = append(out, y)
		}
	}
	return append(out, to)
}

func yearText(y float64) string {
	if y == math.Trunc(y) {
		return fmt.Sprintf("%.0f", y)
	}
	return fmt.Sprintf("%.1f", y)
}

func rgba(c palette.Color) color.RGBA {
	r, g, b := c.RGB().RGB8()
	return color.RGBA{r, g, b, 255}
}

// contrasting returns black or white, whichever stands out more on paper.
func contrasting(paper palette.Color) palette.Color {
	black, white := palette.FromRGB(palette.RGB{}), palette.FromRGB(palette.RGB{R: 1, G: 1, B: 1})
	if palette.ContrastRatio(black, paper) >= palette.ContrastRatio(white, paper) {
		return black
	}
	return white
}

// mix blends a toward b by t in OKLab.
func mix(a, b palette.Color, t float64) palette.Color {
	p, q := a.OKLab(), b.OKLab()
	return palette.FromOKLab(palette.OKLab{L: p.L + t*(q.L-p.L), A: p.A + t*(q.A-p.A), B: p.B + t*(q.B-p.B)})
}
