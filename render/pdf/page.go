package pdf

import (
	"sheaf/palette"
	"sheaf/palette/press"

	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"math"
	"runtime"
	"sort"
	"strconv"

	"github.com/klauspost/compress/zlib"
	"github.com/tdewolff/canvas"
)

// ptPerMM converts canvas units (millimetres, as in every canvas renderer)
// to PDF points (1/72 in, ISO 32000-1 §8.3.2.3).
const ptPerMM = 72 / 25.4

// MMPerPt converts points to the millimetres a draw function works in.
const MMPerPt = 25.4 / 72

// PageBoxes are a page's boundaries in points, with the media origin at
// (0,0). TrimBox ⊆ BleedBox ⊆ MediaBox is required (ISO 32000-1 §14.11.2);
// the CropBox is written equal to the MediaBox.
type PageBoxes struct {
	Media, Bleed, Trim canvas.Rect
}

// PageSetup is what a page needs besides its drawing.
type PageSetup struct {
	Boxes PageBoxes
	// Marks draws crop marks (and the slug) in registration colour when
	// not nil.
	Marks *MarkOptions
	// Slug is one line of job information printed in the slug area,
	// between the bleed and the media edge; empty for none.
	Slug string
	// Press, when not nil, turns every colour into the printer's device
	// colours (DeviceCMYK, DeviceGray or DeviceRGB): chart colours through
	// its profile, greys as black ink alone, black type overprinting. The
	// document's Options.Press must be the same condition. Nil: colours
	// stay sRGB (ICCBased).
	Press *press.Condition `json:"-"`
}

// EncodedPage is a page turned into PDF: a compressed content stream plus
// the resources it names. It holds no object numbers, so it can be cached
// (all exported fields serialise with encoding/gob) and added to any
// document later with Writer.AddEncoded.
//
// Fonts are referred to by a content hash (FontKey). A page produced by
// EncodePage in this process also carries a pointer to the font itself;
// a page decoded from a cache does not, and its fonts must have been made
// known to the writer with Writer.RegisterFont first.
type EncodedPage struct {
	Boxes   PageBoxes
	Content []byte // the content stream, compressed as Compressed says
	// Compressed is true when Content is zlib/deflate (FlateDecode).
	Compressed bool
	Fonts      []PageFont // named /F0, /F1, … in the content
	Patterns   []Shading  // shading patterns /P0, /P1, …
	GStates    []Alpha    // graphics states /G0, /G1, …
	// Transparent is true when the page uses opacity below 1, so the page
	// gets a transparency group (PDF/X-4 permits live transparency).
	Transparent bool
	// Device is the number of device colour components the page was drawn
	// in (4 CMYK, 3 RGB, 1 gray; see PageSetup.Press); 0: sRGB (ICCBased).
	Device int
	// Load, when Content is nil, gives the content stream at the moment
	// the page is written; the bytes need stay unchanged only until the
	// page is written, so a caller can read each of many cached pages
	// into one buffer instead of holding them all. Not part of a page's
	// value: caches and gob leave it out.
	Load func() ([]byte, error)
}

// PageFont is a font as one page uses it.
type PageFont struct {
	Key    FontKey
	Glyphs []GlyphUse // sorted by ID
	font   *fontData  // nil after a round trip through a cache
}

// GlyphUse is a glyph a page shows and the text it stands for (for the
// ToUnicode map that makes the text searchable).
type GlyphUse struct {
	ID   uint16
	Text string
}

// Shading is an axial (ShadingType 2) or radial (ShadingType 3) shading in
// page points, extended at both ends.
type Shading struct {
	Radial bool
	// Device is the number of components of the stops' Ink (DeviceCMYK:
	// 4); 0: the stops are sRGB (R, G, B) in the ICC-based space.
	Device int
	// Coords are x0 y0 x1 y1 (axial) or x0 y0 r0 x1 y1 r1 (radial).
	Coords []float64
	Stops  []Stop
}

// Stop is a gradient stop: offset in [0,1] and an sRGB colour with
// components in [0,1].
type Stop struct {
	Offset  float64
	R, G, B float64
	Ink     []float64 // device values when the shading's Device is set
}

// Alpha is a constant opacity for fills (ca) and strokes (CA).
type Alpha struct {
	Fill, Stroke float64
	// Overprint sets /OP and /op true with /OPM 1 (ISO 32000-1 §8.6.7):
	// black type over colour leaves the colour under it, so a slight
	// misregistration shows no white edge (common practice).
	Overprint bool
}

