package pdf

import (
	"bytes"
	"image"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/render/tooltest"
)

// TestMarksPositionedByShaperStayText: a letter with a combining mark
// that has no precomposed form (q + U+0301, x + U+0308) is shaped with the
// mark moved onto its base (GPOS mark positioning in DejaVu Sans
// Condensed). Such glyphs used to be drawn as outlines; they are text now:
// pdftotext returns the words, and poppler draws them where canvas puts
// the glyph outlines.
func TestMarksPositionedByShaperStayText(t *testing.T) {
	tooltest.Require(t, "pdftotext", "poppler-utils")
	tooltest.Require(t, "pdftoppm", "poppler-utils")
	f := loadFont(t, dejavusanscondensed.TTF)
	const words = "Maq\u0301ina x\u0308yz"
	face := f.Face(48, canvas.Black)
	moved := false
	canvas.NewTextLine(face, words, canvas.Left).WalkSpans(func(_, _ float64, sp canvas.TextSpan) {
		for _, g := range sp.Glyphs {
			moved = moved || g.XOffset != 0 || g.YOffset != 0
		}
	})
	require.True(t, moved, "the shaper moves the marks (precondition)")

	// The same line as PDF text and as glyph outlines drawn by canvas
	// (Text.RenderAsPath, which places each glyph at its pen position
	// plus its offsets); poppler renders both.
	txt := canvas.NewTextLine(face, words, canvas.Left)
	render := func(outlines bool) image.Image {
		draw := func(c *canvas.Canvas) error {
			ctx := canvas.NewContext(c)
			ctx.SetFillColor(canvas.White)
			ctx.DrawPath(0, 0, canvas.Rectangle(c.W, c.H))
			if outlines {
				txt.RenderAsPath(c, canvas.Identity.Translate(20, 100), canvas.DPMM(0))
			} else {
				ctx.DrawText(20, 100, txt)
			}
			return nil
		}
		var buf bytes.Buffer
		w := NewWriter(&buf, Options{Title: "marks", Date: testDate})
		require.NoError(t, w.AddPage(PageSetup{Boxes: a5Boxes()}, draw))
		require.NoError(t, w.Close())
		dir := t.TempDir()
		p := filepath.Join(dir, "m.pdf")
		require.NoError(t, os.WriteFile(p, buf.Bytes(), 0o644))
		if !outlines {
			text := run(t, "pdftotext", p, "-")
			assert.Contains(t, text, "Ma", "the text is text")
			assert.Contains(t, text, "\u0301", "the mark is text: %q", text)
		}
		out, err := exec.Command("pdftoppm", "-r", "300", "-aa", "no", "-aaVector", "no", "-png", "-singlefile", p, filepath.Join(dir, "m")).CombinedOutput()
		require.NoError(t, err, string(out))
		fh, err := os.Open(filepath.Join(dir, "m.png"))
		require.NoError(t, err)
		defer fh.Close()
		img, err := png.Decode(fh)
		require.NoError(t, err)
		return img
	}
	asText, asOutlines := render(false), render(true)
	bx := a5Boxes()
	res := canvas.DPI(300)
	h := bx.Media.H() * MMPerPt
	r := image.Rect(int(18*res.DPMM()), int((h-125)*res.DPMM()), int(170*res.DPMM()), int((h-90)*res.DPMM()))
	mean, share := tooltest.CompareImages(tooltest.SubImage(asText, r), tooltest.SubImage(asOutlines, r), 48)
	// The worst 60 × 60 pixel window (5 mm, about a mark's size at this
	// scale): edge pixels differ everywhere a little, a misplaced mark
	// differs in one place a lot.
	worst := 0.0
	for y := r.Min.Y; y+60 <= r.Max.Y; y += 20 {
		for x := r.Min.X; x+60 <= r.Max.X; x += 20 {
			w := image.Rect(x, y, x+60, y+60)
			_, s := tooltest.CompareImages(tooltest.SubImage(asText, w), tooltest.SubImage(asOutlines, w), 48)
			worst = max(worst, s)
		}
	}
	t.Logf("text vs outlines: mean abs diff %.3f/255, pixels off by > 48: %.3f %%, worst 60 px window %.2f %%", mean, 100*share, 100*worst)
	// Limits set here: glyphs rendered as text and as paths differ only
	// at their edges (measured: worst window 5.5 %, mean 1.25/255, 0.49 %
	// of pixels); a mark drawn at the pen instead of on its base gave a
	// window of 28 %.
	assert.Less(t, mean, 2.0)
	assert.Less(t, share, 0.01)
	assert.Less(t, worst, 0.12)
}
