// Package pdf writes press-ready PDF from canvas drawings.
//
// A Writer implements the document side (ISO 32000-1, PDF 1.6, with the
// structure PDF/X-4 asks for, ISO 15930-7): page boxes (MediaBox = CropBox,
// BleedBox, TrimBox), colours either in one embedded ICC sRGB profile (an
// RGB file: no output intent, no PDF/X claim) or, with a printing condition
// (Options.Press), in the press's device colours with its profile as the
// GTS_PDFX output intent (PDF/X-4), TrueType and CFF fonts embedded as
// subset CID fonts with ToUnicode maps, Info and XMP metadata that agree,
// a trailer /ID, and printer's marks in a registration colour. Drawing
// stays canvas code: each page is drawn on a *canvas.Canvas and rendered
// through this package's canvas.Renderer.
//
// Output is deterministic: no clock is read (dates come from Options.Date;
// sheaf's is feature.DocumentDate), objects are written in a fixed order,
// font subset tags come from a hash of the glyph set, and the /ID is a hash of the bytes.
//
// Pages are encoded and compressed in parallel (bounded by GOMAXPROCS)
// and written in the order added, with a bounded window of pages in
// flight. Encoding a page (EncodePage) is a separate, pure step whose
// result can be cached and added later with AddEncoded.
//
// Units: page boxes and mark options are in points; a draw function works
// in canvas millimetres like every canvas renderer (MMPerPt converts), and
// gradient points are page coordinates in millimetres, as in canvas's own
// PDF and SVG writers.
//
// Fonts: glyph codes are the font's own glyph IDs (Identity-H, CIDToGIDMap
// Identity) and the subset keeps IDs, blanking unused outlines, so a page
// can be encoded before the document knows all glyphs. An EncodedPage names
// fonts by FontKey (SHA-256 of the font tables); pages made by EncodePage
// carry the font, pages restored from a cache need Writer.RegisterFont.
// The slug font, DejaVu Sans Condensed, is always registered.
//
// Limits, each reported or handled rather than written wrong: raster
// images and hatch patterns are errors; fonts whose outlines cannot be
// embedded, vertical text and rotated glyphs are drawn as outlines (not
// searchable);
// miter-clip and arcs joins are stroked into outlines by canvas; a
// gradient's opacity is its first stop's (PDF shadings have no alpha
// without soft masks).
package pdf

import (
	"cmp"
	"sheaf/palette/press"

	"bufio"
	"crypto/sha256"
	"errors"
	"fmt"
	"hash"
	"io"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"time"
	"unicode/utf16"

	"github.com/klauspost/compress/zlib"

	"github.com/tdewolff/canvas"
)

// Uncompressed as Options.Compression writes streams without a filter,
// for reading the content by eye.
const Uncompressed = -100

// DefaultCompression is the zlib level used when Options.Compression is 0.
// Content streams are mostly decimal numbers; on the benchmark document
// (84 pages of 48 curves) level 1 gives 15.2 MB in 0.86 s and level 6
// 13.5 MB in 2.3 s (2 cores, measured): 12 % larger for 2.7× the speed.
// The compressor is klauspost/compress's zlib, not the standard
// library's: at level 1 on the catalog's 75 content streams it takes
// 0.67× the CPU time and writes 4.6 % fewer bytes (README, Speed).
const DefaultCompression = 1

// Options are the document-wide settings.
type Options struct {
	Title string
	// Version is the sheaf version; the Producer is "sheaf <Version>".
	Version string
	// Date is both CreationDate and ModDate. It is never taken from the
	// clock: pass a fixed time (sheaf: feature.DocumentDate). The zero Time
	// means the Unix epoch, 1970-01-01T00:00:00Z.
	Date time.Time
	// Compression is the zlib level (1–9) of content streams and font
	// files; 0 means DefaultCompression, Uncompressed means none.
	Compression int
	// Press is the printing condition. With it the document is a PDF/X-4
	// (ISO 15930-7): its output intent carries the press's profile and
	// every page must have been drawn for the same condition
	// (PageSetup.Press). Without it the document is plain RGB — colours
	// in the embedded sRGB profile, no output intent, no PDF/X claim —
	// and the printer converts it.
	Press *press.Condition
}

// Object numbers fixed by the writer.
const (
	objCatalog = 1 + iota
	objPages
	objInfo
	objMetadata
	objICC
	objICCSpace
	objRegSpace
	firstFreeObj
)