// validate checks the box nesting of ISO 32000-1 §14.11.2.
func (b PageBoxes) validate() error {
	for _, r := range []struct {
		name string
		r    canvas.Rect
	}{{"MediaBox", b.Media}, {"BleedBox", b.Bleed}, {"TrimBox", b.Trim}} {
		if !finite(r.r.X0, r.r.Y0, r.r.X1, r.r.Y1) {
			return fmt.Errorf("%s %v is not finite", r.name, r.r)
		}
		if r.r.X1 <= r.r.X0 || r.r.Y1 <= r.r.Y0 {
			return fmt.Errorf("%s %v has no area", r.name, r.r)
		}
	}
	// Annex C.2: page sizes outside 3–14 400 units are not portable.
	if w, h := b.Media.W(), b.Media.H(); w < 3 || h < 3 || w > 14400 || h > 14400 {
		return fmt.Errorf("MediaBox %gx%g pt is outside 3–14400 pt (ISO 32000-1 Annex C.2)", w, h)
	}
	if b.Media.X0 != 0 || b.Media.Y0 != 0 {
		return fmt.Errorf("MediaBox must start at 0,0, got %g,%g", b.Media.X0, b.Media.Y0)
	}
	if !contains(b.Media, b.Bleed) {
		return fmt.Errorf("BleedBox %v is not inside MediaBox %v", b.Bleed, b.Media)
	}
	if !contains(b.Bleed, b.Trim) {
		return fmt.Errorf("TrimBox %v is not inside BleedBox %v", b.Trim, b.Bleed)
	}
	return nil
}

func contains(outer, inner canvas.Rect) bool {
	return inner.X0 >= outer.X0 && inner.Y0 >= outer.Y0 && inner.X1 <= outer.X1 && inner.Y1 <= outer.Y1
}

// EncodePage draws one page and encodes it, compressed at
// DefaultCompression. It is pure: the result depends only on the arguments. The draw
// function gets a canvas in millimetres (as all canvas renderers use) the
// size of the MediaBox; MMPerPt converts layout points.
func EncodePage(setup PageSetup, draw func(c *canvas.Canvas) error) (*EncodedPage, error) {
	return encodePage(setup, draw, 0, nil, encodePools)
}

// PageEncoder encodes the pages of one document as EncodePage does, but
// reads each font's tables (a SHA-256 of every table, its key) once for
// all its pages rather than once a page: fonts are known by their parsed
// *font.SFNT, so a PageEncoder must not outlive the fonts it was given
// (one per build, never process-wide: a freed font's address can be
// taken by another). It is safe for concurrent use.
type PageEncoder struct{ keys *fontKeys }

// NewPageEncoder returns a PageEncoder with nothing known yet.
func NewPageEncoder() *PageEncoder { return &PageEncoder{keys: newFontKeys()} }

// Encode is EncodePage with the fonts read once per PageEncoder; the
// bytes are EncodePage's.
func (pe *PageEncoder) Encode(setup PageSetup, draw func(c *canvas.Canvas) error) (*EncodedPage, error) {
	return encodePage(setup, draw, 0, pe.keys, encodePools)
}

// encodePools are EncodePage's: a program that encodes pages one by one,
// on every core, reuses as many compressors and content buffers as it
// runs pages at once, rather than allocating a megabyte a page for the
// garbage collector. A reused compressor writes the very bytes a new one
// would (zlib.Writer.Reset).
var encodePools = newPools(DefaultCompression)

// pools recycles content buffers and zlib compressors between pages:
// both are large (hundreds of KB) and every page needs them. They are
// free lists of a fixed length, unlike a sync.Pool, which the garbage
// collector empties: a build allocates so much that it would empty it
// between pages.
type pools struct {
	level int
	bufs  chan []byte
	zlibs chan *zlib.Writer // at level
}

func newPools(level int) *pools {
	n := max(2, runtime.GOMAXPROCS(0))
	return &pools{level: level, bufs: make(chan []byte, n), zlibs: make(chan *zlib.Writer, n)}
}

func (p *pools) buf() []byte {
	if p != nil {
		select {
		case b := <-p.bufs:
			return b[:0]
		default:
		}
	}
	return make([]byte, 0, 64<<10)
}

func (p *pools) putBuf(b []byte) {
	if p != nil && cap(b) > 0 {
		select {
		case p.bufs <- b:
		default:
		}
	}
}

func (p *pools) zlib() *zlib.Writer {
	if p != nil {
		select {
		case z := <-p.zlibs:
			return z
		default:
		}
	}
	return nil
}

func (p *pools) putZlib(z *zlib.Writer) {
	if p != nil {
		select {
		case p.zlibs <- z:
		default:
		}
	}
}

