package specs

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// head is the smallest valid spec; cases append to it or replace it.
const head = `title: T
data: {counts: c.csv, totals: t.csv}
years: {from: 1900, to: 1950}
`

// printOut is a valid print output that a case can add keys to (line 5 on).
const printOut = head + `outputs:
  print:
    kind: print
`

// TestParseErrors checks that each problem is found at its place with a
// clear message. Positions are counted by hand from the inline text
// (line:col, 1-based, as YAML 1.2 §5 numbers them and editors show them).
// Messages are this project's own wording.
func TestParseErrors(t *testing.T) {
	tests := []struct {
		name string
		text string
		at   string // "line:col"
		want string // substring of the message
	}{
		{"empty", "", "1:1", "the spec is empty"},
		{"blank lines", "\n  \n\n", "1:1", "the spec is empty"},
		{"comments only", "# nothing yet\n", "1:1", "the spec is empty"},
		{"BOM only", "\ufeff", "1:1", "the spec is empty"},
		{"document marker only", "---\n", "1:1", "the spec is empty"},
		{"two documents", printOut + "---\ntitle: U\n", "8:1", "a second YAML document (after ---); a spec is one document"},
		{"syntax error in second document", "title: T\n---\na: [\n", "3:1", "YAML syntax: did not find expected node content"},
		{"unclosed flow list", "title: T\ndata: [a, b\nyears: 1\n", "2:1", "YAML syntax: did not find expected ',' or ']'"},
		{"bad indentation", "title: T\ndata:\n  counts: a\n totals: b\n", "4:2", "YAML syntax: did not find expected key"},
		{"mapping in plain scalar", "title: T\ndek: a: b\n", "2:1", "YAML syntax: mapping values are not allowed in this context"},
		{"unclosed quote", "title: 'T\n", "1:1", "YAML syntax: found unexpected end of stream"},
		{"tab indentation", "title: T\ndata:\n\tcounts: a.csv\n", "3:1", "a tab is used for indentation; YAML needs spaces"},
		{"tab after key", "title: T\n\tdek: x\n", "2:1", "a tab is used for indentation"},
		{"undefined alias", "title: T\ndek: *nothing\n", "2:1", "YAML syntax: unknown anchor 'nothing' referenced"},
		{"top is a list", "- a\n- b\n", "1:1", "the spec must be a mapping of keys to values, not a list"},
		{"top is text", "just words\n", "1:1", `the spec must be a mapping of keys to values, not "just words"`},
		{"unknown top key", head + "outputs: {print: {kind: print}}\ntitel: x\n", "5:1", `unknown key "titel" in the spec; did you mean "title"?`},
		{"unknown output key", printOut + "    colums: 3\n", "7:5", `unknown key "colums" in outputs.print; did you mean "columns"?`},
		{"unknown key no hint", printOut + "    zzzzzz: 3\n", "7:5", `unknown key "zzzzzz" in outputs.print`},
		{"key twice", printOut + "    columns: 3\n    columns: 4\n", "8:5", "outputs.print.columns is given twice"},
		{"missing required", "title: T\n", "1:1", "data is missing"},
		{"missing data key", "title: T\ndata: {counts: c.csv}\nyears: {from: 1900, to: 1950}\noutputs: {print: {kind: print}}\n", "2:7", "data.totals is missing"},
		{"title a list", strings.Replace(printOut, "title: T", "title: [a, b]", 1), "1:8", "title must be a single value, not a list"},
		{"title empty", strings.Replace(printOut, "title: T", `title: ""`, 1), "1:8", "title is empty"},
		{"title null", strings.Replace(printOut, "title: T", "title:", 1), "1:7", "title must be a single value, not empty"},
		{"data not a mapping", "title: T\ndata: 5\nyears: {from: 1900, to: 1950}\noutputs: {print: {kind: print}}\n", "2:7", `data must be a mapping of keys to values, not "5"`},
		{"year not a number", "title: T\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: abc, to: 1950}\noutputs: {print: {kind: print}}\n", "3:15", `years.from must be a whole number, not "abc"`},
		{"years backwards", "title: T\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1950, to: 1900}\noutputs: {print: {kind: print}}\n", "3:8", "years: to (1900) must come after from (1950)"},
		{"fold-case not bool", "title: T\ndata: {counts: c.csv, totals: t.csv, fold-case: maybe}\nyears: {from: 1900, to: 1950}\noutputs: {print: {kind: print}}\n", "2:49", `data.fold-case must be true or false, not "maybe"`},
		{"columns not a number", printOut + "    columns: x\n", "7:14", `outputs.print.columns must be a whole number, not "x"`},
		{"zero columns", printOut + "    columns: 0\n", "7:14", "outputs.print.columns must be between 1 and 100, not 0"},
		{"negative columns", printOut + "    columns: -2\n", "7:14", "outputs.print.columns must be between 1 and 100, not -2"},
		{"bare number length", printOut + "    gutter: 4\n", "7:13", `outputs.print.gutter: "4" has no unit; write it with one, like 4mm or 4pt`},
		{"unknown unit", printOut + "    bleed: 3furlongs\n", "7:12", `outputs.print.bleed: unknown unit "furlongs" in "3furlongs"; use mm, cm, in, pt, pc or px`},
		{"negative bleed", printOut + "    bleed: -3mm\n", "7:12", "outputs.print.bleed must not be negative, not -3mm"},
		{"zero line", printOut + "    line: 0pt\n", "7:11", "outputs.print.line must be greater than zero, not 0pt"},
		{"negative type size", printOut + "    type: {label: -7pt}\n", "7:19", "outputs.print.type.label must be greater than zero, not -7pt"},
		{"zero trim", printOut + "    trim: 0mm x 10mm\n", "7:11", "outputs.print.trim: width and height must be greater than zero"},
		{"unknown trim name", printOut + "    trim: A6\n", "7:11", `outputs.print.trim: "A6" is not a size`},
		{"side margins too wide", printOut + "    trim: A5\n    margins: 80mm\n", "8:5", "outputs.print: the inside and outside margins (160.0 mm together) leave no room on a 148.0 mm wide page"},
		{"top margins too tall", printOut + "    trim: A5\n    margins: {top: 110mm, bottom: 100mm}\n", "8:5", "the top and bottom margins (210.0 mm together) leave no room on a 210.0 mm tall page"},
		{"page past the PDF limit", printOut + "    trim: 6000mm x 300mm\n", "7:5", "PDF pages stop at 14400 pt (200 in, ISO 32000-1 Annex C.2)"},
		{"proofs too large", printOut + "    trim: 2000mm x 300mm\n    proofs: 1200\n", "8:5", "proofs at 1200 dpi would be 95717 pixels across; the most is 40000"},
		{"screen margins in px", head + "outputs:\n  web:\n    kind: screen\n    trim: 60px\n    margins: 32px\n", "8:5", "(64 px together) leave no room on a 60 px wide page"},
		{"bleed on screen", head + "outputs:\n  web: {kind: screen, bleed: 3mm}\n", "5:8", "outputs.web: bleed, marks and slug-line are for print outputs"},
		{"flow choice", head + "outputs:\n  web: {kind: screen, flow: scroll-group}\n", "5:29", `outputs.web.flow must be one of pages, scroll, scroll-groups, not "scroll-group"; did you mean "scroll-groups"?`},
		{"spreads on a scroll", head + "outputs:\n  web:\n    kind: screen\n    trim: 1200px\n    spreads: true\n", "8:5", "outputs.web.spreads: spreads pair a left and a right page; flow scroll has no facing pages"},
		{"spreads on scroll-groups", head + "outputs:\n  web:\n    kind: screen\n    trim: 1200px x 1600px\n    flow: scroll-groups\n    spreads: true\n", "9:5", "flow scroll-groups has no facing pages"},
		{"flow on print", printOut + "    flow: scroll-groups\n", "6:5", "outputs.print: flow, spreads and panel-files are for screen outputs"},
		{"key-every on print", printOut + "    key-every: 200mm\n", "7:5", "outputs.print.key-every: the colour key repeats down scrolling screen pages; every print page carries its own key"},
		{"key-every 0 on print", printOut + "    key-every: 0\n", "7:5", "outputs.print.key-every: the colour key repeats down scrolling screen pages"},
		{"key-every on pages", head + "outputs:\n  web:\n    kind: screen\n    trim: 1200px x 1600px\n    key-every: 1600px\n", "8:5", "outputs.web.key-every: the colour key repeats down scrolling pages; with flow pages every page carries its own key"},
		{"key-every on explicit pages", head + "outputs:\n  web:\n    kind: screen\n    key-every: 0\n    flow: pages\n    trim: 1200px x 1600px\n", "7:5", "with flow pages every page carries its own key"},
		{"key-every without unit", head + "outputs:\n  web:\n    kind: screen\n    key-every: 1600\n", "7:16", `outputs.web.key-every: "1600" has no unit; write it with one, like 1600px (CSS px, 96 to the inch)`},
		{"key-every negative", head + "outputs:\n  web:\n    kind: screen\n    key-every: -10px\n", "7:16", "outputs.web.key-every must not be negative, not -10px"},
		{"key-every a list", head + "outputs:\n  web:\n    kind: screen\n    key-every: [1, 2]\n", "7:16", "outputs.web.key-every must be a single value, not a list"},
		{"kind unknown", head + "outputs:\n  web: {kind: scren}\n", "5:15", `outputs.web.kind must be one of print, screen, not "scren"; did you mean "screen"?`},
		{"kind missing", head + "outputs:\n  web: {trim: A4}\n", "5:8", "outputs.web.kind is missing"},
		{"output name", head + "outputs:\n  my output: {kind: print}\n", "5:3", `output name "my output": use letters, digits, - and _`},
		{"no outputs", head + "outputs: {}\n", "4:1", "outputs: give at least one output"},
		{"order choice", printOut + "order: alphabetic\n", "7:8", `order must be one of listed, alphabetical, peak-year, similarity, not "alphabetic"; did you mean "alphabetical"?`},
		{"scale choice", printOut + "scale: {values: per-mille}\n", "7:17", `scale.values must be one of per-million, own-peak, raw, not "per-mille"; did you mean "per-million"?`},
		{"bad colour", printOut + "palette: {paper: '#ffff'}\n", "7:18", `palette.paper: "#ffff" is not a colour; write #rrggbb, lab(L a b) or oklch(L C h)`},
		{"lab out of range", printOut + "palette: {paper: 'lab(120 0 0)'}\n", "7:18", "L* must be between 0 and 100"},
		{"one anchor", printOut + "palette:\n  anchors:\n    - {year: 1900, color: '#000000'}\n", "9:5", "give at least two anchors"},
		{"date format", printOut + "date: 1.2.2024\n", "7:7", `date must be written YYYY-MM-DD, not "1.2.2024"`},
		{"date not in the calendar", printOut + "date: 2025-02-30\n", "7:7", `date "2025-02-30" is not a day of the calendar`},
		{"length past any page", printOut + "    line: 1e308pt\n", "7:11", "outputs.print.line: 1e308pt is larger than the largest PDF page (14400 pt"},
		{"insert output", printOut + "inserts:\n  fig1: {output: prnt, size: 80mm x 50mm, terms: [a]}\n", "8:10", `inserts.fig1.output: no output named "prnt"; did you mean "print"?`},
		{"insert too many terms", printOut + "inserts:\n  fig1: {output: print, size: 80mm x 50mm, terms: [a, b, c, d, e]}\n", "8:44", "inserts.fig1.terms: an insert shows 1 to 4 terms, not 5"},
		{"self alias", "title: T\nnotes: &n [a, *n]\n", "2:15", "a YAML alias refers to a value that contains it"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse("bad.yaml", []byte(tt.text))
			require.Error(t, err, "no error for\n%s", tt.text)
			es, ok := err.(Errors)
			require.True(t, ok, "error is %T, want specs.Errors: %v", err, err)
			want := "bad.yaml:" + tt.at + ": "
			found := false
			for _, e := range es {
				found = found || strings.HasPrefix(e.Error(), want) && strings.Contains(e.Msg, tt.want)
			}
			assert.True(t, found, "want an error %q…%q; got\n%v", want, tt.want, err)
		})
	}
}

