package insert

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"
	"golang.org/x/text/language"
	"golang.org/x/text/message"
	"golang.org/x/text/number"

	"sheaf/layout/fonts"
	"sheaf/render/svg"
	"sheaf/specs"
)

// wordsInsert is testSet's four terms (values times k) as an insert in
// lang, on a screen output.
func wordsInsert(t *testing.T, lang specs.Language, compare specs.Compare, k float64) *Graphic {
	t.Helper()
	out := specs.DefaultOutput("web", specs.Screen)
	s := &specs.Spec{Title: "T", Language: lang}
	s.Palette.Paper = specs.Color{Space: specs.SpaceSRGB, V: [3]float64{1, 1, 1}}
	in := &specs.Insert{Name: "words", Output: "web", Size: specs.Size{W: 600 * 0.75, H: 360 * 0.75}, Compare: compare}
	fs, err := fonts.Load(s, &out)
	require.NoError(t, err)
	d := testSet()
	d.Unit = s.Phrase(specs.PhraseUnitShare) // as series.Load sets it, in the spec's language
	for i := range d.Series {
		sr := &d.Series[i]
		for j := range sr.Values {
			sr.Values[j] *= k
		}
		sr.Peak *= k
		sr.YMax *= k
	}
	g, err := New(s, in, &out, d, testPalette(t), fs)
	require.NoError(t, err)
	return g
}

// TestDescribeLanguages: the description of a comparison for assistive
// technology, every word from the spec's language. The expected sentences
// are written out by hand from the phrases' design: British single and
// American double quotation marks (New Hart's Rules; Chicago Manual of
// Style 6.9), the American serial comma before "and" (Chicago 6.19), the
// German „…“ (Duden) and the Spanish «…» (RAE) — the typographic rules
// from memory. The one number, the shared scale's top (testSet × 0.3:
// highest value 1.2, round top 1.5), is written as golang.org/x/text's
// CLDR formatting writes it for each language (decimal "." in English,
// "," in German and Spanish: CLDR en.xml, de.xml, es.xml).
func TestDescribeLanguages(t *testing.T) {
	top := func(tag language.Tag) string { return message.NewPrinter(tag).Sprint(number.Decimal(1.5)) }
	tests := []struct {
		lang    specs.Language
		compare specs.Compare
		title   string
		desc    string
	}{
		{specs.EnglishUK, specs.CompareOverlay, "telegraph, telephone, wireless and Maßstab",
			"How often ‘telegraph’ (solid line), ‘telephone’ (dashed line), ‘wireless’ (dotted line) and ‘Maßstab’ (dash-dot line) were used each year, 1900–1905, on one scale (per million words, 0 to " + top(language.BritishEnglish) + "). " +
				"Highest: ‘telegraph’ in 1901, ‘telephone’ in 1903, ‘wireless’ in 1904 and ‘Maßstab’ in 1905."},
		{specs.EnglishUS, specs.CompareOverlay, "telegraph, telephone, wireless, and Maßstab",
			"How often “telegraph” (solid line), “telephone” (dashed line), “wireless” (dotted line), and “Maßstab” (dash-dot line) were used each year, 1900–1905, on one scale (per million words, 0 to " + top(language.AmericanEnglish) + "). " +
				"Highest: “telegraph” in 1901, “telephone” in 1903, “wireless” in 1904, and “Maßstab” in 1905."},
		{specs.EnglishUK, specs.CompareRows, "telegraph, telephone, wireless and Maßstab",
			"How often ‘telegraph’, ‘telephone’, ‘wireless’ and ‘Maßstab’ were used each year, 1900–1905, one row each, top to bottom, on one scale (per million words, 0 to 1.5). " +
				"Highest: ‘telegraph’ in 1901, ‘telephone’ in 1903, ‘wireless’ in 1904 and ‘Maßstab’ in 1905."},
		{specs.German, specs.CompareOverlay, "telegraph, telephone, wireless und Maßstab",
			"Wie oft „telegraph“ (durchgezogene Linie), „telephone“ (gestrichelte Linie), „wireless“ (gepunktete Linie) und „Maßstab“ (Strich-Punkt-Linie) in jedem Jahr verwendet wurden, 1900–1905, auf einer gemeinsamen Skala (je Million Wörter, 0 bis " + top(language.German) + "). " +
				"Am häufigsten: „telegraph“ im Jahr 1901, „telephone“ im Jahr 1903, „wireless“ im Jahr 1904 und „Maßstab“ im Jahr 1905."},
		{specs.German, specs.CompareRows, "telegraph, telephone, wireless und Maßstab",
			"Wie oft „telegraph“, „telephone“, „wireless“ und „Maßstab“ in jedem Jahr verwendet wurden, 1900–1905, je eine Zeile, von oben nach unten, auf einer gemeinsamen Skala (je Million Wörter, 0 bis 1,5). " +
				"Am häufigsten: „telegraph“ im Jahr 1901, „telephone“ im Jahr 1903, „wireless“ im Jahr 1904 und „Maßstab“ im Jahr 1905."},
		{specs.Spanish, specs.CompareOverlay, "telegraph, telephone, wireless y Maßstab",
			"Con qué frecuencia se usaron «telegraph» (línea continua), «telephone» (línea discontinua), «wireless» (línea de puntos) y «Maßstab» (línea de trazo y punto) cada año, 1900–1905, en una misma escala (por millón de palabras, de 0 a " + top(language.Spanish) + "). " +
				"Máximos: «telegraph» en 1901, «telephone» en 1903, «wireless» en 1904 y «Maßstab» en 1905."},
	}
	for _, tt := range tests {
		g := wordsInsert(t, tt.lang, tt.compare, 0.3)
		require.Equal(t, 1.5, g.YMax(), "the round top over 1.2 (steps of 1, 2, 2.5, 5 × 10^k)")
		title, desc := g.Describe()
		assert.Equal(t, tt.title, title, "%s %s", tt.lang, tt.compare)
		assert.Equal(t, tt.desc, desc, "%s %s", tt.lang, tt.compare)
	}
	assert.Equal(t, "1,5", top(language.German), "x/text's German decimal comma (CLDR de.xml)")
}

