package page

import (
	"image/color"

	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
)

// mm is millimetres per point: layout works in points, canvas renderers
// in millimetres.
const mm = 25.4 / 72

// pen draws on a canvas context in points, converting every coordinate,
// width and font size to canvas's millimetres at the last moment, so no
// view matrix has to be trusted to scale strokes, gradients and text
// alike.
type pen struct {
	ctx   *canvas.Context
	fonts *fonts.Set
}

// face returns a canvas face for size points in colour col.
func (p pen) face(st fonts.Style, size float64, col color.Color) *canvas.FontFace {
	return p.fonts.Font(st).Face(size, col)
}

// text draws one line with its baseline at y; align is about x.
func (p pen) text(st fonts.Style, size float64, col color.Color, x, y float64, align canvas.TextAlign, s string) {
	if s == "" {
		return
	}
	p.ctx.DrawText(x*mm, y*mm, canvas.NewTextLine(p.face(st, size, col), s, align))
}

// line strokes a straight line with butt caps.
func (p pen) line(x0, y0, x1, y1, width float64, col color.Color) {
	p.ctx.ResetStyle()
	p.ctx.SetFillColor(canvas.Transparent)
	p.ctx.SetStrokeColor(col)
	p.ctx.SetStrokeWidth(width * mm)
	p.ctx.SetStrokeCapper(canvas.ButtCap)
	p.ctx.DrawPath(0, 0, canvas.Line((x1-x0)*mm, (y1-y0)*mm).Translate(x0*mm, y0*mm))
}

// fillRect fills a rectangle with a colour or, when g is not nil, a
// gradient.
func (p pen) fillRect(x0, y0, x1, y1 float64, col color.Color, g *canvas.LinearGradient) {
	p.ctx.ResetStyle()
	p.ctx.SetStrokeColor(canvas.Transparent)
	if g != nil {
		p.ctx.SetFillGradient(g)
	} else {
		p.ctx.SetFillColor(col)
	}
	p.ctx.DrawPath(0, 0, canvas.Rectangle((x1-x0)*mm, (y1-y0)*mm).Translate(x0*mm, y0*mm))
}

// dot fills a circle, optionally ringed with a hairline.
func (p pen) dot(x, y, r float64, fill, ring color.Color, ringWidth float64) {
	p.ctx.ResetStyle()
	p.ctx.SetFillColor(fill)
	if ringWidth > 0 {
		p.ctx.SetStrokeColor(ring)
		p.ctx.SetStrokeWidth(ringWidth * mm)
	} else {
		p.ctx.SetStrokeColor(canvas.Transparent)
	}
	p.ctx.DrawPath(x*mm, y*mm, canvas.Circle(r*mm))
}

// gradient returns a horizontal linear gradient from x0 to x1 (points).
func (p pen) gradient(x0, x1, y float64) *canvas.LinearGradient {
	return canvas.NewLinearGradient(canvas.Point{X: x0 * mm, Y: y * mm}, canvas.Point{X: x1 * mm, Y: y * mm})
}

// strokeGradient strokes a path given in millimetres with a gradient,
// round caps and joins.
func (p pen) strokeGradient(path *canvas.Path, g *canvas.LinearGradient, width float64) {
	p.ctx.ResetStyle()
	p.ctx.SetFillColor(canvas.Transparent)
	p.ctx.SetStrokeGradient(g)
	p.ctx.SetStrokeWidth(width * mm)
	p.ctx.SetStrokeCapper(canvas.RoundCap)
	p.ctx.SetStrokeJoiner(canvas.RoundJoin)
	p.ctx.DrawPath(0, 0, path)
}
