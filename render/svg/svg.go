// Package svg writes a canvas drawing as an SVG document for the web.
//
// A Document is a canvas.Renderer: the page composer draws into it exactly
// as it draws into the PDF writer or the rasterizer, in canvas's
// millimetres with y up, and the document writes CSS pixels with y down
// (96 px per inch, CSS Values and Units Level 3 §5.2), so one user unit of
// the viewBox is one px. Text stays text (<text> in the output's web font
// family, optionally with an embedded subset of the font); the era
// gradient becomes a <linearGradient> in user space, written once however
// many lines share it; coordinates are rounded to 0.1 px and path data is
// written in its compact relative form. The bytes depend only on what was
// drawn.
//
// A Document also implements the page composer's Grouper: each panel
// becomes a <g role="img"> with its own <title> and <desc>.
package svg

import (
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"encoding/binary"
	"encoding/xml"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/tdewolff/canvas"
	"github.com/tdewolff/font"

	otf "sheaf/render/internal/sfnt"
)

// PxPerMm is CSS pixels per millimetre: 96 px per inch, 25.4 mm per inch
// (CSS Values and Units Level 3 §5.2).
const PxPerMm = 96 / 25.4

// pxPerPt is CSS pixels per point: 1 px = 0.75 pt (CSS Values and Units
// Level 3 §5.2).
const pxPerPt = 96.0 / 72

// EmbeddedFamily is the font-family name the embedded font subsets are
// declared under; it leads the document's family list when fonts are
// embedded.
const EmbeddedFamily = "sheaf-subset"

// Options describe a document as a whole.
type Options struct {
	Title string // the document's <title>: what it shows, in a few words
	Desc  string // the document's <desc>: a sentence or two

	// FontFamily is the CSS font-family list every text uses, such as
	// `"DejaVu Sans Condensed", sans-serif`. Empty: sans-serif.
	FontFamily string
	// EmbedFonts embeds a subset of every font drawn with (only the glyphs
	// used) as a base64 @font-face — TrueType outlines as font/ttf, CFF
	// as font/otf — so the document looks the same wherever it is opened.
	EmbedFonts bool

	// Background, when not nil, fills the whole document first (the
	// paper); nil leaves it transparent.
	Background color.Color
}

// Document collects a drawing and writes it as SVG. Make one with New,
// draw into it through canvas.NewContext, then call WriteTo once.
type Document struct {
	wmm, hmm float64 // size in millimetres (canvas units)
	wpx, hpx float64
	toPx     canvas.Matrix // canvas millimetres, y up → px, y down
	opts     Options

	body  bytes.Buffer
	defs  bytes.Buffer
	grads map[string]int // gradient key → id number
	fonts []*fontUse
	depth int // open groups
	ids   map[string]bool
	err   error
}

type fontUse struct {
	font   *canvas.Font
	glyphs map[uint16]bool
	// cmap is the glyph each character was drawn with where shaping chose
	// another than the font's cmap (lining figures, lnum): the subset's
	// cmap then maps the character there, since a browser shapes the text
	// again from the cmap alone (the subset keeps no GSUB).
	cmap  map[rune]uint16
	runes map[rune]bool // every character drawn
	// variant counts the fonts of the same weight and slant used before
	// this one (the same face shaped with other features, such as tabular
	// figures): a variant gets a family of its own, named by a class on
	// its text, since one family holds one font per weight and slant.
	variant int
}

// slot is a font's weight and slant, as CSS selects @font-face rules.
func slot(f *canvas.Font) [2]bool {
	if h := f.SFNT.Head; h != nil {
		return [2]bool{h.MacStyle[0], h.MacStyle[1]}
	}
	return [2]bool{}
}

// use returns the record of font f, made on its first use.
func (d *Document) use(f *canvas.Font) *fontUse {
	for _, u := range d.fonts {
		if u.font == f {
			return u
		}
	}
	u := &fontUse{font: f, glyphs: map[uint16]bool{}, cmap: map[rune]uint16{}, runes: map[rune]bool{}}
	for _, o := range d.fonts {
		if slot(o.font) == slot(f) {
			u.variant++
		}
	}
	d.fonts = append(d.fonts, u)
	return u
}

