package production

import (
	"context"
	"encoding/xml"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"golang.org/x/text/language"
	"golang.org/x/text/message"
	"golang.org/x/text/number"

	"sheaf/render/feature"
	"sheaf/render/tooltest"
)

// editorJob is a small spec over the demo's data in lang, with the
// editor's layer on the terms its inserts show: a screen insert in rows
// and a print insert overlaid; extra adds items to the annotations list.
func editorJob(t testing.TB, lang, extra string) *feature.Job {
	t.Helper()
	data, err := filepath.Abs("../../examples/quillmere/data")
	require.NoError(t, err)
	spec := `title: Insert test
date: 2026-01-15
language: ` + lang + `
data: {counts: ` + filepath.Join(data, "counts.csv") + `, totals: ` + filepath.Join(data, "totals.csv") + `}
years: {from: 1868, to: 2025}
terms: {list: [brick, welding, computer, telegraph]}
scale: {values: per-million}
highlights: [welding]
outputs:
  print:
    kind: print
    trim: A5
    columns: 2
    proofs: 40
  web:
    kind: screen
    trim: 800px
    columns: 2
    band: 99.5%
inserts:
  paar:
    output: web
    size: 720px x 440px
    terms: [brick, welding]
  druck:
    output: print
    size: 90mm x 60mm
    terms: [welding, computer]
    compare: overlay
annotations:
  - {term: welding, year: 1940, text: Werftbau}
  - {term: computer, year: 1946, text: erste Rechner}
` + extra
	return loadSpec(t, spec)
}

// svgDoc is what a test reads back from an SVG with encoding/xml: the
// document's <desc> and the text of every <text>.
type svgDoc struct {
	Desc  string
	Texts []string
}

func readSVG(t testing.TB, path string) svgDoc {
	t.Helper()
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	dec := xml.NewDecoder(f)
	var doc svgDoc
	var in string
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		require.NoError(t, err)
		switch e := tok.(type) {
		case xml.StartElement:
			in = e.Name.Local
			if in == "desc" {
				for _, a := range e.Attr {
					if a.Name.Local == "id" && a.Value == "doc-desc" {
						in = "doc-desc"
					}
				}
			}
		case xml.CharData:
			switch in {
			case "doc-desc":
				doc.Desc += string(e)
			case "text", "tspan":
				doc.Texts = append(doc.Texts, string(e))
			}
		case xml.EndElement:
			in = ""
		}
	}
	return doc
}