// Writer writes one PDF document to an io.Writer.
//
// Pages are drawn concurrently, so a draw function must not share
// unsynchronised state with other pages' draw functions. An error in a
// page's drawing is returned by a later AddPage or by Close; after it the
// writer writes nothing more (no trailer), so the output is visibly
// incomplete — callers should write to a temporary file and rename it only
// when Close succeeds.
type Writer struct {
	out  *bufio.Writer
	hash *blockHasher
	n    int64

	opts    Options
	level   int
	started bool
	closed  bool
	err     error

	offsets []int64 // by object number; 0 = not yet written
	nextObj int

	keys     *fontKeys
	pools    *pools
	registry map[FontKey]*fontData
	fonts    map[FontKey]*docFont
	fontSeq  []*docFont

	functions map[string]int
	patterns  map[string]int
	// shadingKeys names patterns and functions by their written form.
	shadingKeys shadingKeys
	gstates     map[Alpha]int
	pages       []int

	added  int
	queue  []*pending
	sem    chan struct{}
	window int

	buf []byte
}

type docFont struct {
	ref  int
	data *fontData
	used map[uint16]string
}

type pending struct {
	done  chan struct{}
	page  *EncodedPage
	err   error
	index int
}

// NewWriter returns a Writer that writes to w.
func NewWriter(w io.Writer, opts Options) *Writer {
	procs := runtime.GOMAXPROCS(0)
	pw := &Writer{
		opts:      opts,
		level:     opts.Compression,
		nextObj:   firstFreeObj,
		offsets:   make([]int64, firstFreeObj),
		keys:      newFontKeys(),
		pools:     newPools(cmp.Or(opts.Compression, DefaultCompression)),
		registry:  map[FontKey]*fontData{},
		fonts:     map[FontKey]*docFont{},
		functions: map[string]int{},
		patterns:  map[string]int{},
		gstates:   map[Alpha]int{},
		sem:       make(chan struct{}, procs),
		window:    2 * procs,
	}
	pw.hash = &blockHasher{w: w, h: sha256.New(), inFlight: make(chan struct{}, 8), free: make(chan []byte, 8)}
	pw.out = bufio.NewWriterSize(pw.hash, 256<<10)
	if sf := slugFont(); sf != nil {
		pw.registry[sf.key] = sf
	}
	return pw
}

// RegisterFont makes a font known by its key, for pages that come back
// from a cache without their font (see EncodedPage). It returns the key.
func (w *Writer) RegisterFont(f *canvas.Font) (FontKey, error) {
	if f == nil || f.SFNT == nil {
		return FontKey{}, errors.New("pdf: RegisterFont: no font")
	}
	d, err := w.keys.get(f.SFNT)
	if err != nil {
		return FontKey{}, fmt.Errorf("pdf: RegisterFont %s: %w", f.Name(), err)
	}
	w.registry[d.key] = d
	return d.key, nil
}

func (w *Writer) usable() error {
	if w.err != nil {
		return w.err
	}
	if w.closed {
		return errors.New("pdf: writer is closed")
	}
	return nil
}

// AddPage queues a page. draw is called, possibly concurrently with
// other pages' draw functions, with a canvas the size of the MediaBox in
// millimetres. Box and mark errors are returned at once and the page is
// not added; drawing errors are returned by a later call (see Writer).
func (w *Writer) AddPage(setup PageSetup, draw func(c *canvas.Canvas) error) error {
	if err := w.usable(); err != nil {
		return err
	}
	n := w.added + 1
	if err := setup.Boxes.validate(); err != nil {
		return fmt.Errorf("pdf: page %d: %w", n, err)
	}
	if setup.Marks != nil {
		if err := setup.Marks.validate(setup.Boxes, setup.Slug); err != nil {
			return fmt.Errorf("pdf: page %d: %w", n, err)
		}
	}
	p := &pending{done: make(chan struct{}), index: w.added}
	w.added++
	w.queue = append(w.queue, p)
	level, keys, pl := w.level, w.keys, w.pools
	w.sem <- struct{}{} // bounds the encoders running at once
	go func() {
		defer func() { <-w.sem; close(p.done) }()
		p.page, p.err = encodePage(setup, draw, level, keys, pl)
	}()
	return w.drain(w.window)
}

// AddEncoded queues a page encoded earlier (by EncodePage or from a
// cache). Its fonts must be carried by the page or registered.
func (w *Writer) AddEncoded(p *EncodedPage) error {
	if err := w.usable(); err != nil {
		return err
	}
	n := w.added + 1
	if p == nil {
		return fmt.Errorf("pdf: page %d: nil page", n)
	}
	if err := p.Boxes.validate(); err != nil {
		return fmt.Errorf("pdf: page %d: %w", n, err)
	}
	for _, f := range p.Fonts {
		if f.font == nil && w.registry[f.Key] == nil && w.fonts[f.Key] == nil {
			return fmt.Errorf("pdf: page %d: font %v is not registered (call RegisterFont)", n, f.Key)
		}
	}
	done := make(chan struct{})
	close(done)
	w.queue = append(w.queue, &pending{done: done, page: p, index: w.added})
	w.added++
	return w.drain(w.window)
}