func encodePage(setup PageSetup, draw func(c *canvas.Canvas) error, level int, keys *fontKeys, pl *pools) (page *EncodedPage, err error) {
	if err := setup.Boxes.validate(); err != nil {
		return nil, err
	}
	if setup.Marks != nil {
		if err := setup.Marks.validate(setup.Boxes, setup.Slug); err != nil {
			return nil, err
		}
	}
	// The draw function is the caller's code; a panic in it must not take
	// down the other pages' goroutines.
	defer func() {
		if r := recover(); r != nil {
			page, err = nil, fmt.Errorf("drawing panicked: %v", r)
		}
	}()
	c := canvas.New(setup.Boxes.Media.W()*MMPerPt, setup.Boxes.Media.H()*MMPerPt)
	if draw != nil {
		if err := draw(c); err != nil {
			return nil, fmt.Errorf("drawing: %w", err)
		}
	}
	e := newEncoder(setup.Boxes.Media, keys)
	e.press = setup.Press
	e.buf = pl.buf()
	defer func() { pl.putBuf(e.buf) }()
	c.RenderTo(e)
	if e.err != nil {
		return nil, e.err
	}
	if setup.Marks != nil {
		if err := e.drawMarks(setup.Boxes, *setup.Marks, setup.Slug); err != nil {
			return nil, err
		}
	}
	return e.finish(setup.Boxes, level, pl)
}

// encoder is a canvas.Renderer that writes a PDF content stream.
type encoder struct {
	buf   []byte
	w, h  float64 // media size in mm, for Size
	st    gstate
	saved []gstate
	err   error
	op    int // drawing operation count, for error messages

	fonts     []*fontUse
	fontIndex map[*fontData]int
	keys      *fontKeys

	patterns     []Shading
	patternIndex map[string]int
	shadingKeys  shadingKeys // a page's gradients share a few palettes
	gstates      []Alpha
	gstateIndex  map[Alpha]int
	transparent  bool

	press  *press.Condition // nil: sRGB
	inText bool             // painting glyphs (black type overprints)
}

// gstate mirrors the parts of the PDF graphics state the encoder sets, so
// that unchanged parameters are not written again.
type gstate struct {
	fillCS, strokeCS   int // 0 unset, csICC, csPattern, csReg, csDevice
	fill, stroke       [4]float64
	fillPat, strokePat int
	lineWidth, miter   float64
	cap, join          int
	dash               string
	alpha              Alpha
	textMode           int
	font               int
	fontSize           float64
}

const (
	csICC = 1 + iota
	csPattern
	csReg
	csDevice
)

func newEncoder(media canvas.Rect, keys *fontKeys) *encoder {
	if keys == nil {
		keys = newFontKeys()
	}
	return &encoder{
		w:            media.W() * MMPerPt,
		h:            media.H() * MMPerPt,
		st:           initialState(),
		fontIndex:    map[*fontData]int{},
		keys:         keys,
		patternIndex: map[string]int{},
		gstateIndex:  map[Alpha]int{},
	}
}

// initialState is the PDF default graphics state (ISO 32000-1 Table 52),
// with the colour spaces marked unset because a colour space is always
// chosen explicitly here.
func initialState() gstate {
	return gstate{lineWidth: 1, miter: 10, alpha: Alpha{Fill: 1, Stroke: 1}, font: -1}
}

func (e *encoder) fail(format string, args ...any) {
	if e.err == nil {
		e.err = fmt.Errorf("drawing operation %d: %s", e.op, fmt.Sprintf(format, args...))
	}
}

// Size returns the media size in millimetres.
func (e *encoder) Size() (float64, float64) { return e.w, e.h }

// RenderImage reports an error: raster images are not part of what sheaf
// prints and would need their own colour handling. The one image it
// draws is none: a line of text shaped before it was recorded (see
// spanImage).
func (e *encoder) RenderImage(img image.Image, m canvas.Matrix) {
	if s, ok := img.(spanImage); ok {
		// a line of shaped text a recording carried (draw.SpanImage)
		e.RenderTextSpan(s.TextSpan(), m)
		return
	}
	e.op++
	e.fail("raster images are not supported by the press PDF writer")
}

func (e *encoder) op1(s string) {
	e.buf = append(e.buf, s...)
	e.buf = append(e.buf, '\n')
}

// pdfMatrix is m in PDF's [a b c d e f] order with the translation scaled
// from mm to points.
func pdfMatrix(m canvas.Matrix, k float64) [6]float64 {
	return [6]float64{m[0][0], m[1][0], m[0][1], m[1][1], m[0][2] * k, m[1][2] * k}
}

func matrixFinite(m canvas.Matrix) bool {
	return finite(m[0][0], m[0][1], m[0][2], m[1][0], m[1][1], m[1][2])
}

