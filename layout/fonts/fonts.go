// Package fonts loads the typefaces of an output and measures text with
// them. Layout sizes every text band from these measurements and the render
// stage draws with the very same parsed fonts, so text measured here is text
// drawn there.
//
// All sizes and lengths are in PostScript points; canvas works in
// millimetres, and the conversion stays inside this package.
package fonts

import (
	"bytes"
	"crypto/sha256"
	"errors"
	"fmt"
	"strings"
	"sync"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/dejavu/dejavusanscondensedbold"
	"github.com/go-fonts/dejavu/dejavusanscondensedoblique"
	"github.com/go-text/typesetting/harfbuzz"
	"github.com/tdewolff/canvas"
	canvastext "github.com/tdewolff/canvas/text"
	"github.com/tdewolff/font"

	"sheaf/specs"
)

// mmPerPt converts points (1/72 in, ISO 32000-1 §8.3.2.3) to millimetres
// (1 in = 25.4 mm exactly).
const mmPerPt = 25.4 / 72

// Style is the role of a face within a Set.
type Style int

const (
	Regular Style = iota
	Bold
	Italic
	// Figures is the regular face shaped with tabular lining figures
	// (OpenType lnum and tnum), for tick labels and columns of numbers;
	// in a face without those features it is the regular face.
	Figures
	numStyles
)

func (s Style) String() string {
	switch s {
	case Regular:
		return "regular"
	case Bold:
		return "bold"
	case Italic:
		return "italic"
	case Figures:
		return "figures"
	}
	return fmt.Sprintf("Style(%d)", int(s))
}

// MarshalText writes the style's name, for JSON plans.
func (s Style) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// UnmarshalText reads what MarshalText writes.
func (s *Style) UnmarshalText(b []byte) error {
	for st := Style(0); st < numStyles; st++ {
		if st.String() == string(b) {
			*s = st
			return nil
		}
	}
	return fmt.Errorf("fonts: unknown style %q", b)
}

// Set is the fonts of one output, parsed once. A Set is safe for concurrent
// use by its own methods; the *canvas.FontFace values it hands out share the
// parsed fonts.
type Set struct {
	raw  [numStyles][]byte
	path [numStyles]string // resolved path; "" for a built-in face
	face [numStyles]int    // index of the face in a collection
	// sfnt is each face as tdewolff/font parses it (canvas's own first
	// step): what Load checks, and what metrics, names and glyph
	// coverage read, without canvas's second, full parse for shaping.
	sfnt [numStyles]*font.SFNT
	name [numStyles]string // as canvas names the face
	// fonts are canvas's fonts, for drawing, parsed on first use.
	fonts [numStyles]*canvasFont
	emb   [numStyles]Embedding

	// like are the Sets Load may take parsed faces from (only while it
	// runs).
	like []*Set

	// The shaper behind canvas.FontFace.TextWidth is not documented as safe
	// for concurrent use, so measuring goes through one lock per Set.
	// Shaping costs about 10 µs a string; layout measures the same folios,
	// headings and lines again for every output and page, hence the cache.
	mu      sync.Mutex
	err     error // see Err
	widths  map[widthKey]float64
	metrics map[widthKey]Metrics // text is always ""
	// saved is what LoadWidths read (savedRaw its bytes): a width found
	// there counts as measured, so SaveWidths keeps only the widths a run
	// used. reused counts the widths taken from saved.
	saved    map[widthKey]float64
	savedRaw []byte
	reused   int
	// adv holds texts' shaped advances in font units by style: the shaper
	// works in font units whatever the size (canvas scales the sum by the
	// face's mm per em), so a label tried at several sizes, or measured
	// for several outputs set in the same faces (ShareShaping), is shaped
	// once.
	adv *advances
}

type advances struct {
	mu sync.Mutex // taken inside a Set's mu, never the other way round
	m  map[advanceKey]int32
	// shapers shape for measuring, by style, made on first use (a
	// rebuild that finds every width saved parses nothing); nil where
	// go-text cannot read the face, and canvas's shaper measures.
	shapers [numStyles]*shaper
	tried   [numStyles]bool
	// glyphs are the shaped glyphs behind m's advances, kept for drawing
	// (Glyphs): a label measured is drawn soon after, and shaping it once
	// is half the cost. dir is the direction harfbuzz chose; a drawing
	// that asks another shapes afresh.
	glyphs map[advanceKey]shapedRun
	keep   bool // KeepGlyphs: a Set sharing these advances will draw
}

