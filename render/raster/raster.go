// Package raster draws pages to images for proofs and web PNGs, with
// canvas's rasterizer and two workarounds: canvas sometimes fills a long
// stroked Bézier path as a solid blob (seen on about 2 % of random-walk
// curves), so every stroked path is flattened to line segments first; and
// it evaluates gradients in device pixels, so gradients are mapped there
// before drawing.
// The drawing units are canvas's millimetres, as for every canvas
// renderer; page sizes are given in points.
package raster

import (
	"context"
	"fmt"
	"image"
	"image/color"
	"image/draw"
	"image/png"
	"io"
	"math"

	"github.com/tdewolff/canvas"
	"github.com/tdewolff/canvas/renderers/rasterizer"

	"sheaf/palette"
	"sheaf/palette/press"
	"sheaf/specs"
)

// flatTolerancePx is the largest distance, in device pixels, between a
// curve and the line segments that replace it: far below what a pixel
// shows.
const flatTolerancePx = 0.05

// Renderer is a canvas.Renderer that rasterizes with flattened strokes.
type Renderer struct {
	// done, when not nil, is a cancelled drawing's signal: once it is
	// closed every Render call draws nothing, so a long drawing ends as
	// fast as its paths can be built.
	done  <-chan struct{}
	ras   *rasterizer.Rasterizer
	img   *image.RGBA
	tol   float64       // flattening tolerance in millimetres
	shift canvas.Matrix // page millimetres to the image's region
	dpi   float64
	proof *press.Condition // soft proof: colours as this press prints them
}

// New returns a renderer for a page of w × h points at dpi dots per inch,
// on a background of the given colour.
func New(w, h, dpi float64, background color.Color) (*Renderer, error) {
	if !(w > 0 && h > 0 && dpi > 0) || math.IsInf(w*h*dpi, 0) {
		return nil, fmt.Errorf("raster: page %g × %g pt at %g dpi has no area", w, h, dpi)
	}
	px, py := int(w*dpi/72+0.5), int(h*dpi/72+0.5)
	if px < 1 || py < 1 || px > 40000 || py > 40000 {
		return nil, fmt.Errorf("raster: %d × %d pixels is out of range; change the resolution", px, py)
	}
	img := image.NewRGBA(image.Rect(0, 0, px, py))
	draw.Draw(img, img.Bounds(), image.NewUniform(background), image.Point{}, draw.Src)
	ras := rasterizer.FromImage(img, canvas.DPI(dpi), canvas.DefaultColorSpace)
	// canvas puts y = 0 on the image's bottom edge, but the pixel count
	// was rounded: move the page's top edge onto the image's, where PDF
	// rasterizers put it (row = (h − y)·dpi/72), so a page whose height is
	// not a whole number of pixels is not shifted by the rounding.
	lift := float64(py)*25.4/dpi - h*specs.MmPerPt
	return &Renderer{ras: ras, img: img, tol: flatTolerancePx * 25.4 / dpi, shift: canvas.Identity.Translate(0, lift), dpi: dpi}, nil
}

// Region is the part of a page an image shows, in whole device pixels
// counted from the page's top-left corner, as a PDF rasterizer such as
// poppler's pdftoppm crops with -x -y -W -H.
type Region struct {
	X, Y, W, H int
}

// RegionOf returns the pixels covering the rectangle (x0, y0)–(x1, y1)
// (points, y up) of a page pageH points tall at dpi, edges rounded to the
// nearest pixel.
func RegionOf(pageH, dpi, x0, y0, x1, y1 float64) Region {
	px := func(v float64) int { return int(math.Round(v * dpi / 72)) }
	x, y := px(x0), px(pageH-y1)
	return Region{X: x, Y: y, W: px(x1) - x, H: px(pageH-y0) - y}
}

// NewRegion returns a renderer for region r of a page pageH points tall,
// so a proof of the trim box lands on exactly the pixels a full-page
// rendering would give them.
func NewRegion(pageH, dpi float64, r Region, background color.Color) (*Renderer, error) {
	w, h := float64(r.W)*72/dpi, float64(r.H)*72/dpi
	rr, err := New(w, h, dpi, background)
	if err != nil {
		return nil, err
	}
	// Page point (X, Y) must land at pixel (X·dpi/72 − r.X, (pageH − Y)·dpi/72 − r.Y).
	mmPerPx := 25.4 / dpi
	top := pageH*specs.MmPerPt - float64(r.Y)*mmPerPx // page y (mm) of the region's top edge
	rr.shift = canvas.Identity.Translate(-float64(r.X)*mmPerPx, h*specs.MmPerPt-top)
	return rr, nil
}