// RenderPath writes a path with its fill and stroke.
func (e *encoder) RenderPath(path *canvas.Path, style canvas.Style, m canvas.Matrix) {
	e.op++
	if e.err != nil || path == nil || path.Empty() {
		return
	}
	hasFill, hasStroke := style.HasFill(), style.HasStroke()
	if !hasFill && !hasStroke {
		return
	}
	if !matrixFinite(m) {
		e.fail("transformation %v is not finite", m)
		return
	}
	if !pathFinite(path) {
		e.fail("path has a NaN or infinite coordinate")
		return
	}
	if hasStroke && !finite(style.StrokeWidth, style.DashOffset) || !finite(style.Dashes...) {
		e.fail("stroke width or dashes are not finite")
		return
	}
	path = path.ReplaceArcs() // copies only when there are arcs

	if hasStroke && !strokeIsNative(style) {
		// PDF cannot express this join (miter-clip, arcs) or cap: draw
		// the stroke's outline as a fill, as canvas itself would.
		if hasFill {
			e.paint(path, m, style, true, false)
		}
		outline := path
		if style.IsDashed() {
			off, d := canvas.ScaleDash(style.StrokeWidth, style.DashOffset, style.Dashes)
			outline = outline.Dash(off, d...)
		}
		outline = outline.Stroke(style.StrokeWidth, style.StrokeCapper, style.StrokeJoiner, canvas.Tolerance)
		fs := canvas.Style{Fill: style.Stroke, FillRule: canvas.NonZero}
		e.paint(outline, m, fs, true, false)
		return
	}
	e.paint(path, m, style, hasFill, hasStroke)
}

// paint fills and/or strokes one path. With a similarity transform the
// path is transformed here and the stroke width scaled; otherwise the
// matrix goes into a cm so PDF strokes with the true (non-uniform) pen.
func (e *encoder) paint(path *canvas.Path, m canvas.Matrix, style canvas.Style, fill, stroke bool) {
	similar := m.IsSimilarity()
	scale := math.Sqrt(math.Abs(m.Det()))
	var pm [6]float64
	useCM := !similar || scale == 0
	if useCM {
		pm = [6]float64{1, 0, 0, 1, 0, 0}
		if !invertible(m) {
			return // a degenerate transform paints nothing
		}
	} else {
		pm = pdfMatrix(m, 1)
		for i := range pm {
			pm[i] *= ptPerMM
		}
	}
	width := style.StrokeWidth
	if !useCM {
		width *= scale * ptPerMM
	}

	bothTogether := fill && stroke && sameAlpha(style.Fill, style.Stroke)
	if fill && stroke && !bothTogether {
		e.paint(path, m, style, true, false)
		e.paint(path, m, style, false, true)
		return
	}

	if useCM {
		// The stroke width stays in the path's own units: PDF applies
		// the cm to the pen as well (§8.4.3.2).
		e.save()
		cm := pdfMatrix(m, ptPerMM)
		e.buf = appendNums(e.buf, cm[0]*ptPerMM, cm[1]*ptPerMM, cm[2]*ptPerMM, cm[3]*ptPerMM, cm[4], cm[5])
		e.op1(" cm")
	}
	okFill, okStroke := true, true
	if fill {
		okFill = e.setPaint(style.Fill, false)
	}
	if stroke {
		okStroke = e.setPaint(style.Stroke, true)
		e.setStrokeParams(style, width, useCM)
	}
	if !okFill || !okStroke {
		if useCM {
			e.restore()
		}
		return
	}
	closed := e.appendPath(path, pm)
	evenOdd := style.FillRule == canvas.EvenOdd
	switch {
	case fill && stroke:
		if closed {
			e.buf = append(e.buf, 'b')
		} else {
			e.buf = append(e.buf, 'B')
		}
		if evenOdd {
			e.buf = append(e.buf, '*')
		}
	case fill:
		e.buf = append(e.buf, 'f')
		if evenOdd {
			e.buf = append(e.buf, '*')
		}
	default:
		e.buf = append(e.buf, 'S')
	}
	e.buf = append(e.buf, '\n')
	if useCM {
		e.restore()
	}
}

func invertible(m canvas.Matrix) bool {
	d := m.Det()
	return d != 0 && finite(d)
}

func sameAlpha(a, b canvas.Paint) bool { return paintAlpha(a) == paintAlpha(b) }

// strokeIsNative reports whether PDF's own line caps and joins draw what
// canvas means (ISO 32000-1 §8.4.3.3–8.4.3.5).
func strokeIsNative(s canvas.Style) bool {
	switch s.StrokeCapper.(type) {
	case canvas.ButtCapper, canvas.RoundCapper, canvas.SquareCapper, nil:
	default:
		return false
	}
	switch j := s.StrokeJoiner.(type) {
	case canvas.BevelJoiner, canvas.RoundJoiner, nil:
	case canvas.MiterJoiner:
		// canvas's limit is the same ratio as PDF's (miter length over
		// line width); a nil gap joiner means "clip the miter", which
		// PDF cannot do.
		if _, ok := j.GapJoiner.(canvas.BevelJoiner); !ok || !finite(j.Limit) {
			return false
		}
	default:
		return false
	}
	return true
}