// New returns a document of w × h points; the drawing's origin is the
// document's lower-left corner.
func New(w, h float64, opts Options) (*Document, error) {
	return NewWindow(0, 0, w, h, opts)
}

// NewWindow returns a document showing the rectangle (x0, y0)–(x1, y1) of
// a drawing, in points with y up: a panel cut from its page keeps the
// page's coordinates.
func NewWindow(x0, y0, x1, y1 float64, opts Options) (*Document, error) {
	w, h := x1-x0, y1-y0
	if !(w > 0 && h > 0) || math.IsInf(w+h, 0) || math.IsInf(x0+y0, 0) {
		return nil, fmt.Errorf("svg: document %g × %g pt has no area", w, h)
	}
	d := &Document{
		wmm: w * 25.4 / 72, hmm: h * 25.4 / 72,
		wpx: w * pxPerPt, hpx: h * pxPerPt,
		opts:  opts,
		grads: map[string]int{},
		ids:   map[string]bool{},
	}
	const mm = 25.4 / 72
	d.toPx = canvas.Identity.Translate(0, d.hpx).Scale(PxPerMm, -PxPerMm).Translate(-x0*mm, -y0*mm)
	return d, nil
}

// Size returns the document's size in millimetres, as canvas.Renderer asks.
func (d *Document) Size() (float64, float64) { return d.wmm, d.hmm }

// SizePx returns the document's size in CSS pixels, as written into its
// width and height (rounded to 0.1 px).
func (d *Document) SizePx() (float64, float64) { return roundTenth(d.wpx), roundTenth(d.hpx) }

func roundTenth(v float64) float64 { return math.Round(v*10) / 10 }

// BeginGroup opens a group for one panel, with a title and a description
// for assistive technology. id must be unique within the document.
func (d *Document) BeginGroup(id, title, desc string) {
	if d.ids[id] && d.err == nil {
		d.err = fmt.Errorf("svg: group id %q is used twice", id)
	}
	d.ids[id] = true
	d.body.WriteString(`<g id="`)
	escape(&d.body, id)
	d.body.WriteString(`" role="img"><title>`)
	escape(&d.body, title)
	d.body.WriteString(`</title>`)
	if desc != "" {
		d.body.WriteString(`<desc>`)
		escape(&d.body, desc)
		d.body.WriteString(`</desc>`)
	}
	d.body.WriteString("\n")
	d.depth++
}

// EndGroup closes the group BeginGroup opened.
func (d *Document) EndGroup() {
	if d.depth == 0 {
		if d.err == nil {
			d.err = fmt.Errorf("svg: EndGroup without BeginGroup")
		}
		return
	}
	d.depth--
	d.body.WriteString("</g>\n")
}

// RenderPath draws a path in style under the transformation m.
func (d *Document) RenderPath(p *canvas.Path, style canvas.Style, m canvas.Matrix) {
	fill, stroke := style.HasFill(), style.HasStroke()
	if p.Empty() || !fill && !stroke {
		return
	}
	mp := d.toPx.Mul(m)
	q := p.Copy().Transform(mp).ReplaceArcs()
	b := &d.body
	b.WriteString(`<path d="`)
	writePathData(b, q)
	b.WriteByte('"')
	if fill {
		d.paint(b, "fill", style.Fill, mp)
		if style.FillRule == canvas.EvenOdd {
			b.WriteString(` fill-rule="evenodd"`)
		}
	} else {
		b.WriteString(` fill="none"`)
	}
	if stroke {
		d.paint(b, "stroke", style.Stroke, mp)
		scale := math.Sqrt(math.Abs(mp.Det()))
		b.WriteString(` stroke-width="`)
		b.WriteString(attrNum(style.StrokeWidth * scale))
		b.WriteByte('"')
		switch style.StrokeCapper {
		case canvas.RoundCap:
			b.WriteString(` stroke-linecap="round"`)
		case canvas.SquareCap:
			b.WriteString(` stroke-linecap="square"`)
		}
		switch style.StrokeJoiner {
		case canvas.RoundJoin:
			b.WriteString(` stroke-linejoin="round"`)
		case canvas.BevelJoin:
			b.WriteString(` stroke-linejoin="bevel"`)
		}
		// canvas gives dashes in units of the stroke width, as its own
		// renderers read them (canvas.ScaleDash).
		if len(style.Dashes) > 0 {
			scale *= style.StrokeWidth
			b.WriteString(` stroke-dasharray="`)
			for i, v := range style.Dashes {
				if i > 0 {
					b.WriteByte(' ')
				}
				b.WriteString(attrNum(v * scale))
			}
			b.WriteByte('"')
			if style.DashOffset != 0 {
				b.WriteString(` stroke-dashoffset="`)
				b.WriteString(attrNum(style.DashOffset * scale))
				b.WriteByte('"')
			}
		}
	}
	b.WriteString("/>\n")
}

