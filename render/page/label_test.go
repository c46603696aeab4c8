package page

import (
	"bytes"
	"encoding/csv"
	"encoding/xml"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/go-text/typesetting/segmenter"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/render/pdf"
	"sheaf/render/svg"
	"sheaf/render/tooltest"
	"sheaf/specs"
	"sheaf/specs/series"
)

// uax14Breaks are the line break opportunities inside text (as rune
// offsets of the rune after the break, neither 0 nor the end) that the
// Unicode Line Breaking Algorithm (UAX #14) allows, as go-text's
// segmenter computes them (it is tested against Unicode's
// LineBreakTest.txt).
func uax14Breaks(text string) []int {
	var seg segmenter.Segmenter
	r := []rune(text)
	seg.Init(r)
	var out []int
	it := seg.LineIterator()
	for it.Next() {
		if l := it.Line(); l.Offset > 0 {
			out = append(out, l.Offset)
		}
	}
	return out
}

// TestLabelBreaks checks where a label may turn to its next line: at a
// space, and after a hyphen or slash that joins two letters or digits.
// Every break offered must be a line break opportunity of UAX #14 (HY and
// BA hyphens and SY solidus break after, never before; SP breaks after;
// LB25 keeps a hyphen before a digit, a minus sign, with its number) —
// checked with go-text's segmenter on the table and on every term of the
// demo's data — and the rule is narrower: no break after a hyphen that
// does not join two word characters.
func TestLabelBreaks(t *testing.T) {
	tests := []struct {
		text string
		want []string // the lines at every break, "|" between
	}{
		{"boiler", nil},
		{"steam hammer", []string{"steam|hammer"}},
		{"cathode ray tube", []string{"cathode|ray tube", "cathode ray|tube"}},
		{"non-destructive", []string{"non-|destructive"}},
		{"computer-aided design", []string{"computer-|aided design", "computer-aided|design"}},
		{"AC/DC motor", []string{"AC/|DC motor", "AC/DC|motor"}},
		{"B-52", nil}, // UAX #14 LB25: no break between a hyphen and a digit after it
		{"-40 degrees", []string{"-40|degrees"}},
		{"wire - rope", []string{"wire|- rope", "wire -|rope"}}, // a spaced hyphen is no joint
		{"e\u2010scooter", []string{"e\u2010|scooter"}},         // U+2010 HYPHEN (UAX #14 class BA)
		{"Maßstab-Änderung", []string{"Maßstab-|Änderung"}},
		{"24/7 service", []string{"24/7|service"}}, // LB25: NU SY × NU
		{"4-stroke engine", []string{"4-|stroke engine", "4-stroke|engine"}},
	}
	for _, tc := range tests {
		t.Run(tc.text, func(t *testing.T) {
			var got []string
			for _, b := range labelBreaks(tc.text) {
				got = append(got, tc.text[:b.end]+"|"+tc.text[b.next:])
			}
			assert.Equal(t, tc.want, got)
		})
	}
	// Every break is a UAX #14 opportunity, on the table and the demo's
	// 1,200 invented terms.
	terms := []string{}
	for _, tc := range tests {
		terms = append(terms, tc.text)
	}
	fh, err := os.Open("../../examples/quillmere/data/counts.csv")
	require.NoError(t, err)
	defer fh.Close()
	rows, err := csv.NewReader(fh).ReadAll()
	require.NoError(t, err)
	seen := map[string]bool{}
	for _, row := range rows[1:] {
		if !seen[row[0]] {
			seen[row[0]] = true
			terms = append(terms, row[0])
		}
	}
	checked := 0
	for _, text := range terms {
		ok := uax14Breaks(text)
		for _, b := range labelBreaks(text) {
			at := len([]rune(text[:b.next]))
			assert.Contains(t, ok, at, "%q: break before rune %d is not a UAX #14 opportunity (those are %v)", text, at, ok)
			checked++
		}
	}
	assert.Greater(t, checked, 300, "breaks checked against UAX #14")
}

