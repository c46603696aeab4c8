// Package preflight checks an output before it is built: what would
// print badly or read wrongly but is not, strictly, bad input. It finds
// text that does not fit, type below a floor, rules and lines below a
// floor in print, colours out of gamut and failed palette checks, glyphs
// the chosen fonts lack, panels without data, and one-year spikes worth
// an editor's look.
//
// Check is pure: it reads the prepared job (spec, plan, data, fonts,
// palette report, the page's label fitting) and returns findings; it
// touches no files.
package preflight

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/palette/press"
	"sheaf/render/page"
	"sheaf/specs"
	"sheaf/specs/series"
)

// Severity grades a finding. Strict builds stop at Warning and above.
type Severity int

const (
	Info    Severity = iota // for the record
	Review                  // worth an editor's look; not a fault
	Warning                 // may print badly or read wrongly
	Error                   // will print wrongly
)

func (s Severity) String() string {
	switch s {
	case Info:
		return "info"
	case Review:
		return "review"
	case Warning:
		return "warning"
	case Error:
		return "error"
	}
	return fmt.Sprintf("Severity(%d)", int(s))
}

// MarshalText writes the severity's name, for JSON.
func (s Severity) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// UnmarshalText reads a severity's name.
func (s *Severity) UnmarshalText(b []byte) error {
	for _, v := range []Severity{Info, Review, Warning, Error} {
		if string(b) == v.String() {
			*s = v
			return nil
		}
	}
	return fmt.Errorf("preflight: unknown severity %q", b)
}

// Ids of the findings. They are stable: scripts may filter on them.
const (
	IDGlyph       = "glyph-missing"  // a character the font cannot draw
	IDTypeFloor   = "type-floor"     // a type size below the floor
	IDLineFloor   = "line-floor"     // the chart line below the floor (print)
	IDHairline    = "hairline-floor" // the page's hairlines below the floor (print)
	IDLabelCut    = "label-cut"      // a term cut with an ellipsis
	IDLabelShrunk = "label-shrunk"   // a term set smaller than the label size
	IDLabelWrap   = "label-wrapped"  // a term set on two lines (or more) to fit
	IDLayout      = "layout"         // a layout warning
	IDNoData      = "no-data"        // a panel whose values are all zero or gaps
	IDSpike       = "spike"          // one year far above the term's others
	IDGamut       = "palette-gamut"  // palette colours outside sRGB
	IDPalette     = "palette"        // the palette check's verdict and findings
	IDPaperTint   = "paper-tint"     // a non-white paper colour printed over the whole page
	IDSparse      = "sparse-counts"  // a term whose line rests on counts too small to read
	IDOutlined    = "text-outlined"  // text drawn as glyph outlines, not embedded as a font
	IDLicence     = "font-licence"   // what a font's licence allows the files it goes into
)

// Finding is one result.
type Finding struct {
	ID       string   `json:"id"`
	Severity Severity `json:"severity"`
	Output   string   `json:"output"`
	Insert   string   `json:"insert,omitempty"` // the insert it is about (which borrows Output); "" for the output's pages
	Page     int      `json:"page,omitempty"`   // 1-based; 0 when not about a page
	Term     string   `json:"term,omitempty"`
	Year     int      `json:"year,omitempty"`
	At       string   `json:"at,omitempty"` // spec position that set the value, file:line:col
	Message  string   `json:"message"`
}

// Where says where the finding is, for a table.
func (f Finding) Where() string {
	var parts []string
	parts = append(parts, f.Output)
	if f.Insert != "" {
		parts = append(parts, "insert "+f.Insert)
	}
	if f.Page > 0 {
		parts = append(parts, "p. "+strconv.Itoa(f.Page))
	}
	if f.Term != "" {
		parts = append(parts, strconv.Quote(f.Term))
	}
	if f.Year > 0 {
		parts = append(parts, strconv.Itoa(f.Year))
	}
	return strings.Join(parts, " ")
}

func (f Finding) String() string {
	s := fmt.Sprintf("%s %s %s: %s", f.Severity, f.ID, f.Where(), f.Message)
	if f.At != "" {
		s += " (" + f.At + ")"
	}
	return s
}