// TestParseReportsAll checks that one run lists every problem, in file
// order, and stops at MaxErrors.
func TestParseReportsAll(t *testing.T) {
	text := printOut + "    colums: 3\n    gutter: 4\n    bleed: -1mm\norder: alphabetic\n"
	_, err := Parse("bad.yaml", []byte(text))
	es, _ := err.(Errors)
	var got []string
	for _, e := range es {
		got = append(got, fmt.Sprintf("%d:%d", e.Pos.Line, e.Pos.Col))
	}
	want := []string{"7:5", "8:13", "9:12", "10:8"}
	assert.Equal(t, want, got, "error positions; errors:\n%v", err)

	var b strings.Builder
	b.WriteString(printOut)
	for i := range 80 {
		fmt.Fprintf(&b, "    bad-key-%d: 1\n", i)
	}
	_, err = Parse("many.yaml", []byte(b.String()))
	es, _ = err.(Errors)
	assert.Len(t, es, MaxErrors, "errors, capped")
	msg := err.Error()
	assert.True(t, strings.HasSuffix(msg, fmt.Sprintf("(stopped after %d problems)", MaxErrors)), "capped error list does not say it stopped:\n…%s", msg[len(msg)-80:])
}

// billionLaughs builds the "billion laughs" shape (Klein, 2002; see also
// OWASP's XML entity expansion notes; the YAML form is common practice):
// levels of lists, each holding width aliases of the level below.
func billionLaughs(levels, width int) string {
	var b strings.Builder
	b.WriteString("title: T\n")
	b.WriteString(`l0: &l0 ["lol"`)
	for range width - 1 {
		b.WriteString(`, "lol"`)
	}
	b.WriteString("]\n")
	for i := 1; i < levels; i++ {
		fmt.Fprintf(&b, "l%d: &l%d [*l%d", i, i, i-1)
		for range width - 1 {
			fmt.Fprintf(&b, ", *l%d", i-1)
		}
		b.WriteString("]\n")
	}
	fmt.Fprintf(&b, "notes: *l%d\n", levels-1)
	return b.String()
}