// Size returns the page size in millimetres.
func (r *Renderer) Size() (float64, float64) { return r.ras.Size() }

// RenderPath draws a path; strokes are flattened first (see the package doc).
func (r *Renderer) RenderPath(p *canvas.Path, style canvas.Style, m canvas.Matrix) {
	if r.stopped() {
		return
	}
	if r.proof != nil {
		style.Fill = r.proofPaint(style.Fill)
		style.Stroke = r.proofPaint(style.Stroke)
	}
	m = r.shift.Mul(m)
	if style.HasStroke() {
		scale := math.Sqrt(math.Abs(m.Det()))
		if scale == 0 {
			return
		}
		p = p.Flatten(r.tol / scale)
		// canvas's round joiner is slow on the hundreds of short segments a
		// flattened curve has (51 → 17 ms a chart line at 100 dpi, see
		// BenchmarkStrokeWalk); a bevel differs from a round join by at most
		// w/2·(1 − cos(θ/2)) at a turn of θ: under a fifth of a pixel for a
		// 0.7 pt line at 100 dpi even at a right angle. Round caps stay:
		// they are where a line visibly ends.
		if _, ok := style.StrokeJoiner.(canvas.RoundJoiner); ok {
			style.StrokeJoiner = canvas.BevelJoin
		}
	}
	// canvas's rasterizer evaluates gradients at pixel coordinates (y down)
	// without mapping them from the drawing's units, so map them here.
	if style.Fill.IsGradient() || style.Stroke.IsGradient() {
		_, hmm := r.ras.Size()
		dpmm := float64(r.img.Bounds().Dy()) / hmm
		toPixels := canvas.Identity.Translate(0, float64(r.img.Bounds().Dy())).Scale(dpmm, -dpmm).Mul(m)
		if style.Fill.IsGradient() {
			style.Fill.Gradient = style.Fill.Gradient.SetView(toPixels)
		}
		if style.Stroke.IsGradient() {
			style.Stroke.Gradient = style.Stroke.Gradient.SetView(toPixels)
		}
	}
	r.ras.RenderPath(p, style, m)
}

// RenderText draws text.
func (r *Renderer) RenderText(t *canvas.Text, m canvas.Matrix) {
	if r.stopped() {
		return
	}
	if r.proof != nil {
		// as the rasterizer does, but through RenderPath so the glyphs'
		// colours are proofed too
		t.RenderAsPath(r, m, canvas.DPI(r.dpi))
		return
	}
	r.ras.RenderText(t, r.shift.Mul(m))
}

// RenderImage draws an image. A line of shaped text a recording carries
// in an image's place (render/draw's SpanImage) is drawn as the text
// canvas sets it in.
func (r *Renderer) RenderImage(img image.Image, m canvas.Matrix) {
	if s, ok := img.(interface{ Text() *canvas.Text }); ok {
		r.RenderText(s.Text(), m)
		return
	}
	if r.stopped() {
		return
	}
	r.ras.RenderImage(img, r.shift.Mul(m))
}

// Image finishes drawing and returns the picture.
func (r *Renderer) Image() *image.RGBA {
	r.ras.Close()
	return r.img
}

// stopped reports whether the drawing was cancelled.
func (r *Renderer) stopped() bool {
	if r.done == nil {
		return false
	}
	select {
	case <-r.done:
		return true
	default:
		return false
	}
}

// Draw renders one page of w × h points: draw gets a context in
// millimetres with the origin at the lower-left corner.
func Draw(w, h, dpi float64, background color.Color, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	return DrawContext(context.Background(), w, h, dpi, background, draw)
}

// DrawContext is Draw that stops when ctx is cancelled: nothing more is
// drawn and it returns ctx's error.
func DrawContext(ctx context.Context, w, h, dpi float64, background color.Color, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	r, err := New(w, h, dpi, background)
	if err != nil {
		return nil, err
	}
	return r.run(ctx, draw)
}

// run draws with r until done or cancelled.
func (r *Renderer) run(ctx context.Context, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	r.done = ctx.Done()
	err := draw(canvas.NewContext(r))
	if cerr := ctx.Err(); cerr != nil {
		return nil, cerr
	}
	if err != nil {
		return nil, err
	}
	return r.Image(), nil
}

// WritePNG encodes img as PNG with the default compression.
func WritePNG(w io.Writer, img image.Image) error {
	return WritePNGContext(context.Background(), w, img)
}

