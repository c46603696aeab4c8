package specs

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"golang.org/x/text/language"
	"golang.org/x/text/message"
	"golang.org/x/text/number"
	"gopkg.in/yaml.v3"
)

// The editor's layer of a spec: the language its words and numbers are set
// in, every phrase on the page (each with a default per language),
// annotations pinned to a term and years, highlighted terms and labelled
// periods on the key.

// Text holds the phrases the spec sets itself; an empty field takes the
// language's default (see Phrase).
type Text struct {
	KeyTitle     string // the key's caption, "Colour shows the year"
	KeyNote      string // what a panel's height means; empty: the wording for the scale
	Unit         string // the unit phrase of the plotted values
	GapNote      string // the note on years without data; {years}
	GapNoteOn    string // every-page, first-page or none
	Folio        string // the folio; {page}
	Continued    string // a group's heading on its later pages; {heading}
	GroupHeading string // a peak-decade group's heading; {decade}
	DekMeasure   int    // the dek's measure in characters
	// The descriptions for assistive technology (SVG <desc>): of one
	// term's panel or insert, and of a comparison insert.
	Describe        string // {term} {span} {unit} {peak}
	DescribeCompare string // {terms} {span} {how} {unit} {max} {peaks}
}

// Where the gap note stands.
const (
	GapNoteEveryPage = "every-page" // in the footer of every page (every page shows the gaps)
	GapNoteFirstPage = "first-page" // with the notes at the foot of page 1
	GapNoteNone      = "none"
)

// DefaultDekMeasure is the dek's default measure in characters: comfortable
// reading is about 45–75 characters a line (common practice; Bringhurst's
// rule of thumb, from memory).
const DefaultDekMeasure = 70

// Annotation is a short note pinned to a term at a year or a span.
type Annotation struct {
	Term     string
	From, To int // the year, or the span (From < To)
	Text     string
	Path     string // the spec path, "annotations.2", for positions
}

// Span reports whether the annotation marks a span rather than one year.
func (a Annotation) Span() bool { return a.To > a.From }

// Period is a named span of years shown on the colour key.
type Period struct {
	From, To int
	Label    string
	Path     string
}

// Language is a supported language of the page's words and numbers.
type Language string

const (
	EnglishUK Language = "en-GB"
	EnglishUS Language = "en-US"
	German    Language = "de-DE"
	Spanish   Language = "es-ES"
)

// Languages lists the supported languages.
var Languages = []Language{EnglishUK, EnglishUS, German, Spanish}

// Tag is the language as a BCP 47 tag.
func (l Language) Tag() language.Tag {
	if l == "" {
		l = EnglishUK
	}
	return language.MustParse(string(l))
}

// ParseLanguage reads a BCP 47 tag and picks the supported language for
// it: English is British unless the region is the US (or another region
// that spells the American way is asked for with en-US itself).
func ParseLanguage(s string) (Language, error) {
	t, err := language.Parse(s)
	if err != nil {
		return "", fmt.Errorf("%q is not a language tag (BCP 47, like en-GB, en-US, de-DE, es-ES)", s)
	}
	base, _ := t.Base()
	reg, conf := t.Region()
	switch base.String() {
	case "en":
		if conf == language.Exact && reg.String() == "US" {
			return EnglishUS, nil
		}
		return EnglishUK, nil
	case "de":
		return German, nil
	case "es":
		return Spanish, nil
	}
	return "", fmt.Errorf("language %q has no phrases yet; use one of en-GB, en-US, de-DE, es-ES (and set every phrase under text:)", s)
}

// PhraseID names a phrase on the page.
type PhraseID int

