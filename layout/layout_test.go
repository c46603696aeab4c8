package layout

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"

	"sheaf/specs"
)

func TestColumnWidthWorkedExample(t *testing.T) {
	// Worked arithmetic (common practice, no source): A4 with 20 mm side
	// margins, 6 columns and 4 mm gutters gives (210 − 40 − 5×4)/6 = 25 mm.
	p := solveT(t, testSpec(), a4Print(), []Group{{Count: 50}})
	if got := toMM(p.PanelW); math.Abs(got-25) > 1e-9 {
		t.Errorf("column width %.12f mm, want 25", got)
	}
	for _, pg := range p.Pages {
		for _, pn := range pg.Panels {
			if math.Abs(toMM(pn.Plot.W())-25) > 1e-9 {
				t.Fatalf("page %d item %d: plot %.12f mm wide", pg.Number, pn.Item, toMM(pn.Plot.W()))
			}
		}
	}
}

// readTable reads the rows of the markdown table under heading in
// testdata/print-facts.md.
func readTable(t *testing.T, heading string) [][]string {
	t.Helper()
	b, err := os.ReadFile("testdata/print-facts.md")
	if err != nil {
		t.Fatal(err)
	}
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
	if len(rows) < 2 {
		t.Fatalf("no table under %q", heading)
	}
	return rows[1:] // drop the header row
}

func pair(t *testing.T, s string) (float64, float64) {
	t.Helper()
	a, b, ok := strings.Cut(s, " × ")
	x, err1 := strconv.ParseFloat(a, 64)
	y, err2 := strconv.ParseFloat(b, 64)
	if !ok || err1 != nil || err2 != nil {
		t.Fatalf("bad pair %q", s)
	}
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
		if math.Abs(tr.W()-wpt) > 0.0005 || math.Abs(tr.H()-hpt) > 0.0005 {
			t.Errorf("%s (%s, %s): trim %.3f × %.3f pt, want %s", r[0], r[1], r[3], tr.W(), tr.H(), r[2])
		}
	}
	for _, r := range readTable(t, "Bleed boxes") {
		size, ok := sizes[r[0]]
		if !ok {
			t.Fatalf("unknown size %q", r[0])
		}
		bleed, _ := strconv.ParseFloat(r[1], 64)
		wantW, wantH := pair(t, r[2])
		out := a4Print()
		out.Trim = specs.Size{W: mmL(size[0]), H: mmL(size[1])}
		out.Bleed = mmL(bleed)
		p := solveT(t, testSpec(), out, []Group{{Count: 5}})
		pg := p.Pages[0]
		if math.Abs(pg.Bleed.W()-wantW) > 0.0005 || math.Abs(pg.Bleed.H()-wantH) > 0.0005 {
			t.Errorf("%s + %s mm bleed: bleed box %.3f × %.3f pt, want %s", r[0], r[1], pg.Bleed.W(), pg.Bleed.H(), r[2])
		}
		slug := out.Slug.Pt()
		if math.Abs(pg.Media.W()-(wantW+2*slug)) > 0.0005 || pg.Media.X0 != 0 || pg.Media.Y0 != 0 {
			t.Errorf("%s: media %v, want bleed box + %.3f pt slug each side, from the origin", r[0], pg.Media, slug)
		}
		if !pg.Media.Contains(pg.Bleed) || !pg.Bleed.Contains(pg.Trim) || !pg.Trim.Contains(pg.Live) {
			t.Errorf("%s: boxes do not nest: media %v bleed %v trim %v live %v", r[0], pg.Media, pg.Bleed, pg.Trim, pg.Live)
		}
	}
}