type shapedRun struct {
	dir    harfbuzz.Direction
	glyphs []canvastext.Glyph
}

// ShareShaping makes s measure with o's shaped advances when both hold
// the same faces (the same font bytes and faces for every style), and
// reports whether it does. Widths stay each Set's own.
func (s *Set) ShareShaping(o *Set) bool {
	if s == o {
		return true
	}
	for st := range numStyles {
		if s.face[st] != o.face[st] || !bytes.Equal(s.raw[st], o.raw[st]) {
			return false
		}
	}
	o.mu.Lock()
	if o.adv == nil {
		o.adv = &advances{}
	}
	adv := o.adv
	o.mu.Unlock()
	s.mu.Lock()
	s.adv = adv
	s.mu.Unlock()
	return true
}

type advanceKey struct {
	st   Style
	text string
}

type widthKey struct {
	st   Style
	size float64
	text string
}

// maxCached bounds the width cache; past it, widths are measured afresh.
const maxCached = 1 << 14

// Load returns the fonts of out: the font files named in out.Fonts
// (TrueType or OpenType with TrueType or CFF outlines, single fonts or
// collections with the face the spec picks), resolved against the spec's
// folder, or the built-in DejaVu Sans Condensed faces where a path is
// empty. The italic face is DejaVu Sans Condensed Oblique when the regular
// face is built in; with a custom regular face it is that face (the spec
// names no italic file).
//
// A face whose licence (OS/2 fsType) forbids embedding is an error for an
// output that embeds its fonts: every print output, and a screen output
// with fonts.embed. Errors name the spec's place of the font.
//
// A face whose bytes one of the Sets in like already holds, in the same
// style, is taken from it parsed (outputs in the same faces parse them
// once); the Sets then share the parsed fonts, never their widths.
func Load(spec *specs.Spec, out *specs.Output, like ...*Set) (*Set, error) {
	if spec == nil || out == nil {
		return nil, fmt.Errorf("fonts: Load needs a spec and an output")
	}
	s := &Set{like: like}
	defer func() { s.like = nil }()
	embeds := out.Kind == specs.Print || out.Fonts.Embed
	load := func(st Style, written string, ref specs.FaceRef, key string, builtin []byte) error {
		if written == "" {
			return s.set(st, builtin, "", 0, "built-in "+st.String()+" face")
		}
		resolved := spec.Resolve(written)
		where := fmt.Sprintf("%s: output %q: fonts.%s", spec.Where("outputs."+out.Name+".fonts."+key), out.Name, key)
		b, err := readFont(resolved)
		if err != nil {
			return fmt.Errorf("%s: cannot read font %q (resolved to %q): %w", where, written, resolved, err)
		}
		face, err := pickFace(b, ref)
		if err == nil {
			b, err = extractFace(b, face)
		}
		if err != nil {
			var fe *FaceError
			if errors.As(err, &fe) {
				where = fmt.Sprintf("%s: output %q: fonts.%s.face", spec.Where("outputs."+out.Name+".fonts."+key+".face"), out.Name, key)
				return fmt.Errorf("%s: %q (resolved to %q): %w", where, written, resolved, err)
			}
			return fmt.Errorf("%s: %q (resolved to %q) is not a usable TrueType/OpenType font: %w", where, written, resolved, err)
		}
		unusable := fmt.Sprintf("%s: %q (resolved to %q) is not a usable TrueType/OpenType font", where, written, resolved)
		if err := s.set(st, b, resolved, 0, unusable); err != nil {
			return fmt.Errorf("%s: %w", unusable, err)
		}
		s.face[st] = face
		if why := s.emb[st].Licence.Refusal(); why != "" && embeds {
			return fmt.Errorf("%s: font %q (%s, resolved to %q): %s; output %q embeds its fonts (%s); choose another font or one licensed for embedding",
				where, s.name[st], written, resolved, why, out.Name, embedsWhy(out))
		}
		return nil
	}
	if err := load(Regular, out.Fonts.Regular, out.Fonts.RegularFace, "regular", dejavusanscondensed.TTF); err != nil {
		return nil, err
	}
	if err := load(Bold, out.Fonts.Bold, out.Fonts.BoldFace, "bold", dejavusanscondensedbold.TTF); err != nil {
		return nil, err
	}
	if out.Fonts.Regular == "" {
		if err := s.set(Italic, dejavusanscondensedoblique.TTF, "", 0, "built-in italic face"); err != nil {
			return nil, err
		}
	} else {
		s.copyStyle(Italic, Regular)
		s.fonts[Italic] = s.fonts[Regular]
	}
	// The regular face again, with its own canvas font: canvas keeps
	// features per font.
	if !s.share(Figures, s.raw[Regular]) {
		s.copyStyle(Figures, Regular)
		if err := s.newCanvasFont(Figures, s.fonts[Regular].where); err != nil {
			return nil, err
		}
	}
	s.path[Figures], s.face[Figures] = s.path[Regular], s.face[Regular]
	return s, nil
}