// drain writes finished pages in order until at most limit are queued.
func (w *Writer) drain(limit int) error {
	for len(w.queue) > limit {
		p := w.queue[0]
		<-p.done
		w.queue = w.queue[1:]
		if w.err != nil {
			continue
		}
		if p.err != nil {
			w.err = fmt.Errorf("pdf: page %d: %w", p.index+1, p.err)
			continue
		}
		if err := w.writePage(p.page); err != nil {
			w.err = fmt.Errorf("pdf: page %d: %w", p.index+1, err)
		}
		p.page = nil
	}
	return w.err
}

// low-level output

func (w *Writer) write(b []byte) {
	if w.err != nil {
		return
	}
	n, err := w.out.Write(b)
	w.n += int64(n)
	if err != nil {
		w.err = fmt.Errorf("pdf: write: %w", err)
	}
}

func (w *Writer) alloc() int {
	n := w.nextObj
	w.nextObj++
	w.offsets = append(w.offsets, 0)
	return n
}

// obj writes object num with the dictionary or value in body.
func (w *Writer) obj(num int, body []byte) {
	w.offsets[num] = w.n
	b := w.buf[:0]
	b = strconv.AppendInt(b, int64(num), 10)
	b = append(b, " 0 obj\n"...)
	b = append(b, body...)
	b = append(b, "\nendobj\n"...)
	w.buf = b
	w.write(b)
}

// stream writes a stream object; dict holds the entries besides /Length.
func (w *Writer) stream(num int, dict string, data []byte) {
	w.offsets[num] = w.n
	b := w.buf[:0]
	b = strconv.AppendInt(b, int64(num), 10)
	b = append(b, " 0 obj\n<<"...)
	b = append(b, dict...)
	b = append(b, " /Length "...)
	b = strconv.AppendInt(b, int64(len(data)), 10)
	b = append(b, " >>\nstream\n"...)
	w.buf = b
	w.write(b)
	w.write(data)
	w.write([]byte("\nendstream\nendobj\n"))
}

func (w *Writer) compress(data []byte) ([]byte, string) {
	if w.level == Uncompressed {
		return data, ""
	}
	level := w.level
	if level == 0 {
		level = DefaultCompression
	}
	var sb strings.Builder
	zw, err := zlib.NewWriterLevel(&sb, level)
	if err != nil {
		w.err = fmt.Errorf("pdf: compression level %d: %w", level, err)
		return nil, ""
	}
	zw.Write(data)
	zw.Close()
	return []byte(sb.String()), " /Filter /FlateDecode"
}

func (w *Writer) start() {
	if w.started {
		return
	}
	w.started = true
	// The comment line of bytes ≥ 128 tells transfer programs the file
	// is binary (ISO 32000-1 §7.5.2).
	w.write([]byte("%PDF-1.6\n%\xE2\xE3\xCF\xD3\n"))
	if pc := w.opts.Press; pc != nil {
		// The press profile is both the output intent's DestOutputProfile
		// and the alternate space of the registration colour.
		n := pc.Components()
		data, filter := w.compress(pc.Profile.Bytes())
		w.stream(objICC, " /N "+strconv.Itoa(n)+" /Alternate "+deviceSpace(n)+filter, data)
		w.obj(objICCSpace, []byte("[/ICCBased "+ref(objICC)+"]"))
		// Registration: colourant All marks every separation (§8.6.6.4);
		// its alternate puts tint t on every device component.
		c0, c1 := strings.Repeat("0 ", n), strings.Repeat("1 ", n)
		if n != 4 {
			c0, c1 = strings.Repeat("1 ", n), strings.Repeat("0 ", n) // additive: 0 is black
		}
		w.obj(objRegSpace, []byte("[/Separation /All "+ref(objICCSpace)+
			" << /FunctionType 2 /Domain [0 1] /C0 ["+strings.TrimSpace(c0)+"] /C1 ["+strings.TrimSpace(c1)+"] /N 1 >>]"))
		return
	}
	icc := SRGBProfile()
	data, filter := w.compress(icc)
	w.stream(objICC, " /N 3 /Alternate /DeviceRGB"+filter, data)
	w.obj(objICCSpace, []byte("[/ICCBased "+ref(objICC)+"]"))
	// Registration colour: colourant All marks every separation
	// (§8.6.6.4); its alternate maps tint 1 to black in the sRGB space.
	w.obj(objRegSpace, []byte("[/Separation /All "+ref(objICCSpace)+
		" << /FunctionType 2 /Domain [0 1] /C0 [1 1 1] /C1 [0 0 0] /N 1 >>]"))
}