func TestAliasBomb(t *testing.T) {
	// 9 levels of 9: 9^9 ≈ 387 million leaves if expanded. With 200 000
	// nodes allowed, the first list over budget is l5 (9^6 leaves), on
	// line 7, column 5 (its anchor).
	_, err := Parse("bomb.yaml", []byte(billionLaughs(9, 9)))
	es, _ := err.(Errors)
	if assert.Len(t, es, 1, "want one error at bomb.yaml:7:5 about aliases that multiply; got %v", err) {
		assert.Equal(t, "bomb.yaml:7:5", es[0].Pos.String(), "position of the alias bomb")
		assert.Contains(t, es[0].Msg, "expands to too many values")
	}
	// Modest, honest reuse of anchors stays allowed.
	ok := printOut + "palette:\n  paper: &p '#fffff0'\ndek: *p\n"
	_, err = Parse("ok.yaml", []byte(ok))
	assert.NoError(t, err, "plain alias rejected")
}

func BenchmarkAliasBomb(b *testing.B) {
	text := []byte(billionLaughs(9, 9))
	for b.Loop() {
		_, err := Parse("bomb.yaml", text)
		require.Error(b, err, "alias bomb accepted")
	}
}

func TestParseValid(t *testing.T) {
	text := "\ufeff" + head + `terms:
  list: [telegraph, boiler]
  exclude: steam
outputs:
  print:
    kind: print
    trim: Letter landscape
    bleed: 0.125in
    margins: {top: 1in, bottom: 0.75in, inside: 1in, outside: 0.5in}
    columns: 4
  web:
    kind: screen
    trim: 1200px x 1600px
`
	s, err := Parse("dir/ok.yaml", []byte(text))
	require.NoError(t, err)
	assert.Equal(t, "T", s.Title, "title")
	assert.Equal(t, Span{1900, 1950}, s.Years, "years")
	assert.Equal(t, 51, s.Years.Len(), "years 1900–1950, both ends counted")
	assert.Equal(t, []string{"telegraph", "boiler"}, s.Terms.List, "terms.list")
	assert.Len(t, s.Terms.Exclude, 1, "terms.exclude")
	p := s.Output("print")
	require.NotNil(t, p, "print output")
	// Letter landscape is 792 × 612 pt (ANSI 8.5 × 11 in, print-facts.md);
	// 1/8 in bleed is 9 pt (ISO 32000-1 §8.3.2.3: 72 pt per inch).
	require.Equal(t, Size{792, 612}, p.Trim, "print trim, Letter landscape")
	require.Equal(t, Length(9), p.Bleed, "print bleed, 1/8 in")
	require.Equal(t, 4, p.Columns, "print columns")
	assert.Equal(t, Margins{72, 54, 72, 36}, p.Margins, "margins 1in, 0.75in, 1in, 0.5in in pt")
	w := s.Output("web")
	require.NotNil(t, w, "web output")
	// 1200 × 1600 px = 900 × 1200 pt (CSS Values L3: 96 px per inch).
	assert.Equal(t, Size{900, 1200}, w.Trim, "web trim, 1200 × 1600 px")
	assert.Equal(t, FlowPages, w.Flow, "web flow")
	assert.Zero(t, w.Bleed, "web bleed")
	assert.False(t, w.Marks, "web crop marks")
	assert.Equal(t, OrderListed, s.Order, "default order")
	assert.Equal(t, ScaleShare, s.Scale.Mode, "default scale mode")
	assert.Equal(t, YOwn, s.Scale.YRange, "default y range")
	assert.Equal(t, "dir/ok.yaml:11:5", s.Where("outputs.print.bleed").String(), "Where(outputs.print.bleed)")
	assert.Equal(t, "dir/ok.yaml:5:21", s.Where("terms.list.1").String(), "Where(terms.list.1)")
	assert.Equal(t, "dir/ok.yaml:8:3", s.Where("outputs.print.no-such").String(), "Where falls back to the parent")
	assert.Equal(t, filepath.Join("dir", "c.csv"), s.Resolve("c.csv"), "Resolve")
}