func pathFinite(p *canvas.Path) bool {
	s := p.Scanner()
	for s.Scan() {
		for _, v := range s.Values() {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return false
			}
		}
	}
	return true
}

// appendPath writes the path construction operators (m l c h) with every
// point mapped by pm; quadratic Béziers become cubics (exact degree
// elevation). It reports whether the path ends closed.
func (e *encoder) appendPath(p *canvas.Path, pm [6]float64) bool {
	b := e.buf
	pt := func(x, y float64) {
		b = appendNum(b, pm[0]*x+pm[2]*y+pm[4])
		b = append(b, ' ')
		b = appendNum(b, pm[1]*x+pm[3]*y+pm[5])
		b = append(b, ' ')
	}
	closed := false
	var cur canvas.Point
	s := p.Scanner()
	for s.Scan() {
		v := s.Values()
		closed = false
		switch s.Cmd() {
		case canvas.MoveToCmd:
			pt(v[0], v[1])
			b = append(b, "m\n"...)
			cur = canvas.Point{X: v[0], Y: v[1]}
		case canvas.LineToCmd:
			pt(v[0], v[1])
			b = append(b, "l\n"...)
			cur = canvas.Point{X: v[0], Y: v[1]}
		case canvas.QuadToCmd:
			c := canvas.Point{X: v[0], Y: v[1]}
			end := canvas.Point{X: v[2], Y: v[3]}
			c1 := cur.Add(c.Sub(cur).Mul(2.0 / 3.0))
			c2 := end.Add(c.Sub(end).Mul(2.0 / 3.0))
			pt(c1.X, c1.Y)
			pt(c2.X, c2.Y)
			pt(end.X, end.Y)
			b = append(b, "c\n"...)
			cur = end
		case canvas.CubeToCmd:
			pt(v[0], v[1])
			pt(v[2], v[3])
			pt(v[4], v[5])
			b = append(b, "c\n"...)
			cur = canvas.Point{X: v[4], Y: v[5]}
		case canvas.CloseCmd:
			b = append(b, "h\n"...)
			cur = canvas.Point{X: v[0], Y: v[1]}
			closed = true
		}
	}
	e.buf = b
	return closed
}

func (e *encoder) save() {
	e.saved = append(e.saved, e.st)
	e.op1("q")
}

func (e *encoder) restore() {
	e.st = e.saved[len(e.saved)-1]
	e.saved = e.saved[:len(e.saved)-1]
	e.op1("Q")
}

// paintAlpha is the constant opacity a paint is drawn with. canvas colours
// are alpha-premultiplied. A gradient's opacity is its first stop's: PDF
// shadings carry no alpha (that would need a soft mask).
func paintAlpha(p canvas.Paint) float64 {
	if p.IsGradient() {
		if stops := gradientStops(p.Gradient); len(stops) > 0 {
			return float64(stops[0].Color.A) / 255
		}
		return 0
	}
	return float64(p.Color.A) / 255
}

// unpremultiply returns the sRGB components of a premultiplied colour.
func unpremultiply(c interface{ RGBA() (r, g, b, a uint32) }) [3]float64 {
	r, g, b, a := c.RGBA()
	if a == 0 {
		return [3]float64{}
	}
	f := func(v uint32) float64 { return math.Min(1, float64(v)/float64(a)) }
	return [3]float64{f(r), f(g), f(b)}
}

func gradientStops(g canvas.Gradient) canvas.Stops {
	switch g := g.(type) {
	case *canvas.LinearGradient:
		return g.Stops
	case *canvas.RadialGradient:
		return g.Stops
	}
	return nil
}