func ref(n int) string { return strconv.Itoa(n) + " 0 R" }

func rectArray(b []byte, r canvas.Rect) []byte {
	b = append(b, '[')
	b = appendNums(b, r.X0, r.Y0, r.X1, r.Y1)
	return append(b, ']')
}

func (w *Writer) writePage(p *EncodedPage) error {
	w.start()
	want := 0
	if w.opts.Press != nil {
		want = w.opts.Press.Components()
	}
	if p.Device != want {
		return fmt.Errorf("a page drawn in %s does not belong in a document in %s", spaceName(p.Device), spaceName(want))
	}
	var res []byte
	res = append(res, "<< /ColorSpace << /CS0 "...)
	res = append(res, ref(objICCSpace)...)
	res = append(res, " /CS1 "...)
	res = append(res, ref(objRegSpace)...)
	res = append(res, " >>"...)
	if len(p.Fonts) > 0 {
		res = append(res, " /Font <<"...)
		for i, pf := range p.Fonts {
			df := w.fonts[pf.Key]
			if df == nil {
				d := pf.font
				if d == nil {
					d = w.registry[pf.Key]
				}
				if d == nil {
					return fmt.Errorf("font %v is not registered", pf.Key)
				}
				if !d.embeddable {
					return fmt.Errorf("font %s has no TrueType or CFF outlines to embed", d.psName)
				}
				if d.refusal != "" {
					return fmt.Errorf("font %s: %s", d.psName, d.refusal)
				}
				df = &docFont{ref: w.alloc(), data: d, used: map[uint16]string{}}
				w.fonts[pf.Key] = df
				w.fontSeq = append(w.fontSeq, df)
			}
			for _, g := range pf.Glyphs {
				if int(g.ID) >= df.data.numGlyphs {
					return fmt.Errorf("glyph %d is beyond font %s's %d glyphs", g.ID, df.data.psName, df.data.numGlyphs)
				}
				if t, ok := df.used[g.ID]; !ok || t == "" {
					df.used[g.ID] = g.Text
				}
			}
			res = append(res, " /F"...)
			res = strconv.AppendInt(res, int64(i), 10)
			res = append(res, ' ')
			res = append(res, ref(df.ref)...)
		}
		res = append(res, " >>"...)
	}
	if len(p.Patterns) > 0 {
		res = append(res, " /Pattern <<"...)
		for i, sh := range p.Patterns {
			num, err := w.pattern(sh)
			if err != nil {
				return err
			}
			res = append(res, " /P"...)
			res = strconv.AppendInt(res, int64(i), 10)
			res = append(res, ' ')
			res = append(res, ref(num)...)
		}
		res = append(res, " >>"...)
	}
	if len(p.GStates) > 0 {
		res = append(res, " /ExtGState <<"...)
		for i, a := range p.GStates {
			if !finite(a.Fill, a.Stroke) || a.Fill < 0 || a.Fill > 1 || a.Stroke < 0 || a.Stroke > 1 {
				return fmt.Errorf("opacity %+v outside [0,1]", a)
			}
			num, ok := w.gstates[a]
			if !ok {
				num = w.alloc()
				w.gstates[a] = num
				var b []byte
				b = append(b, "<< /Type /ExtGState /ca "...)
				b = appendNum(b, a.Fill)
				b = append(b, " /CA "...)
				b = appendNum(b, a.Stroke)
				if a.Overprint {
					b = append(b, " /OP true /op true /OPM 1"...)
				}
				b = append(b, " >>"...)
				w.obj(num, b)
			}
			res = append(res, " /G"...)
			res = strconv.AppendInt(res, int64(i), 10)
			res = append(res, ' ')
			res = append(res, ref(num)...)
		}
		res = append(res, " >>"...)
	}
	res = append(res, " >>"...)

	content := w.alloc()
	filter := ""
	if p.Compressed {
		filter = " /Filter /FlateDecode"
	}
	data := p.Content
	if data == nil && p.Load != nil {
		var err error
		if data, err = p.Load(); err != nil {
			return err
		}
	}
	w.stream(content, filter, data)

	page := w.alloc()
	var b []byte
	b = append(b, "<< /Type /Page /Parent "...)
	b = append(b, ref(objPages)...)
	b = append(b, " /MediaBox "...)
	b = rectArray(b, p.Boxes.Media)
	b = append(b, " /CropBox "...)
	b = rectArray(b, p.Boxes.Media)
	b = append(b, " /BleedBox "...)
	b = rectArray(b, p.Boxes.Bleed)
	b = append(b, " /TrimBox "...)
	b = rectArray(b, p.Boxes.Trim)
	b = append(b, " /Resources "...)
	b = append(b, res...)
	if p.Transparent {
		b = append(b, " /Group << /Type /Group /S /Transparency /CS "...)
		if p.Device > 0 {
			b = append(b, deviceSpace(p.Device)...)
		} else {
			b = append(b, ref(objICCSpace)...)
		}
		b = append(b, " >>"...)
	}
	b = append(b, " /Contents "...)
	b = append(b, ref(content)...)
	b = append(b, " >>"...)
	w.obj(page, b)
	w.pages = append(w.pages, page)
	return w.err
}