// TestKeyEvery checks the distance the colour key repeats at down a
// scrolling screen page: 1600 px by default (this project's choice,
// README "Outputs"), 0 for the top only, and 0 wherever the flow does not
// scroll. Lengths convert at 96 px per inch and 72 pt per inch (CSS Values
// and Units Level 3, absolute lengths).
func TestKeyEvery(t *testing.T) {
	for _, c := range []struct {
		name, keys string
		want       Length
	}{
		{"scroll default", "trim: 1200px", 1200},
		{"scroll-groups default", "trim: 1200px\n    flow: scroll-groups", 1200},
		{"pages: none", "trim: 1200px x 1600px", 0},
		{"in px", "trim: 1200px\n    key-every: 2400px", 1800},
		{"in other units", "key-every: 10in", 720},
		{"bare 0: top only", "key-every: 0", 0},
		{"0 with a unit", "key-every: 0px", 0},
		{"scroll over a height", "trim: 1200px x 1600px\n    flow: scroll\n    key-every: 800px", 600},
	} {
		t.Run(c.name, func(t *testing.T) {
			s, err := Parse("ok.yaml", []byte(head+"outputs:\n  web:\n    kind: screen\n    "+c.keys+"\n"))
			require.NoError(t, err)
			assert.InDelta(t, float64(c.want), float64(s.Output("web").KeyEvery), 1e-9, "key-every in pt")
		})
	}
	assert.Zero(t, DefaultOutput("print", Print).KeyEvery, "print default key-every")
}