// WritePNGContext is WritePNG that stops when ctx is cancelled (a tall
// page's PNG takes seconds to compress) and returns ctx's error.
func WritePNGContext(ctx context.Context, w io.Writer, img image.Image) error {
	enc := png.Encoder{CompressionLevel: png.DefaultCompression}
	if ctx.Done() != nil {
		w = ctxWriter{ctx, w}
	}
	if err := enc.Encode(w, img); err != nil {
		if cerr := ctx.Err(); cerr != nil {
			return cerr
		}
		return err
	}
	return nil
}

// ctxWriter fails every write once its context is cancelled.
type ctxWriter struct {
	ctx context.Context
	w   io.Writer
}

func (c ctxWriter) Write(p []byte) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	return c.w.Write(p)
}

// DrawRegion renders region r of a page pageH points tall; draw gets a
// context in page millimetres, as for Draw.
func DrawRegion(pageH, dpi float64, r Region, background color.Color, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	return DrawRegionContext(context.Background(), pageH, dpi, r, background, draw)
}

// DrawRegionContext is DrawRegion that stops when ctx is cancelled:
// nothing more is drawn and it returns ctx's error.
func DrawRegionContext(ctx context.Context, pageH, dpi float64, r Region, background color.Color, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	return ProofRegionContext(ctx, pageH, dpi, r, background, nil, draw)
}

// ProofRegion is DrawRegion as a soft proof for a printing condition: every
// colour (background, fills, strokes, gradients, type) is drawn as the
// press prints it — the colour the PDF carries for that press (greys as
// black ink, gradients as its refined ink ramp) taken back through the
// profile to sRGB (see press.Condition.Proof). With cond nil it is
// DrawRegion.
func ProofRegion(pageH, dpi float64, r Region, background color.Color, cond *press.Condition, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	return ProofRegionContext(context.Background(), pageH, dpi, r, background, cond, draw)
}

// ProofRegionContext is ProofRegion that stops when ctx is cancelled:
// nothing more is drawn and it returns ctx's error.
func ProofRegionContext(ctx context.Context, pageH, dpi float64, r Region, background color.Color, cond *press.Condition, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if cond != nil {
		background = proofColor(cond, color.RGBAModel.Convert(background).(color.RGBA))
	}
	rr, err := NewRegion(pageH, dpi, r, background)
	if err != nil {
		return nil, err
	}
	rr.proof = cond
	return rr.run(ctx, draw)
}

// proofPaint maps a paint's colours to the soft proof.
func (r *Renderer) proofPaint(p canvas.Paint) canvas.Paint {
	switch {
	case p.IsPattern():
		return p
	case p.IsGradient():
		switch g := p.Gradient.(type) {
		case *canvas.LinearGradient:
			c := *g
			c.Stops = proofStops(r.proof, g.Stops)
			p.Gradient = &c
		case *canvas.RadialGradient:
			c := *g
			c.Stops = proofStops(r.proof, g.Stops)
			p.Gradient = &c
		}
		return p
	}
	if p.Color.A == 0 {
		return p
	}
	p.Color = proofColor(r.proof, p.Color)
	return p
}

// proofColor is a premultiplied colour as the press prints it.
func proofColor(cond *press.Condition, c color.RGBA) color.RGBA {
	if c.A == 0 {
		return c
	}
	a := float64(c.A) / 255
	rgb := palette.RGB{R: float64(c.R) / 255 / a, G: float64(c.G) / 255 / a, B: float64(c.B) / 255 / a}
	ink, _ := cond.Ink(rgb)
	return premultiplied(cond.Proof(ink), c.A)
}

func premultiplied(c palette.RGB, alpha uint8) color.RGBA {
	r, g, b := c.Clip().RGB8()
	a := float64(alpha) / 255
	return color.RGBA{uint8(math.Round(float64(r) * a)), uint8(math.Round(float64(g) * a)), uint8(math.Round(float64(b) * a)), alpha}
}

// proofStops are a gradient's stops as the press prints them: the ink ramp
// the PDF carries (press.Condition.Ramp), each stop proofed.
func proofStops(cond *press.Condition, stops canvas.Stops) canvas.Stops {
	if len(stops) == 0 {
		return stops
	}
	alpha := stops[0].Color.A
	in := make([]press.RGBStop, len(stops))
	for i, s := range stops {
		a := math.Max(float64(s.Color.A), 1) / 255
		in[i] = press.RGBStop{Offset: s.Offset, RGB: palette.RGB{R: float64(s.Color.R) / 255 / a, G: float64(s.Color.G) / 255 / a, B: float64(s.Color.B) / 255 / a}}
	}
	ramp := cond.Ramp(in)
	out := make(canvas.Stops, len(ramp))
	for i, s := range ramp {
		out[i] = canvas.Stop{Offset: s.Offset, Color: premultiplied(cond.Proof(s.Ink), alpha)}
	}
	return out
}