func TestScreenUnits(t *testing.T) {
	// CSS Values and Units Level 3: 1 px = 0.75 pt. A 1200 px screen sheet
	// is 900 pt wide, with no bleed and no slug (media = bleed = trim).
	p := solveT(t, testSpec(), webScroll(), []Group{{Count: 40}})
	pg := p.Pages[0]
	if pg.Trim.W() != 900 || pg.Media != pg.Trim || pg.Bleed != pg.Trim {
		t.Errorf("screen boxes: media %v bleed %v trim %v", pg.Media, pg.Bleed, pg.Trim)
	}
	// min-panel-width 160 px in 1136 px live with 16 px gutters: 6 columns
	// (6×160 + 5×16 = 1040 ≤ 1136 < 7×160 + 6×16 = 1216).
	if p.Columns != 6 {
		t.Errorf("derived %d columns, want 6", p.Columns)
	}
	if len(p.Pages) != 1 {
		t.Errorf("scroll output has %d pages", len(p.Pages))
	}
	// The sheet is exactly as tall as its content plus margins.
	last := pg.Panels[len(pg.Panels)-1]
	if math.Abs(last.Ticks.Y0-pg.Grid.Y0) > 1e-6 {
		t.Errorf("sheet ends %.3f pt below the last panel", last.Ticks.Y0-pg.Grid.Y0)
	}
	if got := p.Summary(); !strings.HasPrefix(got, "web: 1 scrolling page 1200 × ") || !strings.Contains(got, "6 × 7 panels") {
		t.Errorf("summary %q", got)
	}
}