// TestFlow checks how a screen output's flow follows from flow and trim
// (this project's own rules, README "Outputs").
func TestFlow(t *testing.T) {
	for _, c := range []struct {
		name, keys string
		want       Flow
	}{
		{"width alone scrolls", "trim: 1200px", FlowScroll},
		{"a height makes pages", "trim: 1200px x 1600px", FlowPages},
		{"scroll over a height", "trim: 1200px x 1600px\n    flow: scroll", FlowScroll},
		{"a page per group", "trim: 1200px\n    flow: scroll-groups", FlowScrollGroups},
		{"a page per group ignores a height", "trim: 1200px x 1600px\n    flow: scroll-groups", FlowScrollGroups},
		{"spreads on pages", "trim: 900px x 700px\n    spreads: true", FlowPages},
	} {
		t.Run(c.name, func(t *testing.T) {
			s, err := Parse("ok.yaml", []byte(head+"outputs:\n  web:\n    kind: screen\n    "+c.keys+"\n"))
			require.NoError(t, err)
			w := s.Output("web")
			assert.Equal(t, c.want, w.Flow, "flow")
			assert.Equal(t, c.want != FlowPages, w.Flow.Scrolls(), "Scrolls() for %q", w.Flow)
		})
	}
}

func TestParseColor(t *testing.T) {
	tests := []struct {
		in     string
		space  ColorSpace
		v      [3]float64
		source string
	}{
		{"#ff8000", SpaceSRGB, [3]float64{1, 128.0 / 255, 0}, "CSS Color 4 §5.2 hex notation"},
		{"#f80", SpaceSRGB, [3]float64{1, 136.0 / 255, 0}, "CSS Color 4 §5.2: #rgb doubles each digit"},
		{"lab(50 20 -30)", SpaceLab, [3]float64{50, 20, -30}, "CSS Color 4 §9.3 lab()"},
		{"oklch(70% 0.1 120deg)", SpaceOKLCh, [3]float64{0.7, 0.1, 120}, "CSS Color 4 §9.4 oklch(), L as a percentage"},
		{"oklch(0.7, 0.1, 120)", SpaceOKLCh, [3]float64{0.7, 0.1, 120}, "commas allowed (this project's leniency)"},
	}
	for _, tt := range tests {
		c, err := ParseColor(tt.in)
		if !assert.NoError(t, err, "ParseColor(%q) [%s]", tt.in, tt.source) {
			continue
		}
		assert.Equal(t, tt.space, c.Space, "ParseColor(%q) space [%s]", tt.in, tt.source)
		for i := range 3 {
			assert.InDelta(t, tt.v[i], c.V[i], 1e-12, "ParseColor(%q) = %v, component %d [%s]", tt.in, c.V, i, tt.source)
		}
	}
	for _, bad := range []string{"#ggg", "red", "lab(-1 0 0)", "oklch(1.2 0.1 0)", "oklch(0.5 -0.1 0)", "rgb(1 2 3)"} {
		_, err := ParseColor(bad)
		assert.Error(t, err, "ParseColor(%q) accepted", bad)
	}
}

