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
	"fmt"
	"image"
	"image/color"
	"image/draw"
	"image/png"
	"io"
	"math"

	"github.com/tdewolff/canvas"
	"github.com/tdewolff/canvas/renderers/rasterizer"
)

// flatTolerancePx is the largest distance, in device pixels, between a
// curve and the line segments that replace it: far below what a pixel
// shows.
const flatTolerancePx = 0.05

// Renderer is a canvas.Renderer that rasterizes with flattened strokes.
type Renderer struct {
	ras *rasterizer.Rasterizer
	img *image.RGBA
	tol float64 // flattening tolerance in points
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
	return &Renderer{ras: ras, img: img, tol: flatTolerancePx * 25.4 / dpi}, nil
}

// Size returns the page size in millimetres.
func (r *Renderer) Size() (float64, float64) { return r.ras.Size() }

// RenderPath draws a path; strokes are flattened first (see the package doc).
func (r *Renderer) RenderPath(p *canvas.Path, style canvas.Style, m canvas.Matrix) {
	if style.HasStroke() {
		scale := math.Sqrt(math.Abs(m.Det()))
		if scale == 0 {
			return
		}
		p = p.Flatten(r.tol / scale)
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
func (r *Renderer) RenderText(t *canvas.Text, m canvas.Matrix) { r.ras.RenderText(t, m) }

// RenderImage draws an image.
func (r *Renderer) RenderImage(img image.Image, m canvas.Matrix) { r.ras.RenderImage(img, m) }

// Image finishes drawing and returns the picture.
func (r *Renderer) Image() *image.RGBA {
	r.ras.Close()
	return r.img
}

// Draw renders one page of w × h points: draw gets a context in
// millimetres with the origin at the lower-left corner.
func Draw(w, h, dpi float64, background color.Color, draw func(ctx *canvas.Context) error) (*image.RGBA, error) {
	r, err := New(w, h, dpi, background)
	if err != nil {
		return nil, err
	}
	if err := draw(canvas.NewContext(r)); err != nil {
		return nil, err
	}
	return r.Image(), nil
}

// WritePNG encodes img as PNG with the default compression.
func WritePNG(w io.Writer, img image.Image) error {
	enc := png.Encoder{CompressionLevel: png.DefaultCompression}
	return enc.Encode(w, img)
}

// Crop returns the part of a page image inside the rectangle (x0, y0)–(x1,
// y1), given in points with y up, for a page pageH points tall drawn at
// dpi. Edges round to the nearest pixel.
func Crop(img *image.RGBA, pageH, dpi, x0, y0, x1, y1 float64) *image.RGBA {
	px := func(v float64) int { return int(math.Round(v * dpi / 72)) }
	r := image.Rect(px(x0), px(pageH-y1), px(x1), px(pageH-y0)).Intersect(img.Bounds())
	return img.SubImage(r).(*image.RGBA)
}