func TestFacingPagesMirror(t *testing.T) {
	out := a4Print()
	out.Margins.Inside, out.Margins.Outside = mmL(25), mmL(15)
	p := solveT(t, testSpec(), out, []Group{{Count: 200}})
	if len(p.Pages) < 3 {
		t.Fatalf("%d pages", len(p.Pages))
	}
	r, l := p.Pages[2], p.Pages[1] // page 3 right, page 2 left
	if !r.Right || l.Right {
		t.Fatalf("page 3 right %v, page 2 right %v", r.Right, l.Right)
	}
	// On a right-hand page the inside margin is on the left (common practice).
	if got := toMM(r.Live.X0 - r.Trim.X0); math.Abs(got-25) > 1e-9 {
		t.Errorf("right page left margin %.6f mm, want the 25 mm inside margin", got)
	}
	if got := toMM(l.Live.X0 - l.Trim.X0); math.Abs(got-15) > 1e-9 {
		t.Errorf("left page left margin %.6f mm, want the 15 mm outside margin", got)
	}
	// Exact mirror: column c of the left page is the reflection of column
	// n−1−c of the right page about the trim's centre line.
	mid := (r.Trim.X0 + r.Trim.X1) / 2
	cols := map[int]Rect{}
	for _, pn := range r.Panels {
		cols[pn.Col] = pn.Plot
	}
	for _, pn := range l.Panels {
		m := cols[p.Columns-1-pn.Col]
		if math.Abs((2*mid-m.X1)-pn.Plot.X0) > 1e-9 || math.Abs((2*mid-m.X0)-pn.Plot.X1) > 1e-9 {
			t.Fatalf("left col %d %v does not mirror right col %d %v", pn.Col, pn.Plot, p.Columns-1-pn.Col, m)
		}
	}
	// The folio sits on the outside: right on right pages, left on left.
	folio := func(pg Page) TextLine {
		for _, tl := range pg.Text {
			if tl.Role == RoleFolio {
				return tl
			}
		}
		t.Fatalf("page %d has no folio", pg.Number)
		return TextLine{}
	}
	if f := folio(r); math.Abs(f.X+f.Width-r.Live.X1) > 1e-9 || f.Text != "3" {
		t.Errorf("right page folio %+v", f)
	}
	if f := folio(l); f.X != l.Live.X0 || f.Text != "2" {
		t.Errorf("left page folio %+v", f)
	}

	out.FirstPageLeft = true
	p = solveT(t, testSpec(), out, []Group{{Count: 200}})
	if p.Pages[0].Right || !p.Pages[1].Right {
		t.Error("first-page-left not honoured")
	}
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
	if len(f) != len(bal) {
		t.Fatalf("balancing changed the page count: %v → %v", f, bal)
	}
	if f[len(f)-1] >= f[len(f)-2]-1 {
		t.Fatalf("test needs a short last page, got %v", f)
	}
	lo, hi := bal[1], bal[1]
	for _, r := range bal[1:] {
		lo, hi = min(lo, r), max(hi, r)
	}
	if hi-lo > 1 || bal[0] < lo-1 && bal[0] != free.RowsFirstPage {
		t.Errorf("balanced rows %v (unbalanced %v)", bal, f)
	}
	sum := 0
	for _, r := range bal {
		sum += r
	}
	if sum != 23 {
		t.Errorf("balanced rows %v sum to %d", bal, sum)
	}
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
	if len(p.Pages) < 4 || strings.Join(heads, ",") != strings.Join(want, ",") {
		t.Errorf("headings %v, want %v", heads, want)
	}
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
			if pn.Ticks.Y1 != pn.Plot.Y0 || pn.Ticks.H() <= 0 {
				t.Errorf("item %d ticks %v under plot %v", pn.Item, pn.Ticks, pn.Plot)
			}
		}
	}
	if got := strconvInts(shown); got != "4 5 6 7 8 9" {
		t.Errorf("ticks on items %s", got)
	}
	out.Ticks = specs.TicksEveryPanel
	p = solveT(t, testSpec(), out, []Group{{Count: 10}})
	for _, pn := range p.Pages[0].Panels {
		if !pn.ShowTicks {
			t.Errorf("every-panel: item %d has no ticks", pn.Item)
		}
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
	if grow.PlotH <= spread.PlotH {
		t.Errorf("grow: plot %.3f pt, spread %.3f pt", grow.PlotH, spread.PlotH)
	}
	for _, p := range []*Plan{spread, grow} {
		pg := p.Pages[1] // a full later page
		low := pg.Panels[len(pg.Panels)-1]
		if math.Abs(low.Ticks.Y0-pg.Grid.Y0) > 1e-6 {
			t.Errorf("%v: %.4f pt of slack left at the bottom", out.Slack, low.Ticks.Y0-pg.Grid.Y0)
		}
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
			if len(s.Pages) != 1 || s.Sheet.W() != w {
				t.Errorf("first spread %+v: page 1 is right-hand and stands alone", s)
			}
		case len(s.Pages) == 2:
			a, b := p.Pages[s.Pages[0].Page], p.Pages[s.Pages[1].Page]
			if a.Right || !b.Right || s.Pages[1].Offset.X != w || s.Sheet.W() != 2*w {
				t.Errorf("spread %d %+v", i, s)
			}
		case i != len(sp)-1:
			t.Errorf("lone page inside the run: %+v", s)
		}
	}
	for i, v := range seen {
		if v != i {
			t.Fatalf("spreads cover pages %v", seen)
		}
	}
	if len(seen) != len(p.Pages) {
		t.Fatalf("spreads cover %d of %d pages", len(seen), len(p.Pages))
	}
}

func TestRectJSON(t *testing.T) {
	b, err := json.Marshal(Rect{0.00049, -0.0004, 612.2834645669, 858.8976377952})
	if err != nil {
		t.Fatal(err)
	}
	if string(b) != "[0,0,612.283,858.898]" {
		t.Errorf("rect JSON %s", b)
	}
	var r Rect
	if err := json.Unmarshal(b, &r); err != nil || r != (Rect{0, 0, 612.283, 858.898}) {
		t.Errorf("round trip %v %v", r, err)
	}
}

func TestPlanJSONAndDeterminism(t *testing.T) {
	groups := []Group{{"1800s", 13}, {"1850s", 40}}
	a, _ := json.Marshal(solveT(t, testSpec(), a4Print(), groups))
	b, _ := json.Marshal(solveT(t, testSpec(), a4Print(), groups))
	if !bytes.Equal(a, b) {
		t.Fatal("two solves of the same input differ")
	}
	var back struct {
		Pages []struct {
			Trim   Rect
			Panels []struct{ Label, Plot Rect }
		}
	}
	if err := json.Unmarshal(a, &back); err != nil {
		t.Fatal(err)
	}
	if len(back.Pages) == 0 || back.Pages[0].Trim.W() < 595 || len(back.Pages[0].Panels) == 0 || back.Pages[0].Panels[0].Plot.W() <= 0 {
		t.Errorf("JSON lacks boxes: %.300s", a)
	}
}

