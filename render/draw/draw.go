// Package draw holds the drawing helpers that render/page and
// render/insert share: a Pen that draws on a canvas context in points
// (layout's unit) and converts every coordinate, width and font size to
// canvas's millimetres at the last moment, so no view matrix has to be
// trusted to scale strokes, gradients and text alike; the palette's
// colours as image colours; and year ticks whose labels never collide.
package draw

import (
	"image/color"

	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/specs"
)

// mm is millimetres per point: layout works in points, canvas renderers
// in millimetres.
const mm = specs.MmPerPt

// Pen draws on Ctx in points with Fonts.
type Pen struct {
	Ctx   *canvas.Context
	Fonts *fonts.Set
}

// Face returns a canvas face for size points in colour col.
func (p Pen) Face(st fonts.Style, size float64, col color.Color) *canvas.FontFace {
	return p.Fonts.Font(st).Face(size, col)
}

// Text draws one line with its baseline at y; align is about x. A line
// of one script and direction is drawn from the glyphs p.Fonts shapes
// when the renderer takes them (see SpanRenderer); the rest as canvas
// sets it. Both draw the same.
func (p Pen) Text(st fonts.Style, size float64, col color.Color, x, y float64, align canvas.TextAlign, s string) {
	if s == "" {
		return
	}
	face := p.Face(st, size, col)
	if p.textSpan(face, st, x, y, align, s) {
		return
	}
	p.Ctx.DrawText(x*mm, y*mm, canvas.NewTextLine(face, s, align))
}

// Line strokes a straight line with butt caps.
func (p Pen) Line(x0, y0, x1, y1, width float64, col color.Color) {
	p.stroke(width, col, canvas.ButtCap)
	p.Ctx.DrawPath(0, 0, canvas.Line((x1-x0)*mm, (y1-y0)*mm).Translate(x0*mm, y0*mm))
}

// StyledLine strokes a straight line with round caps and dashes (on and
// off lengths as canvas's SetDashes takes them; none: solid).
func (p Pen) StyledLine(x0, y0, x1, y1, width float64, col color.Color, dashes ...float64) {
	p.stroke(width, col, canvas.RoundCap)
	p.Ctx.SetDashes(0, dashes...)
	p.Ctx.DrawPath(0, 0, canvas.Line((x1-x0)*mm, (y1-y0)*mm).Translate(x0*mm, y0*mm))
}

func (p Pen) stroke(width float64, col color.Color, capper canvas.Capper) {
	p.Ctx.ResetStyle()
	p.Ctx.SetFillColor(canvas.Transparent)
	p.Ctx.SetStrokeColor(col)
	p.Ctx.SetStrokeWidth(width * mm)
	p.Ctx.SetStrokeCapper(capper)
}

// FillRect fills a rectangle with a colour or, when g is not nil, a
// gradient.
func (p Pen) FillRect(x0, y0, x1, y1 float64, col color.Color, g *canvas.LinearGradient) {
	p.Ctx.ResetStyle()
	p.Ctx.SetStrokeColor(canvas.Transparent)
	if g != nil {
		p.Ctx.SetFillGradient(g)
	} else {
		p.Ctx.SetFillColor(col)
	}
	p.Ctx.DrawPath(0, 0, canvas.Rectangle((x1-x0)*mm, (y1-y0)*mm).Translate(x0*mm, y0*mm))
}

// Dot fills a circle, ringed with a line of ringWidth when that is > 0.
func (p Pen) Dot(x, y, r float64, fill, ring color.Color, ringWidth float64) {
	p.Ctx.ResetStyle()
	p.Ctx.SetFillColor(fill)
	if ringWidth > 0 {
		p.Ctx.SetStrokeColor(ring)
		p.Ctx.SetStrokeWidth(ringWidth * mm)
	} else {
		p.Ctx.SetStrokeColor(canvas.Transparent)
	}
	p.Ctx.DrawPath(x*mm, y*mm, canvas.Circle(r*mm))
}

// Gradient returns a horizontal linear gradient from x0 to x1 at y.
func (p Pen) Gradient(x0, x1, y float64) *canvas.LinearGradient {
	return canvas.NewLinearGradient(canvas.Point{X: x0 * mm, Y: y * mm}, canvas.Point{X: x1 * mm, Y: y * mm})
}

// StrokeGradient strokes a path given in millimetres with a gradient,
// round caps and joins.
func (p Pen) StrokeGradient(path *canvas.Path, g *canvas.LinearGradient, width float64) {
	p.Ctx.ResetStyle()
	p.Ctx.SetFillColor(canvas.Transparent)
	p.Ctx.SetStrokeGradient(g)
	p.Ctx.SetStrokeWidth(width * mm)
	p.Ctx.SetStrokeCapper(canvas.RoundCap)
	p.Ctx.SetStrokeJoiner(canvas.RoundJoin)
	p.Ctx.DrawPath(0, 0, path)
}

// RGBA is a palette colour as an opaque image colour, clipped to sRGB.
func RGBA(c palette.RGB) color.RGBA {
	r, g, b := c.Clip().RGB8()
	return color.RGBA{r, g, b, 0xff}
}

// TickYears chooses year ticks over span whose labels, set in fs's
// figures (tabular lining) at size, never collide across width points: the smallest
// round step whose spacing leaves a label's width plus an em between
// labels (an em between labels: common practice for axis labels).
func TickYears(fs *fonts.Set, span specs.Span, width, size float64) []int {
	label := fs.Width(fonts.Figures, size, "0000") + size
	perYear := width / float64(span.To-span.From)
	for _, s := range []int{5, 10, 20, 25, 50, 100, 200, 250, 500, 1000} {
		if float64(s)*perYear >= label {
			var ys []int
			for y := (span.From + s - 1) / s * s; y <= span.To; y += s {
				ys = append(ys, y)
			}
			return ys
		}
	}
	return nil
}
