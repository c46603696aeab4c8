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
	"errors"
	"fmt"
	"strings"
	"sync"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/dejavu/dejavusanscondensedbold"
	"github.com/go-fonts/dejavu/dejavusanscondensedoblique"
	"github.com/tdewolff/canvas"

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
	raw   [numStyles][]byte
	path  [numStyles]string // resolved path; "" for a built-in face
	face  [numStyles]int    // index of the face in a collection
	fonts [numStyles]*canvas.Font
	emb   [numStyles]Embedding

	// like are the Sets Load may take parsed faces from (only while it
	// runs); shared marks the faces taken, whose features are set already.
	like   []*Set
	shared [numStyles]bool

	// The shaper behind canvas.FontFace.TextWidth is not documented as safe
	// for concurrent use, so measuring goes through one lock per Set.
	// Shaping costs about 10 µs a string; layout measures the same folios,
	// headings and lines again for every output and page, hence the cache.
	mu      sync.Mutex
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
			return s.set(st, builtin, "", 0)
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
		if err := s.set(st, b, resolved, 0); err != nil {
			return fmt.Errorf("%s: %q (resolved to %q) is not a usable TrueType/OpenType font: %w", where, written, resolved, err)
		}
		s.face[st] = face
		if why := s.emb[st].Licence.Refusal(); why != "" && embeds {
			return fmt.Errorf("%s: font %q (%s, resolved to %q): %s; output %q embeds its fonts (%s); choose another font or one licensed for embedding",
				where, s.fonts[st].Name(), written, resolved, why, out.Name, embedsWhy(out))
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
		if err := s.set(Italic, dejavusanscondensedoblique.TTF, "", 0); err != nil {
			return nil, err
		}
	} else {
		s.raw[Italic], s.path[Italic], s.face[Italic], s.fonts[Italic], s.emb[Italic] =
			s.raw[Regular], s.path[Regular], s.face[Regular], s.fonts[Regular], s.emb[Regular]
	}
	// The same bytes parsed again: canvas keeps features per font.
	if err := s.set(Figures, s.raw[Regular], s.path[Regular], 0); err != nil {
		return nil, err
	}
	s.face[Figures] = s.face[Regular]
	if !s.shared[Figures] {
		s.fonts[Figures].SetFeatures(figureFeatures)
	}
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

// set parses face i of b. Font files come from users, so a panic inside
// the parser is turned into an error rather than taking the program down.
func (s *Set) set(st Style, b []byte, path string, face int) (err error) {
	for _, o := range s.like {
		if o != nil && o.fonts[st] != nil && bytes.Equal(o.raw[st], b) {
			s.raw[st], s.path[st], s.face[st], s.fonts[st], s.emb[st] = b, path, face, o.fonts[st], o.emb[st]
			s.shared[st] = true
			return nil
		}
	}
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("font parser failed: %v", r)
		}
	}()
	f, err := canvas.LoadFont(b, face, canvas.FontRegular)
	if err != nil {
		return err
	}
	if f.Head == nil || f.Head.UnitsPerEm == 0 {
		return fmt.Errorf("font has no units per em")
	}
	if f.Hmtx == nil || f.Maxp == nil || f.NumGlyphs() == 0 {
		return fmt.Errorf("font has no glyphs or no horizontal metrics")
	}
	emb, err := embeddingOf(f.SFNT)
	if err != nil {
		return err
	}
	f.SetFeatures(features)
	s.raw[st], s.path[st], s.face[st], s.fonts[st], s.emb[st] = b, path, face, f, emb
	return nil
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

// Font returns the parsed canvas font for st.
func (s *Set) Font(st Style) *canvas.Font { return s.fonts[s.valid(st)] }

// Name returns the font's name from its name table.
func (s *Set) Name(st Style) string { return s.fonts[s.valid(st)].Name() }

func (s *Set) valid(st Style) Style {
	if st < 0 || st >= numStyles {
		return Regular
	}
	return st
}

// Face returns a black canvas face of st at size points. Callers may change
// its Fill.
func (s *Set) Face(st Style, size float64) *canvas.FontFace {
	return s.Font(st).Face(size, canvas.Black)
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

func (s *Set) metricsOf(st Style, size float64) Metrics {
	m := s.Face(st, size).Metrics()
	return Metrics{
		Ascent:    m.Ascent / mmPerPt,
		Descent:   m.Descent / mmPerPt,
		LineGap:   m.LineGap / mmPerPt,
		CapHeight: m.CapHeight / mmPerPt,
		XHeight:   m.XHeight / mmPerPt,
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
		w = s.measure(k.st, size, text)
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
func (s *Set) measure(st Style, size float64, text string) float64 {
	face := s.Face(st, size)
	k := advanceKey{st, text}
	if s.adv == nil {
		s.adv = &advances{}
	}
	s.adv.mu.Lock()
	defer s.adv.mu.Unlock()
	units, ok := s.adv.m[k]
	if !ok {
		if sh := s.shaper(st); sh != nil {
			units = sh.advance(text)
		} else {
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
	return face.MmPerEm * float64(units) / mmPerPt
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