func TestSummary(t *testing.T) {
	p := solveT(t, testSpec(), a4Print(), []Group{{Count: 150}})
	want := "print: " + strconv.Itoa(len(p.Pages)) + " pages, 6 × " + strconv.Itoa(p.RowsPerPage) + " panels a page, panel 25 × "
	if got := p.Summary(); !strings.HasPrefix(got, want) || !strings.HasSuffix(got, " mm") {
		t.Errorf("summary %q, want prefix %q", got, want)
	}
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
		if !strings.Contains(all, want) {
			t.Errorf("warnings lack %q:\n%s", want, all)
		}
	}
	if p := solveT(t, testSpec(), a4Print(), []Group{{Count: 10}}); len(p.Warnings) != 0 {
		t.Errorf("clean output warned: %v", p.Warnings)
	}
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
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.HasPrefix(err.Error(), "feature.yaml") && tc.name != "negative count" {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
	}
	if _, err := Solve(nil, nil, nil, nil); err == nil {
		t.Error("nil input accepted")
	}
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
		if !errors.As(err, &inf) {
			t.Errorf("%s: error %v, want *InfeasibleError", tc.name, err)
			continue
		}
		msg := err.Error()
		t.Log(msg)
		if inf.Constraint != tc.constraint || !strings.HasPrefix(msg, `feature.yaml: output "print": `) {
			t.Errorf("%s: constraint %q, message %q", tc.name, inf.Constraint, msg)
		}
		for _, w := range tc.want {
			if !strings.Contains(msg, w) {
				t.Errorf("%s: %q lacks %q", tc.name, msg, w)
			}
		}
		if len(inf.Remedies) == 0 || inf.Need <= inf.Have {
			t.Errorf("%s: need %g, have %g, remedies %v", tc.name, inf.Need, inf.Have, inf.Remedies)
		}
		// Every suggestion, applied, is feasible.
		for _, r := range inf.Remedies {
			fixed := tc.out()
			if err := r.Apply(&fixed); err != nil {
				t.Fatal(err)
			}
			if _, err := Solve(spec, &fixed, fs, []Group{{"A", 30}, {"B", 30}}); err != nil {
				t.Errorf("%s: remedy %q does not work: %v", tc.name, r.Text, err)
			}
		}
	}
}