const (
	PhraseKeyTitle       PhraseID = iota
	PhraseNoteOwnPeakDot          // full wording
	PhraseNoteOwnPeakDotShort
	PhraseNoteOwnPeak
	PhraseNoteOwnPeakShort
	PhraseNoteShared // {max} {unit}
	PhraseNoteSharedShort
	PhraseNoteOwn // {unit}
	PhraseNoteOwnShort
	PhraseUnitShare
	PhraseUnitOwnPeak
	PhraseUnitRaw
	PhraseGapNote // {years}
	PhraseFolio   // {page}
	PhraseContinued
	PhraseGroupHeading
	PhraseAnd
	PhraseRollingShare // {years}
	PhraseRollingMean  // {years}
	PhraseBandTint     // {level}
	// The descriptions for assistive technology and their parts.
	PhraseDescribe        // {term} {span} {unit} {peak}
	PhraseDescribeCompare // {terms} {span} {how} {unit} {max} {peaks}
	PhraseQuoted          // {term}: a term named in a sentence
	PhraseStyledTerm      // {term} {line}: an overlaid term and its stroke
	PhraseLineSolid
	PhraseLineDashed
	PhraseLineDotted
	PhraseLineDashDot
	PhraseOneScale     // how overlaid terms are drawn
	PhraseRowsOneScale // how terms in aligned rows are drawn
	PhrasePeakOf       // {term} {year}: one item of the peaks' list
	// Words an insert sets on the graphic.
	PhrasePeakLabel // {year}: under a row's term
	PhraseSameScale // in the rows' scale note
	numPhrases
)

// phrases are the defaults, per language.
var phrases = map[Language][numPhrases]string{
	EnglishUK: {
		"Colour shows the year",
		"Each line reaches full height in its peak year, marked by a dot", "Full height at each peak (dot)",
		"Each line reaches full height in its peak year", "Full height at each peak",
		"Panel height: 0 to {max} {unit}, the same on every panel", "0 to {max} {unit}",
		"Each panel runs from 0 to its own peak ({unit}), printed beside the peak year", "0 to each panel's peak ({unit})",
		"per million words", "share of the term's own peak", "occurrences a year",
		"Lines break at years with no data: {years}.",
		"{page}", "{heading} (continued)", "Peak in the {decade}s", "and",
		"{years}-year rolling share", "{years}-year rolling mean", "tint: {level}% interval",
		"How often {term} was used each year, {span} ({unit}); highest in {peak}.",
		"How often {terms} were used each year, {span}, {how} ({unit}, 0 to {max}). Highest: {peaks}.",
		"‘{term}’", "{term} ({line})",
		"solid line", "dashed line", "dotted line", "dash-dot line",
		"on one scale", "one row each, top to bottom, on one scale",
		"{term} in {year}", "peak {year}", "the same scale in every row",
	},
	German: {
		"Die Farbe zeigt das Jahr",
		"Jede Linie erreicht im Spitzenjahr die volle Höhe (Punkt)", "Volle Höhe im Spitzenjahr (Punkt)",
		"Jede Linie erreicht im Spitzenjahr die volle Höhe", "Volle Höhe im Spitzenjahr",
		"Feldhöhe: 0 bis {max} {unit}, in jedem Feld gleich", "0 bis {max} {unit}",
		"Jedes Feld reicht von 0 bis zum eigenen Höchstwert ({unit}), der neben dem Spitzenjahr steht", "0 bis zum Höchstwert ({unit})",
		"je Million Wörter", "Anteil am eigenen Höchstwert", "Vorkommen im Jahr",
		"Die Linien brechen in Jahren ohne Daten ab: {years}.",
		"{page}", "{heading} (Fortsetzung)", "Höhepunkt in den {decade}er-Jahren", "und",
		"gleitender {years}-Jahres-Anteil", "gleitendes {years}-Jahres-Mittel", "Tönung: {level}-%-Intervall",
		"Wie oft {term} in jedem Jahr verwendet wurde, {span} ({unit}); am häufigsten im Jahr {peak}.",
		"Wie oft {terms} in jedem Jahr verwendet wurden, {span}, {how} ({unit}, 0 bis {max}). Am häufigsten: {peaks}.",
		"„{term}“", "{term} ({line})",
		"durchgezogene Linie", "gestrichelte Linie", "gepunktete Linie", "Strich-Punkt-Linie",
		"auf einer gemeinsamen Skala", "je eine Zeile, von oben nach unten, auf einer gemeinsamen Skala",
		"{term} im Jahr {year}", "Höhepunkt {year}", "in jeder Zeile dieselbe Skala",
	},
	Spanish: {
		"El color indica el año",
		"Cada línea alcanza su altura máxima en su año pico, marcado con un punto", "Altura máxima en el año pico (punto)",
		"Cada línea alcanza su altura máxima en su año pico", "Altura máxima en el año pico",
		"Altura del panel: de 0 a {max} {unit}, igual en todos", "De 0 a {max} {unit}",
		"Cada panel va de 0 a su propio máximo ({unit}), indicado junto al año pico", "De 0 al máximo de cada panel ({unit})",
		"por millón de palabras", "fracción del máximo propio", "apariciones al año",
		"Las líneas se interrumpen en los años sin datos: {years}.",
		"{page}", "{heading} (continuación)", "Pico en la década de {decade}", "y",
		"fracción móvil de {years} años", "media móvil de {years} años", "sombreado: intervalo del {level} %",
		"Con qué frecuencia se usó {term} cada año, {span} ({unit}); máximo en {peak}.",
		"Con qué frecuencia se usaron {terms} cada año, {span}, {how} ({unit}, de 0 a {max}). Máximos: {peaks}.",
		"«{term}»", "{term} ({line})",
		"línea continua", "línea discontinua", "línea de puntos", "línea de trazo y punto",
		"en una misma escala", "una fila por término, de arriba abajo, en una misma escala",
		"{term} en {year}", "pico en {year}", "la misma escala en todas las filas",
	},
}