// Input is one prepared output. Palette may be nil when the palette was
// not checked.
type Input struct {
	Spec    *specs.Spec
	Output  *specs.Output
	Plan    *layout.Plan
	Data    *series.Set
	Fonts   *fonts.Set
	Labels  []page.Label // as page.Feature.Labels returns them
	Palette *palette.Report
	// Scale is the era palette drawn (page.Feature.Palette) and Press the
	// printing condition of a print output (nil: RGB); both for the press
	// checks.
	Scale *palette.Scale
	Press *press.Condition
	// Facts are the data's own checks (DataFacts): the same for every
	// output of a job, so a caller checking several works them out once.
	// nil, or facts of other data or thresholds: Check works them out.
	Facts *Facts
}

// Facts are what the data alone says, term by term: each term's highest
// and next-highest yearly value (spikes, empty panels) and the median of
// the counts its plotted values rest on (sparse terms). Every output of
// a job shows the same data, so its checks need them once.
type Facts struct {
	data  *series.Set
	th    specs.Preflight
	terms []termFacts
}

type termFacts struct {
	top, second float64
	year        int // of top, from the span's first
	med         float64
	medOK       bool // a median exists (see MedianActive)
}

// DataFacts works out the facts of d for the spec's thresholds
// (specs.Preflight): pure; the findings Check makes from them are the
// ones it makes without them.
func DataFacts(s *specs.Spec, d *series.Set) *Facts {
	f := &Facts{data: d, th: s.Preflight, terms: make([]termFacts, len(d.Series))}
	var yearly, pooled, exposure, scratch []float64
	for i := range d.Series {
		sr := &d.Series[i]
		y := d.YearlyInto(sr, yearly)
		if len(sr.Counts) > 0 {
			yearly = y // scratch; a series without counts gave its own values
		}
		tf := &f.terms[i]
		tf.top, tf.second, tf.year = Spike(y)
		if tf.top <= 0 || s.Preflight.MinCount <= 0 {
			continue
		}
		var p []float64
		p, exposure = d.PooledInto(sr, pooled[:cap(pooled)], exposure[:cap(exposure)])
		pooled = p
		tf.med, tf.medOK, scratch = medianActive(sr.Counts, p, scratch)
	}
	return f
}

// Check runs every check on in with the spec's thresholds
// (specs.Preflight) and returns the findings sorted by severity (worst
// first), then page, term and id.
func Check(in Input) ([]Finding, error) {
	if in.Spec == nil || in.Output == nil || in.Plan == nil || in.Data == nil || in.Fonts == nil {
		return nil, fmt.Errorf("preflight: Check needs a spec, an output, a plan, data and fonts")
	}
	c := checker{in: in, th: in.Spec.Preflight, out: in.Output.Name, pageOf: pagesOf(in.Plan)}
	c.typeSizes()
	c.lines()
	c.labels()
	c.layout()
	c.glyphs()
	c.panels()
	c.palette()
	c.paperTint()
	c.press()
	c.fontFiles()
	sort.SliceStable(c.found, func(i, j int) bool {
		a, b := c.found[i], c.found[j]
		if a.Severity != b.Severity {
			return a.Severity > b.Severity
		}
		if a.Page != b.Page {
			return a.Page < b.Page
		}
		if a.Term != b.Term {
			return a.Term < b.Term
		}
		return a.ID < b.ID
	})
	return c.found, nil
}

// paperTint warns that a print output's paper colour is not paper: sheaf
// paints it over the whole bleed box, so the press lays a tint of ink over
// every page (common practice: ask for the stock's colour instead, or
// check the tint on a proof).
func (c *checker) paperTint() {
	p := c.in.Spec.Palette.Paper
	if c.in.Output.Kind != specs.Print || p.Space == specs.SpaceSRGB && p.V == [3]float64{1, 1, 1} {
		return
	}
	c.add(Finding{ID: IDPaperTint, Severity: Warning, At: c.in.Spec.Where("palette.paper").String(),
		Message: fmt.Sprintf("paper %s is printed as a tint of ink over every page, bleed included; if the stock has that colour, set paper to #ffffff for print, or check the tint on a press proof", p.Text)})
}