func TestLoadFileErrors(t *testing.T) {
	dir := t.TempDir()
	spec := filepath.Join(dir, "s.yaml")
	require.NoError(t, os.WriteFile(spec, []byte("title: [\n"), 0o644))
	tests := []struct {
		path, want string
	}{
		{dir, dir + ": is a directory; give the spec's YAML file"},
		{filepath.Join(dir, "none.yaml"), filepath.Join(dir, "none.yaml") + ": spec file does not exist"},
		{spec, spec + ":1:1: YAML syntax:"},
	}
	for _, tt := range tests {
		_, err := Load(tt.path)
		if assert.Error(t, err, "Load(%s)", tt.path) {
			assert.True(t, strings.HasPrefix(err.Error(), tt.want), "Load(%s) = %q, want %q…", tt.path, err, tt.want)
		}
	}
}

func TestClosest(t *testing.T) {
	names := []string{"telegraph", "telephone", "boiler", "Maßstab", "steam"}
	tests := []struct {
		word string
		want string
	}{
		{"telegraf", "telegraph"},  // two edits (f→p, +h)
		{"Telegraph", "telegraph"}, // case does not count
		{"boyler", "boiler"},
		{"xyzzy", ""}, // too far from everything
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, strings.Join(Closest(tt.word, names, 1), ","), "Closest(%q)", tt.word)
	}
	assert.LessOrEqual(t, len(Closest("tele", names, 3)), 3, "names Closest returns, asked for 3")
}