func init() {
	us := phrases[EnglishUK]
	us[PhraseKeyTitle] = "Color shows the year"
	// Quotation marks: British usage prefers single quotes (New Hart's
	// Rules ch. 9), American double (Chicago Manual of Style 6.9) — both
	// from memory. German „…“ (Duden) and Spanish «…» (RAE, Ortografía
	// 2010, angular quotes first) are set in their defaults above.
	us[PhraseQuoted] = "“{term}”"
	phrases[EnglishUS] = us
}

// Phrase is the spec's wording of a phrase: what text: sets, else the
// language's default. Placeholders ({max}, {page}…) are left for Fill.
func (s *Spec) Phrase(id PhraseID) string {
	t := s.Text
	over := map[PhraseID]string{
		PhraseKeyTitle: t.KeyTitle, PhraseGapNote: t.GapNote, PhraseFolio: t.Folio,
		PhraseContinued: t.Continued, PhraseGroupHeading: t.GroupHeading,
		PhraseDescribe: t.Describe, PhraseDescribeCompare: t.DescribeCompare,
	}
	if v := over[id]; v != "" {
		return v
	}
	if t.Unit != "" && (id == PhraseUnitShare || id == PhraseUnitOwnPeak || id == PhraseUnitRaw) {
		return t.Unit
	}
	if t.KeyNote != "" && id >= PhraseNoteOwnPeakDot && id <= PhraseNoteOwnShort {
		return t.KeyNote
	}
	l := s.Language
	if l == "" {
		l = EnglishUK
	}
	return phrases[l][id]
}

// Fill replaces each {name} in a phrase by its value.
func Fill(phrase string, pairs ...string) string {
	return strings.NewReplacer(withBraces(pairs)...).Replace(phrase)
}

func withBraces(pairs []string) []string {
	out := make([]string, len(pairs))
	for i, p := range pairs {
		if i%2 == 0 {
			p = "{" + p + "}"
		}
		out[i] = p
	}
	return out
}

// FormatNumber writes v with the language's decimal separator, digit
// grouping and minus sign (CLDR's, through golang.org/x/text), with at
// most digits fraction digits.
func (s *Spec) FormatNumber(v float64, digits int) string {
	p := message.NewPrinter(s.Language.Tag())
	out := p.Sprint(number.Decimal(v, number.MaxFractionDigits(digits)))
	if s.Language == Spanish {
		out = minimumGrouping2(out, ".", ",")
	}
	return out
}