// setPaint selects colour space and colour (or pattern) for filling or
// stroking. It reports false when the paint draws nothing.
func (e *encoder) setPaint(p canvas.Paint, stroke bool) bool {
	if p.IsPattern() {
		e.fail("canvas patterns (hatches) are not supported; draw the hatch lines instead")
		return false
	}
	alpha := paintAlpha(p)
	if alpha <= 0 {
		return false
	}
	want := e.st.alpha
	if stroke {
		want.Stroke = round3(alpha)
	} else {
		want.Fill = round3(alpha)
	}
	var ink []float64
	want.Overprint = false
	if e.press != nil && !p.IsGradient() {
		c := unpremultiply(p.Color)
		var black bool
		ink, black = e.press.Ink(palette.RGB{R: c[0], G: c[1], B: c[2]})
		want.Overprint = e.inText && black && alpha == 1 && solidBlack(ink)
	}
	e.setAlpha(want)

	if p.IsGradient() {
		sh, ok := e.shading(p.Gradient)
		if !ok {
			return false
		}
		if len(sh.Stops) == 1 {
			if sh.Device > 0 {
				return e.setInk(sh.Stops[0].Ink, stroke)
			}
			return e.setColor([3]float64{sh.Stops[0].R, sh.Stops[0].G, sh.Stops[0].B}, stroke)
		}
		idx := e.pattern(sh)
		cs, pat := &e.st.fillCS, &e.st.fillPat
		csOp, scnOp := " cs\n", " scn\n"
		if stroke {
			cs, pat = &e.st.strokeCS, &e.st.strokePat
			csOp, scnOp = " CS\n", " SCN\n"
		}
		if *cs != csPattern {
			e.buf = append(e.buf, "/Pattern"...)
			e.buf = append(e.buf, csOp...)
			*cs = csPattern
			*pat = -1
		}
		if *pat != idx {
			e.buf = append(e.buf, "/P"...)
			e.buf = strconv.AppendInt(e.buf, int64(idx), 10)
			e.buf = append(e.buf, scnOp...)
			*pat = idx
		}
		return true
	}
	if ink != nil {
		return e.setInk(ink, stroke)
	}
	return e.setColor(unpremultiply(p.Color), stroke)
}

// solidBlack is 100 % black ink and nothing else (or the darkest of a
// gray press).
func solidBlack(ink []float64) bool {
	switch len(ink) {
	case 4:
		return ink[0] == 0 && ink[1] == 0 && ink[2] == 0 && ink[3] == 1
	case 1:
		return ink[0] == 0
	}
	return false
}

// deviceSpace names the device colour space of n components.
func deviceSpace(n int) string {
	switch n {
	case 1:
		return "/DeviceGray"
	case 3:
		return "/DeviceRGB"
	}
	return "/DeviceCMYK"
}

// setInk sets device colour values (the press's colour space).
func (e *encoder) setInk(ink []float64, stroke bool) bool {
	var c [4]float64
	for i := range ink {
		c[i] = round4(ink[i])
	}
	cs, cur := &e.st.fillCS, &e.st.fill
	csOp, scOp := " cs\n", " sc\n"
	if stroke {
		cs, cur = &e.st.strokeCS, &e.st.stroke
		csOp, scOp = " CS\n", " SC\n"
	}
	if *cs != csDevice {
		e.buf = append(e.buf, deviceSpace(len(ink))...)
		e.buf = append(e.buf, csOp...)
		*cs = csDevice
		*cur = [4]float64{-1, -1, -1, -1}
	}
	if *cur != c {
		e.buf = appendNums(e.buf, c[:len(ink)]...)
		e.buf = append(e.buf, scOp...)
		*cur = c
	}
	return true
}

// round4 keeps ink values to 0.01 % (1/10,000), finer than any press
// reproduces and fine enough that a matched black tint stays matched.
func round4(v float64) float64 { return math.Round(v*10000) / 10000 }

func round3(v float64) float64 { return math.Round(v*1000) / 1000 }

// setColor sets an sRGB colour in the ICC-based colour space /CS0.
func (e *encoder) setColor(c [3]float64, stroke bool) bool {
	for i := range c {
		c[i] = round3(c[i])
	}
	cs, cur := &e.st.fillCS, &e.st.fill
	csOp, scOp := " cs\n", " sc\n"
	if stroke {
		cs, cur = &e.st.strokeCS, &e.st.stroke
		csOp, scOp = " CS\n", " SC\n"
	}
	if *cs != csICC {
		e.buf = append(e.buf, "/CS0"...)
		e.buf = append(e.buf, csOp...)
		*cs = csICC
		*cur = [4]float64{-1, -1, -1, -1}
	}
	if c4 := [4]float64{c[0], c[1], c[2], 0}; *cur != c4 {
		e.buf = appendNums(e.buf, c[0], c[1], c[2])
		e.buf = append(e.buf, scOp...)
		*cur = c4
	}
	return true
}

// setRegistration selects the registration colour (Separation /All,
// ISO 32000-1 §8.6.6.4) at tint 1 for fill and stroke.
func (e *encoder) setRegistration() {
	if e.st.fillCS != csReg {
		e.op1("/CS1 cs 1 sc")
		e.st.fillCS = csReg
	}
	if e.st.strokeCS != csReg {
		e.op1("/CS1 CS 1 SC")
		e.st.strokeCS = csReg
	}
}