func embedsWhy(out *specs.Output) string {
	if out.Kind == specs.Print {
		return "a print PDF carries its fonts"
	}
	return "fonts.embed is on"
}

// readFont reads a font file: a regular file (a FIFO or a device is
// refused at once, never waited on) of at most specs.MaxFontSize bytes —
// the largest CJK collections are a few tens of megabytes.
func readFont(path string) ([]byte, error) {
	return specs.ReadRegular(path, specs.MaxFontSize)
}

// Default returns a Set of the built-in faces (DejaVu Sans Condensed).
func Default() (*Set, error) {
	return Load(&specs.Spec{}, &specs.Output{})
}

// features are the OpenType features every face is shaped with: lining
// figures (lnum), so years and counts stand on the baseline at cap height
// in faces whose default figures are old-style. Faces without the feature
// keep their own figures.
const features = "lnum"

// figureFeatures add tabular figures (tnum): every digit one advance
// wide, so numbers in a column or under ticks line up.
const figureFeatures = "lnum,tnum"

// set parses face i of b as tdewolff/font parses it for canvas, and
// checks what measuring and drawing rely on; canvas's own parse waits
// for the first drawing (see canvasFont), and a failure of it is prefixed
// with where. Font files come from users, so a panic inside the parser
// is turned into an error rather than taking the program down.
func (s *Set) set(st Style, b []byte, path string, face int, where string) (err error) {
	if s.share(st, b) {
		s.path[st], s.face[st] = path, face
		return nil
	}
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("font parser failed: %v", r)
		}
	}()
	f, err := font.ParseFont(b, face) // canvas.LoadFont's first step
	if err != nil {
		return err
	}
	if f.Head == nil || f.Head.UnitsPerEm == 0 {
		return fmt.Errorf("font has no units per em")
	}
	if f.Hmtx == nil || f.Maxp == nil || f.NumGlyphs() == 0 {
		return fmt.Errorf("font has no glyphs or no horizontal metrics")
	}
	if f.OS2 == nil || f.Hhea == nil {
		// tdewolff/font reads a TrueType font without them, but canvas's
		// metrics (and so every line of text it draws) read both.
		return fmt.Errorf("font has no OS/2 or hhea table (vertical metrics), which OpenType requires")
	}
	emb, err := embeddingOf(f)
	if err != nil {
		return err
	}
	s.raw[st], s.path[st], s.face[st], s.sfnt[st], s.name[st], s.emb[st] = b, path, face, f, canvasName(f), emb
	return s.newCanvasFont(st, where)
}

// share takes the face for st from one of the Sets Load was given, when
// it holds the same bytes in that style (its features are set already).
func (s *Set) share(st Style, b []byte) bool {
	for _, o := range s.like {
		if o != nil && o.fonts[st] != nil && bytes.Equal(o.raw[st], b) {
			s.copyStyle(st, st, o)
			s.fonts[st] = o.fonts[st]
			return true
		}
	}
	return false
}

// copyStyle makes st's face from's face of o (s when o is not given),
// but for its canvas font.
func (s *Set) copyStyle(st, from Style, o ...*Set) {
	src := s
	if len(o) > 0 {
		src = o[0]
	}
	s.raw[st], s.path[st], s.face[st], s.sfnt[st], s.name[st], s.emb[st] =
		src.raw[from], src.path[from], src.face[from], src.sfnt[from], src.name[from], src.emb[from]
}