// fontFiles reports, for each face an output draws with, text that
// cannot go into its files as a font (drawn as outlines: not searchable,
// heavier, no hinting) and what the face's licence (OS/2 fsType) says
// where it shapes the files. A licence that forbids embedding is refused
// when the fonts are loaded (bad input), before preflight runs.
func (c *checker) fontFiles() {
	embeds := c.in.Output.Kind == specs.Print || c.in.Output.Fonts.Embed
	seen := map[string]bool{}
	for _, st := range []fonts.Style{fonts.Regular, fonts.Bold, fonts.Italic} {
		name := c.in.Fonts.Name(st)
		if seen[name] {
			continue
		}
		seen[name] = true
		key := "regular"
		if st == fonts.Bold {
			key = "bold"
		}
		at := c.in.Spec.Where(c.path("fonts." + key)).String()
		e := c.in.Fonts.Embedding(st)
		if e.Outlined != "" && c.in.Output.Kind == specs.Print {
			c.add(Finding{ID: IDOutlined, Severity: Warning, At: at,
				Message: fmt.Sprintf("text in %s (%s) is drawn as outlines, not as a font: %s; it will not be searchable and may print heavier at small sizes — use a TrueType or CFF OpenType font", name, st, e.Outlined)})
		}
		if !embeds {
			continue
		}
		l := e.Licence
		switch {
		case !l.HasOS2:
			c.add(Finding{ID: IDLicence, Severity: Info, At: at,
				Message: fmt.Sprintf("%s has no OS/2 table, so its embedding permission is not stated; embedded as installable (common practice) — check the font's licence", name)})
		case l.NoSubsetting():
			c.add(Finding{ID: IDLicence, Severity: Info, At: at,
				Message: fmt.Sprintf("%s: its licence forbids subsetting (%s), so the whole font is embedded in every file that uses it", name, l)})
		case l.PreviewPrint():
			c.add(Finding{ID: IDLicence, Severity: Info, At: at,
				Message: fmt.Sprintf("%s is licensed for preview & print embedding (%s): the files may be viewed and printed, not edited with the font", name, l)})
		}
	}
}

// Errs reports whether any finding is an error: something that will print
// wrongly (a missing glyph), not just a risk.
func Errs(fs []Finding) bool {
	for _, f := range fs {
		if f.Severity >= Error {
			return true
		}
	}
	return false
}

// Stops reports whether findings stop a strict build: any at Warning or
// above.
func Stops(fs []Finding) bool {
	for _, f := range fs {
		if f.Severity >= Warning {
			return true
		}
	}
	return false
}

type checker struct {
	in     Input
	th     specs.Preflight
	out    string
	pageOf map[int]int // series index → 1-based page
	found  []Finding
}

func (c *checker) add(f Finding) {
	f.Output = c.out
	c.found = append(c.found, f)
}

// pagesOf maps every panel's item to its page.
func pagesOf(p *layout.Plan) map[int]int {
	m := map[int]int{}
	for i, pg := range p.Pages {
		for _, pn := range pg.Panels {
			m[pn.Item] = i + 1
		}
	}
	return m
}

// units prints a length in the output's own unit.
func (c *checker) units(l float64) string {
	if c.in.Output.Kind == specs.Screen {
		return strconv.FormatFloat(l*specs.PxPerPt, 'g', 4, 64) + " px"
	}
	return strconv.FormatFloat(l, 'g', 4, 64) + " pt"
}

// typeSizes compares every type size of the output with the floor: 5 pt
// in print, 10 px on screen by default (common practice for figure text).
func (c *checker) typeSizes() {
	floor := c.th.MinType.Pt()
	if c.in.Output.Kind == specs.Screen {
		floor = c.th.MinScreenType.Pt()
	}
	if floor <= 0 {
		return
	}
	t := c.in.Output.Type
	for _, r := range []struct {
		key  string
		size specs.Length
	}{{"title", t.Title}, {"dek", t.Dek}, {"label", t.Label}, {"ticks", t.Ticks}, {"key", t.Key},
		{"notes", t.Notes}, {"folio", t.Folio}, {"heading", t.Heading}} {
		if r.size > 0 && r.size.Pt() < floor-1e-9 {
			c.add(Finding{ID: IDTypeFloor, Severity: Warning, At: c.in.Spec.Where(c.path("type." + r.key)).String(),
				Message: fmt.Sprintf("type.%s is %s, below the %s floor; it may not be legible", r.key, c.units(r.size.Pt()), c.units(floor))})
		}
	}
	// Labels may shrink below their size to fit (never under the floor
	// page uses); report any that still ended below this floor.
	for _, l := range c.in.Labels {
		if l.Shrunk && l.Size < floor-1e-9 {
			c.add(Finding{ID: IDTypeFloor, Severity: Warning, Page: c.pageOf[l.Item], Term: l.Term,
				Message: fmt.Sprintf("label shrunk to %s, below the %s floor", c.units(l.Size), c.units(floor))})
		}
	}
}