// widthOf measures bold label text.
func widthOf(f *Feature, size float64, s string) float64 {
	return f.Fonts.Width(fonts.Bold, size, s)
}

// TestLabelsWrap checks the order in which a label is made to fit (issue
// 16, item 5: wrap onto two lines at full size before shrinking; never
// inside a word; a single word too wide still shrinks) and the lines'
// geometry: no line wider than the panel, the last no wider than the
// room the peak text leaves. Widths are set from the font's own
// measurements around invented terms; the 7 pt label and its 85 % floor
// are the project's rule (TestLabelsFit).
func TestLabelsWrap(t *testing.T) {
	const size = 7.0
	f := smallFeature(t, func(_ *specs.Spec, out *specs.Output) { out.Type.Label = specs.Length(size) })
	floor := f.labelFloor()
	peak := func() float64 { r := f.roomFor(0, 1000, true); return 1000 - r.last }()
	W := func(s string) float64 { return widthOf(f, size, s) }
	tests := []struct {
		name   string
		term   string
		lines  int                         // label-lines
		width  func() float64              // panel width
		want   []string                    // lines; nil: one line
		shrunk bool                        // set below the label size
		check  func(t *testing.T, l Label) // more
	}{
		{name: "fits: untouched", term: "steam hammer", lines: 2,
			width: func() float64 { return peak + W("steam hammer") + 0.5 }},
		{name: "too wide: two lines at full size", term: "reinforced concrete", lines: 2,
			width: func() float64 { return max(W("reinforced"), peak+W("concrete")) + 0.5 },
			want:  []string{"reinforced", "concrete"}},
		{name: "the longest first line", term: "cathode ray tube", lines: 2,
			width: func() float64 { return max(W("cathode ray"), peak+W("ray tube")) + 0.5 },
			want:  []string{"cathode ray", "tube"}},
		{name: "a space before a hyphen", term: "computer-aided design", lines: 2,
			width: func() float64 { return max(W("computer-aided"), peak+W("aided design")) + 0.5 },
			want:  []string{"computer-aided", "design"}},
		{name: "a space before a hyphen, even on a shorter first line", term: "check non-return", lines: 2,
			width: func() float64 { return max(W("check non-"), peak+W("non-return")) + 0.5 },
			want:  []string{"check", "non-return"},
			check: func(t *testing.T, l Label) {
				require.Greater(t, peak+W("non-return"), W("check"), "test setup")
				require.Less(t, peak+W("return"), f.Plan.PanelW, "test setup: a break after the hyphen fits too")
			}},
		{name: "after a hyphen when no space does", term: "non-destructive", lines: 2,
			width: func() float64 { return max(W("non-"), peak+W("destructive")) + 0.5 },
			want:  []string{"non-", "destructive"}},
		{name: "a long single word shrinks, unbroken", term: "electrophotographic", lines: 2,
			width:  func() float64 { return peak + widthOf(f, 0.92*size, "electrophotographic") },
			shrunk: true},
		{name: "two lines not enough: shrinks on two", term: "additive manufacturing", lines: 2,
			width:  func() float64 { return max(widthOf(f, 6.5, "additive"), peak+widthOf(f, 6.5, "manufacturing")) + 0.01 },
			want:   []string{"additive", "manufacturing"},
			shrunk: true,
			check: func(t *testing.T, l Label) {
				// The largest size that fits on two lines: a quarter point
				// more does not.
				w := f.Plan.PanelW
				assert.Nil(t, f.breakLabel(l.Term, l.Size+0.25, 2, f.roomFor(0, w, true)), "fits at %.2f pt too", l.Size+0.25)
			}},
		{name: "label-lines 1: one line, shrunk", term: "reinforced concrete", lines: 1,
			width:  func() float64 { return peak + widthOf(f, 0.92*size, "reinforced concrete") },
			shrunk: true},
		{name: "three lines when allowed", term: "heat pump water heater", lines: 3,
			width: func() float64 { return max(W("heat pump"), W("water"), peak+W("heater")) + 0.5 },
			want:  []string{"heat pump", "water", "heater"}},
		{name: "a single word too wide even alone is cut on one line", term: "electrophotographically", lines: 2,
			width: func() float64 { return widthOf(f, floor, "electrophoto…") + 0.1 }, shrunk: true,
			check: func(t *testing.T, l Label) {
				require.True(t, l.Truncated && l.NoPeak, "cut, without the peak")
				assert.Equal(t, "electrophoto…", l.Text)
			}},
		{name: "cut on the last line", term: "hydrogen economy electrophotographically", lines: 2,
			width: func() float64 { return widthOf(f, floor, "hydrogen economy") + 0.5 }, shrunk: true,
			want: []string{"hydrogen economy", "electrophotograp…"},
			check: func(t *testing.T, l Label) {
				require.True(t, l.Truncated && l.NoPeak, "cut, without the peak")
				require.Len(t, l.Lines, 2)
				assert.Equal(t, "hydrogen economy", l.Lines[0])
				assert.True(t, strings.HasSuffix(l.Lines[1], "…"), "last line %q ends in an ellipsis", l.Lines[1])
				assert.Equal(t, "hydrogen economy "+l.Lines[1], l.Text)
				assert.True(t, strings.HasPrefix("electrophotographically", strings.TrimSuffix(l.Lines[1], "…")), "the last line is the cut rest: %q", l.Lines[1])
			}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f.Data.Series[0].Term = tc.term
			f.Output.LabelLines = tc.lines
			w := tc.width()
			f.Plan.PanelW = w
			l := f.fitLabel(0, w, tc.lines)
			t.Logf("%q in %.1f pt: %q at %.2f pt", tc.term, w, l.Drawn(), l.Size)
			if tc.want == nil {
				assert.Nil(t, l.Lines, "one line")
			} else {
				assert.Equal(t, tc.want, l.Lines, "lines")
			}
			assert.Equal(t, tc.shrunk, l.Shrunk, "shrunk (at %.2f pt)", l.Size)
			assert.Equal(t, l.Size < size, l.Shrunk, "Shrunk and the size agree")
			if !tc.shrunk {
				assert.Equal(t, size, l.Size, "set at the label size")
			}
			if !l.Truncated {
				assert.Equal(t, tc.term, l.Text, "text")
				assert.Equal(t, strings.ReplaceAll(tc.term, " ", ""), strings.ReplaceAll(strings.Join(l.Drawn(), ""), " ", ""), "the lines are the term's words, in order")
			}
			room := f.roomFor(0, w, !l.NoPeak)
			lines := l.Drawn()
			for i, s := range lines {
				assert.Equal(t, strings.TrimSpace(s), s, "line %q has no outer space", s)
				limit := room.other
				if i == len(lines)-1 {
					limit = room.last
				}
				assert.LessOrEqual(t, widthOf(f, l.Size, s), limit+1e-9, "line %d %q at %.2f pt", i, s, l.Size)
				assert.LessOrEqual(t, widthOf(f, l.Size, s), w+1e-9, "line %q within the panel", s)
			}
			if tc.check != nil {
				tc.check(t, l)
			}
		})
	}
}