func TestNoPanels(t *testing.T) {
	for _, groups := range [][]Group{nil, {{"empty", 0}}} {
		p := solveT(t, testSpec(), a4Print(), groups)
		if len(p.Pages) != 1 || len(p.Pages[0].Panels) != 0 || len(p.Pages[0].Headings) != 0 {
			t.Errorf("groups %v: %d pages", groups, len(p.Pages))
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
	if err != nil {
		t.Fatal(err)
	}
	_, err = Solve(spec, spec.Output("print"), fontSet(t), []Group{{Count: 30}})
	var inf *InfeasibleError
	if !errors.As(err, &inf) || inf.Pos.String() != "dir/feature.yaml:7:5" ||
		!strings.HasPrefix(err.Error(), `dir/feature.yaml:7:5: output "print": 14 columns`) {
		t.Fatalf("error %v at %v", err, inf)
	}
	// The parser's default outputs lay out as they are.
	for _, k := range []specs.Kind{specs.Print, specs.Screen} {
		out := specs.DefaultOutput("x", k)
		if _, err := Solve(spec, &out, fontSet(t), []Group{{Count: 100}}); err != nil {
			t.Errorf("default %s output: %v", k, err)
		}
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
		if got := pitch(pg); got > w+1e-6 {
			t.Errorf("page %d (%d rows): row pitch %.3f pt, a full page's is %.3f pt", pg.Number, len(rows), got, w)
		}
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
		if c.page >= len(p.Pages) {
			t.Fatalf("%d pages, want 3 (one per group with panels)", len(p.Pages))
		}
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
		if got := pg.Trim.H(); math.Abs(got-want) > 1e-6 {
			t.Errorf("page %d is %.4f pt tall, want %.4f", c.page+1, got, want)
		}
		if pg.Trim.W() != 900 {
			t.Errorf("page %d is %.4f pt wide, want 900 (1200 px)", c.page+1, pg.Trim.W())
		}
		if len(pg.Headings) != 1 || pg.Headings[0].Group != c.group || pg.Headings[0].Continued {
			t.Errorf("page %d headings %+v, want group %d's", c.page+1, pg.Headings, c.group)
		}
		for _, pn := range pg.Panels {
			if pn.Group != c.group {
				t.Fatalf("page %d holds item %d of group %d", c.page+1, pn.Item, pn.Group)
			}
		}
	}
	if len(p.Pages) != 3 {
		t.Errorf("%d pages, want 3", len(p.Pages))
	}
	if got := p.Summary(); !strings.HasPrefix(got, "web: 3 scrolling pages, one a group, 1200 × ") {
		t.Errorf("summary %q", got)
	}

	// Ungrouped, a page per group is one scrolling page: the same as scroll.
	one := []Group{{Count: 40}}
	a := solveT(t, testSpec(), out, one)
	out.Flow = specs.FlowScroll
	b := solveT(t, testSpec(), out, one)
	ja, _ := json.Marshal(a.Pages)
	jb, _ := json.Marshal(b.Pages)
	if !bytes.Equal(ja, jb) {
		t.Error("scroll-groups with one group differs from scroll")
	}
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
			if got != want {
				t.Fatalf("%d repeated keys, want %d", got, want)
			}
			if c.flow == specs.FlowPages {
				return
			}
			pg := p.Pages[0]
			if d := pg.Trim.H() - h0; math.Abs(d-float64(want)*kb) > 1e-6 {
				t.Errorf("page grew by %.4f pt, want %d × %.4f", d, want, kb)
			}
			// Each repeat is the top key moved down: same strip, same
			// columns, the same gap above the next row as under the top key.
			for i, k := range pg.KeyRepeats {
				dy := pg.Key.Y1 - k.Key.Y1
				if !near(k.Strip, pg.KeyStrip.Translate(0, -dy)) || !near(k.Ticks, pg.KeyTicks.Translate(0, -dy)) || !near(k.Key, pg.Key.Translate(0, -dy)) {
					t.Errorf("repeat %d %+v is not the top key %v moved down %.3f pt", i, k, pg.Key, dy)
				}
				next := math.Inf(-1)
				for _, pn := range pg.Panels {
					if pn.Label.Y1 < k.Key.Y0 {
						next = max(next, pn.Label.Y1)
					}
				}
				if gap := k.Key.Y0 - next; math.Abs(gap-(kb-keyH)) > 1e-6 {
					t.Errorf("repeat %d: %.4f pt above the next row, want %.4f", i, gap, kb-keyH)
				}
			}
			if len(p.Warnings) != 0 != (c.name == "before every row") {
				t.Errorf("warnings %v", p.Warnings)
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
	if len(pg.KeyRepeats) == 0 {
		t.Fatal("no repeated keys")
	}
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
			if !pn.ShowTicks {
				t.Errorf("repeat %d: item %d above it has no year labels", i, pn.Item)
			}
			if gap := pn.Ticks.Y0 - k.Key.Y1; math.Abs(gap-p.RowGap) > 1e-6 {
				t.Errorf("repeat %d: %.4f pt under the tick labels above, want the row gap %.4f", i, gap, p.RowGap)
			}
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
		if what == "" {
			t.Errorf("repeat %d: neither a heading nor a row a gap under it", i)
		}
	}
	// 9 rows a group at this pitch: the keys fall at group starts too.
	if overHeading == 0 {
		t.Error("no repeated key above a heading; the case is not tested")
	}
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
