// Package specs reads and validates a sheaf page spec: the YAML file that
// says what a feature contains (title, data, terms, scaling, palette) and how
// each output looks (trim, margins, grid, type). It keeps the position of
// every key so later stages can point back at the line that asked for
// something impossible.
package specs

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"
)

// Pos is a place in a spec or data file. Line and Col are 1-based; 0
// means unknown, and String leaves it out.
type Pos struct {
	File      string
	Line, Col int
}

func (p Pos) String() string {
	switch {
	case p.Line == 0:
		return p.File
	case p.Col == 0:
		return fmt.Sprintf("%s:%d", p.File, p.Line)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Length is a distance in PostScript points (1/72 in). The spec writes
// lengths with a unit; see ParseLength.
type Length float64

// Pt returns the length in points.
func (l Length) Pt() float64 { return float64(l) }

// Mm returns the length in millimetres.
func (l Length) Mm() float64 { return float64(l) * MmPerPt }

// Px returns the length in CSS reference pixels (96 per inch).
func (l Length) Px() float64 { return float64(l) * PxPerPt }

// Size is a width and a height.
type Size struct{ W, H Length }

// Spec is a whole, validated page spec.
type Spec struct {
	File string // path as given on the command line
	Dir  string // directory that relative data and font paths are resolved against

	Title  string
	Dek    string // a sentence or two under the title
	Source string // source line
	Notes  []string
	Date   string // fixed date for file metadata (YYYY-MM-DD); empty: from SOURCE_DATE_EPOCH or the inputs

	Data    Data
	Years   Span
	Terms   Terms
	Order   Order
	Group   Grouping
	Scale   Scale
	Palette Palette
	Outputs []Output
	Inserts []Insert

	Preflight Preflight

	// The editor's layer (text.go): the language of words and numbers,
	// every phrase, annotations, highlighted terms, labelled periods.
	Language    Language
	Text        Text
	Annotations []Annotation
	Highlights  []string
	Periods     []Period
	PeriodBands bool // light bands behind every plot for the periods

	// DataGaps are the years of the span the data has no total for, set
	// when the data is loaded (render/feature), for the gap note.
	DataGaps []int

	positions map[string]Pos
}

// Where returns the position of the key at a dotted path such as
// "outputs.print.columns" or "terms.list.3". Unknown paths give the
// position of the nearest known parent, or the file alone.
func (s *Spec) Where(path string) Pos {
	for p := path; ; {
		if pos, ok := s.positions[p]; ok {
			return pos
		}
		i := lastDot(p)
		if i < 0 {
			return Pos{File: s.File}
		}
		p = p[:i]
	}
}

func lastDot(s string) int {
	for i := len(s) - 1; i >= 0; i-- {
		if s[i] == '.' {
			return i
		}
	}
	return -1
}

// Resolve returns a path from the spec resolved against the spec's folder.
func (s *Spec) Resolve(p string) string {
	if p == "" || filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(s.Dir, p)
}

// Output returns the output with the given name, or nil.
func (s *Spec) Output(name string) *Output {
	for i := range s.Outputs {
		if s.Outputs[i].Name == name {
			return &s.Outputs[i]
		}
	}
	return nil
}

// Data names the two tables a feature is drawn from.
type Data struct {
	Counts   string // counts table (term, year, count), as written in the spec
	Totals   string // totals table (year, total), as written in the spec
	FoldCase bool   // treat terms that differ only in case as one term
}

// Span is an inclusive range of years.
type Span struct{ From, To int }

// Len is the number of years in the span.
func (s Span) Len() int { return s.To - s.From + 1 }

// Terms says which terms become panels.
type Terms struct {
	List     []string // explicit list, order kept
	Top      int      // add the top N terms by overall share (0: none)
	MinTotal float64  // a term needs at least this many occurrences over the span
	Exclude  []string
}

// Order is the order panels are placed in.
type Order string

const (
	OrderListed   Order = "listed"       // as listed, then rule-selected terms by share
	OrderAlpha    Order = "alphabetical" // by term, Unicode collation-free code point order after case folding
	OrderPeakYear Order = "peak-year"    // by the year of the term's peak, then name
	// OrderSimilarity puts panels whose plotted shapes look alike next to
	// each other (package specs/series/shape).
	OrderSimilarity Order = "similarity"
)

// Grouping puts panels into groups with headings.
type Grouping string

const (
	GroupNone       Grouping = "none"
	GroupPeakDecade Grouping = "peak-decade"
	// GroupSimilarity makes clusters of alike shapes into groups, each
	// headed by a description of its mean shape.
	GroupSimilarity Grouping = "similarity"
)

// ScaleMode is how yearly counts become the plotted value.
type ScaleMode string

const (
	ScaleShare   ScaleMode = "per-million" // count / year's total × 1e6
	ScaleOwnPeak ScaleMode = "own-peak"    // share, divided by the term's own highest share (0–1)
	ScaleRaw     ScaleMode = "raw"         // counts as they are
)

// YRange says whether panels share one y-range.
type YRange string

const (
	YShared YRange = "shared"
	YOwn    YRange = "own"
)

// Scale is how values are computed and ranged.
type Scale struct {
	Mode   ScaleMode
	YRange YRange
	// Rolling is the length in years of the centred window the counts
	// are pooled over before scaling (an odd number); 0: no smoothing.
	Rolling int
}

// Color is a colour as written in the spec, in one of three spaces.
type Color struct {
	Space ColorSpace
	V     [3]float64 // sRGB 0–1; CIELAB L,a,b; OKLCh L (0–1), C, h (degrees)
	Text  string     // as written
}

// ColorSpace names the space of a Color's values.
type ColorSpace string

const (
	SpaceSRGB  ColorSpace = "srgb"
	SpaceLab   ColorSpace = "lab"
	SpaceOKLCh ColorSpace = "oklch"
)

// Palette is the era palette: colour encodes the year along every line.
type Palette struct {
	Paper   Color    // the background the lines are read against
	Anchors []Anchor // empty: the built-in palette
	Eras    []int    // era boundary years for a stepped palette; empty: continuous
	Checks  PaletteChecks
}

// Anchor fixes the palette's colour at a year.
type Anchor struct {
	Year  float64
	Color Color
}

// PaletteChecks holds the thresholds of the palette checks.
type PaletteChecks struct {
	MinStep     float64 // ΔE00 between adjacent eras or decades
	MinSpan     float64 // ΔE00 between first and last colour
	MinContrast float64 // WCAG contrast ratio against the paper
	MinCVDStep  float64 // ΔE00 between adjacent steps under simulated deficiencies
	Lightness   string  // "increasing", "decreasing" or "any"
}

// Preflight holds the thresholds of the checks run before every build.
type Preflight struct {
	SpikeRatio    float64 // a year above this many times the term's next-highest year is a spike
	MinType       Length  // smallest type size in print
	MinScreenType Length  // smallest type size on screen
	MinLine       Length  // thinnest rule or line in print
	Strict        bool    // findings stop the build
	// MinCount is the median count (yearly, or per rolling window) below
	// which a term's line is mostly Poisson noise; 0 turns the check off.
	MinCount float64
}

// Kind is the medium of an output.
type Kind string

const (
	Print  Kind = "print"
	Screen Kind = "screen"
)

// Output is one rendition of the feature: a print page set or a screen layout.
type Output struct {
	Name string
	Kind Kind

	Trim          Size   // page size (screen: width and, for pages flow, height)
	Bleed         Length // print only
	Slug          Length // room outside the bleed for marks and the slug line
	Margins       Margins
	Facing        bool // inside/outside margins mirror on left and right pages
	FirstPageLeft bool // page 1 is a left-hand page (default right)

	Columns       int     // 0: derived from MinPanelWidth
	MinPanelWidth Length  // used when Columns is 0
	Gutter        Length  // between columns
	RowGap        Length  // between rows
	PanelAspect   float64 // plot width / plot height; used when PanelHeight is 0
	PanelHeight   Length  // whole panel height (label + plot)
	Slack         Slack
	Balance       bool   // balance the last page
	FloorWidth    Length // legibility floor for the plot width
	FloorHeight   Length // legibility floor for the plot height

	Fonts    Fonts
	Type     TypeSizes
	Line     Length // chart line width
	Ticks    TickPlacement
	PeakDot  bool
	Running  string  // running head on pages after the first; empty: the title
	Marks    bool    // crop marks (print)
	SlugLine bool    // one-line slug with job, output, page and date (print)
	Proofs   float64 // proof resolution in dpi (print)

	Flow       Flow // screen: pages, scroll or scroll-groups
	PanelFiles bool // screen: one SVG per term as well
	Spreads    bool // screen pages: two facing pages side by side

	// KeyEvery repeats the colour key down a scrolling page (screen,
	// scroll flows), so a reader deep in it need not scroll back to decode
	// colour: a key band goes before the first row that starts more than
	// this far below the previous key. 0: the key at the top only.
	KeyEvery Length

	// Press is the printing condition (print): with it the PDF is CMYK
	// through the printer's profile and a PDF/X-4; nil: an RGB PDF.
	Press *Press
	// Band is the confidence level (0.95 for 95 %) of the uncertainty
	// band drawn behind every line: the exact Poisson interval of each
	// year's (pooled) count. 0: no band.
	Band float64
	// PanelBank is panel aspect "bank": the aspect is chosen from the data
	// by banking (layout/bank); PanelAspect is 0 until then.
	PanelBank bool

	// LabelLines is the most lines a panel's label may wrap to at its full
	// size before it shrinks (spec label-lines, 2 by default; 0 or 1:
	// labels never wrap).
	LabelLines int
	// LabelBand is how many label lines the layout reserves above every
	// plot of the output (0 or 1: one). It is not read from the spec:
	// render/feature sets it on a copy of the output, as layout/bank sets
	// PanelAspect, when some label wraps — every panel of the output then
	// gets the same band, so plots keep one height.
	LabelBand int
}

// Margins are the four margins of a page. On facing pages Inside is the
// binding side.
type Margins struct{ Top, Bottom, Inside, Outside Length }

// Slack says what happens with vertical room left over after the rows.
type Slack string

const (
	SlackSpread Slack = "spread" // distribute evenly between rows
	SlackGrow   Slack = "grow"   // panels grow taller to fill
)

// Fonts are the faces an output uses. Empty paths mean the Go fonts
// embedded in the binary.
type Fonts struct {
	Regular string // TTF/OTF/TTC/OTC path, resolved against the spec
	Bold    string
	Family  string // screen: CSS font-family list written into SVG
	Embed   bool   // screen: embed the font subset in SVG

	// RegularFace and BoldFace pick a face of a collection (.ttc, .otc);
	// the zero value is the first face.
	RegularFace, BoldFace FaceRef
}

// FaceRef names one face of a font file: by its full name (name ID 4)
// when Name is set, else by its index in a collection, from 0.
type FaceRef struct {
	Index int
	Name  string
}

func (f FaceRef) String() string {
	if f.Name != "" {
		return strconv.Quote(f.Name)
	}
	return "#" + strconv.Itoa(f.Index)
}

// TypeSizes are the type sizes an output uses.
type TypeSizes struct {
	Title, Dek, Label, Ticks, Key, Notes, Folio, Heading Length
	Leading                                              float64 // line height as a multiple of the size
}

// TickPlacement says which panels carry year ticks.
type TickPlacement string

const (
	TicksBottomRow  TickPlacement = "bottom-row"
	TicksEveryPanel TickPlacement = "every-panel"
)

// Flow is how a screen output is cut into files.
type Flow string

const (
	FlowPages  Flow = "pages"  // pages of the trim's height
	FlowScroll Flow = "scroll" // one page as tall as every panel needs
	// FlowScrollGroups is one page per group, each as tall as its group
	// needs, so a group can be shown alone in an article. Ungrouped, it is
	// FlowScroll.
	FlowScrollGroups Flow = "scroll-groups"
)

// Scrolls reports whether pages take their height from their content
// rather than from the trim.
func (f Flow) Scrolls() bool { return f == FlowScroll || f == FlowScrollGroups }

// Insert is a single graphic of 1–4 terms for an article page. With two or
// more terms it is a comparison panel: shared axes, one line style per term.
type Insert struct {
	Name   string
	Output string // output whose fonts, type and kind it borrows
	Size   Size
	Terms  []string
	Title  string
	// Compare is how a comparison of two to four terms is drawn: in
	// aligned rows (the default) or overlaid on one plot.
	Compare Compare
}

// Compare is how a comparison insert shows its terms.
type Compare string

const (
	// CompareRows gives each term a strip of its own, one above the
	// other, sharing the x axis and the y-range.
	CompareRows Compare = "rows"
	// CompareOverlay draws every term on one plot, told apart by stroke.
	CompareOverlay Compare = "overlay"
)

// ForInsert returns a copy of the spec that selects exactly the insert's
// terms, in its order and ungrouped, scaled as the feature is; errors
// about those terms point at the insert's list (inserts.NAME.terms.N).
func (s *Spec) ForInsert(in *Insert) *Spec {
	c := *s
	c.Terms = Terms{List: append([]string(nil), in.Terms...)}
	c.Order = OrderListed
	c.Group = GroupNone
	c.positions = make(map[string]Pos, len(s.positions)+len(in.Terms)+1)
	for k, v := range s.positions {
		if k != "terms" && !strings.HasPrefix(k, "terms.") {
			c.positions[k] = v
		}
	}
	c.positions["terms"] = s.Where("inserts." + in.Name + ".terms")
	c.positions["terms.list"] = c.positions["terms"]
	for i := range in.Terms {
		key := fmt.Sprintf("inserts.%s.terms.%d", in.Name, i)
		c.positions[fmt.Sprintf("terms.list.%d", i)] = s.Where(key)
	}
	return &c
}