// TestInsertEditorLayerInFiles builds a German spec with a screen and a
// print insert and reads the files back: the annotations are drawn as
// text (the SVG's <text>, read with encoding/xml; the PDF's text, read by
// poppler's pdftotext), the highlighted term's tint is in the SVG, the
// SVG's description is in German with its number written as
// golang.org/x/text's CLDR formatting writes it for German (grouping
// ".": CLDR de.xml), the visible scale note has the band level with a
// decimal comma, and an annotation with no room is a note-unplaced
// finding that names its insert.
func TestInsertEditorLayerInFiles(t *testing.T) {
	pdftotext := tooltest.Require(t, "pdftotext", "poppler-utils")
	j := editorJob(t, "de-DE", `  - {term: brick, year: 1880, text: ein Vermerk}
`)
	// A crowd of notes on brick's strip: some find no room.
	for y := 1870; y < 1910; y += 3 {
		j.Spec.Annotations = append(j.Spec.Annotations, j.Spec.Annotations[len(j.Spec.Annotations)-1])
		j.Spec.Annotations[len(j.Spec.Annotations)-1].From, j.Spec.Annotations[len(j.Spec.Annotations)-1].To = y, y
	}
	dir := filepath.Join(t.TempDir(), "out")
	res, err := Build(context.Background(), j, Options{Dir: dir, NoProofs: true})
	require.NoError(t, err)

	ins, err := j.PrepareInserts()
	require.NoError(t, err)
	require.Len(t, ins, 2)
	paar := ins[0].Graphic
	require.Equal(t, "paar", ins[0].Name())

	doc := readSVG(t, filepath.Join(dir, "inserts", "paar.svg"))
	de := message.NewPrinter(language.German)
	max := de.Sprint(number.Decimal(paar.YMax()))
	assert.Contains(t, max, ".", "a value over 999 is grouped in German (CLDR de: group '.'), yMax %v", paar.YMax())
	assert.Equal(t, "Wie oft „brick“ und „welding“ in jedem Jahr verwendet wurden, 1868–2025, je eine Zeile, von oben nach unten, auf einer gemeinsamen Skala (je Million Wörter, 0 bis "+max+
		"). Am häufigsten: „brick“ im Jahr "+strconv.Itoa(paar.Data.Series[0].PeakYear)+" und „welding“ im Jahr "+strconv.Itoa(paar.Data.Series[1].PeakYear)+".", doc.Desc)
	all := strings.Join(doc.Texts, "\n")
	assert.Contains(t, all, "Werftbau", "welding's annotation is drawn on the screen insert")
	assert.Contains(t, all, "Die Farbe zeigt das Jahr", "the key's caption in German")
	assert.Contains(t, all, "Höhepunkt "+strconv.Itoa(paar.Data.Series[1].PeakYear), "the peak line in German")
	assert.Contains(t, all, "Tönung: "+de.Sprint(number.Decimal(99.5))+"-%-Intervall", "the band level with a decimal comma (CLDR de: decimal ',')")
	raw, err := os.ReadFile(filepath.Join(dir, "inserts", "paar.svg"))
	require.NoError(t, err)
	assert.Contains(t, string(raw), "#e9e9e9", "the highlight's tint (9 % ink) behind welding's strip")

	out, err := exec.Command(pdftotext, filepath.Join(dir, "inserts", "druck.pdf"), "-").Output()
	require.NoError(t, err)
	text := strings.Join(strings.Fields(string(out)), " ") // a note may be set on two lines
	for _, want := range []string{"Werftbau", "erste Rechner", "Die Farbe zeigt das Jahr"} {
		assert.Contains(t, text, want, "druck.pdf as pdftotext reads it")
	}

	found := 0
	for _, f := range res.Findings {
		if f.ID == feature.IDNoteUnplaced && f.Insert != "" {
			found++
			assert.Equal(t, "paar", f.Insert)
			assert.Equal(t, "web", f.Output, "the output the insert borrows")
			assert.Equal(t, "brick", f.Term)
			assert.Contains(t, f.Message, `on insert "paar"`)
			assert.Contains(t, f.Where(), "insert paar")
		}
	}
	assert.Positive(t, found, "the crowd on brick's strip has unplaced notes")
}

// TestInsertNotesInReport: `check --json` (Summarize) lists every insert
// with where its annotations landed, inside the insert.
func TestInsertNotesInReport(t *testing.T) {
	j := editorJob(t, "en-GB", "")
	r, err := j.Summarize()
	require.NoError(t, err)
	require.Len(t, r.Inserts, 2)
	assert.Equal(t, []string{"brick", "welding"}, r.Inserts[0].Terms)
	assert.Equal(t, "rows", r.Inserts[0].Compare)
	assert.Equal(t, "overlay", r.Inserts[1].Compare)
	got := map[string]string{}
	for _, in := range r.Inserts {
		for _, n := range in.Notes {
			got[in.Name+" "+n.Text] = n.Term
			if n.Placed {
				assert.True(t, n.Box.X0 >= 0 && n.Box.Y0 >= 0 && n.Box.X1 <= in.SizePt[0] && n.Box.Y1 <= in.SizePt[1], "%s %q: box %v inside the insert", in.Name, n.Text, n.Box)
			}
			assert.Equal(t, n.Term, in.Terms[n.Item], "item is the term's place in the insert")
		}
	}
	assert.Equal(t, map[string]string{"paar Werftbau": "welding", "druck Werftbau": "welding", "druck erste Rechner": "computer"}, got)
}