// TestEvenRowsSetsAgain: a label set smaller to match its row is set
// again at that size on as few lines as it takes — one, when it fits
// there — and a row keeps one size (project rule, README).
func TestEvenRowsSetsAgain(t *testing.T) {
	f := smallFeature(t, func(_ *specs.Spec, out *specs.Output) { out.Type.Label = 7 })
	require.GreaterOrEqual(t, len(f.Plan.Pages[0].Panels), 2)
	a, b := f.Plan.Pages[0].Panels[0], f.Plan.Pages[0].Panels[1]
	require.Equal(t, a.Row, b.Row, "the first two panels share a row (precondition)")
	floor := f.labelFloor()
	f.Data.Series[a.Item].Term = "reinforced concrete"
	room := f.roomFor(a.Item, 1000, true)
	w := 1000 - room.last + widthOf(f, floor, "reinforced concrete") + 0.1 // one line only at the floor
	for i := range f.Plan.Pages {
		for j := range f.Plan.Pages[i].Panels {
			f.Plan.Pages[i].Panels[j].Label.X1 = f.Plan.Pages[i].Panels[j].Label.X0 + w
		}
	}
	f.labels = make([]Label, len(f.Data.Series))
	for i := range f.labels {
		f.labels[i] = Label{Item: i, Term: f.Data.Series[i].Term, Text: f.Data.Series[i].Term, Size: 7}
	}
	f.labels[a.Item] = f.fitLabel(a.Item, w, 2)
	require.Len(t, f.labels[a.Item].Lines, 2, "wrapped at 7 pt (precondition)")
	f.labels[b.Item].Size, f.labels[b.Item].Shrunk = floor, true // its neighbour needed the floor
	f.Plan.LabelLines = 2
	f.Output.LabelLines = 2
	f.evenRows()
	la := f.labels[a.Item]
	assert.Equal(t, floor, la.Size, "one size a row")
	assert.True(t, la.Shrunk)
	assert.True(t, la.ForRow, "smaller only to match its row (preflight says so)")
	assert.False(t, f.labels[b.Item].ForRow, "the neighbour shrank to fit its own panel")
	assert.Nil(t, la.Lines, "at the row's size it fits on one line: %q", la.Drawn())
}

