package page

import (
	"image/color"

	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/draw"
	"sheaf/specs"
)

// mm is millimetres per point: layout works in points, canvas renderers
// in millimetres.
const mm = specs.MmPerPt

// pen draws on a canvas context in points with the shared helpers of
// package draw (see draw.Pen).
type pen struct {
	ctx   *canvas.Context
	fonts *fonts.Set
}

func (p pen) d() draw.Pen { return draw.Pen{Ctx: p.ctx, Fonts: p.fonts} }

func (p pen) face(st fonts.Style, size float64, col color.Color) *canvas.FontFace {
	return p.d().Face(st, size, col)
}

func (p pen) text(st fonts.Style, size float64, col color.Color, x, y float64, align canvas.TextAlign, s string) {
	p.d().Text(st, size, col, x, y, align, s)
}

func (p pen) line(x0, y0, x1, y1, width float64, col color.Color) {
	p.d().Line(x0, y0, x1, y1, width, col)
}

func (p pen) fillRect(x0, y0, x1, y1 float64, col color.Color, g *canvas.LinearGradient) {
	p.d().FillRect(x0, y0, x1, y1, col, g)
}

func (p pen) dot(x, y, r float64, fill, ring color.Color, ringWidth float64) {
	p.d().Dot(x, y, r, fill, ring, ringWidth)
}

func (p pen) gradient(x0, x1, y float64) *canvas.LinearGradient { return p.d().Gradient(x0, x1, y) }

func (p pen) strokeGradient(path *canvas.Path, g *canvas.LinearGradient, width float64) {
	p.d().StrokeGradient(path, g, width)
}
