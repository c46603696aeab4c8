package layout

import (
	"bufio"
	"bytes"
	"encoding/json"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

func TestColumnWidthWorkedExample(t *testing.T) {
	// Worked arithmetic (common practice, no source): A4 with 20 mm side
	// margins, 6 columns and 4 mm gutters gives (210 − 40 − 5×4)/6 = 25 mm.
	p := solveT(t, testSpec(), a4Print(), []Group{{Count: 50}})
	assert.InDelta(t, 25, toMM(p.PanelW), 1e-9, "column width in mm")
	for _, pg := range p.Pages {
		for _, pn := range pg.Panels {
			require.InDelta(t, 25, toMM(pn.Plot.W()), 1e-9, "page %d item %d: plot width in mm", pg.Number, pn.Item)
		}
	}
}

// readTable reads the rows of the markdown table under heading in
// testdata/print-facts.md.
func readTable(t *testing.T, heading string) [][]string {
	t.Helper()
	b, err := os.ReadFile("testdata/print-facts.md")
	require.NoError(t, err)
	var rows [][]string
	in := false
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		l := sc.Text()
		if strings.HasPrefix(l, "## ") {
			in = strings.HasPrefix(l, "## "+heading)
			continue
		}
		if !in || !strings.HasPrefix(l, "|") || strings.HasPrefix(l, "|---") {
			continue
		}
		var cells []string
		for _, c := range strings.Split(strings.Trim(l, "|"), "|") {
			cells = append(cells, strings.TrimSpace(c))
		}
		rows = append(rows, cells)
	}
	require.GreaterOrEqual(t, len(rows), 2, "no table under %q (a header row and at least one row)", heading)
	return rows[1:] // drop the header row
}

func pair(t *testing.T, s string) (float64, float64) {
	t.Helper()
	a, b, ok := strings.Cut(s, " × ")
	x, err1 := strconv.ParseFloat(a, 64)
	y, err2 := strconv.ParseFloat(b, 64)
	require.True(t, ok, "bad pair %q: no ' × '", s)
	require.NoError(t, err1, "bad pair %q", s)
	require.NoError(t, err2, "bad pair %q", s)
	return x, y
}

func TestPageBoxesFromReference(t *testing.T) {
	// ISO 216 and ANSI sizes and the bleed boxes computed from them, from
	// testdata/print-facts.md (copied from the project's reference notes);
	// boxes nest Trim ⊆ Bleed ⊆ Media per ISO 32000-1 §14.11.2.
	sizes := map[string][2]float64{}
	for _, r := range readTable(t, "Paper sizes") {
		wmm, hmm := pair(t, r[1])
		wpt, hpt := pair(t, r[2])
		sizes[r[0]] = [2]float64{wmm, hmm}
		out := a4Print()
		out.Trim = specs.Size{W: mmL(wmm), H: mmL(hmm)}
		out.Columns = 3
		p := solveT(t, testSpec(), out, []Group{{Count: 5}})
		tr := p.Pages[0].Trim
		assert.InDelta(t, wpt, tr.W(), 0.0005, "%s (%s, %s): trim width in pt, want %s", r[0], r[1], r[3], r[2])
		assert.InDelta(t, hpt, tr.H(), 0.0005, "%s (%s, %s): trim height in pt, want %s", r[0], r[1], r[3], r[2])
	}
	for _, r := range readTable(t, "Bleed boxes") {
		require.Contains(t, sizes, r[0], "bleed box of an unknown size")
		size := sizes[r[0]]
		bleed, _ := strconv.ParseFloat(r[1], 64)
		wantW, wantH := pair(t, r[2])
		out := a4Print()
		out.Trim = specs.Size{W: mmL(size[0]), H: mmL(size[1])}
		out.Bleed = mmL(bleed)
		p := solveT(t, testSpec(), out, []Group{{Count: 5}})
		pg := p.Pages[0]
		assert.InDelta(t, wantW, pg.Bleed.W(), 0.0005, "%s + %s mm bleed: bleed box width in pt, want %s", r[0], r[1], r[2])
		assert.InDelta(t, wantH, pg.Bleed.H(), 0.0005, "%s + %s mm bleed: bleed box height in pt, want %s", r[0], r[1], r[2])
		slug := out.Slug.Pt()
		assert.InDelta(t, wantW+2*slug, pg.Media.W(), 0.0005, "%s: media %v, want bleed box + %.3f pt slug each side", r[0], pg.Media, slug)
		assert.Zero(t, pg.Media.X0, "%s: media %v starts at the origin", r[0], pg.Media)
		assert.Zero(t, pg.Media.Y0, "%s: media %v starts at the origin", r[0], pg.Media)
		assert.True(t, pg.Media.Contains(pg.Bleed), "%s: bleed %v not inside media %v", r[0], pg.Bleed, pg.Media)
		assert.True(t, pg.Bleed.Contains(pg.Trim), "%s: trim %v not inside bleed %v", r[0], pg.Trim, pg.Bleed)
		assert.True(t, pg.Trim.Contains(pg.Live), "%s: live %v not inside trim %v", r[0], pg.Live, pg.Trim)
	}
}

