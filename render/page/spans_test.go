package page

import (
	"bytes"
	"image"
	"os"
	"path/filepath"
	"sync/atomic"
	"testing"
	"time"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/palette/press"
	"sheaf/render/draw"
	"sheaf/render/pdf"
	"sheaf/specs"
)

// canvasOnly hands a page's recording on under another type, so the
// Pen finds no renderer that takes shaped spans and has canvas shape and
// set every line, as it did before it drew from layout/fonts' glyphs.
type canvasOnly struct{ *canvas.Canvas }

// spanCount counts the lines recordings carry as shaped spans (the
// writer encodes pages on several goroutines).
type spanCount struct{ atomic.Int64 }

func (*spanCount) Size() (float64, float64)                             { return 0, 0 }
func (*spanCount) RenderPath(*canvas.Path, canvas.Style, canvas.Matrix) {}
func (*spanCount) RenderText(*canvas.Text, canvas.Matrix)               {}
func (n *spanCount) RenderImage(img image.Image, _ canvas.Matrix) {
	if _, ok := img.(draw.SpanImage); ok {
		n.Add(1)
	}
}

// pagePDF writes pages of f into a PDF, its lines drawn from shaped
// spans or (spans false) set by canvas, and counts the spans.
func pagePDF(t *testing.T, f *Feature, pages []int, cond *press.Condition, spans bool, n *spanCount) []byte {
	t.Helper()
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: f.Spec.Title, Date: time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC), Press: cond})
	for _, i := range pages {
		pg := f.Plan.Pages[i]
		r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
		setup := pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}, Marks: &pdf.MarkOptions{}, Press: cond}
		require.NoError(t, w.AddPage(setup, func(c *canvas.Canvas) error {
			if !spans {
				return f.Draw(canvas.NewContext(canvasOnly{c}), i)
			}
			if err := f.Draw(canvas.NewContext(draw.Recording{Canvas: c}), i); err != nil {
				return err
			}
			c.RenderTo(n)
			return nil
		}))
	}
	require.NoError(t, w.Close())
	return buf.Bytes()
}

// A page whose lines the Pen draws from the glyphs layout/fonts shapes
// is byte for byte the page it drew when canvas shaped and set every
// line (canvas.NewTextLine, the reference: the output before the
// change): the demo's first and last print pages (labels, ticks, key,
// notes, folios, German words in the small feature), in the built-in
// faces and in Latin Modern (CFF), in sRGB and for a CMYK press.
func TestPageSpansSameBytes(t *testing.T) {
	lm := func(_ *specs.Spec, out *specs.Output) {
		dir := t.TempDir()
		for name, b := range map[string][]byte{"lm.otf": lmsans10regular.TTF, "lmb.otf": lmsans10bold.TTF} {
			require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
		}
		out.Fonts.Regular, out.Fonts.Bold = filepath.Join(dir, "lm.otf"), filepath.Join(dir, "lmb.otf")
	}
	cond, err := press.New(coatedProfile(t), press.Settings{Registry: "http://www.color.org", InkLimit: 300})
	require.NoError(t, err)
	tests := []struct {
		name string
		f    *Feature
		cond *press.Condition
	}{
		{"demo, built-in faces", demoFeature(t, "print", nil), nil},
		{"demo, Latin Modern (CFF)", demoFeature(t, "print", lm), nil},
		{"demo, CMYK press", demoFeature(t, "print", nil), cond},
		{"small (Maßstab)", smallFeature(t, nil), nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			pages := []int{0, len(tc.f.Plan.Pages) - 1}
			if pages[1] == 0 {
				pages = pages[:1]
			}
			var n spanCount
			want := pagePDF(t, tc.f, pages, tc.cond, false, nil)
			got := pagePDF(t, tc.f, pages, tc.cond, true, &n)
			require.True(t, bytes.Equal(want, got), "the PDFs differ (%d and %d bytes)", len(want), len(got))
			require.Greater(t, n.Load(), int64(10), "lines drawn from shaped spans")
		})
	}
}
