package raster

import (
	"bytes"
	"context"
	"image/color"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
)

// TestDrawStopsWhenCancelled: once the context is cancelled in the middle
// of a drawing, nothing more reaches the image and the drawing ends with
// the context's error; a PNG being written stops at its next write.
// (Go's context package: Done is closed on cancel, Err is then Canceled.)
func TestDrawStopsWhenCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	white := color.RGBA{255, 255, 255, 255}
	var drawnAfter int
	_, err := DrawContext(ctx, 100, 100, 72, white, func(c *canvas.Context) error {
		for i := range 100 {
			if i == 10 {
				cancel() // Ctrl-C in the middle of the page
			}
			c.SetFillColor(canvas.Black)
			c.DrawPath(float64(i)*0.3, 0, canvas.Rectangle(0.3, 35))
			if i >= 10 {
				drawnAfter++
			}
		}
		return nil
	})
	require.ErrorIs(t, err, context.Canceled)
	assert.Equal(t, 90, drawnAfter, "the drawing function runs to its end, cheaply")

	// The same renderer's effect, seen in its pixels: after the cancel
	// nothing is painted.
	r, err := New(100, 100, 72, white)
	require.NoError(t, err)
	ctx2, cancel2 := context.WithCancel(context.Background())
	r.done = ctx2.Done()
	c := canvas.NewContext(r)
	c.SetFillColor(canvas.Black)
	c.DrawPath(0, 0, canvas.Rectangle(10, 10)) // bottom-left corner, before
	cancel2()
	c.DrawPath(20, 20, canvas.Rectangle(10, 10)) // after: dropped
	img := r.Image()
	assert.Equal(t, color.RGBA{0, 0, 0, 255}, img.RGBAAt(5, 98), "painted before the cancel")
	assert.Equal(t, white, img.RGBAAt(70, 40), "nothing painted after the cancel")

	var buf bytes.Buffer
	ctx3, cancel3 := context.WithCancel(context.Background())
	cancel3()
	require.ErrorIs(t, WritePNGContext(ctx3, &buf, img), context.Canceled)
	assert.Zero(t, buf.Len(), "no byte of PNG after the cancel")
}
