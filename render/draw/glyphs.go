package draw

import (
	"image"
	"image/color"
	"unicode/utf8"

	"github.com/tdewolff/canvas"
	canvastext "github.com/tdewolff/canvas/text"

	"sheaf/layout/fonts"
)

// SpanRenderer is a canvas.Renderer that draws a line of text from its
// shaped glyphs, so the Pen need not have canvas shape the line again
// (canvas.NewTextLine makes a new harfbuzz buffer, and so compiles a new
// shape plan, for every string; layout/fonts keeps its buffers).
// RenderTextSpan(span, m) must draw exactly what RenderText(t, m) draws
// for a canvas.Text t of one line holding only span, with no
// decorations, as canvas.NewTextLine makes it.
type SpanRenderer interface {
	canvas.Renderer
	RenderTextSpan(span canvas.TextSpan, m canvas.Matrix)
}

// SpanImage is how a line of shaped glyphs travels through a recording
// (*canvas.Canvas, which keeps only paths, texts and images) to the
// renderer it is replayed into: a SpanRenderer draws TextSpan() where it
// is asked to draw the image; any other renderer draws Text(), the very
// text canvas would have recorded. As an image it is empty.
type SpanImage interface {
	image.Image
	TextSpan() canvas.TextSpan
	Text() *canvas.Text
}

// Recording is a recording (*canvas.Canvas) that its caller replays only
// into renderers that know a SpanImage (render/pdf's encoder, which
// draws it as glyphs; render/svg and render/raster, which draw it as
// canvas's text): on it, the Pen records a line as a SpanImage instead
// of having canvas shape it again. On a plain *canvas.Canvas the Pen
// records canvas's text, so a recording replayed into canvas's own
// renderers (which would take a SpanImage for an empty image) keeps its
// text.
type Recording struct{ *canvas.Canvas }

// spanImage is the SpanImage the Pen records.
type spanImage struct {
	span  canvas.TextSpan
	align canvas.TextAlign
}

func (s *spanImage) TextSpan() canvas.TextSpan { return s.span }

// Text is what canvas.NewTextLine makes of the line (shaping it again).
func (s *spanImage) Text() *canvas.Text {
	return canvas.NewTextLine(s.span.Face, s.span.Text, s.align)
}

func (*spanImage) ColorModel() color.Model { return color.RGBAModel }
func (*spanImage) Bounds() image.Rectangle { return image.Rectangle{} }
func (*spanImage) At(int, int) color.Color { return color.RGBA{} }

// textSpan draws s as shaped glyphs when the Pen's renderer takes them
// and the line is one that canvas.NewTextLine would set as a single span
// (one script item: one script, one bidi level), and reports whether it
// did; otherwise the caller draws through canvas.
//
// On a Recording the Pen records the span as a SpanImage, which
// render/pdf's encoder draws as glyphs, and sheaf's other renderers draw
// as canvas's text.
func (p Pen) textSpan(face *canvas.FontFace, st fonts.Style, x, y float64, align canvas.TextAlign, s string) bool {
	direct, ok := p.Ctx.Renderer.(SpanRenderer)
	if !ok {
		if _, rec := p.Ctx.Renderer.(Recording); !rec {
			return false
		}
	}
	// DrawText reflects the text for the coordinate systems with y or x
	// down; sheaf draws in canvas's default (CartesianI) only.
	if p.Ctx.CoordSystemView() != canvas.Identity {
		return false
	}
	span, ok := lineSpan(p.Fonts, st, face, align, s)
	if !ok {
		return false
	}
	// as canvas's Context.DrawText places a text
	coord := p.Ctx.CoordView().Dot(canvas.Point{X: x * mm, Y: y * mm})
	m := p.Ctx.CoordSystemView().Mul(p.Ctx.View()).Translate(coord.X, coord.Y)
	if direct != nil {
		direct.RenderTextSpan(span, m)
	} else {
		p.Ctx.RenderImage(&spanImage{span: span, align: align}, m)
	}
	return true
}

// lineSpan is the one span canvas.NewTextLine(face, s, align) sets s in
// (tdewolff/canvas text.go: itemizeString, scriptDirection, Shape,
// textWidth and the alignment offsets, for a line that is one item), with
// the glyphs shaped by fs; ok is false when NewTextLine would set s
// otherwise (several lines or items, decorations, a face with a script,
// language or vertical direction) or fs cannot shape st.
func lineSpan(fs *fonts.Set, st fonts.Style, face *canvas.FontFace, align canvas.TextAlign, s string) (canvas.TextSpan, bool) {
	if len(face.Deco) != 0 || face.Script != 0 || face.Language != "" ||
		face.Direction == canvastext.TopToBottom || face.Direction == canvastext.BottomToTop {
		return canvas.TextSpan{}, false
	}
	level, ok := oneItem(s)
	if !ok {
		return canvas.TextSpan{}, false
	}
	// scriptDirection for horizontal text: the face's direction, else the
	// item's bidi level's.
	dir := face.Direction
	if dir != canvastext.LeftToRight && dir != canvastext.RightToLeft {
		if level%2 == 1 {
			dir = canvastext.RightToLeft
		} else {
			dir = canvastext.LeftToRight
		}
	}
	glyphs, ok := fs.Glyphs(st, s, dir)
	if !ok {
		return canvas.TextSpan{}, false
	}
	// FontFace.textWidth
	var w int32
	for _, g := range glyphs {
		if !g.Vertical {
			w += g.XAdvance
		} else {
			w -= g.YAdvance
		}
	}
	width := face.MmPerEm * float64(w)
	x := 0.0
	span := canvas.TextSpan{X: x, Width: width, Face: face, Text: s, Glyphs: glyphs, Direction: dir, Level: level}
	x += width
	switch align {
	case canvas.Center, canvas.Middle:
		span.X = -x / 2.0
	case canvas.Right:
		span.X = -x
	}
	// reorderSpans moves nothing on a line of one span.
	return span, true
}

// oneItem reports whether canvas's itemizer (itemizeString: bidi
// embedding levels, then script items) makes s a single item whose text
// is s itself, on a single line, and its bidi level.
func oneItem(s string) (level int, ok bool) {
	if s == "" {
		return 0, false
	}
	ascii := true
	for i := 0; i < len(s); i++ {
		if s[i] < 0x20 || s[i] > 0x7e {
			ascii = false
			break
		}
	}
	if ascii {
		// Printable ASCII is one item at level 0: no right-to-left or
		// explicit bidi characters (UAX #9), one script (Latin and
		// Common, which joins its neighbours), no separators.
		// TestOneItemASCII checks this against the itemizer itself.
		return 0, true
	}
	if !utf8.ValidString(s) {
		return 0, false // the itemizer's text would be U+FFFD-mended
	}
	runes := []rune(s)
	for _, r := range runes {
		if canvastext.IsParagraphSeparator(r) {
			return 0, false // NewTextLine breaks the line there
		}
	}
	items := canvastext.ScriptItemizer(runes, canvastext.EmbeddingLevels(runes))
	if len(items) != 1 || items[0].Text != s {
		return 0, false
	}
	return items[0].Level, true
}
