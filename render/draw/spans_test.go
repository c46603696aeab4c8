package draw_test

import (
	"bytes"
	"image"
	"image/color"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/go-fonts/latin-modern/lmsans10bold"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout/fonts"
	"sheaf/render/draw"
	"sheaf/render/pdf"
	"sheaf/render/raster"
	"sheaf/render/svg"
	"sheaf/specs"
)

// canvasOnly passes a recording on under another type, so the Pen sees
// no renderer that takes shaped spans and has canvas set every line, as
// it did before it drew from the glyphs layout/fonts shapes.
type canvasOnly struct{ *canvas.Canvas }

// spanCounter counts the lines a recording carries as shaped spans and as
// canvas texts.
type spanCounter struct{ spans, texts int }

func (c *spanCounter) Size() (float64, float64)                             { return 0, 0 }
func (c *spanCounter) RenderPath(*canvas.Path, canvas.Style, canvas.Matrix) {}
func (c *spanCounter) RenderText(*canvas.Text, canvas.Matrix)               { c.texts++ }
func (c *spanCounter) RenderImage(img image.Image, _ canvas.Matrix) {
	if _, ok := img.(draw.SpanImage); ok {
		c.spans++
	}
}

// penLines draws every label of glyphLabels once in each of a few
// styles, alignments, colours and views, as a page of a print PDF does.
func penLines(p draw.Pen, labels []string) {
	styles := []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic, fonts.Figures}
	aligns := []canvas.TextAlign{canvas.Left, canvas.Center, canvas.Right}
	cols := []color.Color{color.Black, color.RGBA{0xb0, 0x30, 0x20, 0xff}, color.NRGBA{0x20, 0x40, 0xa0, 0x80}}
	for i, s := range labels {
		if i%7 == 3 {
			p.Ctx.Push()
			p.Ctx.SetView(canvas.Identity.Translate(2, 3).Scale(1.25, 1.25))
		}
		x, y := 20+float64(i%5)*110, 20+float64(i/5%60)*12
		p.Text(styles[i%4], 6.5+float64(i%3), cols[i%3], x, y, aligns[i/4%3], s)
		if i%7 == 3 {
			p.Ctx.Pop()
		}
	}
}

// A print PDF whose lines the Pen draws from the glyphs layout/fonts
// shapes is byte for byte the PDF it wrote when canvas shaped and set
// every line (canvas.NewTextLine; the reference), for the demo's labels
// and strings canvas sets otherwise, in a TrueType and a CFF set; and
// most lines did take the shaped spans.
func TestPenSpansSameBytes(t *testing.T) {
	labels := draw.GlyphLabels(t)
	dir := t.TempDir()
	for name, b := range map[string][]byte{"lm.otf": lmsans10regular.TTF, "lmb.otf": lmsans10bold.TTF} {
		require.NoError(t, os.WriteFile(filepath.Join(dir, name), b, 0o644))
	}
	out := &specs.Output{Kind: specs.Print}
	out.Fonts.Regular, out.Fonts.Bold = "lm.otf", "lmb.otf"
	lm, err := fonts.Load(&specs.Spec{Dir: dir}, out)
	require.NoError(t, err)
	for name, fs := range map[string]*fonts.Set{"built-in": defaultFonts(t), "Latin Modern (CFF)": lm} {
		t.Run(name, func(t *testing.T) {
			var counted spanCounter
			doc := func(spans bool) []byte {
				var buf bytes.Buffer
				w := pdf.NewWriter(&buf, pdf.Options{Title: "spans", Date: time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)})
				box := canvas.Rect{X1: 600, Y1: 800}
				require.NoError(t, w.AddPage(pdf.PageSetup{Boxes: pdf.PageBoxes{Media: box, Bleed: box, Trim: box}}, func(c *canvas.Canvas) error {
					var r canvas.Renderer = canvasOnly{c}
					if spans {
						r = draw.Recording{Canvas: c}
					}
					penLines(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs}, labels)
					if spans {
						c.RenderTo(&counted)
					}
					return nil
				}))
				require.NoError(t, w.Close())
				return buf.Bytes()
			}
			want := doc(false)
			got := doc(true)
			require.True(t, bytes.Equal(want, got), "the PDFs differ (%d and %d bytes)", len(want), len(got))
			require.Greater(t, counted.spans, 10*counted.texts, "lines drawn from shaped spans (%d) and by canvas (%d)", counted.spans, counted.texts)
			require.Positive(t, counted.texts, "lines canvas sets itself")
		})
	}
}