// paint writes a fill or stroke attribute (and its opacity).
func (d *Document) paint(b *bytes.Buffer, attr string, p canvas.Paint, m canvas.Matrix) {
	switch {
	case p.IsGradient():
		g, ok := p.Gradient.(*canvas.LinearGradient)
		if !ok {
			if d.err == nil {
				d.err = fmt.Errorf("svg: only linear gradients are supported, not %T", p.Gradient)
			}
			b.WriteString(` ` + attr + `="none"`)
			return
		}
		fmt.Fprintf(b, ` %s="url(#g%d)"`, attr, d.gradient(g, m))
	case p.IsColor():
		hex, opacity := colorAttr(p.Color)
		b.WriteString(` ` + attr + `="` + hex + `"`)
		if opacity != "" {
			b.WriteString(` ` + attr + `-opacity="` + opacity + `"`)
		}
	default:
		b.WriteString(` ` + attr + `="none"`)
	}
}

// gradient returns the id number of a linear gradient in user space,
// defining it on first use. Gradients that draw the same are written once:
// for a horizontal gradient the y coordinate changes nothing, so it is
// set to 0 before comparing.
func (d *Document) gradient(g *canvas.LinearGradient, m canvas.Matrix) int {
	s, e := m.Dot(g.Start), m.Dot(g.End)
	x1, y1, x2, y2 := attrNum(s.X), attrNum(s.Y), attrNum(e.X), attrNum(e.Y)
	if y1 == y2 {
		y1, y2 = "0", "0"
	}
	var k strings.Builder
	fmt.Fprintf(&k, ` x1="%s" y1="%s" x2="%s" y2="%s">`, x1, y1, x2, y2)
	for _, st := range g.Stops {
		hex, op := colorAttr(st.Color)
		fmt.Fprintf(&k, `<stop offset="%s" stop-color="%s"`, strconv.FormatFloat(math.Round(st.Offset*1e4)/1e4, 'f', -1, 64), hex)
		if op != "" {
			fmt.Fprintf(&k, ` stop-opacity="%s"`, op)
		}
		k.WriteString("/>")
	}
	key := k.String()
	if id, ok := d.grads[key]; ok {
		return id
	}
	id := len(d.grads) + 1
	d.grads[key] = id
	fmt.Fprintf(&d.defs, `<linearGradient id="g%d" gradientUnits="userSpaceOnUse"%s</linearGradient>`+"\n", id, key)
	return id
}

// colorAttr returns a colour as #rgb or #rrggbb and, when it is not
// opaque, its opacity. canvas colours are alpha-premultiplied.
func colorAttr(c color.RGBA) (string, string) {
	r, g, b := c.R, c.G, c.B
	op := ""
	if c.A != 0xff {
		if c.A == 0 {
			return "#000", "0"
		}
		un := func(v uint8) uint8 { return uint8(math.Min(255, math.Round(float64(v)*255/float64(c.A)))) }
		r, g, b = un(r), un(g), un(b)
		op = strconv.FormatFloat(math.Round(float64(c.A)/255*1000)/1000, 'f', -1, 64)
	}
	if r>>4 == r&15 && g>>4 == g&15 && b>>4 == b&15 {
		return fmt.Sprintf("#%x%x%x", r&15, g&15, b&15), op
	}
	return fmt.Sprintf("#%02x%02x%02x", r, g, b), op
}