func (c *checker) path(key string) string { return "outputs." + c.out + "." + key }

// lines checks the chart line and the page's hairlines against the rule
// floor in print: 0.25 pt by default (common practice; thinner rules may
// break up on press). Screens have no such floor.
func (c *checker) lines() {
	floor := c.th.MinLine.Pt()
	if c.in.Output.Kind != specs.Print || floor <= 0 {
		return
	}
	if lw := c.in.Output.Line.Pt(); lw < floor-1e-9 {
		c.add(Finding{ID: IDLineFloor, Severity: Warning, At: c.in.Spec.Where(c.path("line")).String(),
			Message: fmt.Sprintf("chart lines are %s, below the %s floor for print; they may break up on press", c.units(lw), c.units(floor))})
	}
	if page.Hairline < floor-1e-9 {
		c.add(Finding{ID: IDHairline, Severity: Warning, At: c.in.Spec.Where("preflight.min-line").String(),
			Message: fmt.Sprintf("baselines, ticks and rules are %s hairlines, below the %s floor", c.units(page.Hairline), c.units(floor))})
	}
}

// labels reports terms wrapped, shrunk or cut to fit their panel.
func (c *checker) labels() {
	for _, l := range c.in.Labels {
		if l.Wrapped() {
			c.add(Finding{ID: IDLabelWrap, Severity: Info, Page: c.pageOf[l.Item], Term: l.Term,
				Message: fmt.Sprintf("set on %d lines to fit its panel: %q", len(l.Lines), strings.Join(l.Lines, " / "))})
		}
		switch {
		case l.Truncated:
			c.add(Finding{ID: IDLabelCut, Severity: Warning, Page: c.pageOf[l.Item], Term: l.Term,
				Message: fmt.Sprintf("does not fit its panel: cut to %q at %s", l.Text, c.units(l.Size))})
		case l.Shrunk || l.NoPeak:
			why := "to fit its panel"
			if l.ForRow {
				why = "to match the smallest label of its row"
			}
			msg := fmt.Sprintf("set at %s instead of %s %s", c.units(l.Size), c.units(c.in.Output.Type.Label.Pt()), why)
			switch {
			case l.NoPeak && l.Shrunk:
				msg += ", without its peak year (the dot marks the peak)"
			case l.NoPeak:
				msg = "fits its panel without its peak year beside it (the dot marks the peak)"
			}
			c.add(Finding{ID: IDLabelShrunk, Severity: Info, Page: c.pageOf[l.Item], Term: l.Term, Message: msg})
		}
	}
}

func (c *checker) layout() {
	for _, w := range c.in.Plan.Warnings {
		// Type sizes and line widths have their own findings here, with
		// floors the spec can set; the layout's warning would say it twice.
		if w.Key == "line" || strings.HasPrefix(w.Key, "type.") {
			continue
		}
		at := ""
		if w.Pos.File != "" {
			at = w.Pos.String()
		}
		// Labels that could not wrap (no room for a taller label band)
		// are set as before, shrunk on one line: for the record, with the
		// wrapped ones, not a fault.
		if w.Key == "label-lines" {
			c.add(Finding{ID: IDLabelWrap, Severity: Info, At: at, Message: w.Message})
			continue
		}
		c.add(Finding{ID: IDLayout, Severity: Warning, At: at, Message: w.Message})
	}
}