// newCanvasFont gives st its canvas font, to be parsed on first use. A
// face without a name is parsed now: canvas names it by a count of the
// nameless faces it has loaded, and Load's order keeps those names as
// they were when every face was parsed here.
func (s *Set) newCanvasFont(st Style, where string) error {
	feats := features
	if st == Figures {
		feats = figureFeatures
	}
	c := &canvasFont{b: s.raw[st], features: feats, where: where}
	if canvasName(s.sfnt[st]) == "" {
		f, err := loadCanvas(c.b, c.features)
		if err != nil {
			return err
		}
		c.once.Do(func() { c.f = f })
		s.name[st] = f.Name()
	}
	s.fonts[st] = c
	return nil
}

// canvasName is the name canvas.LoadFont gives a face: the first record
// of name ID 6, else 4, else 1; "" where canvas numbers it instead.
func canvasName(f *font.SFNT) string {
	for _, id := range []font.NameID{6, 4, 1} {
		for _, r := range f.Name.Get(id) {
			return r.String()
		}
	}
	return ""
}

// canvasFont is a face's canvas font, parsed on first use. canvas parses
// a face twice, once with tdewolff/font and again, written out, with
// go-text for its shaper (every glyph outline); measuring shapes with a
// parse of its own and only drawing needs canvas's, so a `check` never
// makes one. Sets loaded alike share it.
type canvasFont struct {
	once     sync.Once
	b        []byte
	features string
	where    string // the face's place, before a failure
	f        *canvas.Font
	err      error

	// sha is the SHA-256 of b, for the widths' identity: hashed once
	// for every Set sharing the face (megabytes a run otherwise).
	shaOnce sync.Once
	sha     [sha256.Size]byte
}

// sum is the SHA-256 of the face's bytes.
func (c *canvasFont) sum() [sha256.Size]byte {
	c.shaOnce.Do(func() { c.sha = sha256.Sum256(c.b) })
	return c.sha
}

// get parses c on the first call. A nil c (a Set not loaded) is an error.
func (c *canvasFont) get() (*canvas.Font, error) {
	if c == nil {
		return nil, errors.New("fonts: no font loaded")
	}
	c.once.Do(func() {
		c.f, c.err = loadCanvas(c.b, c.features)
		if c.err != nil {
			c.err = specs.BadInput(fmt.Errorf("%s: %w", c.where, c.err))
		}
	})
	return c.f, c.err
}

// loadCanvas parses b as canvas does, a panic of a parser being an error.
func loadCanvas(b []byte, features string) (f *canvas.Font, err error) {
	defer func() {
		if r := recover(); r != nil {
			f, err = nil, fmt.Errorf("font parser failed: %v", r)
		}
	}()
	f, err = canvas.LoadFont(b, 0, canvas.FontRegular)
	if err != nil {
		return nil, err
	}
	f.SetFeatures(features)
	return f, nil
}

// Embedding returns how the face for st goes into a document: its outline
// format, whether it is drawn as outlines and why, and its licence.
func (s *Set) Embedding(st Style) Embedding { return s.emb[s.valid(st)] }

// FaceIndex returns the index of the face for st within its file (0 for
// a single font).
func (s *Set) FaceIndex(st Style) int { return s.face[s.valid(st)] }

// Regular returns the raw bytes of the regular font file, for embedding.
func (s *Set) Regular() []byte { return s.raw[Regular] }

// Bold returns the raw bytes of the bold font file, for embedding.
func (s *Set) Bold() []byte { return s.raw[Bold] }

// Italic returns the raw bytes of the italic font file, for embedding.
func (s *Set) Italic() []byte { return s.raw[Italic] }

// Bytes returns the raw bytes of the font for st.
func (s *Set) Bytes(st Style) []byte { return s.raw[s.valid(st)] }

// Path returns the resolved file path of the font for st, or "" for a
// built-in face.
func (s *Set) Path(st Style) string { return s.path[s.valid(st)] }

// Font returns canvas's font for st, for drawing, parsed on first use
// (Load checks each face with the lighter parse canvas's starts with).
// It is nil when canvas cannot read the face after all: Ready says why,
// and whatever draws calls Ready first.
func (s *Set) Font(st Style) *canvas.Font {
	f, _ := s.fonts[s.valid(st)].get()
	return f
}

// Ready parses the faces of styles (every style when none is given) for
// drawing now and reports the first that canvas cannot read, or that
// measuring could not (see Err), with its place in the spec: bad input
// (specs.InputError). Nothing is drawn with a Set that is not ready.
func (s *Set) Ready(styles ...Style) error {
	if len(styles) == 0 {
		styles = []Style{Regular, Bold, Italic, Figures}
	}
	for _, st := range styles {
		if _, err := s.fonts[s.valid(st)].get(); err != nil {
			return err
		}
	}
	return s.Err()
}