// wrapFeature prepares testdata/small's print output, four columns on A5,
// with its terms renamed: long ones wrap.
func wrapFeature(t testing.TB, terms []string, edit func(out *specs.Output)) *Feature {
	t.Helper()
	s, err := specs.Load(smallSpec)
	require.NoError(t, err)
	d, err := series.Load(s)
	require.NoError(t, err)
	for i, term := range terms {
		d.Series[i].Term = term
	}
	out := s.Output("print")
	out.Columns = 4
	out.Type.Label = 7
	if edit != nil {
		edit(out)
	}
	f, err := PrepareForTest(s, d, out)
	require.NoError(t, err)
	return f
}

// TestWrappedLabelGeometry: with a term too wide for its panel the whole
// output gets a two-line label band, every plot keeps one height (small
// multiples compare; issue 16), and every label's lines — their ink, from
// the face's ascent above each baseline to its descent below — stay in
// the panel's label box: off the plot below, off the neighbours beside.
// With label-lines: 1 nothing wraps and the band is one line.
func TestWrappedLabelGeometry(t *testing.T) {
	terms := []string{"reinforced concrete", "boiler", "Maßstab"}
	one := wrapFeature(t, terms, func(out *specs.Output) { out.LabelLines = 1 })
	two := wrapFeature(t, terms, nil)
	assert.Equal(t, 1, one.Plan.LabelLines)
	assert.Nil(t, one.Labels()[0].Lines, "label-lines 1: one line")
	require.Equal(t, 2, two.Plan.LabelLines, "a wrapped label asks for a band of two lines")
	require.Equal(t, []string{"reinforced", "concrete"}, two.Labels()[0].Lines)
	assert.Equal(t, 7.0, two.Labels()[0].Size, "wrapped at full size")
	assert.InDelta(t, one.Plan.PlotH, two.Plan.PlotH, 1e-9, "the band takes no height from the plots (panel aspect)")
	assert.InDelta(t, 2*one.Plan.LabelH, two.Plan.LabelH, 1e-9, "two label lines")
	m := two.Fonts.Metrics(fonts.Bold, 7)
	for _, pg := range two.Plan.Pages {
		for _, pn := range pg.Panels {
			assert.InDelta(t, two.Plan.PlotH, pn.Plot.H(), 1e-9, "plot height")
			l := two.Labels()[pn.Item]
			lines := l.Drawn()
			pitch := l.Size * two.leading()
			top := pn.LabelBaseline + float64(len(lines)-1)*pitch + m.Ascent
			assert.LessOrEqual(t, top, pn.Label.Y1+1e-9, "%q: top line's ascent inside the label box", l.Term)
			assert.GreaterOrEqual(t, pn.LabelBaseline-m.Descent, pn.Plot.Y1-1e-9, "%q: last line's descent above the plot", l.Term)
			for _, s := range lines {
				assert.LessOrEqual(t, pn.Label.X0+widthOf(two, l.Size, s), pn.Label.X1+1e-9, "%q inside its column", s)
			}
			for _, other := range pg.Panels {
				if other.Item != pn.Item {
					assert.False(t, pn.Label.X0 < other.Label.X1-1e-9 && other.Label.X0 < pn.Label.X1-1e-9 &&
						pn.Label.Y0 < other.Label.Y1-1e-9 && other.Label.Y0 < pn.Label.Y1-1e-9, "label boxes of %d and %d overlap", pn.Item, other.Item)
				}
			}
		}
	}
	// The highlight rule stands on the label's first line, not over an
	// empty line of the band.
	pn := two.Plan.Pages[0].Panels[1]
	require.Equal(t, "boiler", two.Labels()[pn.Item].Term)
	assert.Less(t, two.LabelTop(pn, two.Labels()[pn.Item]), pn.Label.Y1-0.5*two.Plan.LabelH+1e-9, "a one-line label's top is in the band's lower line")
	pn = two.Plan.Pages[0].Panels[0]
	assert.InDelta(t, pn.Label.Y1, two.LabelTop(pn, two.Labels()[pn.Item]), 1e-9, "a wrapped label's top is the band's")
}