func TestScreenUnits(t *testing.T) {
	// CSS Values and Units Level 3: 1 px = 0.75 pt. A 1200 px screen sheet
	// is 900 pt wide, with no bleed and no slug (media = bleed = trim).
	p := solveT(t, testSpec(), webScroll(), []Group{{Count: 40}})
	pg := p.Pages[0]
	assert.Equal(t, 900.0, pg.Trim.W(), "screen trim width in pt (1200 px)")
	assert.Equal(t, pg.Trim, pg.Media, "screen media = trim")
	assert.Equal(t, pg.Trim, pg.Bleed, "screen bleed = trim")
	// min-panel-width 160 px in 1136 px live with 16 px gutters: 6 columns
	// (6×160 + 5×16 = 1040 ≤ 1136 < 7×160 + 6×16 = 1216).
	assert.Equal(t, 6, p.Columns, "derived columns")
	assert.Len(t, p.Pages, 1, "scroll output pages")
	// The sheet is exactly as tall as its content plus margins.
	last := pg.Panels[len(pg.Panels)-1]
	assert.InDelta(t, pg.Grid.Y0, last.Ticks.Y0, 1e-6, "bottom of the last panel's ticks vs the grid's bottom (pt)")
	got := p.Summary()
	assert.True(t, strings.HasPrefix(got, "web: 1 scrolling page 1200 × "), "summary %q", got)
	assert.Contains(t, got, "6 × 7 panels", "summary")
}

func TestFacingPagesMirror(t *testing.T) {
	out := a4Print()
	out.Margins.Inside, out.Margins.Outside = mmL(25), mmL(15)
	p := solveT(t, testSpec(), out, []Group{{Count: 200}})
	require.GreaterOrEqual(t, len(p.Pages), 3, "pages")
	r, l := p.Pages[2], p.Pages[1] // page 3 right, page 2 left
	require.True(t, r.Right, "page 3 is right-hand")
	require.False(t, l.Right, "page 2 is left-hand")
	// On a right-hand page the inside margin is on the left (common practice).
	assert.InDelta(t, 25, toMM(r.Live.X0-r.Trim.X0), 1e-9, "right page left margin in mm, want the 25 mm inside margin")
	assert.InDelta(t, 15, toMM(l.Live.X0-l.Trim.X0), 1e-9, "left page left margin in mm, want the 15 mm outside margin")
	// Exact mirror: column c of the left page is the reflection of column
	// n−1−c of the right page about the trim's centre line.
	mid := (r.Trim.X0 + r.Trim.X1) / 2
	cols := map[int]Rect{}
	for _, pn := range r.Panels {
		cols[pn.Col] = pn.Plot
	}
	for _, pn := range l.Panels {
		m := cols[p.Columns-1-pn.Col]
		require.InDelta(t, 2*mid-m.X1, pn.Plot.X0, 1e-9, "left col %d %v does not mirror right col %d %v", pn.Col, pn.Plot, p.Columns-1-pn.Col, m)
		require.InDelta(t, 2*mid-m.X0, pn.Plot.X1, 1e-9, "left col %d %v does not mirror right col %d %v", pn.Col, pn.Plot, p.Columns-1-pn.Col, m)
	}
	// The folio sits on the outside: right on right pages, left on left.
	folio := func(pg Page) TextLine {
		for _, tl := range pg.Text {
			if tl.Role == RoleFolio {
				return tl
			}
		}
		require.Failf(t, "no folio", "page %d has no folio", pg.Number)
		return TextLine{}
	}
	fr := folio(r)
	assert.InDelta(t, r.Live.X1, fr.X+fr.Width, 1e-9, "right page folio %+v ends at the live area's outside edge", fr)
	assert.Equal(t, "3", fr.Text, "right page folio")
	fl := folio(l)
	assert.Equal(t, l.Live.X0, fl.X, "left page folio %+v starts at the live area's outside edge", fl)
	assert.Equal(t, "2", fl.Text, "left page folio")

	out.FirstPageLeft = true
	p = solveT(t, testSpec(), out, []Group{{Count: 200}})
	assert.False(t, p.Pages[0].Right, "first-page-left: page 1 is left-hand")
	assert.True(t, p.Pages[1].Right, "first-page-left: page 2 is right-hand")
}

