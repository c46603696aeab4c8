package pdf

import (
	"sort"

	"github.com/tdewolff/canvas"
	canvastext "github.com/tdewolff/canvas/text"
)

// fontUse records the glyphs a page shows in one font.
type fontUse struct {
	data   *fontData
	glyphs map[uint16]string
}

func (f *fontUse) pageFont() PageFont {
	pf := PageFont{Key: f.data.key, font: f.data}
	for id, t := range f.glyphs {
		pf.Glyphs = append(pf.Glyphs, GlyphUse{ID: id, Text: t})
	}
	sort.Slice(pf.Glyphs, func(i, j int) bool { return pf.Glyphs[i].ID < pf.Glyphs[j].ID })
	return pf
}

// useFont returns the page-local index of a font (/F<index>).
func (e *encoder) useFont(d *fontData) int {
	if i, ok := e.fontIndex[d]; ok {
		return i
	}
	i := len(e.fonts)
	e.fonts = append(e.fonts, &fontUse{data: d, glyphs: map[uint16]string{}})
	e.fontIndex[d] = i
	return i
}

// spanImage is a line of shaped text as a recording (*canvas.Canvas)
// carries it to the encoder, in an image's place: render/draw's Pen
// records its lines so (draw.SpanImage), having shaped them with the
// buffers layout/fonts keeps, and the encoder draws the span as
// RenderTextSpan.
type spanImage interface {
	TextSpan() canvas.TextSpan
}

// RenderText writes horizontal text as real text (embedded TrueType or
// CFF font, searchable through ToUnicode). What PDF text cannot say as
// canvas means it — vertical writing, rotated glyphs, outlines that
// cannot be embedded — is drawn as glyph outlines instead. A font whose licence
// forbids embedding is an error: its outlines may not go into the file.
func (e *encoder) RenderText(t *canvas.Text, m canvas.Matrix) {
	e.op++
	if e.err != nil || t == nil || t.Empty() {
		return
	}
	if !matrixFinite(m) {
		e.fail("text transformation %v is not finite", m)
		return
	}
	if t.WritingMode != canvas.HorizontalTB {
		t.RenderAsPath(e, m, 0)
		return
	}
	t.WalkDecorations(func(fill canvas.Paint, p *canvas.Path) {
		style := canvas.DefaultStyle
		style.Fill = fill
		e.RenderPath(p, style, m)
	})
	t.WalkSpans(func(x, y float64, span canvas.TextSpan) { e.span(x, y, span, m) })
}

// RenderTextSpan draws what RenderText draws for a text of one line that
// holds only span and has no decorations (draw.SpanRenderer): the span
// where canvas's Text.WalkSpans puts the span of a first line.
func (e *encoder) RenderTextSpan(span canvas.TextSpan, m canvas.Matrix) {
	e.op++
	if e.err != nil || span.Face == nil {
		return
	}
	if !matrixFinite(m) {
		e.fail("text transformation %v is not finite", m)
		return
	}
	var lineY float64 // the first line's
	face := span.Face
	e.span(span.X+face.MmPerEm*float64(face.XOffset), -lineY+face.MmPerEm*float64(face.YOffset), span, m)
}

// span draws one span of a text at (x, y) in the text's space.
func (e *encoder) span(x, y float64, span canvas.TextSpan, m canvas.Matrix) {
	if e.err != nil {
		return
	}
	if !span.IsText() {
		for _, obj := range span.Objects {
			obj.Canvas.RenderViewTo(e, m.Mul(obj.View(x, y, span.Face)))
		}
		return
	}
	if len(span.Glyphs) == 0 {
		return
	}
	d, err := e.keys.get(span.Face.Font.SFNT)
	if err == nil && d.refusal != "" {
		e.fail("font %s: %s", d.psName, d.refusal)
		return
	}
	if err != nil || !d.embeddable || !spanIsPlain(span) {
		e.spanOutlines(x, y, span, m)
		return
	}
	e.spanText(x, y, span, m, d)
}

// spanIsPlain reports whether a span can be shown as PDF text: no
// rotated or vertical glyphs (glyph offsets are shown, see spanText).
func spanIsPlain(span canvas.TextSpan) bool {
	if span.Rotation != canvastext.NoRotation {
		return false
	}
	for _, g := range span.Glyphs {
		if g.Vertical {
			return false
		}
	}
	return true
}