// pattern writes (once per distinct shading) a shading pattern
// (PatternType 2, ISO 32000-1 §8.7.4.3) whose colour comes from a
// stitching function (Type 3, §7.10.4) of exponential interpolations
// (Type 2, N = 1) between the stops. The pattern space is the page's
// default space, in points, as the shading coordinates are.
func (w *Writer) pattern(sh Shading) (int, error) {
	key := w.shadingKeys.key(sh)
	if num, ok := w.patterns[key]; ok {
		return num, nil
	}
	if n := len(sh.Coords); !sh.Radial && n != 4 || sh.Radial && n != 6 || !finite(sh.Coords...) {
		return 0, fmt.Errorf("shading coordinates %v are malformed", sh.Coords)
	}
	if len(sh.Stops) == 0 {
		return 0, errors.New("shading without stops")
	}
	fkey := key[strings.IndexByte(key+";", ';'):]
	fn, ok := w.functions[fkey]
	if !ok {
		body, err := stitching(sh.Stops)
		if err != nil {
			return 0, err
		}
		fn = w.alloc()
		w.functions[fkey] = fn
		w.obj(fn, body)
	}
	num := w.alloc()
	w.patterns[key] = num
	var b []byte
	b = append(b, "<< /Type /Pattern /PatternType 2 /Shading << /ShadingType "...)
	if sh.Radial {
		b = append(b, '3')
	} else {
		b = append(b, '2')
	}
	b = append(b, " /ColorSpace "...)
	if sh.Device > 0 {
		b = append(b, deviceSpace(sh.Device)...)
	} else {
		b = append(b, ref(objICCSpace)...)
	}
	b = append(b, " /Coords ["...)
	b = appendNums(b, sh.Coords...)
	b = append(b, "] /Function "...)
	b = append(b, ref(fn)...)
	b = append(b, " /Extend [true true] >> >>"...)
	w.obj(num, b)
	return num, nil
}

// stitching builds the Type 3 function over [0,1] for the stops. Before
// the first and after the last stop the colour is constant (as canvas's
// Stops.At); coincident stops make a hard edge.
func stitching(stops []Stop) ([]byte, error) {
	for i, s := range stops {
		if !finite(s.Offset, s.R, s.G, s.B) || !finite(s.Ink...) || len(s.Ink) != len(stops[0].Ink) || s.Offset < 0 || s.Offset > 1 || i > 0 && s.Offset < stops[i-1].Offset {
			return nil, fmt.Errorf("gradient stop %d %+v is out of range or order", i, s)
		}
	}
	type piece struct {
		t0, t1 float64
		c0, c1 Stop
	}
	var pieces []piece
	first, last := stops[0], stops[len(stops)-1]
	if first.Offset > 0 {
		pieces = append(pieces, piece{0, first.Offset, first, first})
	}
	for i := 0; i+1 < len(stops); i++ {
		if stops[i+1].Offset > stops[i].Offset {
			pieces = append(pieces, piece{stops[i].Offset, stops[i+1].Offset, stops[i], stops[i+1]})
		}
	}
	if last.Offset < 1 || len(pieces) == 0 {
		pieces = append(pieces, piece{last.Offset, 1, last, last})
	}
	var b []byte
	b = append(b, "<< /FunctionType 3 /Domain [0 1] /Functions ["...)
	for _, p := range pieces {
		b = append(b, " << /FunctionType 2 /Domain [0 1] /C0 ["...)
		b = appendNums(b, p.c0.components()...)
		b = append(b, "] /C1 ["...)
		b = appendNums(b, p.c1.components()...)
		b = append(b, "] /N 1 >>"...)
	}
	b = append(b, " ] /Bounds ["...)
	for i := 1; i < len(pieces); i++ {
		if i > 1 {
			b = append(b, ' ')
		}
		b = appendNum(b, pieces[i].t0)
	}
	b = append(b, "] /Encode ["...)
	for i := range pieces {
		if i > 0 {
			b = append(b, ' ')
		}
		b = append(b, "0 1"...)
	}
	b = append(b, "] >>"...)
	return b, nil
}