func TestBalance(t *testing.T) {
	out := a4Print()
	groups := []Group{{Count: 6 * 23}} // 23 rows
	free := solveT(t, testSpec(), out, groups)
	rowsOf := func(p *Plan) []int {
		var r []int
		for _, pg := range p.Pages {
			n := 0
			if len(pg.Panels) > 0 {
				n = pg.Panels[len(pg.Panels)-1].Row + 1
			}
			r = append(r, n)
		}
		return r
	}
	f := rowsOf(free)
	out.Balance = true
	bal := rowsOf(solveT(t, testSpec(), out, groups))
	require.Len(t, bal, len(f), "balancing changed the page count: %v → %v", f, bal)
	require.Less(t, f[len(f)-1], f[len(f)-2]-1, "test needs a short last page, got %v", f)
	lo, hi := bal[1], bal[1]
	for _, r := range bal[1:] {
		lo, hi = min(lo, r), max(hi, r)
	}
	assert.LessOrEqual(t, hi-lo, 1, "balanced rows %v (unbalanced %v): later pages differ by more than a row", bal, f)
	assert.True(t, bal[0] >= lo-1 || bal[0] == free.RowsFirstPage, "balanced rows %v (unbalanced %v): first page short", bal, f)
	sum := 0
	for _, r := range bal {
		sum += r
	}
	assert.Equal(t, 23, sum, "balanced rows %v: sum", bal)
}

func TestGroupsAndContinuedHeadings(t *testing.T) {
	out := a4Print()
	p := solveT(t, testSpec(), out, []Group{{"1800s", 13}, {"1850s", 40}, {"1900s", 200}})
	var heads []string
	for _, pg := range p.Pages {
		for _, h := range pg.Headings {
			heads = append(heads, strconv.Itoa(pg.Number)+":"+h.Text)
		}
	}
	// 1850s (7 rows) does not fit under 1800s (3 rows) on page 1, but
	// moving it would leave page 1 more than half empty: it starts there
	// and continues on page 2. 200 panels in 6 columns is 34 rows, more
	// than a page holds: it continues with a "(continued)" heading on
	// every later page.
	want := []string{"1:1800s", "1:1850s", "2:1850s (continued)", "2:1900s"}
	for i := 3; i <= len(p.Pages); i++ {
		want = append(want, strconv.Itoa(i)+":1900s (continued)")
	}
	assert.GreaterOrEqual(t, len(p.Pages), 4, "pages")
	assert.Equal(t, want, heads, "page:heading")
}

func TestTicksBottomRowUnderEachColumn(t *testing.T) {
	out := a4Print()
	// 10 panels in 6 columns: row 2 has 4 panels, so columns 5 and 6 of
	// row 1 are the bottom of their columns and carry tick labels too.
	p := solveT(t, testSpec(), out, []Group{{Count: 10}})
	var shown []int
	for _, pn := range p.Pages[0].Panels {
		if pn.ShowTicks {
			shown = append(shown, pn.Item)
			assert.Equal(t, pn.Plot.Y0, pn.Ticks.Y1, "item %d ticks %v right under plot %v", pn.Item, pn.Ticks, pn.Plot)
			assert.Positive(t, pn.Ticks.H(), "item %d ticks %v height", pn.Item, pn.Ticks)
		}
	}
	assert.Equal(t, "4 5 6 7 8 9", strconvInts(shown), "items with tick labels")
	out.Ticks = specs.TicksEveryPanel
	p = solveT(t, testSpec(), out, []Group{{Count: 10}})
	for _, pn := range p.Pages[0].Panels {
		assert.True(t, pn.ShowTicks, "every-panel: item %d has no ticks", pn.Item)
	}
}

func strconvInts(v []int) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.Itoa(x)
	}
	return strings.Join(s, " ")
}

func TestSlackSpreadAndGrow(t *testing.T) {
	out := a4Print()
	groups := []Group{{Count: 150}}
	spread := solveT(t, testSpec(), out, groups)
	out.Slack = specs.SlackGrow
	grow := solveT(t, testSpec(), out, groups)
	assert.Greater(t, grow.PlotH, spread.PlotH, "plot height (pt): grow's above spread's")
	for _, c := range []struct {
		name string
		p    *Plan
	}{{"spread", spread}, {"grow", grow}} {
		pg := c.p.Pages[1] // a full later page
		low := pg.Panels[len(pg.Panels)-1]
		assert.InDelta(t, pg.Grid.Y0, low.Ticks.Y0, 1e-6, "%s: slack left at the bottom (pt)", c.name)
	}
}

