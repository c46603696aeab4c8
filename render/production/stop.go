package production

import (
	"context"
	"image"
	"io"

	"github.com/tdewolff/canvas"
)

// stopping is a renderer that draws nothing more once ctx is done, so
// that Ctrl-C ends a large raster between two paths instead of after the
// whole picture (the caller then sees ctx.Err()).
type stopping struct {
	canvas.Renderer
	ctx context.Context
}

func (s stopping) RenderPath(p *canvas.Path, st canvas.Style, m canvas.Matrix) {
	if s.ctx.Err() == nil {
		s.Renderer.RenderPath(p, st, m)
	}
}

func (s stopping) RenderText(t *canvas.Text, m canvas.Matrix) {
	if s.ctx.Err() == nil {
		s.Renderer.RenderText(t, m)
	}
}

func (s stopping) RenderImage(img image.Image, m canvas.Matrix) {
	if s.ctx.Err() == nil {
		s.Renderer.RenderImage(img, m)
	}
}

// stoppable runs draw on a context whose drawing stops when ctx is done,
// and reports ctx's error then.
func stoppable(ctx context.Context, draw func(*canvas.Context) error) func(*canvas.Context) error {
	return func(c *canvas.Context) error {
		if err := draw(canvas.NewContext(stopping{Renderer: c.Renderer, ctx: ctx})); err != nil {
			return err
		}
		return ctx.Err()
	}
}

// ctxWriter fails its next write once ctx is done: a PNG of a hundred
// million pixels takes seconds to compress.
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