// Err reports a face that measuring could not shape after all (neither
// parse of it for shaping reads it): its widths are then unknown, so
// layout stops with this error rather than place text by them.
func (s *Set) Err() error {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.err
}

// Name returns the face's name from its name table, as canvas names it
// (name ID 6, else 4, else 1).
func (s *Set) Name(st Style) string { return s.name[s.valid(st)] }

// HasGlyph reports whether the face for st maps r to a glyph (its cmap).
func (s *Set) HasGlyph(st Style, r rune) bool {
	f := s.sfnt[s.valid(st)]
	return f != nil && f.GlyphIndex(r) != 0
}

func (s *Set) valid(st Style) Style {
	if st < 0 || st >= numStyles {
		return Regular
	}
	return st
}

// Face returns a black canvas face of st at size points, nil when Ready
// fails. Callers may change its Fill.
func (s *Set) Face(st Style, size float64) *canvas.FontFace {
	f := s.Font(st)
	if f == nil {
		return nil
	}
	return f.Face(size, canvas.Black)
}

// mmPerEm is the millimetres per font unit of st at size points, as
// canvas.Font.Face works it out (its size in mm over units per em).
func (s *Set) mmPerEm(st Style, size float64) float64 {
	return size * mmPerPt / float64(s.sfnt[s.valid(st)].Head.UnitsPerEm)
}

// Metrics are the vertical metrics of a face, in points. Ascent and Descent
// are both positive distances from the baseline.
type Metrics struct {
	Ascent, Descent, LineGap, CapHeight, XHeight float64
}

// Metrics returns the vertical metrics of st at size points.
func (s *Set) Metrics(st Style, size float64) Metrics {
	k := widthKey{st: s.valid(st), size: size}
	s.mu.Lock()
	defer s.mu.Unlock()
	if m, ok := s.metrics[k]; ok {
		return m
	}
	m := s.metricsOf(st, size)
	if s.metrics == nil {
		s.metrics = make(map[widthKey]Metrics)
	}
	if len(s.metrics) < maxCached {
		s.metrics[k] = m
	}
	return m
}

// metricsOf is canvas.FontFace.Metrics in points, worked out as it
// does from the same parse of the face, so the same float64s.
func (s *Set) metricsOf(st Style, size float64) Metrics {
	f, em := s.sfnt[s.valid(st)], s.mmPerEm(st, size)
	asc, desc, gap := f.VerticalMetrics()
	return Metrics{
		Ascent:    em * float64(asc) / mmPerPt,
		Descent:   em * float64(desc) / mmPerPt,
		LineGap:   em * float64(gap) / mmPerPt,
		CapHeight: em * float64(f.OS2.SCapHeight) / mmPerPt,
		XHeight:   em * float64(f.OS2.SxHeight) / mmPerPt,
	}
}

// Baseline returns the baseline of a line of type set in a line box whose
// top is at top (y grows up) and whose height is size × leading: the
// leading is split evenly above and below the glyphs' ascent + descent, as
// CSS does for line boxes (CSS 2.1 §10.8.1).
func (s *Set) Baseline(st Style, size, leading, top float64) float64 {
	m := s.Metrics(st, size)
	half := (size*leading - (m.Ascent + m.Descent)) / 2
	return top - half - m.Ascent
}

// Width returns the advance width of text set in st at size points, with
// the font's kerning and shaping applied.
func (s *Set) Width(st Style, size float64, text string) float64 {
	if text == "" {
		return 0
	}
	k := widthKey{s.valid(st), size, text}
	s.mu.Lock()
	defer s.mu.Unlock()
	if w, ok := s.widths[k]; ok {
		return w
	}
	w, ok := s.saved[k]
	if !ok {
		var err error
		if w, err = s.measure(k.st, size, text); err != nil {
			if s.err == nil {
				s.err = err
			}
			return 0 // not kept: Err stops the layout
		}
	}
	if s.widths == nil {
		s.widths = make(map[widthKey]float64)
	}
	if len(s.widths) < maxCached {
		s.widths[k] = w
		if ok {
			s.reused++
		}
	}
	return w
}

