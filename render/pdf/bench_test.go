package pdf

import (
	"fmt"
	"io"
	"math/rand"
	"testing"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	canvaspdf "github.com/tdewolff/canvas/renderers/pdf"
	"golang.org/x/image/font/gofont/goregular"
)

// The benchmark workload of the brief: 4,000 curves of 175 points (random
// walks drawn as cubic Béziers) with gradient strokes and a text label
// each, 48 per page, 84 pages.
const (
	benchCurves  = 4000
	benchPoints  = 175
	benchPerPage = 48
)

type benchData struct {
	font   *canvas.Font
	walks  [][]float64 // y values in [0,1] at equal x steps
	labels []string
}

func newBenchData(tb testing.TB) *benchData {
	rng := rand.New(rand.NewSource(1))
	d := &benchData{font: loadFont(tb, goregular.TTF)}
	for i := 0; i < benchCurves; i++ {
		ys := make([]float64, benchPoints)
		y := 0.5
		for j := range ys {
			y += rng.NormFloat64() * 0.03
			y = min(1, max(0, y))
			ys[j] = y
		}
		d.walks = append(d.walks, ys)
		d.labels = append(d.labels, fmt.Sprintf("term %04d", i))
	}
	return d
}

var benchBoxes = func() PageBoxes {
	const mm = 72 / 25.4
	tw, th, bleed, marks := 210*mm, 297*mm, 3*mm, 12*mm
	o := bleed + marks
	return PageBoxes{
		Media: canvas.Rect{X1: tw + 2*o, Y1: th + 2*o},
		Bleed: canvas.Rect{X0: marks, Y0: marks, X1: marks + tw + 2*bleed, Y1: marks + th + 2*bleed},
		Trim:  canvas.Rect{X0: o, Y0: o, X1: o + tw, Y1: o + th},
	}
}()

// drawBenchPage draws charts [first, first+48) in a 6×8 grid.
func (d *benchData) drawBenchPage(first int) func(c *canvas.Canvas) error {
	return func(c *canvas.Canvas) error {
		ctx := canvas.NewContext(c)
		face := d.font.Face(6, canvas.Black)
		ox, oy := 15+3+10.0, 15+3+10.0 // mm: marks + bleed + margin
		cw, ch := 190.0/6, 277.0/8
		for k := 0; k < benchPerPage && first+k < benchCurves; k++ {
			i := first + k
			x := ox + float64(k%6)*cw
			y := oy + float64(7-k/6)*ch
			w, h := cw-4, ch-10
			g := canvas.NewLinearGradient(canvas.Point{X: x, Y: 0}, canvas.Point{X: x + w, Y: 0})
			// Two stops: canvas's own PDF writer panics on more
			// ("unknown PDF type []pdf.pdfDict", v0.0.0-20250728).
			g.Add(0, canvas.Hex("#3b0f70"))
			g.Add(1, canvas.Hex("#fe9f6d"))
			ctx.SetFillColor(canvas.Transparent)
			ctx.SetStrokeGradient(g)
			ctx.SetStrokeWidth(0.3)
			ctx.SetStrokeJoiner(canvas.RoundJoin)
			ctx.DrawPath(x, y, curve(d.walks[i], w, h))
			ctx.DrawText(x, y+h+4, canvas.NewTextLine(face, d.labels[i], canvas.Left))
		}
		return nil
	}
}

// curve draws a walk through a w×h box as Catmull-Rom cubic Béziers, as
// a chart is built from its data inside the draw function.
func curve(ys []float64, w, h float64) *canvas.Path {
	p := &canvas.Path{}
	n := len(ys)
	dx := w / float64(n-1)
	p.MoveTo(0, ys[0]*h)
	for j := 0; j+1 < n; j++ {
		y0, y1, y2, y3 := ys[max(0, j-1)], ys[j], ys[j+1], ys[min(n-1, j+2)]
		x1 := float64(j) * dx
		p.CubeTo(x1+dx/3, (y1+(y2-y0)/6)*h, x1+2*dx/3, (y2-(y3-y1)/6)*h, x1+dx, y2*h)
	}
	return p
}

func pagesNeeded() int { return (benchCurves + benchPerPage - 1) / benchPerPage }

func BenchmarkDocument(b *testing.B) {
	d := newBenchData(b)
	b.Run("sheaf", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			w := NewWriter(io.Discard, Options{Title: "bench", Date: testDate})
			for p := 0; p < pagesNeeded(); p++ {
				require.NoError(b, w.AddPage(PageSetup{Boxes: benchBoxes, Marks: &MarkOptions{}}, d.drawBenchPage(p*benchPerPage)))
			}
			require.NoError(b, w.Close())
		}
	})
	b.Run("canvas", func(b *testing.B) {
		b.ReportAllocs()
		W, H := benchBoxes.Media.W()*MMPerPt, benchBoxes.Media.H()*MMPerPt
		for b.Loop() {
			r := canvaspdf.New(io.Discard, W, H, nil)
			for p := 0; p < pagesNeeded(); p++ {
				if p > 0 {
					r.NewPage(W, H)
				}
				c := canvas.New(W, H)
				require.NoError(b, d.drawBenchPage(p*benchPerPage)(c))
				c.RenderTo(r)
			}
			require.NoError(b, r.Close())
		}
	})
}