func (e *encoder) setAlpha(a Alpha) {
	if a == e.st.alpha {
		return
	}
	idx, ok := e.gstateIndex[a]
	if !ok {
		idx = len(e.gstates)
		e.gstates = append(e.gstates, a)
		e.gstateIndex[a] = idx
	}
	if a.Fill < 1 || a.Stroke < 1 {
		e.transparent = true
	}
	e.buf = append(e.buf, "/G"...)
	e.buf = strconv.AppendInt(e.buf, int64(idx), 10)
	e.buf = append(e.buf, " gs\n"...)
	e.st.alpha = a
}

// shading converts a canvas gradient. Gradient points are in canvas page
// coordinates (mm), not transformed by the path's matrix: that is canvas's
// own convention (its PDF and SVG writers do the same).
func (e *encoder) shading(g canvas.Gradient) (Shading, bool) {
	var sh Shading
	var stops canvas.Stops
	switch g := g.(type) {
	case *canvas.LinearGradient:
		sh.Coords = []float64{g.Start.X * ptPerMM, g.Start.Y * ptPerMM, g.End.X * ptPerMM, g.End.Y * ptPerMM}
		stops = g.Stops
		if g.Start == g.End {
			// zero-length axis: PDF's axial shading is undefined;
			// canvas paints the first stop.
			stops = stops[:min(1, len(stops))]
		}
	case *canvas.RadialGradient:
		sh.Radial = true
		sh.Coords = []float64{g.C0.X * ptPerMM, g.C0.Y * ptPerMM, g.R0 * ptPerMM, g.C1.X * ptPerMM, g.C1.Y * ptPerMM, g.R1 * ptPerMM}
		stops = g.Stops
	default:
		e.fail("gradient type %T is not supported", g)
		return sh, false
	}
	if !finite(sh.Coords...) {
		e.fail("gradient coordinates are not finite")
		return sh, false
	}
	if len(stops) == 0 {
		return sh, false
	}
	for i, s := range stops {
		if !finite(s.Offset) {
			e.fail("gradient stop %d offset is not finite", i)
			return sh, false
		}
		c := unpremultiply(s.Color)
		sh.Stops = append(sh.Stops, Stop{Offset: round3(math.Min(1, math.Max(0, s.Offset))), R: round3(c[0]), G: round3(c[1]), B: round3(c[2])})
	}
	sort.SliceStable(sh.Stops, func(i, j int) bool { return sh.Stops[i].Offset < sh.Stops[j].Offset })
	if e.press != nil {
		in := make([]press.RGBStop, len(sh.Stops))
		for i, st := range sh.Stops {
			in[i] = press.RGBStop{Offset: st.Offset, RGB: palette.RGB{R: st.R, G: st.G, B: st.B}}
		}
		ramp := e.press.Ramp(in)
		sh.Device = e.press.Components()
		sh.Stops = sh.Stops[:0]
		for _, st := range ramp {
			ink := make([]float64, len(st.Ink))
			for k, v := range st.Ink {
				ink[k] = round4(v)
			}
			sh.Stops = append(sh.Stops, Stop{Offset: round4(st.Offset), Ink: ink})
		}
	}
	for i := range sh.Coords {
		sh.Coords[i] = round3(sh.Coords[i])
	}
	return sh, true
}

func (e *encoder) pattern(sh Shading) int {
	key := e.shadingKeys.key(sh)
	if idx, ok := e.patternIndex[key]; ok {
		return idx
	}
	idx := len(e.patterns)
	e.patterns = append(e.patterns, sh)
	e.patternIndex[key] = idx
	return idx
}

func shadingKey(sh Shading) string {
	return string(appendStopsKey(shadingHead(nil, sh), sh.Stops))
}

// shadingHead is the part of a shading's key before its stops.
func shadingHead(b []byte, sh Shading) []byte {
	if sh.Radial {
		b = append(b, 'r')
	}
	b = appendNums(b, sh.Coords...)
	if sh.Device > 0 {
		b = append(b, 'd')
		b = strconv.AppendInt(b, int64(sh.Device), 10)
	}
	return b
}

func appendStopsKey(b []byte, stops []Stop) []byte {
	for _, s := range stops {
		b = append(b, ';')
		b = appendNums(b, s.Offset, s.R, s.G, s.B)
		if len(s.Ink) > 0 {
			b = append(b, ',')
			b = appendNums(b, s.Ink...)
		}
	}
	return b
}

// shadingKeys gives shadingKey's keys, formatting the stops (most of a
// key) once for each distinct run of stops, found by their bits: a
// document's gradients share a few palettes, and formatting every stop
// of every gradient was most of writing a document of cached pages.
type shadingKeys struct {
	stops map[string]string
	bits  []byte
	buf   []byte
}