// glyphTexts assigns each glyph the source text of its cluster, so a
// ligature maps back to all its letters. Clusters are byte offsets into
// the span's text.
func glyphTexts(span canvas.TextSpan) []string {
	out := make([]string, len(span.Glyphs))
	n := len(span.Text)
	for i, g := range span.Glyphs {
		start := int(g.Cluster)
		if i > 0 && span.Glyphs[i-1].Cluster == g.Cluster {
			continue // later glyphs of one cluster carry no text
		}
		end := n
		for j := i + 1; j < len(span.Glyphs); j++ {
			if c := int(span.Glyphs[j].Cluster); c > start {
				end = c
				break
			}
		}
		if start >= 0 && start < end && end <= n {
			out[i] = span.Text[start:end]
		} else if g.Text != 0 {
			out[i] = string(g.Text)
		}
	}
	return out
}

func (e *encoder) spanText(x, y float64, span canvas.TextSpan, m canvas.Matrix, d *fontData) {
	face := span.Face
	e.inText = true
	defer func() { e.inText = false }()
	if !e.setPaint(face.Fill, false) {
		return
	}
	fi := e.useFont(d)
	use := e.fonts[fi]
	texts := glyphTexts(span)
	for i, g := range span.Glyphs {
		if _, ok := use.glyphs[g.ID]; !ok || use.glyphs[g.ID] == "" {
			use.glyphs[g.ID] = texts[i]
		}
	}

	tm := m.Translate(x, y)
	if face.FauxItalic != 0 {
		tm = tm.Shear(face.FauxItalic, 0)
	}
	mat := pdfMatrix(tm, ptPerMM)
	size := face.Size * ptPerMM
	if !finite(size) || size <= 0 {
		e.fail("font size %g is not positive", face.Size)
		return
	}
	e.buf = append(e.buf, "BT\n"...)
	mode := 0
	if face.FauxBold > 0 {
		mode = 2
		if !e.setPaint(face.Fill, true) {
			mode = 0
		} else {
			e.buf = appendNum(e.buf, face.FauxBold*2*ptPerMM)
			e.buf = append(e.buf, " w\n"...)
			e.st.lineWidth = round3(face.FauxBold * 2 * ptPerMM)
		}
	}
	if mode != e.st.textMode {
		e.buf = append(e.buf, byte('0'+mode))
		e.buf = append(e.buf, " Tr\n"...)
		e.st.textMode = mode
	}
	// The text state (font, size, mode) persists across BT/ET
	// (ISO 32000-1 §9.3.1), so it is set only when it changes.
	if e.st.font != fi || e.st.fontSize != round3(size) {
		e.buf = append(e.buf, "/F"...)
		e.buf = appendNum(e.buf, float64(fi))
		e.buf = append(e.buf, ' ')
		e.buf = appendNum(e.buf, size)
		e.buf = append(e.buf, " Tf\n"...)
		e.st.font, e.st.fontSize = fi, round3(size)
	}
	// Glyph codes are the original glyph IDs (Identity-H; CIDToGIDMap
	// Identity for TrueType, an identity charset for CFF); subsets keep
	// IDs unchanged. A TJ number moves the next glyph by -n/1000
	// text-space units, so a shaped advance that differs from the font's
	// own becomes one. A glyph the shaper moved off the pen (a mark set
	// on its base, GPOS) or that moves the pen vertically is shown alone
	// at its own text matrix; the run after it starts a new one.
	upem := float64(d.unitsPerEm)
	scale := face.Size / upem
	var penX, penY int32
	startRun := func(dx, dy int32) {
		at := mat
		if dx != 0 || dy != 0 {
			at = pdfMatrix(tm.Translate(float64(dx)*scale, float64(dy)*scale), ptPerMM)
		}
		e.buf = appendNums(e.buf, at[:]...)
		e.buf = append(e.buf, " Tm\n["...)
	}
	inRun, open := false, false
	endRun := func() {
		if open {
			e.buf = append(e.buf, '>')
			open = false
		}
		if inRun {
			e.buf = append(e.buf, "] TJ\n"...)
			inRun = false
		}
	}
	for _, g := range span.Glyphs {
		if g.XOffset != 0 || g.YOffset != 0 || g.YAdvance != 0 {
			endRun()
			startRun(penX+g.XOffset, penY+g.YOffset)
			e.buf = append(e.buf, '<')
			e.buf = appendHex4(e.buf, g.ID)
			e.buf = append(e.buf, ">] TJ\n"...)
			penX += g.XAdvance
			penY += g.YAdvance
			continue
		}
		if !inRun {
			startRun(penX, penY)
			inRun = true
		}
		if !open {
			e.buf = append(e.buf, '<')
			open = true
		}
		e.buf = appendHex4(e.buf, g.ID)
		if adv := d.advance(g.ID); int32(adv) != g.XAdvance {
			e.buf = append(e.buf, "> "...)
			e.buf = appendNum(e.buf, -float64(g.XAdvance-int32(adv))*1000/upem)
			e.buf = append(e.buf, ' ')
			open = false
		}
		penX += g.XAdvance
	}
	endRun()
	e.buf = append(e.buf, "ET\n"...)
}