// canvasOnlyRenderer passes any renderer on under another type, hiding
// RenderTextSpan: canvas sets every line.
type canvasOnlyRenderer struct{ canvas.Renderer }

// An SVG drawn from shaped spans (svg.Document.RenderTextSpan, called
// directly) is the SVG canvas's lines gave (the reference: the output
// before the change), subset fonts embedded; and a recording replayed
// into the raster renderer (which draws a recorded span as canvas's text)
// gives the same pixels as canvas's lines.
func TestPenSpansSameSVGAndPixels(t *testing.T) {
	labels := draw.GlyphLabels(t)
	fs := defaultFonts(t)
	doc := func(spans bool) []byte {
		d, err := svg.New(600, 800, svg.Options{Title: "spans", EmbedFonts: true})
		require.NoError(t, err)
		var r canvas.Renderer = d
		if !spans {
			r = canvasOnlyRenderer{d}
		}
		penLines(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs}, labels)
		var buf bytes.Buffer
		_, err = d.WriteTo(&buf)
		require.NoError(t, err)
		return buf.Bytes()
	}
	want, got := doc(false), doc(true)
	require.True(t, bytes.Equal(want, got), "the SVGs differ (%d and %d bytes)", len(want), len(got))
	replayed := func(spans bool) []byte { // a recording replayed into the document
		d, err := svg.New(600, 800, svg.Options{Title: "spans", EmbedFonts: true})
		require.NoError(t, err)
		c := canvas.New(600*mmPerPt, 800*mmPerPt)
		var r canvas.Renderer = draw.Recording{Canvas: c}
		if !spans {
			r = canvasOnly{c}
		}
		penLines(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs}, labels)
		c.RenderTo(d)
		var buf bytes.Buffer
		_, err = d.WriteTo(&buf)
		require.NoError(t, err)
		return buf.Bytes()
	}
	require.True(t, bytes.Equal(want, replayed(false)), "a recording replays as the lines were drawn")
	require.True(t, bytes.Equal(want, replayed(true)), "the SVGs of recorded spans differ")
	_, direct := canvas.Renderer(&svg.Document{}).(draw.SpanRenderer)
	require.True(t, direct, "svg.Document takes shaped spans")

	pixels := func(spans bool) []byte {
		img, err := raster.Draw(600, 800, 72, color.White, func(ctx *canvas.Context) error {
			c := canvas.New(600*mmPerPt, 800*mmPerPt)
			var r canvas.Renderer = draw.Recording{Canvas: c}
			if !spans {
				r = canvasOnly{c}
			}
			penLines(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs}, labels[:200])
			c.RenderTo(ctx)
			return nil
		})
		require.NoError(t, err)
		return img.Pix
	}
	require.True(t, bytes.Equal(pixels(false), pixels(true)), "the rasters differ")
}

// On a plain *canvas.Canvas (not a draw.Recording) the Pen records
// canvas's own text, never a SpanImage: a recording its caller replays
// into canvas's renderers (which would take a SpanImage for an empty
// image) keeps every line.
func TestPlainCanvasGetsCanvasText(t *testing.T) {
	labels := draw.GlyphLabels(t)[:100]
	fs := defaultFonts(t)
	for name, rec := range map[string]bool{"plain canvas": false, "Recording": true} {
		c := canvas.New(600*mmPerPt, 800*mmPerPt)
		var r canvas.Renderer = c
		if rec {
			r = draw.Recording{Canvas: c}
		}
		penLines(draw.Pen{Ctx: canvas.NewContext(r), Fonts: fs}, labels)
		var counted spanCounter
		c.RenderTo(&counted)
		if rec {
			assert.Greater(t, counted.spans, counted.texts, name)
		} else {
			assert.Zero(t, counted.spans, name)
			assert.GreaterOrEqual(t, counted.texts, len(labels), name)
		}
	}
}