// TestDrawnWordsLanguages: the words an insert sets on the graphic come
// from the spec's language: the key's caption (American "Color", British
// "Colour"), the peak line under a row's term, the rows' scale note, and
// the y labels with the language's decimal separator (x/text's CLDR
// formatting as the outside source).
func TestDrawnWordsLanguages(t *testing.T) {
	tests := []struct {
		lang          specs.Language
		tag           language.Tag
		caption, peak string
		sameScale     string // in the rows' note
	}{
		{specs.EnglishUK, language.BritishEnglish, "Colour shows the year", "peak 1904", "the same scale in every row"},
		{specs.EnglishUS, language.AmericanEnglish, "Color shows the year", "peak 1904", "the same scale in every row"},
		{specs.German, language.German, "Die Farbe zeigt das Jahr", "Höhepunkt 1904", "in jeder Zeile dieselbe Skala"},
		{specs.Spanish, language.Spanish, "El color indica el año", "pico en 1904", "la misma escala en todas las filas"},
	}
	for _, tt := range tests {
		for _, compare := range []specs.Compare{specs.CompareRows, specs.CompareOverlay} {
			g := wordsInsert(t, tt.lang, compare, 0.3)
			w, h := g.Size()
			doc, err := svg.New(w, h, svg.Options{})
			require.NoError(t, err)
			require.NoError(t, g.Draw(canvas.NewContext(doc)))
			var b strings.Builder
			_, err = doc.WriteTo(&b)
			require.NoError(t, err)
			s := b.String()
			assert.Contains(t, s, ">"+tt.caption+"<", "%s %s: the key's caption", tt.lang, compare)
			if compare == specs.CompareRows {
				assert.Contains(t, s, ">"+tt.peak+"<", "%s: wireless's peak line", tt.lang)
				assert.Contains(t, s, tt.sameScale, "%s: the rows' note", tt.lang)
			} else {
				half := message.NewPrinter(tt.tag).Sprint(number.Decimal(0.5))
				assert.Contains(t, s, ">"+half+"<", "%s: the y label 0.5 in the language's form", tt.lang)
			}
		}
	}
}