func appendHex4(b []byte, v uint16) []byte {
	const hex = "0123456789ABCDEF"
	return append(b, hex[v>>12], hex[v>>8&15], hex[v>>4&15], hex[v&15])
}

// spanOutlines draws a span's glyphs as filled paths.
func (e *encoder) spanOutlines(x, y float64, span canvas.TextSpan, m canvas.Matrix) {
	face := span.Face
	sfnt := face.Font.SFNT
	scale := face.Size / float64(sfnt.Head.UnitsPerEm)
	p := &canvas.Path{}
	px, py := 0.0, 0.0
	for _, g := range span.Glyphs {
		gx := px + float64(g.XOffset)*scale
		gy := py + float64(g.YOffset)*scale
		if err := sfnt.GlyphPath(p, g.ID, 0, gx, gy, scale, 0); err != nil {
			e.fail("glyph %d of %q: %v", g.ID, span.Text, err)
			return
		}
		px += float64(g.XAdvance) * scale
		py += float64(g.YAdvance) * scale
	}
	style := canvas.DefaultStyle
	style.Fill = face.Fill
	tm := m.Translate(x, y).Rotate(float64(span.Rotation))
	if face.FauxItalic != 0 {
		tm = tm.Shear(face.FauxItalic, 0)
	}
	if face.FauxBold > 0 {
		style.Stroke = face.Fill
		style.StrokeWidth = face.FauxBold * 2
	}
	e.RenderPath(p, style, tm)
}

// showRun writes a run of text in a font the writer supplies itself (the
// slug), without shaping: glyphs from the cmap, advances from hmtx.
func (e *encoder) showRun(d *fontData, s string, size, x, y float64) {
	fi := e.useFont(d)
	use := e.fonts[fi]
	e.buf = append(e.buf, "BT\n"...)
	if e.st.textMode != 0 {
		e.buf = append(e.buf, "0 Tr\n"...)
		e.st.textMode = 0
	}
	if e.st.font != fi || e.st.fontSize != round3(size) {
		e.buf = append(e.buf, "/F"...)
		e.buf = appendNum(e.buf, float64(fi))
		e.buf = append(e.buf, ' ')
		e.buf = appendNum(e.buf, size)
		e.buf = append(e.buf, " Tf\n"...)
		e.st.font, e.st.fontSize = fi, round3(size)
	}
	e.buf = appendNums(e.buf, 1, 0, 0, 1, x, y)
	e.buf = append(e.buf, " Tm\n<"...)
	for _, r := range s {
		id := d.sfnt.GlyphIndex(r)
		if _, ok := use.glyphs[id]; !ok {
			use.glyphs[id] = string(r)
		}
		e.buf = appendHex4(e.buf, id)
	}
	e.buf = append(e.buf, "> Tj\nET\n"...)
}

// runWidth is the advance width of s in points at the given size.
func runWidth(d *fontData, s string, size float64) float64 {
	w := 0.0
	for _, r := range s {
		w += float64(d.advance(d.sfnt.GlyphIndex(r)))
	}
	return w * size / float64(d.unitsPerEm)
}