// Close writes the fonts, page tree, catalog, metadata, cross-reference
// table and trailer. It does not close the underlying io.Writer.
func (w *Writer) Close() error {
	if w.closed {
		return w.err
	}
	w.closed = true
	w.drain(0)
	if w.err != nil {
		return w.err
	}
	if len(w.pages) == 0 {
		w.err = errors.New("pdf: document has no pages")
		return w.err
	}
	for _, f := range w.fontSeq {
		if err := w.writeFont(f); err != nil {
			w.err = fmt.Errorf("pdf: font %s: %w", f.data.psName, err)
			return w.err
		}
	}

	var b []byte
	b = append(b, "<< /Type /Pages /Kids ["...)
	for i, p := range w.pages {
		if i > 0 {
			b = append(b, ' ')
		}
		b = append(b, ref(p)...)
	}
	b = append(b, "] /Count "...)
	b = strconv.AppendInt(b, int64(len(w.pages)), 10)
	b = append(b, " >>"...)
	w.obj(objPages, b)

	catalog := "<< /Type /Catalog /Pages " + ref(objPages) + " /Metadata " + ref(objMetadata)
	pdfx := ""
	if pc := w.opts.Press; pc != nil {
		// ISO 15930-7 §6.2.4: a GTS_PDFX output intent whose
		// DestOutputProfile characterises the printing condition.
		catalog += " /OutputIntents [<< /Type /OutputIntent /S /GTS_PDFX /OutputConditionIdentifier " + pdfText(pc.Identifier) +
			" /OutputCondition " + pdfText(pc.Identifier) + " /RegistryName " + pdfText(pc.Registry) +
			" /Info " + pdfText(pc.Profile.Description) + " /DestOutputProfile " + ref(objICC) + " >>]"
		pdfx = " /GTS_PDFXVersion (PDF/X-4)"
	}
	w.obj(objCatalog, []byte(catalog+" >>"))

	date := w.opts.Date
	if date.IsZero() {
		date = time.Unix(0, 0)
	}
	date = date.UTC()
	producer := "sheaf"
	if w.opts.Version != "" {
		producer += " " + w.opts.Version
	}
	pdfDate := date.Format("D:20060102150405Z00'00'")
	w.obj(objInfo, []byte("<< /Title "+pdfText(w.opts.Title)+" /Producer "+pdfText(producer)+" /Creator "+pdfText(producer)+
		" /CreationDate ("+pdfDate+") /ModDate ("+pdfDate+") /Trapped /False"+pdfx+" >>"))
	w.stream(objMetadata, " /Type /Metadata /Subtype /XML", xmp(w.opts.Title, producer, date, pdfx != ""))

	// cross-reference table (§7.5.4): 20-byte entries
	xref := w.n
	b = b[:0]
	b = append(b, "xref\n0 "...)
	b = strconv.AppendInt(b, int64(len(w.offsets)), 10)
	b = append(b, "\n0000000000 65535 f \n"...)
	for num := 1; num < len(w.offsets); num++ {
		if w.offsets[num] == 0 {
			w.err = fmt.Errorf("pdf: internal error: object %d was never written", num)
			return w.err
		}
		b = append(b, fmt.Sprintf("%010d 00000 n \n", w.offsets[num])...)
	}
	w.write(b)
	if w.err != nil {
		return w.err
	}
	if err := w.out.Flush(); err != nil {
		w.err = fmt.Errorf("pdf: write: %w", err)
		return w.err
	}
	// /ID: a digest of everything before the trailer (§14.4; PDF/X
	// requires it). Both halves are equal for a newly made file.
	id := fmt.Sprintf("%X", w.hash.sum(nil)[:16])
	w.write([]byte(fmt.Sprintf("trailer\n<< /Size %d /Root %s /Info %s /ID [<%s> <%s>] >>\nstartxref\n%d\n%%%%EOF\n",
		len(w.offsets), ref(objCatalog), ref(objInfo), id, id, xref)))
	if w.err == nil {
		if err := w.out.Flush(); err != nil {
			w.err = fmt.Errorf("pdf: write: %w", err)
		}
	}
	return w.err
}

// Digest gives the SHA-256 and the size of the whole file, once Close
// has succeeded: the writer hashes every byte for the /ID anyway, and the
// trailer after it too, so a caller that records the file's hash (a
// manifest) need not hash 10 MB a second time or read the file back.
func (w *Writer) Digest() (sum [sha256.Size]byte, size int64, err error) {
	if !w.closed || w.err != nil {
		return sum, 0, errors.New("pdf: Digest before a successful Close")
	}
	w.hash.sum(sum[:0])
	return sum, w.n, nil
}

