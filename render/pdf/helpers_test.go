package pdf

import (
	"bytes"
	"image/color"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
)

// Test drawings are made up here; nothing is taken from a publication.

var testDate = time.Date(2024, 5, 17, 9, 30, 0, 0, time.UTC)

func loadFont(t testing.TB, b []byte) *canvas.Font {
	t.Helper()
	f, err := canvas.LoadFont(b, 0, canvas.FontRegular)
	require.NoError(t, err)
	return f
}

// a5Boxes is A5 trim (ISO 216: 419.528 × 595.276 pt) with 3 mm bleed and
// 12 mm of mark area (print-facts.md: 3 mm bleed, Europe).
func a5Boxes() PageBoxes {
	const mm = 72 / 25.4
	bleed, marks := 3*mm, 12*mm
	tw, th := 419.528, 595.276
	return PageBoxes{
		Media: canvas.Rect{X0: 0, Y0: 0, X1: tw + 2*(bleed+marks), Y1: th + 2*(bleed+marks)},
		Bleed: canvas.Rect{X0: marks, Y0: marks, X1: marks + tw + 2*bleed, Y1: marks + th + 2*bleed},
		Trim:  canvas.Rect{X0: marks + bleed, Y0: marks + bleed, X1: marks + bleed + tw, Y1: marks + bleed + th},
	}
}

// testDrawing draws paths, strokes, dashes, a gradient fill, a gradient
// stroke and text, in canvas millimetres.
func testDrawing(regular, bold *canvas.Font) func(c *canvas.Canvas) error {
	return testDrawingWith(regular, bold, nil)
}