// glyphs checks every character the pages draw against the cmap of the
// face that draws it: placed text in its style, headings, labels and the
// key caption in bold, peak values, the unit, period names and
// annotations in regular.
func (c *checker) glyphs() {
	type miss struct {
		st fonts.Style
		r  rune
	}
	seen := map[miss]bool{}
	check := func(st fonts.Style, text, term string, pg int) {
		for _, r := range text {
			if unicode.IsControl(r) || seen[miss{st, r}] && term == "" {
				continue
			}
			// The face's cmap as Load parsed it: canvas's parse for
			// drawing would answer the same and cost a full parse.
			if c.in.Fonts.HasGlyph(st, r) {
				continue
			}
			msg := fmt.Sprintf("%s (%U) is not in %s (%s); it would print as an empty box", strconv.QuoteRune(r), r, c.in.Fonts.Name(st), st)
			if term == "" {
				seen[miss{st, r}] = true
				msg += fmt.Sprintf(", in %q", clip(text, 40))
			}
			c.add(Finding{ID: IDGlyph, Severity: Error, Page: pg, Term: term, Message: msg})
			if term != "" {
				return // one finding per term is enough to fix it
			}
		}
	}
	for i, pg := range c.in.Plan.Pages {
		for _, t := range pg.Text {
			check(t.Style, t.Text, "", i+1)
		}
		for _, h := range pg.Headings {
			check(fonts.Bold, h.Text, "", i+1)
		}
	}
	// The key's caption in the spec's language or its own words, the
	// period names under the key and the annotations' text: all set by
	// the editor, all drawn on every page that shows them.
	check(fonts.Bold, c.in.Spec.Phrase(specs.PhraseKeyTitle), "", 0)
	for _, pd := range c.in.Spec.Periods {
		check(fonts.Regular, pd.Label, "", 0)
	}
	for _, a := range c.in.Spec.Annotations {
		check(fonts.Regular, a.Text, "", 0)
	}
	check(fonts.Regular, c.in.Data.Unit+" · 0123456789.", "", 0)
	for i := range c.in.Data.Series {
		sr := &c.in.Data.Series[i]
		text := sr.Term
		if i < len(c.in.Labels) && c.in.Labels[i].Truncated {
			text += "…"
		}
		check(fonts.Bold, text, sr.Term, c.pageOf[i])
	}
}

func clip(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}

// panels reports panels with nothing to draw, one-year spikes and lines
// that rest on too few occurrences.
//
// A spike is a year whose value is more than spike-ratio times the
// term's next-highest year, because one long article can make a word look
// like a trend. It is a property of the yearly counts, so it is found on
// the values before any rolling window (count ÷ the year's total, or the
// count itself), which smoothing would hide.
func (c *checker) panels() {
	f := c.in.Facts
	if f == nil || f.data != c.in.Data || f.th != c.th {
		f = DataFacts(c.in.Spec, c.in.Data)
	}
	k := c.th.SpikeRatio
	for i := range c.in.Data.Series {
		sr := &c.in.Data.Series[i]
		tf := f.terms[i]
		top, second := tf.top, tf.second
		if top <= 0 {
			c.add(Finding{ID: IDNoData, Severity: Warning, Page: c.pageOf[i], Term: sr.Term,
				Message: fmt.Sprintf("no data in %d–%d: every year is zero or a gap; the panel is empty", c.in.Data.Span.From, c.in.Data.Span.To)})
			continue
		}
		c.sparse(i, sr, tf)
		if k <= 0 || top <= k*second {
			continue
		}
		y := c.in.Data.Span.From + tf.year
		ratio := "no other year has any"
		if second > 0 {
			ratio = fmt.Sprintf("%.1f× its next-highest year", top/second)
		}
		c.add(Finding{ID: IDSpike, Severity: Review, Page: c.pageOf[i], Term: sr.Term, Year: y,
			Message: fmt.Sprintf("%d stands alone: %s (over %g×); check it is not one long article", y, ratio, k)})
	}
}

// sparse reports a term whose typical count is so small that its line is
// mostly Poisson noise: a count k scatters by about √k, 1/√k of itself —
// 32 % at the default min-count of 10 (common practice). The count is the
// one each plotted value rests on: the year's, or the rolling window's
// pooled count; typical is the median over the years from the term's
// first occurrence to its last (gap years left out), so years before a
// word existed do not count against it (DataFacts works it out).
func (c *checker) sparse(i int, sr *series.Series, tf termFacts) {
	floor := c.th.MinCount
	if floor <= 0 {
		return
	}
	med, ok := tf.med, tf.medOK
	if !ok || med >= floor {
		return
	}
	noise := 100.0
	if med > 0 {
		noise = 100 / math.Sqrt(med)
	}
	var msg string
	if w := c.in.Data.Rolling; w > 1 {
		msg = fmt.Sprintf("even pooled over %d years its median count is %s (under %g): the line is mostly noise (about ±%.0f %%); widen scale.rolling or leave the term out",
			w, formatCount(med), floor, noise)
	} else {
		msg = fmt.Sprintf("its median yearly count is %s (under %g): the line is mostly noise (about ±%.0f %% a year); smooth it with scale.rolling, e.g. {years: 5}",
			formatCount(med), floor, noise)
	}
	c.add(Finding{ID: IDSparse, Severity: Review, Page: c.pageOf[i], Term: sr.Term,
		At: c.in.Spec.Where("preflight.min-count").String(), Message: msg})
}