func TestPosString(t *testing.T) {
	for _, tt := range []struct {
		p    Pos
		want string
	}{
		{Pos{File: "a.yaml", Line: 3, Col: 7}, "a.yaml:3:7"},
		{Pos{File: "a.csv", Line: 3}, "a.csv:3"},
		{Pos{File: "a.yaml"}, "a.yaml"},
	} {
		assert.Equal(t, tt.want, tt.p.String(), "%#v.String()", tt.p)
	}
}

// TestPreflightKeys checks the preflight thresholds: defaults, each key,
// and bad values at their place. The defaults are common practice (5 pt
// type and 0.25 pt rules in print; 10 px type on screen, 1 px = 0.75 pt
// by CSS Values L3); the spike ratio 4 is this project's choice.
// Positions: printOut is six lines, "preflight:" the seventh, keys from 8.
func TestPreflightKeys(t *testing.T) {
	tests := []struct {
		name string
		keys string // lines under "preflight:" (empty: no mapping)
		want Preflight
		err  string // "line:col: message substring"
	}{
		{"defaults", "", Preflight{SpikeRatio: 4, MinType: 5, MinScreenType: 7.5, MinLine: 0.25}, ""},
		{"all keys", "  spike-ratio: 6\n  min-type: 2mm\n  min-screen-type: 12px\n  min-line: 0.5pt\n  strict: true\n",
			// 2 mm = 2 × 72 / 25.4 pt; 12 px = 9 pt.
			Preflight{SpikeRatio: 6, MinType: Length(2 * 72 / 25.4), MinScreenType: 9, MinLine: 0.5, Strict: true}, ""},
		{"zero turns a check off", "  min-line: 0pt\n", Preflight{SpikeRatio: 4, MinType: 5, MinScreenType: 7.5}, ""},
		{"ratio at most 1", "  spike-ratio: 1\n", Preflight{}, "8:16: preflight.spike-ratio must be greater than 1"},
		{"type without unit", "  min-type: 5\n", Preflight{}, `8:13: preflight.min-type: "5" has no unit`},
		{"unknown key", "  min-lines: 1pt\n", Preflight{}, `8:3: unknown key "min-lines" in preflight; did you mean "min-line"?`},
		{"strict not bool", "  strict: maybe\n", Preflight{}, `8:11: preflight.strict must be true or false`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			text := printOut
			if tt.keys != "" {
				text += "preflight:\n" + tt.keys
			}
			s, err := Parse("p.yaml", []byte(text))
			if tt.err != "" {
				require.ErrorContains(t, err, "p.yaml:"+tt.err)
				return
			}
			require.NoError(t, err)
			g := s.Preflight
			assert.InDelta(t, float64(tt.want.MinType), float64(g.MinType), 1e-9, "min-type in pt")
			assert.Equal(t, tt.want.SpikeRatio, g.SpikeRatio, "spike-ratio")
			assert.Equal(t, tt.want.MinScreenType, g.MinScreenType, "min-screen-type in pt")
			assert.Equal(t, tt.want.MinLine, g.MinLine, "min-line in pt")
			assert.Equal(t, tt.want.Strict, g.Strict, "strict")
		})
	}
}