func TestSpreads(t *testing.T) {
	out := webScroll()
	out.Flow = specs.FlowPages
	out.Trim.H = pxL(900)
	out.Spreads = true
	p := solveT(t, testSpec(), out, []Group{{Count: 200}})
	sp := p.Spreads()
	w := p.Pages[0].Media.W()
	var seen []int
	for i, s := range sp {
		for _, sp := range s.Pages {
			seen = append(seen, sp.Page)
		}
		switch {
		case i == 0:
			assert.Len(t, s.Pages, 1, "first spread %+v: page 1 is right-hand and stands alone", s)
			assert.Equal(t, w, s.Sheet.W(), "first spread %+v: one page wide", s)
		case len(s.Pages) == 2:
			a, b := p.Pages[s.Pages[0].Page], p.Pages[s.Pages[1].Page]
			assert.False(t, a.Right, "spread %d %+v: first page left-hand", i, s)
			assert.True(t, b.Right, "spread %d %+v: second page right-hand", i, s)
			assert.Equal(t, w, s.Pages[1].Offset.X, "spread %d %+v: second page's offset", i, s)
			assert.Equal(t, 2*w, s.Sheet.W(), "spread %d %+v: sheet width", i, s)
		case i != len(sp)-1:
			assert.Fail(t, "lone page inside the run", "%+v", s)
		}
	}
	all := make([]int, len(p.Pages))
	for i := range all {
		all[i] = i
	}
	require.Equal(t, all, seen, "pages the spreads cover, in order")
}

func TestRectJSON(t *testing.T) {
	b, err := json.Marshal(Rect{0.00049, -0.0004, 612.2834645669, 858.8976377952})
	require.NoError(t, err)
	assert.Equal(t, "[0,0,612.283,858.898]", string(b), "rect JSON")
	var r Rect
	assert.NoError(t, json.Unmarshal(b, &r), "round trip")
	assert.Equal(t, Rect{0, 0, 612.283, 858.898}, r, "round trip")
}

func TestPlanJSONAndDeterminism(t *testing.T) {
	groups := []Group{{"1800s", 13}, {"1850s", 40}}
	a, _ := json.Marshal(solveT(t, testSpec(), a4Print(), groups))
	b, _ := json.Marshal(solveT(t, testSpec(), a4Print(), groups))
	require.True(t, bytes.Equal(a, b), "two solves of the same input differ")
	var back struct {
		Pages []struct {
			Trim   Rect
			Panels []struct{ Label, Plot Rect }
		}
	}
	require.NoError(t, json.Unmarshal(a, &back))
	require.NotEmpty(t, back.Pages, "JSON lacks pages: %.300s", a)
	assert.GreaterOrEqual(t, back.Pages[0].Trim.W(), 595.0, "JSON lacks the trim box: %.300s", a)
	require.NotEmpty(t, back.Pages[0].Panels, "JSON lacks panels: %.300s", a)
	assert.Positive(t, back.Pages[0].Panels[0].Plot.W(), "JSON lacks the plot box: %.300s", a)
}

func TestSummary(t *testing.T) {
	p := solveT(t, testSpec(), a4Print(), []Group{{Count: 150}})
	want := "print: " + strconv.Itoa(len(p.Pages)) + " pages, 6 × " + strconv.Itoa(p.RowsPerPage) + " panels a page, panel 25 × "
	got := p.Summary()
	assert.True(t, strings.HasPrefix(got, want), "summary %q, want prefix %q", got, want)
	assert.True(t, strings.HasSuffix(got, " mm"), "summary %q, want suffix \" mm\"", got)
}

func TestWarnings(t *testing.T) {
	out := a4Print()
	out.Bleed = 0
	out.Line = 0.1
	out.Type.Ticks = 4
	p := solveT(t, testSpec(), out, []Group{{Count: 10}})
	var msgs []string
	for _, w := range p.Warnings {
		msgs = append(msgs, w.String())
	}
	all := strings.Join(msgs, "\n")
	for _, want := range []string{"no bleed", "hairlines", "ticks type at 4 pt"} {
		assert.Contains(t, all, want, "warnings")
	}
	clean := solveT(t, testSpec(), a4Print(), []Group{{Count: 10}})
	assert.Empty(t, clean.Warnings, "clean output warned")
}

func TestBadInputIsAnError(t *testing.T) {
	fs := fontSet(t)
	spec := testSpec()
	mod := func(f func(*specs.Output)) *specs.Output { o := a4Print(); f(&o); return &o }
	cases := []struct {
		name   string
		out    *specs.Output
		groups []Group
		want   string
	}{
		{"no trim", mod(func(o *specs.Output) { o.Trim = specs.Size{} }), nil, "is not a page size"},
		{"unknown kind", mod(func(o *specs.Output) { o.Kind = "poster" }), nil, "kind \"poster\""},
		{"no label size", mod(func(o *specs.Output) { o.Type.Label = 0 }), nil, "type size label"},
		{"negative gutter", mod(func(o *specs.Output) { o.Gutter = -1 }), nil, "gutter must be"},
		{"NaN aspect", mod(func(o *specs.Output) { o.PanelAspect = math.NaN() }), nil, "panel.aspect must be"},
		{"no columns", mod(func(o *specs.Output) { o.Columns = 0 }), nil, "set columns or min-panel-width"},
		{"no height", mod(func(o *specs.Output) { o.PanelAspect = 0 }), nil, "set panel.aspect or panel.height"},
		{"negative count", a4Print2(), []Group{{"x", -3}}, "has -3 panels"},
	}
	for _, tc := range cases {
		_, err := Solve(spec, tc.out, fs, tc.groups)
		if !assert.ErrorContains(t, err, tc.want, tc.name) {
			continue
		}
		if tc.name != "negative count" {
			assert.True(t, strings.HasPrefix(err.Error(), "feature.yaml"), "%s: error %q does not start with the spec file", tc.name, err)
		}
	}
	_, err := Solve(nil, nil, nil, nil)
	assert.Error(t, err, "nil input accepted")
}