// RenderText writes text as <text> elements, one per line, in the
// document's font family; the font's weight and slant come from its head
// table. A line set flush right or centred on its origin is anchored there
// (text-anchor), so a browser that substitutes a wider or narrower font
// still keeps the line on its edge or centre.
func (d *Document) RenderText(t *canvas.Text, m canvas.Matrix) {
	if t.Empty() {
		return
	}
	t.WalkDecorations(func(paint canvas.Paint, p *canvas.Path) {
		style := canvas.DefaultStyle
		style.Fill = paint
		d.RenderPath(p, style, m)
	})
	mp := d.toPx.Mul(m)
	scale := math.Sqrt(math.Abs(mp.Det()))
	t.WalkLines(func(y float64, spans []canvas.TextSpan) { d.textLine(mp, scale, y, spans) })
}

// RenderTextSpan writes what RenderText writes for a text of one line
// that holds only span and has no decorations (draw.SpanRenderer).
func (d *Document) RenderTextSpan(span canvas.TextSpan, m canvas.Matrix) {
	mp := d.toPx.Mul(m)
	scale := math.Sqrt(math.Abs(mp.Det()))
	var lineY float64 // the first line's; WalkLines gives -lineY
	d.textLine(mp, scale, -lineY, []canvas.TextSpan{span})
}

// textLine writes one line of a text, at y in the text's space.
func (d *Document) textLine(mp canvas.Matrix, scale, y float64, spans []canvas.TextSpan) {
	var texts []canvas.TextSpan
	for _, s := range spans {
		if s.IsText() && s.Text != "" {
			texts = append(texts, s)
			d.useGlyphs(s)
		}
	}
	if len(texts) == 0 {
		return
	}
	same := true
	for _, s := range texts[1:] {
		if s.Face != texts[0].Face {
			same = false
		}
	}
	if !same {
		for _, s := range texts {
			d.textElem(mp, scale, s.X, y, "", s.Face, s.Text)
		}
		return
	}
	x0, w := texts[0].X, 0.0
	var sb strings.Builder
	for _, s := range texts {
		x0 = math.Min(x0, s.X)
		w += s.Width
		sb.WriteString(s.Text)
	}
	// Infer the alignment from where the origin (x = 0) sits on the line.
	eps := 1e-6 + w*1e-6
	x, anchor := x0, ""
	switch {
	case math.Abs(x0) <= eps:
	case math.Abs(x0+w) <= eps:
		x, anchor = x0+w, "end"
	case math.Abs(x0+w/2) <= eps:
		x, anchor = x0+w/2, "middle"
	}
	d.textElem(mp, scale, x, y, anchor, texts[0].Face, sb.String())
}

func (d *Document) textElem(mp canvas.Matrix, scale, x, y float64, anchor string, face *canvas.FontFace, s string) {
	pt := mp.Dot(canvas.Point{X: x, Y: y})
	b := &d.body
	b.WriteString(`<text x="`)
	b.WriteString(attrNum(pt.X))
	b.WriteString(`" y="`)
	b.WriteString(attrNum(pt.Y))
	b.WriteString(`" font-size="`)
	b.WriteString(attrNum(face.Size * scale))
	b.WriteByte('"')
	if h := face.Font.SFNT.Head; h != nil {
		if h.MacStyle[0] {
			b.WriteString(` font-weight="bold"`)
		}
		if h.MacStyle[1] {
			b.WriteString(` font-style="italic"`)
		}
	}
	if anchor != "" {
		b.WriteString(` text-anchor="` + anchor + `"`)
	}
	if d.opts.EmbedFonts {
		if v := d.use(face.Font).variant; v > 0 {
			b.WriteString(` class="sheaf-v` + strconv.Itoa(v) + `"`)
		}
	}
	if !(face.Fill.IsColor() && face.Fill.Color == canvas.Black) {
		d.paint(b, "fill", face.Fill, mp)
	}
	if strings.HasPrefix(s, " ") || strings.HasSuffix(s, " ") || strings.Contains(s, "  ") {
		b.WriteString(` xml:space="preserve"`)
	}
	b.WriteByte('>')
	escape(b, s)
	b.WriteString("</text>\n")
}