func (k *shadingKeys) key(sh Shading) string {
	bits := k.bits[:0]
	for _, s := range sh.Stops {
		for _, v := range [4]float64{s.Offset, s.R, s.G, s.B} {
			bits = binary.LittleEndian.AppendUint64(bits, math.Float64bits(v))
		}
		bits = binary.AppendUvarint(bits, uint64(len(s.Ink)))
		for _, v := range s.Ink {
			bits = binary.LittleEndian.AppendUint64(bits, math.Float64bits(v))
		}
	}
	k.bits = bits
	tail, ok := k.stops[string(bits)]
	if !ok {
		tail = string(appendStopsKey(nil, sh.Stops))
		if k.stops == nil {
			k.stops = map[string]string{}
		}
		if len(k.stops) < maxStopsKeys {
			k.stops[string(bits)] = tail
		}
	}
	k.buf = append(shadingHead(k.buf[:0], sh), tail...)
	return string(k.buf)
}

// maxStopsKeys bounds the stops remembered: a document with more
// distinct gradients than this formats the others each time.
const maxStopsKeys = 1 << 12

func (e *encoder) setStrokeParams(s canvas.Style, width float64, inCM bool) {
	if w := round3(width); w != e.st.lineWidth {
		e.buf = appendNum(e.buf, w)
		e.buf = append(e.buf, " w\n"...)
		e.st.lineWidth = w
	}
	capStyle := 0
	switch s.StrokeCapper.(type) {
	case canvas.RoundCapper:
		capStyle = 1
	case canvas.SquareCapper:
		capStyle = 2
	}
	if capStyle != e.st.cap {
		e.buf = strconv.AppendInt(e.buf, int64(capStyle), 10)
		e.buf = append(e.buf, " J\n"...)
		e.st.cap = capStyle
	}
	join, miter := 0, e.st.miter
	switch j := s.StrokeJoiner.(type) {
	case canvas.RoundJoiner:
		join = 1
	case canvas.BevelJoiner:
		join = 2
	case canvas.MiterJoiner:
		miter = round3(math.Max(j.Limit, 1)) // PDF requires ≥ 1
	}
	if join != e.st.join {
		e.buf = strconv.AppendInt(e.buf, int64(join), 10)
		e.buf = append(e.buf, " j\n"...)
		e.st.join = join
	}
	if join == 0 && miter != e.st.miter {
		e.buf = appendNum(e.buf, miter)
		e.buf = append(e.buf, " M\n"...)
		e.st.miter = miter
	}
	// canvas dashes are in units of the stroke width.
	var d []byte
	if s.IsDashed() {
		dashes := s.Dashes
		if len(dashes)%2 == 1 {
			dashes = append(append([]float64{}, dashes...), dashes...)
		}
		total := 0.0
		for _, v := range dashes {
			total += v
		}
		if total <= 0 {
			d = []byte("[] 0")
		} else {
			phase := math.Mod(s.DashOffset, total)
			if phase < 0 {
				phase += total
			}
			d = append(d, '[')
			for i, v := range dashes {
				if i > 0 {
					d = append(d, ' ')
				}
				d = appendNum(d, math.Max(0, v)*width)
			}
			d = append(d, "] "...)
			d = appendNum(d, phase*width)
		}
	} else {
		d = []byte("[] 0")
	}
	if string(d) != e.st.dash {
		if !(e.st.dash == "" && string(d) == "[] 0") {
			e.buf = append(e.buf, d...)
			e.buf = append(e.buf, " d\n"...)
		}
		e.st.dash = string(d)
	}
}

// finish compresses the content and collects the resources.
func (e *encoder) finish(boxes PageBoxes, level int, pl *pools) (*EncodedPage, error) {
	p := &EncodedPage{
		Boxes:       boxes,
		Patterns:    e.patterns,
		GStates:     e.gstates,
		Transparent: e.transparent,
		Device:      e.deviceComponents(),
	}
	for _, f := range e.fonts {
		p.Fonts = append(p.Fonts, f.pageFont())
	}
	if level == Uncompressed {
		p.Content = append([]byte(nil), e.buf...)
		return p, nil
	}
	if level == 0 {
		level = DefaultCompression
	}
	var out bytes.Buffer
	out.Grow(len(e.buf)/2 + 64)
	zw := pl.zlib()
	if zw != nil && pl.level != level {
		zw = nil // a pool for another level (Writer's Options.Compression)
	}
	if zw != nil {
		zw.Reset(&out)
	} else {
		var err error
		if zw, err = zlib.NewWriterLevel(&out, level); err != nil {
			return nil, fmt.Errorf("compression level %d: %w", level, err)
		}
	}
	zw.Write(e.buf)
	if err := zw.Close(); err != nil {
		return nil, err
	}
	pl.putZlib(zw)
	p.Content = out.Bytes()
	p.Compressed = true
	return p, nil
}

func (e *encoder) deviceComponents() int {
	if e.press == nil {
		return 0
	}
	return e.press.Components()
}