func a4Print2() *specs.Output { o := a4Print(); return &o }

func TestInfeasible(t *testing.T) {
	fs := fontSet(t)
	spec := testSpec()
	narrow := func() specs.Output {
		// 130 mm live area (170 mm trim, 20 mm margins), a 20 mm floor.
		o := a4Print()
		o.Trim.W = mmL(170)
		o.FloorWidth = mmL(20)
		o.Gutter = mmL(5.6)
		return o
	}
	cases := []struct {
		name       string
		out        func() specs.Output
		constraint string
		want       []string
	}{
		{"too many columns", narrow, "panel width",
			// 6 × 20 + 5 × 5.6 = 148 mm > 130 mm; 5 columns: 5 × 20 + 4 ×
			// 5.6 = 122.4 mm fit; gutter (130 − 120)/5 = 2 mm.
			[]string{"6 columns of panels at least 20 mm wide", "need 148 mm; the live area is 130 mm", "use 5 columns or a 2 mm gutter"}},
		{"min panel width wider than live", func() specs.Output {
			o := narrow()
			o.Columns, o.MinPanelWidth = 0, mmL(140)
			return o
		}, "panel width", []string{"panels at least 140 mm wide", "minimum panel width of 130 mm"}},
		{"flat plots", func() specs.Output {
			o := a4Print()
			o.PanelAspect = 4 // 25 mm / 4 = 6.25 mm < 3 × 7 pt = 7.41 mm
			return o
		}, "plot height", []string{"plots 6.3 mm tall", "legibility floor is 7.4 mm (3 × the 7 pt label size)", "panel aspect of 3.37", "5 columns"}},
		{"short panel height", func() specs.Output {
			o := a4Print()
			o.PanelAspect, o.PanelHeight = 0, mmL(8)
			return o
		}, "plot height", []string{"panels 8 mm tall", "panel height of 10.5 mm"}},
		{"tall panels", func() specs.Output {
			o := a4Print()
			o.PanelAspect = 0.08
			return o
		}, "page height", []string{"a row of panels needs", "first page has"}},
		{"fixed tall panels", func() specs.Output {
			o := a4Print()
			o.PanelAspect, o.PanelHeight = 0, mmL(300)
			return o
		}, "page height", []string{"panel height of"}},
		{"slug too small", func() specs.Output {
			o := a4Print()
			o.Slug = mmL(2)
			return o
		}, "slug", []string{"crop marks and the slug line need a slug of 7 mm", "use a 7 mm slug"}}, // CropMarks: 1 mm gap + 6 mm mark outside a 3 mm bleed
		{"margins eat the page", func() specs.Output {
			o := a4Print()
			o.Margins.Inside, o.Margins.Outside = mmL(110), mmL(110)
			return o
		}, "live area", []string{"leave no live area"}},
	}
	for _, tc := range cases {
		out := tc.out()
		_, err := Solve(spec, &out, fs, []Group{{"A", 30}, {"B", 30}})
		var inf *InfeasibleError
		if !assert.ErrorAs(t, err, &inf, tc.name) {
			continue
		}
		msg := err.Error()
		t.Log(msg)
		assert.Equal(t, tc.constraint, inf.Constraint, "%s: constraint", tc.name)
		assert.True(t, strings.HasPrefix(msg, `feature.yaml: output "print": `), "%s: message %q does not start with the spec file and output", tc.name, msg)
		for _, w := range tc.want {
			assert.Contains(t, msg, w, tc.name)
		}
		assert.NotEmpty(t, inf.Remedies, "%s: remedies", tc.name)
		assert.Greater(t, inf.Need, inf.Have, "%s: need vs have", tc.name)
		// Every suggestion, applied, is feasible.
		for _, r := range inf.Remedies {
			fixed := tc.out()
			require.NoError(t, r.Apply(&fixed), "%s: applying remedy %q", tc.name, r.Text)
			_, err := Solve(spec, &fixed, fs, []Group{{"A", 30}, {"B", 30}})
			assert.NoError(t, err, "%s: remedy %q does not work", tc.name, r.Text)
		}
	}
}