// useGlyphs records the glyphs a span uses, for the embedded subset.
func (d *Document) useGlyphs(s canvas.TextSpan) {
	if !d.opts.EmbedFonts {
		return
	}
	u := d.use(s.Face.Font)
	for i, g := range s.Glyphs {
		u.glyphs[g.ID] = true
		// a cluster of one character drawn with one glyph
		single := (i == 0 || s.Glyphs[i-1].Cluster != g.Cluster) && (i+1 == len(s.Glyphs) || s.Glyphs[i+1].Cluster != g.Cluster)
		if c := int(g.Cluster); single && c < len(s.Text) {
			r, n := utf8.DecodeRuneInString(s.Text[c:])
			end := len(s.Text)
			for _, h := range s.Glyphs {
				if int(h.Cluster) > c && int(h.Cluster) < end {
					end = int(h.Cluster)
				}
			}
			if _, seen := u.cmap[r]; !seen && c+n == end && g.ID != s.Face.Font.SFNT.GlyphIndex(r) {
				u.cmap[r] = g.ID
			}
		}
	}
	// A browser shapes the string again from the font's cmap: every
	// character must map to a glyph in the subset.
	for _, r := range s.Text {
		u.glyphs[s.Face.Font.SFNT.GlyphIndex(r)] = true
		u.runes[r] = true
	}
}

// RenderImage embeds an image as a PNG data URI. m maps the image's pixel
// grid (one pixel per unit, y up from its lower-left corner) into the
// drawing. A line of shaped text a recording carries in an image's place
// (render/draw's SpanImage) is written as RenderTextSpan writes it.
func (d *Document) RenderImage(img image.Image, m canvas.Matrix) {
	if s, ok := img.(interface{ TextSpan() canvas.TextSpan }); ok {
		d.RenderTextSpan(s.TextSpan(), m)
		return
	}
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		if d.err == nil {
			d.err = fmt.Errorf("svg: encoding an image: %w", err)
		}
		return
	}
	bounds := img.Bounds()
	// SVG places the image from its top-left corner, y down.
	mi := d.toPx.Mul(m).Translate(0, float64(bounds.Dy())).Scale(1, -1)
	a, bb, c, dd, e, f := mi[0][0], mi[1][0], mi[0][1], mi[1][1], mi[0][2], mi[1][2]
	fmt.Fprintf(&d.body, `<image width="%d" height="%d" transform="matrix(%s %s %s %s %s %s)" href="data:image/png;base64,%s"/>`+"\n",
		bounds.Dx(), bounds.Dy(), fnum(a), fnum(bb), fnum(c), fnum(dd), fnum(e), fnum(f),
		base64.StdEncoding.EncodeToString(buf.Bytes()))
}

func fnum(v float64) string { return strconv.FormatFloat(math.Round(v*1e4)/1e4, 'f', -1, 64) }