// blockHasher writes through to w and hashes each block written on
// another goroutine, blocks in order, so that the SHA-256 of a 10 MB
// file (the /ID, and Digest) overlaps the writing instead of following
// it. A block's goroutine ends when the block is hashed: a writer given
// up after an error leaves nothing running. At most cap(inFlight) blocks
// wait to be hashed at once.
type blockHasher struct {
	w        io.Writer
	h        hash.Hash
	last     chan struct{} // closed when every block handed over is hashed
	inFlight chan struct{}
	free     chan []byte // hashed blocks' memory, for the next
}

func (b *blockHasher) Write(p []byte) (int, error) {
	n, err := b.w.Write(p)
	if n == 0 {
		return n, err
	}
	var c []byte
	select {
	case c = <-b.free:
	default:
	}
	c = append(c[:0], p[:n]...)
	prev, done := b.last, make(chan struct{})
	b.last = done
	b.inFlight <- struct{}{}
	go func() {
		if prev != nil {
			<-prev
		}
		b.h.Write(c)
		select {
		case b.free <- c:
		default:
		}
		<-b.inFlight
		close(done)
	}()
	return n, err
}

// sum waits for the blocks written so far and appends their SHA-256 to
// in.
func (b *blockHasher) sum(in []byte) []byte {
	if b.last != nil {
		<-b.last
	}
	return b.h.Sum(in)
}

// writeFont embeds a font as a Type 0 font (ISO 32000-1 §9.7) with
// Identity-H encoding, widths and a ToUnicode CMap: TrueType as a
// CIDFontType2 descendant (CIDToGIDMap Identity, FontFile2), CFF as a
// CIDFontType0 (FontFile3 /CIDFontType0C); see fontData.program.
func (w *Writer) writeFont(f *docFont) error {
	d := f.data
	used := map[uint16]bool{}
	for id := range f.used {
		used[id] = true
	}
	name := d.baseName(used)
	file, fileKey, fileDict, subtype, cidExtra, err := d.program(used)
	if err != nil {
		return err
	}
	scale := 1000 / float64(d.unitsPerEm)

	fileData, filter := w.compress(file)
	fontFile := w.alloc()
	w.stream(fontFile, fileDict+filter, fileData)

	s := d.sfnt
	ascent, descent := 0.0, 0.0
	if s.Hhea != nil {
		ascent, descent = float64(s.Hhea.Ascender)*scale, float64(s.Hhea.Descender)*scale
	}
	capHeight := ascent
	if s.OS2 != nil && s.OS2.SCapHeight != 0 {
		capHeight = float64(s.OS2.SCapHeight) * scale
	}
	italic := 0.0
	if s.Post != nil {
		italic = s.Post.ItalicAngle
	}
	flags := 4 // symbolic: glyphs are addressed by CID, not a standard encoding (§9.8.2)
	if italic != 0 {
		flags |= 64
	}
	var b []byte
	b = append(b, "<< /Type /FontDescriptor /FontName /"...)
	b = append(b, name...)
	b = append(b, " /Flags "...)
	b = strconv.AppendInt(b, int64(flags), 10)
	b = append(b, " /FontBBox ["...)
	b = appendNums(b, float64(s.Head.XMin)*scale, float64(s.Head.YMin)*scale, float64(s.Head.XMax)*scale, float64(s.Head.YMax)*scale)
	b = append(b, "] /ItalicAngle "...)
	b = appendNum(b, italic)
	b = append(b, " /Ascent "...)
	b = appendNum(b, ascent)
	b = append(b, " /Descent "...)
	b = appendNum(b, descent)
	b = append(b, " /CapHeight "...)
	b = appendNum(b, capHeight)
	// StemV is required but fonts do not store it; 80 is the customary
	// value for a regular weight (no standard gives one).
	b = append(b, " /StemV 80 /"+fileKey+" "...)
	b = append(b, ref(fontFile)...)
	b = append(b, " >>"...)
	desc := w.alloc()
	w.obj(desc, b)

	ids := make([]int, 0, len(used))
	for id := range used {
		ids = append(ids, int(id))
	}
	sort.Ints(ids)
	b = b[:0]
	b = append(b, "<< /Type /Font /Subtype /"+subtype+" /BaseFont /"...)
	b = append(b, name...)
	b = append(b, " /CIDSystemInfo << /Registry (Adobe) /Ordering (Identity) /Supplement 0 >> /FontDescriptor "...)
	b = append(b, ref(desc)...)
	b = append(b, cidExtra+" /W ["...)
	for i := 0; i < len(ids); {
		j := i
		for j+1 < len(ids) && ids[j+1] == ids[j]+1 {
			j++
		}
		b = append(b, ' ')
		b = strconv.AppendInt(b, int64(ids[i]), 10)
		b = append(b, " ["...)
		for k := i; k <= j; k++ {
			if k > i {
				b = append(b, ' ')
			}
			b = appendNum(b, float64(d.advance(uint16(ids[k])))*scale)
		}
		b = append(b, ']')
		i = j + 1
	}
	b = append(b, " ] >>"...)
	cid := w.alloc()
	w.obj(cid, b)

	glyphs := make([]GlyphUse, 0, len(f.used))
	for id, t := range f.used {
		glyphs = append(glyphs, GlyphUse{ID: id, Text: t})
	}
	sort.Slice(glyphs, func(i, j int) bool { return glyphs[i].ID < glyphs[j].ID })
	cmap, filter := w.compress(toUnicodeCMap(glyphs))
	tu := w.alloc()
	w.stream(tu, filter, cmap)

	w.obj(f.ref, []byte("<< /Type /Font /Subtype /Type0 /BaseFont /"+name+" /Encoding /Identity-H /DescendantFonts ["+
		ref(cid)+"] /ToUnicode "+ref(tu)+" >>"))
	return w.err
}