// measure is canvas.FontFace.TextWidth in points, shaping text in st
// once for every size: the same sum of advances scaled the same way, so
// the same float64. s.mu is held.
func (s *Set) measure(st Style, size float64, text string) (float64, error) {
	k := advanceKey{st, text}
	if s.adv == nil {
		s.adv = &advances{}
	}
	s.adv.mu.Lock()
	defer s.adv.mu.Unlock()
	units, ok := s.adv.m[k]
	if !ok {
		if sh := s.shaper(st); sh != nil {
			if s.adv.keep {
				var run shapedRun
				units, run = sh.advanceAndGlyphs(text)
				if s.adv.glyphs == nil {
					s.adv.glyphs = make(map[advanceKey]shapedRun)
				}
				if len(s.adv.glyphs) < maxAdvances {
					s.adv.glyphs[k] = run
				}
			} else {
				units = sh.advance(text)
			}
		} else {
			// go-text cannot read the face as it is; canvas's shaper
			// reads it as tdewolff/font writes it out.
			face := s.Face(st, size)
			if face == nil {
				_, err := s.fonts[st].get()
				return 0, err
			}
			for _, g := range face.Glyphs(text) {
				if !g.Vertical {
					units += g.XAdvance
				} else {
					units -= g.YAdvance
				}
			}
		}
		if s.adv.m == nil {
			s.adv.m = make(map[advanceKey]int32)
		}
		if len(s.adv.m) < maxAdvances {
			s.adv.m[k] = units
		}
	}
	return s.mmPerEm(st, size) * float64(units) / mmPerPt, nil
}

// shaper returns the shaper measuring st, made on first use: the
// figures face shapes the regular face's parsed font with its own
// features. s.mu and s.adv.mu are held.
func (s *Set) shaper(st Style) *shaper {
	a := s.adv
	if a.tried[st] {
		return a.shapers[st]
	}
	a.tried[st] = true
	feats := features
	if st == Figures {
		feats = figureFeatures
	}
	if st == Figures && s.face[Figures] == s.face[Regular] && bytes.Equal(s.raw[Figures], s.raw[Regular]) {
		a.shapers[st] = s.shaper(Regular).withFeatures(feats)
	} else {
		a.shapers[st] = newShaper(s.raw[st], feats)
	}
	return a.shapers[st]
}

// KeepGlyphs has measuring keep the glyphs it shapes, for drawing them
// (Glyphs) without shaping again: for a Set that will draw what it
// measures, as a build's do. A Set that only measures (check) leaves it
// off and keeps only advances.
func (s *Set) KeepGlyphs() {
	defer s.lockAdvances()()
	s.adv.keep = true
}

// lockAdvances takes the Set's lock, then its advances' (made on first
// use), in that order, and returns what releases both.
func (s *Set) lockAdvances() (unlock func()) {
	s.mu.Lock()
	if s.adv == nil {
		s.adv = &advances{}
	}
	a := s.adv
	a.mu.Lock()
	return func() {
		a.mu.Unlock()
		s.mu.Unlock()
	}
}

// PrepareShaping parses the faces of styles for shaping now (measuring
// and drawing parse them on first use otherwise), so a caller can have
// it done on a goroutine beside other work. It measures nothing: the
// widths a run used, which SaveWidths keeps, are the same with or
// without it. A face go-text cannot read is left to measuring, which
// says so.
func (s *Set) PrepareShaping(styles ...Style) {
	defer s.lockAdvances()()
	for _, st := range styles {
		s.shaper(s.valid(st))
	}
}

// maxAdvances bounds the advances kept: a few per panel of a large
// catalog, a few bytes each beside the text the labels hold anyway.
const maxAdvances = 1 << 16

// Wrap breaks text into lines no wider than width points, greedily at
// spaces; a newline in text forces a break. A single word wider than width
// stays whole on its own line (breaking inside words would garble terms);
// callers can detect it with Width. Runs of spaces collapse to one. Empty
// text gives no lines.
func (s *Set) Wrap(st Style, size float64, text string, width float64) []string {
	var lines []string
	for _, para := range strings.Split(text, "\n") {
		words := strings.Fields(para)
		if len(words) == 0 {
			continue
		}
		cur := words[0]
		for _, w := range words[1:] {
			try := cur + " " + w
			// Measure the whole candidate line, not word sums: kerning
			// across the space counts.
			if s.Width(st, size, try) <= width {
				cur = try
				continue
			}
			lines = append(lines, cur)
			cur = w
		}
		lines = append(lines, cur)
	}
	return lines
}