// WriteTo writes the whole document. It reports the first problem met
// while drawing, if any.
func (d *Document) WriteTo(w io.Writer) (int64, error) {
	if d.err != nil {
		return 0, d.err
	}
	if d.depth != 0 {
		return 0, fmt.Errorf("svg: %d group(s) left open", d.depth)
	}
	var h bytes.Buffer
	wpx, hpx := d.SizePx()
	ws, hs := attrNum(wpx), attrNum(hpx)
	family := d.opts.FontFamily
	if strings.TrimSpace(family) == "" {
		family = "sans-serif"
	}
	if d.opts.EmbedFonts && len(d.fonts) > 0 {
		family = d.embeddedFamily() + ", " + family
	}
	fmt.Fprintf(&h, `<svg xmlns="http://www.w3.org/2000/svg" width="%s" height="%s" viewBox="0 0 %s %s" role="img"`, ws, hs, ws, hs)
	if d.opts.Title != "" || d.opts.Desc != "" {
		ids := []string{}
		if d.opts.Title != "" {
			ids = append(ids, "doc-title")
		}
		if d.opts.Desc != "" {
			ids = append(ids, "doc-desc")
		}
		fmt.Fprintf(&h, ` aria-labelledby="%s"`, strings.Join(ids, " "))
	}
	h.WriteString(` font-family="`)
	escape(&h, family)
	h.WriteString("\">\n")
	if d.opts.Title != "" {
		h.WriteString(`<title id="doc-title">`)
		escape(&h, d.opts.Title)
		h.WriteString("</title>\n")
	}
	if d.opts.Desc != "" {
		h.WriteString(`<desc id="doc-desc">`)
		escape(&h, d.opts.Desc)
		h.WriteString("</desc>\n")
	}
	if d.opts.EmbedFonts && len(d.fonts) > 0 {
		if err := d.writeFonts(&h); err != nil {
			return 0, err
		}
	}
	if d.defs.Len() > 0 {
		h.WriteString("<defs>\n")
		h.Write(d.defs.Bytes())
		h.WriteString("</defs>\n")
	}
	if d.opts.Background != nil {
		r, g, b, a := d.opts.Background.RGBA()
		hex, op := colorAttr(color.RGBA{uint8(r >> 8), uint8(g >> 8), uint8(b >> 8), uint8(a >> 8)})
		fmt.Fprintf(&h, `<rect width="%s" height="%s" fill="%s"`, ws, hs, hex)
		if op != "" {
			fmt.Fprintf(&h, ` fill-opacity="%s"`, op)
		}
		h.WriteString("/>\n")
	}
	n, err := w.Write(h.Bytes())
	total := int64(n)
	if err != nil {
		return total, err
	}
	n, err = w.Write(d.body.Bytes())
	total += int64(n)
	if err != nil {
		return total, err
	}
	n, err = io.WriteString(w, "</svg>\n")
	return total + int64(n), err
}

// embeddedFamily names this document's subsets: EmbeddedFamily and a
// hash of the fonts and glyphs they hold, so two SVGs pasted into one web
// page never borrow each other's (different) subsets.
func (d *Document) embeddedFamily() string {
	h := sha256.New()
	for _, u := range d.fonts {
		io.WriteString(h, u.font.Name())
		fmt.Fprintf(h, "/%d", u.variant)
		ids := make([]int, 0, len(u.glyphs))
		for id := range u.glyphs {
			ids = append(ids, int(id))
		}
		sort.Ints(ids)
		for _, id := range ids {
			fmt.Fprintf(h, ",%d", id)
		}
		h.Write([]byte{0})
	}
	return fmt.Sprintf("%s-%x", EmbeddedFamily, h.Sum(nil)[:4])
}

