package raster_test

import (
	"bytes"
	"image"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/render/pdf"
	"sheaf/render/tooltest"
)

// page is one test page: its size in points and its drawing.
type page struct {
	w, h float64
	draw func(ctx *canvas.Context) error
}

// writePDF writes the pages to a PDF file with sheaf/render/pdf, every
// box the whole page, and returns its path.
func writePDF(t *testing.T, pages ...page) string {
	t.Helper()
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: "raster test", Date: time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)})
	for _, p := range pages {
		r := canvas.Rect{X0: 0, Y0: 0, X1: p.w, Y1: p.h}
		draw := p.draw
		require.NoError(t, w.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r, Bleed: r, Trim: r}},
			func(c *canvas.Canvas) error { return draw(canvas.NewContext(c)) }))
	}
	require.NoError(t, w.Close())
	path := filepath.Join(t.TempDir(), "in.pdf")
	require.NoError(t, os.WriteFile(path, buf.Bytes(), 0o644))
	return path
}

// poppler renders every page of a PDF with poppler's pdftoppm at dpi,
// full page. Poppler is an independent PDF renderer, so it is the
// reference for where things land and how much they ink.
func poppler(t *testing.T, pdfPath string, dpi float64) []image.Image {
	t.Helper()
	pdftoppm := tooltest.Require(t, "pdftoppm", "poppler-utils")
	dir := t.TempDir()
	cmd := exec.Command(pdftoppm, "-r", strconv.FormatFloat(dpi, 'f', -1, 64), "-png", pdfPath, filepath.Join(dir, "p"))
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "pdftoppm: %s", out)
	files, err := filepath.Glob(filepath.Join(dir, "p-*.png"))
	require.NoError(t, err)
	sort.Strings(files) // pdftoppm pads page numbers to one width
	imgs := make([]image.Image, len(files))
	for i, f := range files {
		imgs[i] = tooltest.ReadPNG(t, f)
	}
	return imgs
}

// popplerCrop renders page 1 of a PDF with pdftoppm's own crop
// (-x -y -W -H).
func popplerCrop(t *testing.T, pdfPath string, dpi float64, r image.Rectangle) image.Image {
	t.Helper()
	pdftoppm := tooltest.Require(t, "pdftoppm", "poppler-utils")
	dir := t.TempDir()
	itoa := strconv.Itoa
	cmd := exec.Command(pdftoppm, "-r", strconv.FormatFloat(dpi, 'f', -1, 64), "-f", "1", "-l", "1", "-singlefile",
		"-x", itoa(r.Min.X), "-y", itoa(r.Min.Y), "-W", itoa(r.Dx()), "-H", itoa(r.Dy()),
		"-png", pdfPath, filepath.Join(dir, "crop"))
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "pdftoppm: %s", out)
	return tooltest.ReadPNG(t, filepath.Join(dir, "crop.png"))
}

func absd(a, b uint8) float64 { return math.Abs(float64(a) - float64(b)) }

// ink is the sum over all pixels of how dark each is (0 white, 1 black),
// in pixels: for black on white it is the inked area, since both
// rasterizers blend coverage straight into the sRGB values.
func ink(img image.Image) float64 {
	b := img.Bounds()
	var s float64
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			c := rgba(img, x, y)
			s += 1 - (float64(c.R)+float64(c.G)+float64(c.B))/(3*255)
		}
	}
	return s
}