// MedianActive returns the median of values over the years from the
// first to the last in which counts is above zero, gap years (NaN in
// either) left out; false when counts has no such year (or values are
// gaps in all of them).
func MedianActive(counts, values []float64) (float64, bool) {
	med, ok, _ := medianActive(counts, values, nil)
	return med, ok
}

// medianActive is MedianActive collecting the values in buf, which it
// returns for the next call, and selecting the middle (quickselect)
// instead of sorting: the same value, a sort's cost left out for every
// term of every output.
func medianActive(counts, values, buf []float64) (float64, bool, []float64) {
	first, last := -1, -1
	for j, c := range counts {
		if c > 0 {
			if first < 0 {
				first = j
			}
			last = j
		}
	}
	if first < 0 {
		return 0, false, buf
	}
	xs := buf[:0]
	for j := first; j <= last; j++ {
		if !math.IsNaN(counts[j]) && !math.IsNaN(values[j]) {
			xs = append(xs, values[j])
		}
	}
	n := len(xs)
	if n == 0 {
		return 0, false, xs // every active year is a gap in values
	}
	hi := nth(xs, n/2)
	if n%2 == 1 {
		return hi, true, xs
	}
	// After nth, xs[:n/2] holds the n/2 smallest: the lower middle is
	// their largest.
	lo := xs[0]
	for _, v := range xs[1 : n/2] {
		lo = max(lo, v)
	}
	return (lo + hi) / 2, true, xs
}

// nth reorders xs (no NaN) so that xs[k] is the value a sort would put
// there, everything before it no larger and everything after no smaller
// (Hoare's selection, middle pivot), and returns xs[k].
func nth(xs []float64, k int) float64 {
	lo, hi := 0, len(xs)-1
	for lo < hi {
		p := xs[lo+(hi-lo)/2]
		i, j := lo, hi
		for i <= j {
			for xs[i] < p {
				i++
			}
			for xs[j] > p {
				j--
			}
			if i <= j {
				xs[i], xs[j] = xs[j], xs[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return xs[k]
		}
	}
	return xs[k]
}

func formatCount(v float64) string {
	return strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64)
}

// Spike returns the highest of values, the highest of the other years,
// and the index of the highest (the first, on ties). NaN values (gaps)
// are skipped. With no positive value top is 0 and index -1.
func Spike(values []float64) (top, second float64, index int) {
	index = -1
	for i, v := range values {
		if math.IsNaN(v) || v <= 0 {
			continue
		}
		switch {
		case index < 0 || v > top:
			second, top, index = top, v, i
		case v > second:
			second = v
		}
	}
	return top, second, index
}

// palette turns the palette report into findings: its verdict, colours
// out of gamut, and the other checks' warnings and failures.
func (c *checker) palette() {
	r := c.in.Palette
	if r == nil {
		return
	}
	verdict := "passes its checks"
	if n := r.Warnings(); n > 0 {
		verdict = fmt.Sprintf("fails no check but has %d warning(s); %d distinguishable classes at the line width, the key labels %d eras", n, r.Classes, r.KeyEras)
	}
	if r.Failed() {
		verdict = "fails a check (run sheaf palette for the table)"
	}
	c.add(Finding{ID: IDPalette, Severity: Info, Message: fmt.Sprintf("palette %s %s", r.Scale, verdict)})
	for _, f := range r.Findings {
		if f.Severity == palette.Info {
			continue
		}
		id := IDPalette
		if f.Check == palette.CheckGamut {
			id = IDGamut
		}
		year := 0
		if !math.IsNaN(f.Year) && f.Label != "" {
			year = int(math.Round(f.Year))
		}
		c.add(Finding{ID: id, Severity: Warning, Year: year, At: c.in.Spec.Where("palette").String(),
			Message: f.Check + ": " + f.Message})
	}
}