// writeFonts writes one @font-face per font used, each a subset holding
// only the glyphs drawn (and .notdef, which a font must keep as glyph 0).
func (d *Document) writeFonts(h *bytes.Buffer) error {
	h.WriteString("<style>\n")
	for _, u := range d.fonts {
		ids := []uint16{0}
		for id := range u.glyphs {
			if id != 0 {
				ids = append(ids, id)
			}
		}
		sort.Slice(ids[1:], func(i, j int) bool { return ids[1+i] < ids[1+j] })
		sub, err := subset(u.font.SFNT, ids)
		if err != nil {
			return fmt.Errorf("svg: subsetting font %q: %w", u.font.Name(), err)
		}
		if len(u.cmap) > 0 {
			// The subset's glyph i is ids[i] (tdewolff/font's Subset keeps
			// the order given).
			at := make(map[uint16]uint16, len(ids))
			for i, id := range ids {
				at[id] = uint16(i)
			}
			m := map[rune]uint16{}
			for r := range u.runes {
				m[r] = at[u.font.SFNT.GlyphIndex(r)]
			}
			for r, g := range u.cmap {
				m[r] = at[g]
			}
			sub.Tables["cmap"] = cmapTable(m)
		}
		weight, style := "normal", "normal"
		if hd := u.font.SFNT.Head; hd != nil {
			if hd.MacStyle[0] {
				weight = "bold"
			}
			if hd.MacStyle[1] {
				style = "italic"
			}
		}
		// The media type and format name of the outlines (RFC 8081;
		// CSS Fonts 4 §4.3.1): glyf outlines "truetype", CFF "opentype".
		mime, format := "font/ttf", "truetype"
		if sub.IsCFF {
			mime, format = "font/otf", "opentype"
		}
		family := d.embeddedFamily()
		if u.variant > 0 {
			family += "-v" + strconv.Itoa(u.variant)
			rest := d.opts.FontFamily
			if strings.TrimSpace(rest) == "" {
				rest = "sans-serif"
			}
			// quotes stay as they are (CSS); < and & are escaped for XML
			h.WriteString(strings.NewReplacer("&", "&amp;", "<", "&lt;").Replace(fmt.Sprintf(".sheaf-v%d{font-family:%q, %s}\n", u.variant, family, rest)))
		}
		fmt.Fprintf(h, "@font-face{font-family:%q;font-weight:%s;font-style:%s;src:url(data:%s;base64,", family, weight, style, mime)
		prog, err := stableWrite(sub)
		if err != nil {
			return fmt.Errorf("svg: writing the subset of font %q: %w", u.font.Name(), err)
		}
		h.WriteString(base64.StdEncoding.EncodeToString(prog))
		fmt.Fprintf(h, ") format(%q)}\n", format)
	}
	h.WriteString("</style>\n")
	return nil
}

func escape(b *bytes.Buffer, s string) {
	// xml.EscapeText never fails on a bytes.Buffer.
	_ = xml.EscapeText(b, []byte(s))
}

// attrNum formats a coordinate in px, rounded to 0.1 px.
func attrNum(v float64) string {
	return string(appendTenths(nil, int64(math.Round(v*10)), false))
}

// appendTenths appends n/10 in its shortest decimal form; compact drops
// the leading zero of a fraction (".5", "-.5"), as path data allows.
func appendTenths(b []byte, n int64, compact bool) []byte {
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	i, f := n/10, n%10
	if i != 0 || !compact || f == 0 {
		b = strconv.AppendInt(b, i, 10)
	}
	if f != 0 {
		b = append(b, '.', byte('0'+f))
	}
	return b
}

// stableWrite writes a font with its head table's modified date as the
// font had it. tdewolff/font's SFNT.Write stamps the clock there, which
// would make two builds differ; the date is put back and the checksums
// the OpenType spec asks for ("head" table: checksumAdjustment =
// 0xB1B0AFBA − sum of the file; table record checksums) recomputed.
func stableWrite(sfnt *font.SFNT) ([]byte, error) {
	buf := sfnt.Write()
	head := sfnt.Tables["head"]
	if len(buf) < 12 || len(head) < 54 {
		return nil, fmt.Errorf("font has no usable head table")
	}
	n := int(binary.BigEndian.Uint16(buf[4:]))
	for i := range n {
		rec := 12 + 16*i
		if rec+16 > len(buf) || string(buf[rec:rec+4]) != "head" {
			continue
		}
		off := int(binary.BigEndian.Uint32(buf[rec+8:]))
		length := int(binary.BigEndian.Uint32(buf[rec+12:]))
		if off+length > len(buf) || length < 54 {
			return nil, fmt.Errorf("font head table out of range")
		}
		copy(buf[off+28:off+36], head[28:36]) // modified
		binary.BigEndian.PutUint32(buf[off+8:], 0)
		end := min(len(buf), off+(length+3)&^3)
		binary.BigEndian.PutUint32(buf[rec+4:], otf.Checksum(buf[off:end]))
		binary.BigEndian.PutUint32(buf[off+8:], 0xB1B0AFBA-otf.Checksum(buf))
		return buf, nil
	}
	return nil, fmt.Errorf("font has no head table")
}

