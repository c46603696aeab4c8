package pdf

import (
	"bytes"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"github.com/tdewolff/canvas/renderers/rasterizer"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/render/tooltest"
)

// TestPixelsMatchCanvasRasterizer renders the test drawing (paths,
// strokes, dashes, a gradient fill, a gradient stroke, text, opacity)
// through this package's PDF and poppler's pdftoppm, and through canvas's
// own rasterizer (a reference renderer of the same drawing library), and
// compares the pixels.
//
// Tolerance (set here, not from a standard): the two rasterizers
// anti-alias edges differently and canvas's snaps text to the pixel
// grid, so edge pixels differ; the mean absolute difference per channel
// must stay under 1/255 and fewer than 1 % of pixels may differ by
// more than 48/255 in any channel. A wrong colour, a missing shape or a
// misplaced gradient breaks both limits by far.
func TestPixelsMatchCanvasRasterizer(t *testing.T) {
	tooltest.Require(t, "pdftoppm", "poppler-utils")
	reg, bold := loadFont(t, goregular.TTF), loadFont(t, gobold.TTF)
	const dpi = 100
	res := canvas.DPI(dpi)

	var buf bytes.Buffer
	w := NewWriter(&buf, Options{Title: "pixels", Date: testDate})
	require.NoError(t, w.AddPage(PageSetup{Boxes: a5Boxes()}, testDrawing(reg, bold)))
	require.NoError(t, w.Close())
	dir := t.TempDir()
	pdfPath := filepath.Join(dir, "p.pdf")
	require.NoError(t, os.WriteFile(pdfPath, buf.Bytes(), 0o644))
	out, err := exec.Command("pdftoppm", "-r", "100", "-png", "-singlefile", pdfPath, filepath.Join(dir, "p")).CombinedOutput()
	require.NoError(t, err, "pdftoppm: %s", out)
	f, err := os.Open(filepath.Join(dir, "p.png"))
	require.NoError(t, err)
	got, err := png.Decode(f)
	f.Close()
	require.NoError(t, err)

	b := a5Boxes()
	c := canvas.New(b.Media.W()*MMPerPt, b.Media.H()*MMPerPt)
	toPixels := func(c *canvas.Canvas, p canvas.Point) canvas.Point {
		return canvas.Point{X: p.X * res.DPMM(), Y: (c.H - p.Y) * res.DPMM()}
	}
	require.NoError(t, testDrawingWith(reg, bold, toPixels)(c))
	want := rasterizer.Draw(c, res, canvas.LinearColorSpace{})

	// ISO 32000-1 §8.5.3.3.3: under the even-odd rule the inner circle
	// of two same-direction circles is a hole; the ring is centred at
	// (70, 30) mm on a #f4efe4 background.
	hole := got.At(int(70*res.DPMM()), int((c.H-30)*res.DPMM()))
	r, g, bl, _ := hole.RGBA()
	assert.Equal(t, [3]uint32{0xf4, 0xef, 0xe4}, [3]uint32{r >> 8, g >> 8, bl >> 8}, "even-odd ring centre, want the background #f4efe4")
	require.Equal(t, got.Bounds().Size(), want.Bounds().Size(), "image sizes: pdftoppm, canvas")
	mean, share := tooltest.CompareImages(got, want, 48)
	t.Logf("mean abs diff %.3f/255, pixels off by > 48: %.3f %%", mean, 100*share)
	ok := assert.LessOrEqual(t, mean, 1.0, "PDF rendering differs from canvas: mean abs diff in /255")
	ok = assert.LessOrEqual(t, share, 0.01, "PDF rendering differs from canvas: share of pixels off by > 48") && ok
	if keep := os.Getenv("SHEAF_KEEP_PIXELS"); keep == "always" || (!ok && keep != "") {
		// For a look: SHEAF_KEEP_PIXELS=1 keeps the two images of a failure, =always every time.
		png.Encode(mustCreate(t, "/tmp/pixels_pdf.png"), got)
		png.Encode(mustCreate(t, "/tmp/pixels_canvas.png"), want)
	}
}

func mustCreate(t *testing.T, p string) *os.File {
	f, err := os.Create(p)
	require.NoError(t, err)
	t.Cleanup(func() { f.Close() })
	return f
}