// minimumGrouping2 applies CLDR's minimumGroupingDigits = 2 (Spanish, UTS
// #35 Part 3 §3.3), which golang.org/x/text does not: a number with four
// integer digits is written without its group separator (1234,5, but
// 12.345,5).
func minimumGrouping2(s, group, decimal string) string {
	intPart, _, _ := strings.Cut(s, decimal)
	digits := strings.TrimLeft(intPart, "-−")
	if strings.Count(digits, group) == 1 && len(digits) == 4+len(group) {
		return strings.Replace(s, group, "", 1)
	}
	return s
}

// FormatSignificant writes v with three significant digits (at least the
// whole number), in the language's form.
func (s *Spec) FormatSignificant(v float64) string {
	a := v
	if a < 0 {
		a = -a
	}
	digits := 0
	switch {
	case a == 0 || a >= 100:
	case a >= 10:
		digits = 1
	case a >= 1:
		digits = 2
	default:
		// Three significant digits of a fraction: 0.0123.
		str := strconv.FormatFloat(a, 'e', 2, 64)
		exp, _ := strconv.Atoi(str[strings.IndexByte(str, 'e')+1:])
		digits = 2 - exp
	}
	return s.FormatNumber(v, digits)
}

// YearList writes years as spans ("1917–1918 and 1943–1944"): runs of
// consecutive years joined by an en dash, the last two items by the
// language's "and".
func (s *Spec) YearList(years []int) string {
	var items []string
	for i := 0; i < len(years); {
		j := i
		for j+1 < len(years) && years[j+1] == years[j]+1 {
			j++
		}
		if j > i {
			items = append(items, strconv.Itoa(years[i])+"–"+strconv.Itoa(years[j]))
		} else {
			items = append(items, strconv.Itoa(years[i]))
		}
		i = j + 1
	}
	return s.List(items)
}

// List joins items as the language writes a list: commas, and the
// language's "and" before the last. American English puts a comma before
// it too when there are three or more (the serial comma, Chicago Manual
// of Style 6.19; British usage mostly leaves it out — from memory); Spanish
// "y" becomes "e" before a word that begins with the sound /i/ (i-, hi-,
// but not hia-, hie-, hio-, hiu-: RAE, Ortografía 2010, §4.4.1.3, from
// memory), looked for past an opening quotation mark.
func (s *Spec) List(items []string) string {
	switch len(items) {
	case 0:
		return ""
	case 1:
		return items[0]
	}
	last := items[len(items)-1]
	and := s.Phrase(PhraseAnd)
	if s.Language == Spanish && and == "y" && beginsWithI(last) {
		and = "e"
	}
	sep := " "
	if s.Language == EnglishUS && len(items) > 2 {
		sep = ", "
	}
	return strings.Join(items[:len(items)-1], ", ") + sep + and + " " + last
}

// beginsWithI reports whether a Spanish word begins with the vowel sound
// /i/: i-, í-, hi-, hí-, but not an unstressed i (or hi) before another
// vowel, which makes a diphthong (hielo, iodo: "y" stays).
func beginsWithI(w string) bool {
	r := []rune(strings.TrimPrefix(strings.ToLower(strings.TrimLeft(w, "«“‘\"'„")), "h"))
	if len(r) == 0 || (r[0] != 'i' && r[0] != 'í') {
		return false
	}
	return r[0] == 'í' || len(r) == 1 || !strings.ContainsRune("aeouáéóú", r[1])
}

// Quote names a term in a sentence, in the language's quotation marks.
func (s *Spec) Quote(term string) string { return Fill(s.Phrase(PhraseQuoted), "term", term) }

// Smoothing says how the values are smoothed ("5-year rolling share"),
// in the spec's language; "" without a rolling window.
func (s *Spec) Smoothing(years int) string {
	if years < 2 {
		return ""
	}
	id := PhraseRollingShare
	if s.Scale.Mode == ScaleRaw {
		id = PhraseRollingMean
	}
	return Fill(s.Phrase(id), "years", strconv.Itoa(years))
}

// Highlighted reports whether the spec highlights a term.
func (s *Spec) Highlighted(term string) bool {
	for _, h := range s.Highlights {
		if h == term {
			return true
		}
	}
	return false
}