func TestNoPanels(t *testing.T) {
	for _, groups := range [][]Group{nil, {{"empty", 0}}} {
		p := solveT(t, testSpec(), a4Print(), groups)
		if assert.Len(t, p.Pages, 1, "groups %v: pages", groups) {
			assert.Empty(t, p.Pages[0].Panels, "groups %v: panels", groups)
			assert.Empty(t, p.Pages[0].Headings, "groups %v: headings", groups)
		}
	}
}

func TestErrorPositionFromParsedSpec(t *testing.T) {
	// The spec's own parser supplies positions: the error points at the
	// line of the key that asked for too much.
	text := `title: T
data: {counts: c.csv, totals: t.csv}
years: {from: 1900, to: 1950}
outputs:
  print:
    kind: print
    columns: 14
`
	spec, err := specs.Parse("dir/feature.yaml", []byte(text))
	require.NoError(t, err)
	_, err = Solve(spec, spec.Output("print"), fontSet(t), []Group{{Count: 30}})
	var inf *InfeasibleError
	require.ErrorAs(t, err, &inf)
	require.Equal(t, "dir/feature.yaml:7:5", inf.Pos.String(), "error position")
	require.True(t, strings.HasPrefix(err.Error(), `dir/feature.yaml:7:5: output "print": 14 columns`), "error %q", err)
	// The parser's default outputs lay out as they are.
	for _, k := range []specs.Kind{specs.Print, specs.Screen} {
		out := specs.DefaultOutput("x", k)
		_, err := Solve(spec, &out, fontSet(t), []Group{{Count: 100}})
		assert.NoError(t, err, "default %s output", k)
	}
}

// TestShortPageKeepsFullPitch: a page that ends early (a group break, or
// the last page) sets its rows at the pitch of a full page instead of
// pushing them to the top and bottom of the page (common practice: rows
// that line up from page to page read as one grid).
func TestShortPageKeepsFullPitch(t *testing.T) {
	out := a4Print()
	full := solveT(t, testSpec(), out, []Group{{Count: 150}})
	cols := full.Columns
	rowsPerPage := full.RowsPerPage
	pitch := func(pg Page) float64 { // distance between the tops of rows 0 and 1
		var y0, y1 float64
		for _, pn := range pg.Panels {
			switch pn.Row {
			case 0:
				y0 = pn.Label.Y1
			case 1:
				y1 = pn.Label.Y1
			}
		}
		return y0 - y1
	}
	// A first page has its own height (the header), so its own pitch.
	want := []float64{pitch(full.Pages[0]), pitch(full.Pages[1])}
	// Page 2 gets two rows of a group; the next group starts on page 3.
	first := full.RowsFirstPage * cols
	plan := solveT(t, testSpec(), out, []Group{{Heading: "A", Count: first - cols}, {Heading: "B", Count: 2 * cols}, {Heading: "C", Count: rowsPerPage * cols}})
	for _, pg := range plan.Pages {
		rows := map[int]bool{}
		for _, pn := range pg.Panels {
			rows[pn.Row] = true
		}
		if len(rows) < 2 {
			continue
		}
		w := want[min(pg.Number-1, 1)]
		assert.LessOrEqual(t, pitch(pg), w+1e-6, "page %d (%d rows): row pitch in pt, a full page's is %.3f pt", pg.Number, len(rows), w)
	}
}

