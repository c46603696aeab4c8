package specs

import (
	"errors"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestFormatNumberCLDR checks number formatting against CLDR's number
// symbols for each language. Sources: CLDR common/main/{en,de,es}.xml
// <symbols numberSystem="latn"> (decimal, group, minusSign), as published
// in the CLDR JSON data (e.g. cldr-numbers-full main/es/numbers.json:
// decimal ",", group ".", minusSign "-"); en-GB and en-US inherit en's
// "." and ","; de has "," and "."; Spanish sets minimumGroupingDigits = 2
// (CLDR es.xml; UTS #35 Part 3 "Numbers" §3.3 explains it: 1234 stays
// ungrouped, 12 345 is grouped) — from memory for that one value.
func TestFormatNumberCLDR(t *testing.T) {
	tests := []struct {
		lang   Language
		v      float64
		digits int
		want   string
		source string
	}{
		{EnglishUK, 1234.5, 2, "1,234.5", "CLDR en: decimal '.', group ','"},
		{EnglishUK, 1234567, 0, "1,234,567", "CLDR en: grouping size 3 (#,##0.###)"},
		{EnglishUS, 12345.25, 2, "12,345.25", "CLDR en (en-US inherits)"},
		{EnglishUS, -3.25, 2, "-3.25", "CLDR en minusSign U+002D"},
		{German, 1234.5, 2, "1.234,5", "CLDR de: decimal ',', group '.'"},
		{German, 1234567, 0, "1.234.567", "CLDR de"},
		{German, -3.25, 2, "-3,25", "CLDR de minusSign U+002D"},
		{German, 0.0123, 4, "0,0123", "CLDR de"},
		{Spanish, 1234.5, 2, "1234,5", "CLDR es minimumGroupingDigits 2: four digits ungrouped"},
		{Spanish, 12345.5, 2, "12.345,5", "CLDR es: group '.', decimal ','"},
		{Spanish, 1234567, 0, "1.234.567", "CLDR es"},
		{Spanish, -1234.25, 2, "-1234,25", "CLDR es minusSign U+002D, minimumGroupingDigits 2"},
	}
	for _, tt := range tests {
		s := &Spec{Language: tt.lang}
		assert.Equal(t, tt.want, s.FormatNumber(tt.v, tt.digits), "%s %v (%s)", tt.lang, tt.v, tt.source)
	}
}

// TestFormatSignificant checks three significant digits (the project's
// own rule for values on the key), in two languages.
func TestFormatSignificant(t *testing.T) {
	tests := []struct {
		lang Language
		v    float64
		want string
	}{
		{EnglishUK, 0.012345, "0.0123"}, // three significant digits
		{EnglishUK, 3.14159, "3.14"},
		{EnglishUK, 31.4159, "31.4"},
		{EnglishUK, 3141.59, "3,142"}, // whole numbers keep every digit
		{German, 31.4159, "31,4"},
		{German, 0.5, "0,5"}, // trailing zeros dropped
	}
	for _, tt := range tests {
		s := &Spec{Language: tt.lang}
		assert.Equal(t, tt.want, s.FormatSignificant(tt.v), "%s %v", tt.lang, tt.v)
	}
}

func TestParseLanguage(t *testing.T) {
	tests := []struct {
		in   string
		want Language
	}{
		{"en-GB", EnglishUK}, {"en", EnglishUK}, {"en-IE", EnglishUK},
		{"en-US", EnglishUS}, {"en_US", EnglishUS}, // BCP 47 parsers accept "_" (x/text does)
		{"de", German}, {"de-AT", German}, {"es", Spanish}, {"es-ES", Spanish},
	}
	for _, tt := range tests {
		got, err := ParseLanguage(tt.in)
		require.NoError(t, err, tt.in)
		assert.Equal(t, tt.want, got, tt.in)
	}
	_, err := ParseLanguage("fr-FR")
	assert.ErrorContains(t, err, "no phrases yet")
	_, err = ParseLanguage("not a tag!")
	assert.ErrorContains(t, err, "not a language tag")
}

// TestPhrases: defaults per language, the spec's overrides, placeholders.
func TestPhrases(t *testing.T) {
	s, err := Parse("s.yaml", []byte(printOut+"language: en-US\ntext: {folio: \"p. {page}\"}\n"))
	require.NoError(t, err)
	assert.Equal(t, "Color shows the year", s.Phrase(PhraseKeyTitle)) // US spelling
	assert.Equal(t, "p. 7", Fill(s.Phrase(PhraseFolio), "page", "7"))
	uk := &Spec{}
	assert.Equal(t, "Colour shows the year", uk.Phrase(PhraseKeyTitle)) // the default is British
	de := &Spec{Language: German}
	assert.Equal(t, "Peak (Fortsetzung)", Fill(de.Phrase(PhraseContinued), "heading", "Peak"))
	de.DataGaps = []int{1917, 1918, 1943, 1944, 1950}
	assert.Equal(t, "Die Linien brechen in Jahren ohne Daten ab: 1917–1918, 1943–1944 und 1950.", de.GapNoteText())
	de.Text.GapNoteOn = GapNoteNone
	assert.Equal(t, "", de.GapNoteText())
	for _, l := range Languages {
		for id := PhraseID(0); id < numPhrases; id++ {
			assert.NotEmpty(t, phrases[l][id], "%s phrase %d", l, id)
		}
	}
}

// TestEditorialKeys: annotations, highlights and periods parse, and bad
// ones are errors at their place (line:col counted by hand).
func TestEditorialKeys(t *testing.T) {
	s, err := Parse("s.yaml", []byte(printOut+`annotations:
  - {term: a, year: 1926, text: strike}
  - {term: b, year: "1914–1918", text: war}
highlights: [a, b]
periods: ["1914-1918: war years", "1939–1945: second war"]
period-bands: true
`))
	require.NoError(t, err)
	require.Len(t, s.Annotations, 2)
	assert.Equal(t, Annotation{Term: "a", From: 1926, To: 1926, Text: "strike", Path: "annotations.0"}, s.Annotations[0])
	assert.True(t, s.Annotations[1].Span())
	assert.Equal(t, []Period{{1914, 1918, "war years", "periods.0"}, {1939, 1945, "second war", "periods.1"}}, s.Periods)
	assert.True(t, s.PeriodBands)
	assert.Equal(t, "9:5", posOf(s.Where("annotations.1")))

	bad := []struct {
		name, text, at, want string
	}{
		{"year outside", "annotations: [{term: a, year: 1990, text: x}]\n", "7:25", "1990 lies outside the years 1900–1950"},
		{"span backwards", "annotations: [{term: a, year: 1920-1910, text: x}]\n", "7:15", "must end after it starts"},
		{"no text", "annotations: [{term: a, year: 1920}]\n", "7:15", "annotations.0.text is missing"},
		{"period without label", "periods: [\"1914-1918\"]\n", "7:11", `write a period as "1914–1918: war years"`},
		{"periods overlap", "periods: [\"1914-1918: a\", \"1916-1920: b\"]\n", "7:27", "must not overlap"},
		{"highlight twice", "highlights: [a, a]\n", "7:17", `"a" is listed twice`},
		{"unknown placeholder", "text: {folio: \"{pg}\"}\n", "7:15", "{pg} is not filled in here; it takes {page}"},
		{"folio without page", "text: {folio: \"page\"}\n", "7:15", "must contain {page}"},
		{"unknown language", "language: fr\n", "7:11", "no phrases yet"},
		{"gap note place", "text: {gap-note-on: footer}\n", "7:21", "every-page, first-page, none"},
	}
	for _, b := range bad {
		_, err := Parse("s.yaml", []byte(printOut+b.text))
		require.Error(t, err, b.name)
		var es Errors
		require.True(t, errors.As(err, &es), b.name)
		assert.Equal(t, b.at, posOf(es[0].Pos), "%s: %v", b.name, err)
		assert.Contains(t, es[0].Msg, b.want, b.name)
	}
}

func posOf(p Pos) string { return itoa(p.Line) + ":" + itoa(p.Col) }

func itoa(i int) string {
	if i == 0 {
		return "0"
	}
	var b []byte
	for ; i > 0; i /= 10 {
		b = append([]byte{byte('0' + i%10)}, b...)
	}
	return string(b)
}

// TestList: a list in each language's form. The serial comma in American
// English (Chicago Manual of Style 6.19) and its absence in British usage,
// German "und" with no comma before it (Duden, Komma rule: no comma before
// "und" joining list items), Spanish "y" that becomes "e" before a word
// beginning with the sound /i/ but not before a diphthong (RAE, Ortografía
// de la lengua española 2010; "agua y hielo", "cobre y iodo") — all from
// memory.
func TestList(t *testing.T) {
	tests := []struct {
		lang  Language
		items []string
		want  string
	}{
		{EnglishUK, []string{"a"}, "a"},
		{EnglishUK, []string{"a", "b"}, "a and b"},
		{EnglishUK, []string{"a", "b", "c"}, "a, b and c"},
		{EnglishUS, []string{"a", "b"}, "a and b"},
		{EnglishUS, []string{"a", "b", "c"}, "a, b, and c"},
		{German, []string{"a", "b", "c"}, "a, b und c"},
		{Spanish, []string{"telégrafo", "teléfono"}, "telégrafo y teléfono"},
		{Spanish, []string{"telégrafo", "internet"}, "telégrafo e internet"},
		{Spanish, []string{"agujas", "hilos"}, "agujas e hilos"},
		{Spanish, []string{"agua", "hielo"}, "agua y hielo"},
		{Spanish, []string{"cobre", "iodo"}, "cobre y iodo"},
		{Spanish, []string{"«cable»", "«imprenta»"}, "«cable» e «imprenta»"},
		{Spanish, []string{"a", "b", "c"}, "a, b y c"},
	}
	for _, tt := range tests {
		s := &Spec{Language: tt.lang}
		assert.Equal(t, tt.want, s.List(tt.items), "%s %v", tt.lang, tt.items)
	}
}

// TestDescribePhrases: the sentences for assistive technology per
// language, with the language's quotation marks (British single, American
// double: New Hart's Rules and the Chicago Manual of Style; German „…“:
// Duden; Spanish «…»: RAE — from memory), and the spec's own wording under
// text: with its placeholders checked.
func TestDescribePhrases(t *testing.T) {
	fill := func(s *Spec) string {
		return Fill(s.Phrase(PhraseDescribe), "term", s.Quote("telegraph"), "span", "1868–2025", "unit", s.Phrase(PhraseUnitShare), "peak", "1884")
	}
	tests := []struct {
		lang Language
		want string
	}{
		{EnglishUK, "How often ‘telegraph’ was used each year, 1868–2025 (per million words); highest in 1884."},
		{EnglishUS, "How often “telegraph” was used each year, 1868–2025 (per million words); highest in 1884."},
		{German, "Wie oft „telegraph“ in jedem Jahr verwendet wurde, 1868–2025 (je Million Wörter); am häufigsten im Jahr 1884."},
		{Spanish, "Con qué frecuencia se usó «telegraph» cada año, 1868–2025 (por millón de palabras); máximo en 1884."},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, fill(&Spec{Language: tt.lang}), tt.lang)
	}
	s, err := Parse("s.yaml", []byte(printOut+"text:\n  describe: \"{term}: {span}, peak {peak} ({unit})\"\n  describe-compare: \"{terms}, {span}\"\n"))
	require.NoError(t, err)
	assert.Equal(t, "‘telegraph’: 1868–2025, peak 1884 (per million words)", fill(s))
	assert.Equal(t, "{terms}, {span}", s.Phrase(PhraseDescribeCompare))
	_, err = Parse("s.yaml", []byte(printOut+"text:\n  describe: \"{term} {max}\"\n"))
	require.Error(t, err)
	assert.Contains(t, err.Error(), "{max} is not filled in here; it takes {term}, {span}, {unit}, {peak}")
	_, err = Parse("s.yaml", []byte(printOut+"text:\n  describe-compare: \"{term}\"\n"))
	require.Error(t, err)
	assert.Contains(t, err.Error(), "{term} is not filled in here; it takes {terms}")
}