var placeholder = regexp.MustCompile(`\{[^{}]*\}`)

// phraseKey decodes a phrase under text:, checking its placeholders.
func (d *decoder) phraseKey(dst *string, allowed ...string) func(*yaml.Node, string) {
	return func(n *yaml.Node, path string) {
		if d.desc != nil {
			d.desc.record(n, schemaString)
			return
		}
		n, ok := d.scalar(n, path)
		if !ok {
			return
		}
		if strings.TrimSpace(n.Value) == "" {
			d.errorf(n, "%s is empty; leave it out for the language's default", path)
			return
		}
		for _, m := range placeholder.FindAllString(n.Value, -1) {
			name := m[1 : len(m)-1]
			known := false
			for _, a := range allowed {
				known = known || a == name
			}
			if !known {
				if len(allowed) == 0 {
					d.errorf(n, "%s: %s is not filled in here; this phrase takes no placeholder", path, m)
				} else {
					d.errorf(n, "%s: %s is not filled in here; it takes {%s}", path, m, strings.Join(allowed, "}, {"))
				}
				return
			}
		}
		*dst = n.Value
	}
}

// text decodes the text: mapping.
func (d *decoder) text(n *yaml.Node, path string, t *Text) {
	d.mapping(n, path, []field{
		{"key-title", d.phraseKey(&t.KeyTitle)},
		{"key-note", d.phraseKey(&t.KeyNote, "max", "unit")},
		{"unit", d.phraseKey(&t.Unit)},
		{"gap-note", d.phraseKey(&t.GapNote, "years")},
		{"gap-note-on", d.choice(&t.GapNoteOn, GapNoteEveryPage, GapNoteFirstPage, GapNoteNone)},
		{"folio", func(n *yaml.Node, p string) {
			d.phraseKey(&t.Folio, "page")(n, p)
			if t.Folio != "" && !strings.Contains(t.Folio, "{page}") {
				d.errorf(d.resolve(n), "%s must contain {page}, where the page number goes", p)
			}
		}},
		{"continued", d.phraseKey(&t.Continued, "heading")},
		{"group-heading", d.phraseKey(&t.GroupHeading, "decade")},
		{"dek-measure", d.integer(&t.DekMeasure, 20, 200)},
		{"describe", d.phraseKey(&t.Describe, "term", "span", "unit", "peak")},
		{"describe-compare", d.phraseKey(&t.DescribeCompare, "terms", "span", "how", "unit", "max", "peaks")},
	})
}

// language decodes the language key.
func (d *decoder) language(dst *Language) func(*yaml.Node, string) {
	return parsed(d, ParseLanguage, dst)
}

// yearSpan reads "1926", 1926, "1914–1918" or "1914-1918".
func yearSpan(v string) (from, to int, err error) {
	v = strings.TrimSpace(v)
	a, b, found := strings.Cut(strings.ReplaceAll(v, "–", "-"), "-")
	from, err = strconv.Atoi(strings.TrimSpace(a))
	if err != nil || from < 1 || from > 9999 {
		return 0, 0, fmt.Errorf("%q is not a year or a span of years like 1914–1918", v)
	}
	to = from
	if found {
		to, err = strconv.Atoi(strings.TrimSpace(b))
		if err != nil || to < 1 || to > 9999 {
			return 0, 0, fmt.Errorf("%q is not a year or a span of years like 1914–1918", v)
		}
		if to <= from {
			return 0, 0, fmt.Errorf("span %q must end after it starts", v)
		}
	}
	return from, to, nil
}