// TestScrollGroups: with flow scroll-groups each group with panels gets a
// page of its own, as tall as its content. The expected heights are summed
// by hand from this project's rules (bands a blank label line apart, the
// key strip 1.6 × the key size over a line of years, rows a row gap
// apart, one heading and one tick area per group), using the line boxes
// the plan reports for the text bands.
func TestScrollGroups(t *testing.T) {
	out := webScroll()
	out.Flow = specs.FlowScrollGroups
	out.Columns = 6
	groups := []Group{{"1880s", 13}, {"1890s", 0}, {"1900s", 30}, {"1910s", 1}}
	p := solveT(t, testSpec(), out, groups)

	lead := out.Type.Leading
	gap := out.Type.Label.Pt() * lead
	key := 1.6*out.Type.Key.Pt() + out.Type.Key.Pt()*lead
	rowH := p.LabelH + p.PlotH + p.TicksH // ticks on every panel: each row carries them
	hh := out.Type.Heading.Pt() * lead
	for _, c := range []struct {
		page, group, rows int
		header            []TextRole // bands above the key
		footer            []TextRole // bands at the bottom
	}{
		{0, 0, 3, []TextRole{RoleTitle, RoleDek}, []TextRole{RoleSource, RoleNote}}, // 13 panels in 6 columns: 3 rows
		{1, 2, 5, []TextRole{RoleRunning}, []TextRole{RoleSource}},                  // 30: 5 rows; 1890s has none, no page
		{2, 3, 1, []TextRole{RoleRunning}, []TextRole{RoleSource}},
	} {
		require.Less(t, c.page, len(p.Pages), "%d pages, want 3 (one per group with panels)", len(p.Pages))
		pg := p.Pages[c.page]
		band := func(roles []TextRole) float64 {
			h := 0.0
			for _, tl := range pg.Text {
				for _, r := range roles {
					if tl.Role == r {
						h += tl.Box.H()
					}
				}
			}
			return h
		}
		grid := float64(c.rows)*rowH + float64(c.rows-1)*p.RowGap + hh
		want := out.Margins.Top.Pt() + band(c.header) + gap + key + gap + grid + gap + band(c.footer) + out.Margins.Bottom.Pt()
		assert.InDelta(t, want, pg.Trim.H(), 1e-6, "page %d height in pt", c.page+1)
		assert.Equal(t, 900.0, pg.Trim.W(), "page %d width in pt (1200 px)", c.page+1)
		if assert.Len(t, pg.Headings, 1, "page %d headings %+v, want group %d's", c.page+1, pg.Headings, c.group) {
			assert.Equal(t, c.group, pg.Headings[0].Group, "page %d heading's group", c.page+1)
			assert.False(t, pg.Headings[0].Continued, "page %d heading is not a continuation", c.page+1)
		}
		for _, pn := range pg.Panels {
			require.Equal(t, c.group, pn.Group, "page %d item %d: group", c.page+1, pn.Item)
		}
	}
	assert.Len(t, p.Pages, 3, "pages")
	got := p.Summary()
	assert.True(t, strings.HasPrefix(got, "web: 3 scrolling pages, one a group, 1200 × "), "summary %q", got)

	// Ungrouped, a page per group is one scrolling page: the same as scroll.
	one := []Group{{Count: 40}}
	a := solveT(t, testSpec(), out, one)
	out.Flow = specs.FlowScroll
	b := solveT(t, testSpec(), out, one)
	ja, _ := json.Marshal(a.Pages)
	jb, _ := json.Marshal(b.Pages)
	assert.True(t, bytes.Equal(ja, jb), "scroll-groups with one group differs from scroll")
}

// TestKeyRepeats: down a scrolling page the colour key repeats before the
// first row whose top is more than key-every below the previous key's
// top. With one group and ticks on every panel the rows are evenly
// pitched, so the counts follow by hand: a key's top is kb (band and gap)
// above the first row after it, and row j after it is kb + j × pitch
// below, so a key is followed by j* = ⌊(E − kb) ÷ pitch⌋ + 1 rows (at
// least one) and R rows need ⌈R ÷ j*⌉ − 1 repeats; each adds kb to the
// page's height (this project's rules, README "Outputs").
func TestKeyRepeats(t *testing.T) {
	base := webScroll()
	base.Columns = 6
	const items = 6 * 40 // 40 rows
	lead := base.Type.Leading
	keyH := 1.6*base.Type.Key.Pt() + base.Type.Key.Pt()*lead
	kb := keyH + base.Type.Label.Pt()*lead
	top := solveT(t, testSpec(), base, []Group{{Count: items}})
	pitch := top.LabelH + top.PlotH + top.TicksH + top.RowGap
	h0 := top.Pages[0].Trim.H()
	for _, c := range []struct {
		name  string
		every specs.Length
		flow  specs.Flow
		want  int // repeats; -1: from the formula
	}{
		{"0: top only", 0, specs.FlowScroll, 0},
		{"longer than the page", pxL(100000), specs.FlowScroll, 0},
		{"1600px", pxL(1600), specs.FlowScroll, -1},
		{"800px", pxL(800), specs.FlowScroll, -1},
		{"3 rows' room", specs.Length(kb + 3*pitch - 0.5), specs.FlowScroll, -1},
		{"before every row", pxL(10), specs.FlowScroll, 39},
		{"scroll-groups, one group", pxL(1600), specs.FlowScrollGroups, -1},
		{"pages: never", pxL(800), specs.FlowPages, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			out := base
			out.KeyEvery, out.Flow = c.every, c.flow
			if c.flow == specs.FlowPages {
				out.Trim.H = pxL(1600)
			}
			p := solveT(t, testSpec(), out, []Group{{Count: items}})
			want := c.want
			if want < 0 {
				per := max(1, int(math.Floor((c.every.Pt()-kb)/pitch))+1)
				want = (40+per-1)/per - 1
			}
			got := 0
			for _, pg := range p.Pages {
				got += len(pg.KeyRepeats)
			}
			require.Equal(t, want, got, "repeated keys")
			if c.flow == specs.FlowPages {
				return
			}
			pg := p.Pages[0]
			assert.InDelta(t, float64(want)*kb, pg.Trim.H()-h0, 1e-6, "page growth in pt, want %d × %.4f", want, kb)
			// Each repeat is the top key moved down: same strip, same
			// columns, the same gap above the next row as under the top key.
			for i, k := range pg.KeyRepeats {
				dy := pg.Key.Y1 - k.Key.Y1
				assert.True(t, near(k.Strip, pg.KeyStrip.Translate(0, -dy)), "repeat %d strip %v is not the top key's %v moved down %.3f pt", i, k.Strip, pg.KeyStrip, dy)
				assert.True(t, near(k.Ticks, pg.KeyTicks.Translate(0, -dy)), "repeat %d ticks %v are not the top key's %v moved down %.3f pt", i, k.Ticks, pg.KeyTicks, dy)
				assert.True(t, near(k.Key, pg.Key.Translate(0, -dy)), "repeat %d key %v is not the top key %v moved down %.3f pt", i, k.Key, pg.Key, dy)
				next := math.Inf(-1)
				for _, pn := range pg.Panels {
					if pn.Label.Y1 < k.Key.Y0 {
						next = max(next, pn.Label.Y1)
					}
				}
				assert.InDelta(t, kb-keyH, k.Key.Y0-next, 1e-6, "repeat %d: gap above the next row in pt", i)
			}
			if c.name == "before every row" {
				assert.NotEmpty(t, p.Warnings, "a key before every row warns")
			} else {
				assert.Empty(t, p.Warnings, "warnings")
			}
		})
	}
}