// wordBox is a word pdftotext -bbox found, in points from the page's
// top-left corner.
type wordBox struct {
	word                   string
	xMin, yMin, xMax, yMax float64
}

var wordRE = regexp.MustCompile(`<word xMin="([0-9.]+)" yMin="([0-9.]+)" xMax="([0-9.]+)" yMax="([0-9.]+)">([^<]*)</word>`)

// TestWrappedLabelDrawn: both lines of a wrapped label are on the page
// as text — in the PDF, where poppler's pdftotext finds each word with
// its box (the first line above the second, both flush left in the label
// box), and in SVG, as two <text> elements.
func TestWrappedLabelDrawn(t *testing.T) {
	f := wrapFeature(t, []string{"reinforced concrete", "boiler", "Maßstab"}, nil)
	require.Equal(t, []string{"reinforced", "concrete"}, f.Labels()[0].Lines)
	pg := f.Plan.Pages[0]
	pn := pg.Panels[0]
	require.Equal(t, 0, pn.Item)

	t.Run("pdf", func(t *testing.T) {
		tooltest.Require(t, "pdftotext", "poppler-utils")
		var buf bytes.Buffer
		w := pdf.NewWriter(&buf, pdf.Options{Title: f.Spec.Title, Date: time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)})
		r := func(r layout.Rect) canvas.Rect { return canvas.Rect{X0: r.X0, Y0: r.Y0, X1: r.X1, Y1: r.Y1} }
		setup := pdf.PageSetup{Boxes: pdf.PageBoxes{Media: r(pg.Media), Bleed: r(pg.Bleed), Trim: r(pg.Trim)}}
		require.NoError(t, w.AddPage(setup, func(c *canvas.Canvas) error { return f.Draw(canvas.NewContext(c), 0) }))
		require.NoError(t, w.Close())
		p := filepath.Join(t.TempDir(), "wrap.pdf")
		require.NoError(t, os.WriteFile(p, buf.Bytes(), 0o644))
		out, err := exec.Command("pdftotext", "-bbox", p, "-").CombinedOutput()
		require.NoError(t, err, string(out))
		words := map[string]wordBox{}
		for _, m := range wordRE.FindAllStringSubmatch(string(out), -1) {
			num := func(i int) float64 { v, _ := strconv.ParseFloat(m[i], 64); return v }
			words[m[5]] = wordBox{m[5], num(1), num(2), num(3), num(4)}
		}
		first, ok1 := words["reinforced"]
		second, ok2 := words["concrete"]
		require.True(t, ok1 && ok2, "pdftotext finds both lines' words: %v", slices.Sorted(func(yield func(string) bool) {
			for k := range words {
				if !yield(k) {
					return
				}
			}
		}))
		H := pg.Media.H()
		lb := pn.Label
		for _, wb := range []wordBox{first, second} {
			// Poppler's word box spans the font's ascent and descent;
			// half a point of slack for its rounding.
			assert.GreaterOrEqual(t, wb.xMin, lb.X0-0.5, "%s left of its label box", wb.word)
			assert.LessOrEqual(t, wb.xMax, lb.X1+0.5, "%s right of its label box", wb.word)
			assert.GreaterOrEqual(t, wb.yMin, H-lb.Y1-0.5, "%s above its label box", wb.word)
			assert.LessOrEqual(t, wb.yMax, H-lb.Y0+0.5, "%s under its label box, on the plot", wb.word)
		}
		assert.InDelta(t, first.xMin, second.xMin, 0.1, "both lines flush left")
		assert.LessOrEqual(t, first.yMax, second.yMin+0.5, "the first line above the second")
		assert.InDelta(t, f.Labels()[0].Size*f.leading(), second.yMin-first.yMin, 0.1, "the lines a line of the label size apart (the leading)")
	})

	t.Run("svg", func(t *testing.T) {
		doc, err := svg.New(pg.Media.W(), pg.Media.H(), svg.Options{Title: "wrap"})
		require.NoError(t, err)
		require.NoError(t, f.Draw(canvas.NewContext(doc), 0))
		var buf bytes.Buffer
		_, err = doc.WriteTo(&buf)
		require.NoError(t, err)
		type text struct {
			Y    float64 `xml:"y,attr"`
			Body string  `xml:",chardata"`
		}
		var texts []text
		dec := xml.NewDecoder(&buf)
		for {
			tok, err := dec.Token()
			if err != nil {
				break
			}
			if se, ok := tok.(xml.StartElement); ok && se.Name.Local == "text" {
				var tx text
				require.NoError(t, dec.DecodeElement(&tx, &se))
				texts = append(texts, tx)
			}
		}
		var ys []float64
		for _, w := range []string{"reinforced", "concrete"} {
			i := slices.IndexFunc(texts, func(tx text) bool { return strings.TrimSpace(tx.Body) == w })
			require.GreaterOrEqual(t, i, 0, "a <text> element holds %q alone", w)
			ys = append(ys, texts[i].Y)
		}
		assert.Less(t, ys[0], ys[1], "the first line above the second (SVG y grows down)")
	})
}

// TestWrapFallsBack: when a row with a two-line label band no longer fits
// (here a fixed panel height whose plot would fall under the legibility
// floor, 3 × the label size), the output keeps its one-line plan, the
// labels shrink on one line as before, and the plan warns at label-lines.
func TestWrapFallsBack(t *testing.T) {
	la := 7 * 1.25
	f := wrapFeature(t, []string{"reinforced concrete", "boiler", "Maßstab"}, func(out *specs.Output) {
		out.Type.Leading = 1.25
		out.PanelHeight = specs.Length(la + 3*7 + 1) // one line: plot 22 pt ≥ 21; two: 13.25
	})
	assert.Equal(t, 1, f.Plan.LabelLines, "the one-line plan stays")
	l := f.Labels()[0]
	assert.Nil(t, l.Lines, "no room to wrap: one line")
	assert.True(t, l.Shrunk || l.NoPeak || l.Truncated, "made to fit on one line")
	i := slices.IndexFunc(f.Plan.Warnings, func(w layout.Warning) bool { return w.Key == "label-lines" })
	require.GreaterOrEqual(t, i, 0, "a warning at label-lines: %v", f.Plan.Warnings)
	assert.Contains(t, f.Plan.Warnings[i].Message, "shrunk on one instead")
}