// testDrawingWith draws the same picture for canvas's own rasterizer when
// gradPt is set, working around two of its quirks (canvas v0.0.0-20250728):
// it evaluates gradients in pixel coordinates (y down), while canvas's PDF
// and SVG writers, and this package, take them in canvas millimetres; and
// it ignores the fill rule (its source says "TODO: use fill rule"), so the
// even-odd ring gets a reversed inner circle there, which gives the same
// hole under nonzero.
func testDrawingWith(regular, bold *canvas.Font, gradPt func(c *canvas.Canvas, p canvas.Point) canvas.Point) func(c *canvas.Canvas) error {
	return func(c *canvas.Canvas) error {
		gp := func(x, y float64) canvas.Point {
			if gradPt == nil {
				return canvas.Point{X: x, Y: y}
			}
			return gradPt(c, canvas.Point{X: x, Y: y})
		}
		ctx := canvas.NewContext(c)
		W, H := c.Size()
		// background in the bleed
		ctx.SetFillColor(canvas.Hex("#f4efe4"))
		ctx.DrawPath(0, 0, canvas.Rectangle(W, H))

		// filled shapes, even-odd ring
		ctx.SetFillColor(canvas.Hex("#2b6cb0"))
		ctx.DrawPath(30, 30, canvas.Circle(12))
		ring := canvas.Circle(14).Append(canvas.Circle(7))
		if gradPt != nil {
			ring = canvas.Circle(14).Append(canvas.Circle(7).Reverse())
		}
		ctx.SetFillColor(canvas.Hex("#c05621"))
		ctx.SetFillRule(canvas.EvenOdd)
		ctx.DrawPath(70, 30, ring)
		ctx.SetFillRule(canvas.NonZero)

		// strokes: widths, caps, joins, dashes
		ctx.SetFillColor(canvas.Transparent)
		ctx.SetStrokeColor(canvas.Hex("#22543d"))
		ctx.SetStrokeWidth(2)
		ctx.SetStrokeJoiner(canvas.RoundJoin)
		ctx.SetStrokeCapper(canvas.RoundCap)
		zig := &canvas.Path{}
		zig.MoveTo(0, 0)
		zig.LineTo(15, 20)
		zig.LineTo(30, 0)
		zig.LineTo(45, 20)
		ctx.DrawPath(100, 15, zig)
		ctx.SetStrokeCapper(canvas.ButtCap)
		ctx.SetStrokeJoiner(canvas.MiterJoin)
		ctx.SetDashes(0, 3, 1.5)
		ctx.SetStrokeWidth(1)
		ctx.DrawPath(100, 45, zig)
		ctx.SetDashes(0)

		// gradient fill
		g := canvas.NewLinearGradient(gp(20, 0), gp(130, 0))
		g.Add(0, canvas.Hex("#1a365d"))
		g.Add(0.5, canvas.Hex("#38a169"))
		g.Add(1, canvas.Hex("#ecc94b"))
		ctx.SetFillGradient(g)
		ctx.SetStrokeColor(canvas.Transparent)
		ctx.DrawPath(20, 70, canvas.Rectangle(110, 25))

		// gradient stroke along a curve: the chart line of sheaf
		curve := &canvas.Path{}
		curve.MoveTo(0, 0)
		curve.CubeTo(20, 40, 40, -20, 60, 10)
		curve.CubeTo(75, 30, 95, 0, 110, 25)
		ctx.SetFillColor(canvas.Transparent)
		ctx.SetStrokeGradient(g)
		ctx.SetStrokeWidth(2.5)
		ctx.SetStrokeCapper(canvas.RoundCap)
		ctx.SetStrokeJoiner(canvas.RoundJoin)
		ctx.DrawPath(20, 110, curve)

		// arcs (ellipse), a quadratic Bézier, a miter-clip join (drawn
		// as an outline) and a stroke under a non-uniform view (cm)
		ctx.SetStrokeColor(canvas.Hex("#553c9a"))
		ctx.SetStrokeWidth(1.2)
		ctx.SetDashes(0)
		ctx.SetStrokeJoiner(canvas.RoundJoin)
		ctx.DrawPath(160, 160, canvas.Ellipse(8, 5))
		quad := &canvas.Path{}
		quad.MoveTo(0, 0)
		quad.QuadTo(10, 25, 20, 0)
		ctx.DrawPath(145, 120, quad)
		ctx.SetStrokeJoiner(canvas.MiterClipJoin)
		ctx.SetStrokeWidth(2)
		sharp := &canvas.Path{}
		sharp.MoveTo(0, 0)
		sharp.LineTo(6, 20)
		sharp.LineTo(12, 0)
		ctx.DrawPath(150, 60, sharp)
		ctx.Push()
		ctx.SetView(canvas.Identity.Translate(130, 195).Scale(3, 1))
		ctx.SetStrokeJoiner(canvas.BevelJoin)
		ctx.SetStrokeWidth(1)
		ctx.DrawPath(0, 0, canvas.Rectangle(8, 8))
		ctx.Pop()

		// translucent fill
		ctx.SetStrokeColor(canvas.Transparent)
		ctx.SetFillColor(color.RGBA{R: 0x80, G: 0, B: 0, A: 0x80})
		ctx.DrawPath(120, 20, canvas.Rectangle(20, 40))

		// text
		face := regular.Face(14, canvas.Hex("#1a202c"))
		ctx.DrawText(20, 180, canvas.NewTextLine(face, "Sheaf of words 1820–2020", canvas.Left))
		boldFace := bold.Face(10, canvas.Hex("#702459"))
		ctx.DrawText(20, 165, canvas.NewTextLine(boldFace, "office affine AVATAR", canvas.Left))
		return nil
	}
}

func writeDoc(t testing.TB, opts Options, pages int) []byte {
	t.Helper()
	reg, bold := loadFont(t, goregular.TTF), loadFont(t, gobold.TTF)
	var buf bytes.Buffer
	w := NewWriter(&buf, opts)
	for i := 0; i < pages; i++ {
		setup := PageSetup{Boxes: a5Boxes(), Marks: &MarkOptions{}, Slug: "job demo · sheet.pdf · page " + string(rune('1'+i)) + " · 2024-05-17"}
		require.NoError(t, w.AddPage(setup, testDrawing(reg, bold)))
	}
	require.NoError(t, w.Close())
	return buf.Bytes()
}