// TestKeyRepeatsEndBlocks: with ticks on the bottom row only, the rows
// above a repeated key end their block: they carry their year labels, and
// the key sits below them, a row gap under the tick area. A heading is
// never parted from its first row: a key due there goes above it.
func TestKeyRepeatsEndBlocks(t *testing.T) {
	out := webScroll()
	out.Columns = 6
	out.Ticks = specs.TicksBottomRow
	out.KeyEvery = pxL(1200)
	p := solveT(t, testSpec(), out, []Group{{"1880s", 6 * 9}, {"1890s", 6 * 9}, {"1900s", 6 * 9}})
	pg := p.Pages[0]
	require.NotEmpty(t, pg.KeyRepeats, "repeated keys")
	overHeading := 0
	for i, k := range pg.KeyRepeats {
		above := math.Inf(1) // lowest panel bottom above the key
		var row []Panel
		for _, pn := range pg.Panels {
			if pn.Plot.Y0 > k.Key.Y1 && pn.Plot.Y0 < above {
				above, row = pn.Plot.Y0, nil
			}
			if pn.Plot.Y0 == above {
				row = append(row, pn)
			}
		}
		for _, pn := range row {
			assert.True(t, pn.ShowTicks, "repeat %d: item %d above it has no year labels", i, pn.Item)
			assert.InDelta(t, p.RowGap, pn.Ticks.Y0-k.Key.Y1, 1e-6, "repeat %d: gap under the tick labels above in pt, want the row gap", i)
		}
		// Under the key, a gap (a blank label line) down: a heading or a
		// row's labels.
		under := k.Key.Y0 - p.LabelH
		what := ""
		for _, h := range pg.Headings {
			if math.Abs(h.Box.Y1-under) < 1e-6 {
				what = "heading " + h.Text
				overHeading++
			}
		}
		for _, pn := range pg.Panels {
			if math.Abs(pn.Label.Y1-under) < 1e-6 {
				what = "row"
			}
		}
		assert.NotEmpty(t, what, "repeat %d: neither a heading nor a row a gap under it", i)
	}
	// 9 rows a group at this pitch: the keys fall at group starts too.
	assert.NotZero(t, overHeading, "no repeated key above a heading; the case is not tested")
}

// near reports whether two rects agree to 1e-6 pt (rounding only).
func near(a, b Rect) bool {
	return math.Abs(a.X0-b.X0) < 1e-6 && math.Abs(a.Y0-b.Y0) < 1e-6 && math.Abs(a.X1-b.X1) < 1e-6 && math.Abs(a.Y1-b.Y1) < 1e-6
}

// TestCropMarks: the one crop-mark rule (common practice, print-facts.md
// "Crop marks": start at least a bleed outside the trim, never in the
// bleed, about 6 mm long; ours adds 1 mm against trimming drift and
// keeps 3 mm clear of the trim with no bleed).
func TestCropMarks(t *testing.T) {
	const mm = 72 / 25.4
	for _, c := range []struct {
		bleed, offset float64 // mm
	}{
		{3, 4},         // Europe's usual 3 mm bleed (print-facts.md): 1 mm beyond it
		{3.175, 4.175}, // North America's 0.125 in
		{5, 6},         // a 5 mm bleed
		{0, 3},         // no bleed: 3 mm clear of the trim
		{1.5, 3},       // 1.5 + 1 < 3
	} {
		off, length := CropMarks(c.bleed * mm)
		assert.InDelta(t, c.offset*mm, off, 1e-9, "offset, bleed %g mm", c.bleed)
		assert.InDelta(t, 6*mm, length, 1e-9, "length, bleed %g mm", c.bleed)
	}
}