// pdfText is a PDF text string (§7.9.2.2): a literal when the text is
// printable ASCII, else UTF-16BE with a byte order mark, in hex.
func pdfText(s string) string {
	ascii := true
	for _, r := range s {
		if r < 32 || r > 126 {
			ascii = false
			break
		}
	}
	if ascii {
		r := strings.NewReplacer(`\`, `\\`, "(", `\(`, ")", `\)`)
		return "(" + r.Replace(s) + ")"
	}
	var b strings.Builder
	b.WriteString("<FEFF")
	for _, c := range utf16.Encode([]rune(s)) {
		fmt.Fprintf(&b, "%04X", c)
	}
	b.WriteString(">")
	return b.String()
}

// xmp is the document's XMP packet (ISO 16684-1) with the properties
// PDF/X-4 wants to agree with the Info dictionary.
func xmp(title, producer string, date time.Time, pdfx bool) []byte {
	d := date.Format("2006-01-02T15:04:05Z")
	sum := sha256.Sum256([]byte(title + "\x00" + d))
	uuid := fmt.Sprintf("uuid:%x-%x-%x-%x-%x", sum[0:4], sum[4:6], sum[6:8], sum[8:10], sum[10:16])
	esc := func(s string) string {
		return strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&quot;").Replace(s)
	}
	// PDF/X-4 identification (ISO 15930-7 §6.7.5): only for a document
	// with a printing condition.
	pdfxNS, pdfxID := "", ""
	if pdfx {
		pdfxNS = "\n xmlns:pdfxid=\"http://www.npes.org/pdfx/ns/id/\""
		pdfxID = "<pdfxid:GTS_PDFXVersion>PDF/X-4</pdfxid:GTS_PDFXVersion>\n"
	}
	return []byte(`<?xpacket begin="` + "\uFEFF" + `" id="W5M0MpCehiHzreSzNTczkc9d"?>
<x:xmpmeta xmlns:x="adobe:ns:meta/">
<rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">
<rdf:Description rdf:about=""
 xmlns:dc="http://purl.org/dc/elements/1.1/"
 xmlns:xmp="http://ns.adobe.com/xap/1.0/"
 xmlns:pdf="http://ns.adobe.com/pdf/1.3/"
 xmlns:xmpMM="http://ns.adobe.com/xap/1.0/mm/"` + pdfxNS + `>
<dc:format>application/pdf</dc:format>
<dc:title><rdf:Alt><rdf:li xml:lang="x-default">` + esc(title) + `</rdf:li></rdf:Alt></dc:title>
<xmp:CreateDate>` + d + `</xmp:CreateDate>
<xmp:ModifyDate>` + d + `</xmp:ModifyDate>
<xmp:MetadataDate>` + d + `</xmp:MetadataDate>
<xmp:CreatorTool>` + esc(producer) + `</xmp:CreatorTool>
<pdf:Producer>` + esc(producer) + `</pdf:Producer>
<pdf:Trapped>False</pdf:Trapped>
<xmpMM:DocumentID>` + uuid + `</xmpMM:DocumentID>
<xmpMM:InstanceID>` + uuid + `</xmpMM:InstanceID>
<xmpMM:VersionID>1</xmpMM:VersionID>
<xmpMM:RenditionClass>default</xmpMM:RenditionClass>
` + pdfxID + `</rdf:Description>
</rdf:RDF>
</x:xmpmeta>
<?xpacket end="w"?>`)
}

func spaceName(device int) string {
	if device == 0 {
		return "sRGB"
	}
	return strings.TrimPrefix(deviceSpace(device), "/")
}

// components are the stop's colour values: device values or sRGB.
func (s Stop) components() []float64 {
	if len(s.Ink) > 0 {
		return s.Ink
	}
	return []float64{s.R, s.G, s.B}
}