// subset makes a web font of the glyphs ids from its own parse of s's
// tables: tdewolff/font's Subset writes into the font it subsets (maxp,
// hhea, head and a CFF table's subroutines), and s is shared with the
// renderers drawing the same pages.
func subset(s *font.SFNT, ids []uint16) (sub *font.SFNT, err error) {
	defer func() {
		if r := recover(); r != nil {
			sub, err = nil, fmt.Errorf("font subsetter failed: %v", r)
		}
	}()
	own, err := font.ParseSFNT(otf.Write(s.Tables), 0)
	if err != nil {
		return nil, err
	}
	return own.Subset(ids, font.SubsetOptions{Tables: font.KeepMinTables})
}

// cmapTable writes a cmap (OpenType spec, "cmap — Character to Glyph
// Index Mapping Table") with a format 4 subtable (Windows, BMP) and, when
// a character lies beyond the BMP, a format 12 one (Windows, full
// repertoire): one segment or group per character.
func cmapTable(m map[rune]uint16) []byte {
	rs := make([]rune, 0, len(m))
	astral := false
	for r := range m {
		if r >= 0 && r <= 0x10FFFF {
			rs = append(rs, r)
			astral = astral || r > 0xFFFF
		}
	}
	sort.Slice(rs, func(i, j int) bool { return rs[i] < rs[j] })
	be := binary.BigEndian
	// format 4
	var bmp []rune
	for _, r := range rs {
		if r < 0xFFFF {
			bmp = append(bmp, r)
		}
	}
	seg := len(bmp) + 1
	es := 0
	for 1<<(es+1) <= seg {
		es++
	}
	f4 := be.AppendUint16(nil, 4)
	f4 = be.AppendUint16(f4, uint16(16+8*seg))
	f4 = be.AppendUint16(f4, 0) // language
	f4 = be.AppendUint16(f4, uint16(2*seg))
	f4 = be.AppendUint16(f4, uint16(2<<es))
	f4 = be.AppendUint16(f4, uint16(es))
	f4 = be.AppendUint16(f4, uint16(2*seg-2<<es))
	for _, r := range bmp {
		f4 = be.AppendUint16(f4, uint16(r)) // endCode
	}
	f4 = be.AppendUint16(f4, 0xFFFF)
	f4 = be.AppendUint16(f4, 0) // reservedPad
	for _, r := range bmp {
		f4 = be.AppendUint16(f4, uint16(r)) // startCode
	}
	f4 = be.AppendUint16(f4, 0xFFFF)
	for _, r := range bmp {
		f4 = be.AppendUint16(f4, m[r]-uint16(r)) // idDelta, modulo 65536
	}
	f4 = be.AppendUint16(f4, 1)
	for range seg {
		f4 = be.AppendUint16(f4, 0) // idRangeOffset
	}
	var f12 []byte
	if astral {
		f12 = be.AppendUint16(nil, 12)
		f12 = be.AppendUint16(f12, 0)
		f12 = be.AppendUint32(f12, uint32(16+12*len(rs)))
		f12 = be.AppendUint32(f12, 0) // language
		f12 = be.AppendUint32(f12, uint32(len(rs)))
		for _, r := range rs {
			f12 = be.AppendUint32(f12, uint32(r))
			f12 = be.AppendUint32(f12, uint32(r))
			f12 = be.AppendUint32(f12, uint32(m[r]))
		}
	}
	n := 1
	if f12 != nil {
		n = 2
	}
	out := be.AppendUint16(nil, 0)
	out = be.AppendUint16(out, uint16(n))
	off := 4 + 8*n
	out = be.AppendUint16(out, 3)
	out = be.AppendUint16(out, 1)
	out = be.AppendUint32(out, uint32(off))
	if f12 != nil {
		out = be.AppendUint16(out, 3)
		out = be.AppendUint16(out, 10)
		out = be.AppendUint32(out, uint32(off+len(f4)))
	}
	out = append(out, f4...)
	return append(out, f12...)
}