// annotations decodes the annotations list: each {term, year, text}, the
// year a year or a span.
func (d *decoder) annotations(n *yaml.Node, path string, s *Spec) {
	n = d.resolve(n)
	if d.desc != nil && n.Kind != yaml.SequenceNode {
		return
	}
	if n.Kind != yaml.SequenceNode {
		d.errorf(n, "%s must be a list of {term, year, text}", path)
		return
	}
	for i, item := range n.Content {
		p := fmt.Sprintf("%s.%d", path, i)
		d.pos[p] = d.at(d.resolve(item))
		var a Annotation
		var year string
		d.mapping(item, p, []field{
			{"term", d.str(&a.Term)},
			{"year", func(n *yaml.Node, p string) {
				if d.desc != nil { // a year (1926) or a span ("1914–1918")
					d.desc.record(n, map[string]any{"type": []any{"string", "integer"}})
					return
				}
				d.str(&year)(n, p)
			}},
			{"text", d.str(&a.Text)},
		}, "term", "year", "text")
		if year == "" || a.Term == "" || a.Text == "" {
			continue
		}
		var err error
		if a.From, a.To, err = yearSpan(year); err != nil {
			d.errorf(d.resolve(item), "%s.year: %v", p, err)
			continue
		}
		if strings.ContainsAny(a.Text, "\n\r") {
			d.errorf(d.resolve(item), "%s.text: one line, please: an annotation is a short note", p)
			continue
		}
		a.Path = p
		s.Annotations = append(s.Annotations, a)
	}
}

// periods decodes the labelled periods: "1914–1918: war years".
func (d *decoder) periods(n *yaml.Node, path string, s *Spec) {
	var items []string
	d.strings(&items)(n, path)
	for i, it := range items {
		p := fmt.Sprintf("%s.%d", path, i)
		span, label, ok := strings.Cut(it, ":")
		label = strings.TrimSpace(label)
		if !ok || label == "" {
			d.errs.Add(s.Where(p), "%s: write a period as \"1914–1918: war years\", not %q", p, it)
			continue
		}
		from, to, err := yearSpan(span)
		if err != nil {
			d.errs.Add(s.Where(p), "%s: %v", p, err)
			continue
		}
		if k := len(s.Periods); k > 0 && s.Periods[k-1].To >= from {
			d.errs.Add(s.Where(p), "%s: periods must be in order and must not overlap (%d–%d after %d–%d)", p, from, to, s.Periods[k-1].From, s.Periods[k-1].To)
			continue
		}
		s.Periods = append(s.Periods, Period{From: from, To: to, Label: label, Path: p})
	}
}

// checkEditorial checks the editor's keys against the years.
func (d *decoder) checkEditorial(s *Spec) {
	in := func(y int) bool { return y >= s.Years.From && y <= s.Years.To }
	if s.Years.From == 0 || s.Years.To == 0 {
		return
	}
	for _, a := range s.Annotations {
		if !in(a.From) || !in(a.To) {
			d.errs.Add(s.Where(a.Path+".year"), "%s.year: %s lies outside the years %d–%d", a.Path, spanText(a.From, a.To), s.Years.From, s.Years.To)
		}
	}
	for _, p := range s.Periods {
		if !in(p.From) || !in(p.To) {
			d.errs.Add(s.Where(p.Path), "%s: %s lies outside the years %d–%d", p.Path, spanText(p.From, p.To), s.Years.From, s.Years.To)
		}
	}
	seen := map[string]string{}
	for i, h := range s.Highlights {
		p := fmt.Sprintf("highlights.%d", i)
		if first, ok := seen[h]; ok {
			d.errs.Add(s.Where(p), "highlights: %q is listed twice (first at %s)", h, s.Where(first))
		}
		seen[h] = p
	}
	if s.Text.GapNoteOn == "" {
		s.Text.GapNoteOn = GapNoteEveryPage
	}
	if s.Text.DekMeasure == 0 {
		s.Text.DekMeasure = DefaultDekMeasure
	}
	if s.Language == "" {
		s.Language = EnglishUK
	}
}

func spanText(from, to int) string {
	if to > from {
		return fmt.Sprintf("%d–%d", from, to)
	}
	return strconv.Itoa(from)
}

// GapNoteText is the note on the years without data (DataGaps), or "" when
// there are none or the spec turns it off.
func (s *Spec) GapNoteText() string {
	if len(s.DataGaps) == 0 || s.Text.GapNoteOn == GapNoteNone {
		return ""
	}
	return Fill(s.Phrase(PhraseGapNote), "years", s.YearList(s.DataGaps))
}
