package draw_test

import (
	"bufio"
	"bytes"
	"fmt"
	"image"
	"image/color"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"testing"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	canvaspdf "github.com/tdewolff/canvas/renderers/pdf"

	"sheaf/layout/fonts"
	"sheaf/render/draw"
	"sheaf/render/tooltest"
)

func TestMain(m *testing.M) { tooltest.Main(m) }

// mmPerPt is the outside definition the package's conversion is checked
// against: 1 pt = 1/72 in (ISO 32000-1 §8.3.2.3, default user space
// unit) and 1 in = 25.4 mm exactly (international inch, 1959).
const mmPerPt = 25.4 / 72

var black = color.RGBA{0, 0, 0, 0xff}

func defaultFonts(t testing.TB) *fonts.Set {
	t.Helper()
	fs, err := fonts.Default()
	require.NoError(t, err)
	return fs
}

// recorded is one call a Renderer received: a path's bounds in canvas
// millimetres (after the context's matrix) with its style, or a text's
// origin and face.
type recorded struct {
	bounds canvas.Rect
	style  canvas.Style
	text   *canvas.Text
	origin canvas.Point
}

// recorder is a canvas.Renderer that keeps what it is asked to draw, so
// the Pen's output can be read in canvas's own unit (mm) with no
// renderer in between.
type recorder struct {
	w, h  float64
	calls []recorded
}

func (r *recorder) Size() (float64, float64) { return r.w, r.h }

func (r *recorder) RenderPath(p *canvas.Path, st canvas.Style, m canvas.Matrix) {
	r.calls = append(r.calls, recorded{bounds: p.Transform(m).Bounds(), style: st})
}

func (r *recorder) RenderText(t *canvas.Text, m canvas.Matrix) {
	r.calls = append(r.calls, recorded{text: t, origin: m.Dot(canvas.Point{})})
}

func (r *recorder) RenderImage(image.Image, canvas.Matrix) {}

// pdfOf draws with a Pen on a page of w × h points and returns the PDF
// canvas's own PDF renderer writes (no code of ours between the Pen and
// the file).
func pdfOf(t *testing.T, fs *fonts.Set, w, h float64, drawWith func(draw.Pen)) string {
	t.Helper()
	var buf bytes.Buffer
	r := canvaspdf.New(&buf, w*mmPerPt, h*mmPerPt, nil)
	drawWith(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs})
	require.NoError(t, r.Close())
	path := filepath.Join(t.TempDir(), "pen.pdf")
	require.NoError(t, os.WriteFile(path, buf.Bytes(), 0o644))
	return path
}

// inkBox is the box around every inked pixel of page 1 as poppler's
// pdftoppm renders it at dpi with anti-aliasing off, in PDF points from
// the page's lower-left corner (pixel edges, so it is good to 72/dpi).
func inkBox(t *testing.T, pdfPath string, dpi float64) [4]float64 {
	t.Helper()
	pdftoppm := tooltest.Require(t, "pdftoppm", "poppler-utils")
	base := filepath.Join(t.TempDir(), "ink")
	// -gray without -png writes a binary PGM (Netpbm P5): a short text
	// header and one byte a pixel, read here without a PNG decoder.
	out, err := exec.Command(pdftoppm, "-r", strconv.FormatFloat(dpi, 'f', -1, 64), "-aa", "no", "-aaVector", "no",
		"-gray", "-singlefile", pdfPath, base).CombinedOutput()
	require.NoError(t, err, "pdftoppm: %s", out)
	raw, err := os.ReadFile(base + ".pgm")
	require.NoError(t, err)
	src := bytes.NewReader(raw)
	r := bufio.NewReader(src)
	var magic string
	var w, h, maxval int
	_, err = fmt.Fscan(r, &magic, &w, &h, &maxval)
	require.NoError(t, err, "PGM header")
	require.Equal(t, "P5", magic, "PGM magic")
	require.Equal(t, 255, maxval, "PGM maxval")
	_, err = r.ReadByte() // the single white space after maxval
	require.NoError(t, err)
	pix := raw[len(raw)-src.Len()-r.Buffered():]
	require.Len(t, pix, w*h, "PGM pixels")
	x0, y0, x1, y1 := w, h, -1, -1
	for y := range h {
		for x, g := range pix[y*w : (y+1)*w] {
			if g < 0x80 {
				x0, y0, x1, y1 = min(x0, x), min(y0, y), max(x1, x), max(y1, y)
			}
		}
	}
	require.LessOrEqual(t, x0, x1, "nothing inked")
	k := 72 / dpi
	return [4]float64{float64(x0) * k, float64(h-y1-1) * k, float64(x1+1) * k, float64(h-y0) * k}
}

// word is one word pdftotext -bbox reports, in points from the page's
// top-left corner.
type word struct {
	x0, y0, x1, y1 float64
	text           string
}

func popplerWords(t *testing.T, pdfPath string) []word {
	t.Helper()
	pdftotext := tooltest.Require(t, "pdftotext", "poppler-utils")
	out, err := exec.Command(pdftotext, "-bbox", pdfPath, "-").CombinedOutput()
	require.NoError(t, err, "pdftotext: %s", out)
	re := regexp.MustCompile(`<word xMin="([-\d.]+)" yMin="([-\d.]+)" xMax="([-\d.]+)" yMax="([-\d.]+)">([^<]*)</word>`)
	var ws []word
	for _, m := range re.FindAllStringSubmatch(string(out), -1) {
		var v [4]float64
		for i := range v {
			v[i], err = strconv.ParseFloat(m[i+1], 64)
			require.NoError(t, err)
		}
		ws = append(ws, word{v[0], v[1], v[2], v[3], m[5]})
	}
	return ws
}
