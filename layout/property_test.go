package layout

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// randomOutput draws an output from the ranges a graphics editor would try.
func randomOutput(r *rand.Rand) specs.Output {
	uni := func(lo, hi float64) float64 { return lo + r.Float64()*(hi-lo) }
	var o specs.Output
	if r.IntN(3) < 2 {
		o = a4Print()
		sizes := [][2]float64{{210, 297}, {297, 420}, {148, 210}, {215.9, 279.4}, {279.4, 431.8}}
		sz := sizes[r.IntN(len(sizes))]
		o.Trim = specs.Size{W: mmL(sz[0]), H: mmL(sz[1])}
		o.Bleed = mmL([]float64{0, 3, 3.175, 5}[r.IntN(4)])
		o.Slug = mmL(uni(10, 15))
		o.Margins = specs.Margins{Top: mmL(uni(8, 25)), Bottom: mmL(uni(8, 25)), Inside: mmL(uni(8, 30)), Outside: mmL(uni(8, 30))}
		o.Gutter, o.RowGap = mmL(uni(0, 6)), mmL(uni(0, 6))
	} else {
		o = webScroll()
		switch r.IntN(3) {
		case 0:
			o.Flow = specs.FlowPages
			o.Trim.H = pxL(uni(700, 1400))
		case 1:
			o.Flow = specs.FlowScrollGroups
		}
		o.Trim.W = pxL(uni(360, 1600))
		o.Gutter, o.RowGap = pxL(uni(0, 24)), pxL(uni(0, 24))
		o.MinPanelWidth = pxL(uni(80, 300))
	}
	o.Facing = r.IntN(2) == 0
	o.FirstPageLeft = r.IntN(4) == 0
	o.Balance = r.IntN(2) == 0
	o.Columns = 0
	if o.Kind == specs.Print || r.IntN(2) == 0 {
		o.Columns = 1 + r.IntN(9)
	}
	if r.IntN(4) == 0 {
		o.PanelAspect, o.PanelHeight = 0, o.Type.Label*specs.Length(uni(5, 14))
	} else {
		o.PanelAspect = uni(0.6, 3)
	}
	o.Slack = []specs.Slack{specs.SlackSpread, specs.SlackGrow}[r.IntN(2)]
	o.Ticks = []specs.TickPlacement{specs.TicksBottomRow, specs.TicksEveryPanel}[r.IntN(2)]
	if o.Flow.Scrolls() && r.IntN(4) > 0 {
		// From a key before every row to one every few screens.
		o.KeyEvery = pxL(uni(50, 3000))
	}
	return o
}

func randomGroups(r *rand.Rand) []Group {
	if r.IntN(3) == 0 {
		return []Group{{Count: r.IntN(400)}}
	}
	g := make([]Group, 1+r.IntN(8))
	for i := range g {
		g[i] = Group{Heading: fmt.Sprintf("%d0s", 180+i), Count: r.IntN(120)}
		if r.IntN(8) == 0 {
			g[i].Heading = ""
		}
	}
	return g
}

func TestPropertiesRandomSpecs(t *testing.T) {
	r := rand.New(rand.NewPCG(20240611, 7))
	fs := fontSet(t)
	spec := testSpec()
	feasible, noRemedy := 0, 0
	for trial := range 600 {
		out := randomOutput(r)
		groups := randomGroups(r)
		p, err := Solve(spec, &out, fs, groups)
		var inf *InfeasibleError
		if errors.As(err, &inf) {
			for _, rem := range inf.Remedies {
				fixed := out
				require.NoError(t, rem.Apply(&fixed), "trial %d: applying remedy %q", trial, rem.Text)
				_, err := Solve(spec, &fixed, fs, groups)
				require.NoError(t, err, "trial %d: %v: remedy %q fails", trial, inf, rem.Text)
			}
			if len(inf.Remedies) == 0 {
				noRemedy++
			}
			continue
		}
		require.NoError(t, err, "trial %d", trial)
		feasible++
		require.Empty(t, checkPlan(p, &out, groups), "trial %d (%s, %d columns, groups %v): the plan's faults", trial, out.Kind, p.Columns, groups)
	}
	t.Logf("%d of 600 feasible; %d infeasible without a remedy", feasible, noRemedy)
	assert.GreaterOrEqual(t, feasible, 300, "feasible outputs of 600: fewer and the generator tests too little")
}

// TestPropertiesKeyRepeats draws scrolling screen outputs only, most with
// key-every, grouped and not, and checks every plan as above — in
// particular checkKeyRepeats and that repeated keys overlap no panel or
// heading.
func TestPropertiesKeyRepeats(t *testing.T) {
	r := rand.New(rand.NewPCG(20250207, 8))
	fs := fontSet(t)
	spec := testSpec()
	plans, repeats := 0, 0
	for trial := 0; plans < 300 && trial < 3000; trial++ {
		out := randomOutput(r)
		if !out.Flow.Scrolls() {
			continue
		}
		groups := randomGroups(r)
		p, err := Solve(spec, &out, fs, groups)
		if err != nil {
			continue // remedies are TestPropertiesRandomSpecs's business
		}
		plans++
		require.Empty(t, checkPlan(p, &out, groups), "trial %d (%s, key-every %.1f px, %d columns, groups %v): the plan's faults", trial, out.Flow, out.KeyEvery.Px(), p.Columns, groups)
		for _, pg := range p.Pages {
			repeats += len(pg.KeyRepeats)
		}
	}
	t.Logf("%d scrolling plans, %d repeated keys", plans, repeats)
	assert.GreaterOrEqual(t, plans, 300, "scrolling plans: fewer and the generator tests too little")
	assert.GreaterOrEqual(t, repeats, 300, "repeated keys: fewer and the generator tests too little")
}

// checkPlan tests the invariants every plan must keep. It recomputes what
// it can from the output rather than reading the solver's state.
func checkPlan(p *Plan, out *specs.Output, groups []Group) string {
	const tol = 0.01 // gutters equal to the spec within 0.01 pt (the brief)
	lead := out.Type.Leading
	hh := out.Type.Heading.Pt() * lead

	// Items: each exactly once, in order; their groups as given.
	next := 0
	groupOf := []int{}
	for g, gr := range groups {
		for range gr.Count {
			groupOf = append(groupOf, g)
		}
	}
	w, lh, ph := p.PanelW, p.LabelH, p.PlotH
	pagesOf := make([]map[int]bool, len(groups))
	for i := range pagesOf {
		pagesOf[i] = map[int]bool{}
	}
	for pi, pg := range p.Pages {
		if !pg.Media.Contains(pg.Bleed) || !pg.Bleed.Contains(pg.Trim) || !pg.Trim.Contains(pg.Live) {
			return fmt.Sprintf("page %d boxes do not nest", pg.Number)
		}
		if pg.Right != ((pi%2 == 0) != out.FirstPageLeft) {
			return fmt.Sprintf("page %d: right %v", pg.Number, pg.Right)
		}
		bands := []Rect{pg.Header, pg.Key, pg.Grid, pg.Footer}
		for i, a := range bands {
			if !a.IsZero() && !pg.Live.Contains(a) {
				return fmt.Sprintf("page %d band %d %v outside live %v", pg.Number, i, a, pg.Live)
			}
			for _, b := range bands[i+1:] {
				if a.Overlaps(b) {
					return fmt.Sprintf("page %d: bands %v and %v overlap", pg.Number, a, b)
				}
			}
		}
		// Facing pages mirror: the live area of every page is the
		// reflection of the first right-hand page's, when they differ.
		ref := p.Pages[0]
		if out.Facing && pg.Right != ref.Right {
			if math.Abs((pg.Live.X0-pg.Trim.X0)-(ref.Trim.X1-ref.Live.X1)) > 1e-9 {
				return fmt.Sprintf("page %d live %v does not mirror page 1 live %v", pg.Number, pg.Live, ref.Live)
			}
		}
		var boxes []Rect
		for _, h := range pg.Headings {
			if !pg.Grid.Contains(h.Box) {
				return fmt.Sprintf("page %d heading %q outside grid", pg.Number, h.Text)
			}
			boxes = append(boxes, h.Box)
		}
		for i, kb := range pg.Keys() {
			if !kb.Key.Contains(kb.Strip) || !kb.Key.Contains(kb.Ticks) || kb.Strip.Y0 != kb.Ticks.Y1 || kb.Key.W() != pg.Live.W() {
				return fmt.Sprintf("page %d key band %d: strip %v and ticks %v not in band %v across the live area", pg.Number, i, kb.Strip, kb.Ticks, kb.Key)
			}
			if i > 0 {
				if !pg.Grid.Contains(kb.Key) {
					return fmt.Sprintf("page %d repeated key %v outside the grid %v", pg.Number, kb.Key, pg.Grid)
				}
				boxes = append(boxes, kb.Key)
			}
		}
		if len(pg.KeyRepeats) > 0 && (!p.isScroll() || out.KeyEvery == 0) {
			return fmt.Sprintf("page %d: %d repeated keys on a %s %s output with key-every %g pt", pg.Number, len(pg.KeyRepeats), out.Kind, p.Flow, out.KeyEvery)
		}
		rowGroup := map[int]int{}
		rowsOnPage := map[int]bool{}
		for i, pn := range pg.Panels {
			if pn.Item != next {
				return fmt.Sprintf("page %d: item %d where %d was due", pg.Number, pn.Item, next)
			}
			next++
			if pn.Item >= len(groupOf) || pn.Group != groupOf[pn.Item] {
				return fmt.Sprintf("item %d in group %d", pn.Item, pn.Group)
			}
			pagesOf[pn.Group][pi] = true
			if math.Abs(pn.Plot.W()-w) > 1e-9 || math.Abs(pn.Label.H()-lh) > 1e-9 || math.Abs(pn.Plot.H()-ph) > 1e-9 {
				return fmt.Sprintf("item %d: panel %v / %v not the plan's size", pn.Item, pn.Label, pn.Plot)
			}
			if pn.Label.Y0 != pn.Plot.Y1 || pn.Label.X0 != pn.Plot.X0 {
				return fmt.Sprintf("item %d: label not on its plot", pn.Item)
			}
			box := pn.Box()
			if pn.ShowTicks {
				if pn.Ticks.Y1 != pn.Plot.Y0 {
					return fmt.Sprintf("item %d: ticks not under the plot", pn.Item)
				}
				box.Y0 = pn.Ticks.Y0
			}
			if !pg.Grid.Contains(box) || !pg.Live.Contains(box) {
				return fmt.Sprintf("page %d item %d: %v outside grid %v", pg.Number, pn.Item, box, pg.Grid)
			}
			boxes = append(boxes, box)
			// A group starts a new row: rows hold one group.
			if g, ok := rowGroup[pn.Row]; ok && g != pn.Group {
				return fmt.Sprintf("page %d row %d holds groups %d and %d", pg.Number, pn.Row, g, pn.Group)
			}
			rowGroup[pn.Row] = pn.Group
			rowsOnPage[pn.Row] = true
			// Gutters: equal to the spec within tol.
			if i > 0 && pg.Panels[i-1].Row == pn.Row {
				if gut := pn.Plot.X0 - pg.Panels[i-1].Plot.X1; math.Abs(gut-out.Gutter.Pt()) > tol {
					return fmt.Sprintf("gutter %.6f pt, spec %.6f", gut, out.Gutter.Pt())
				}
			}
			// Column positions from the live area and the index.
			if x := pg.Live.X0 + float64(pn.Col)*(w+out.Gutter.Pt()); math.Abs(x-pn.Plot.X0) > 1e-9 {
				return fmt.Sprintf("item %d col %d at %.6f, want %.6f", pn.Item, pn.Col, pn.Plot.X0, x)
			}
			if out.Ticks == specs.TicksEveryPanel && !pn.ShowTicks {
				return fmt.Sprintf("item %d: no ticks with every-panel", pn.Item)
			}
		}
		for i, a := range boxes {
			for _, b := range boxes[i+1:] {
				if a.Overlaps(b) {
					return fmt.Sprintf("page %d: %v and %v overlap", pg.Number, a, b)
				}
			}
		}
		// Each column's lowest panel in a block shows ticks (bottom-row).
		if out.Ticks != specs.TicksEveryPanel {
			for i, pn := range pg.Panels {
				below := false
				for _, q := range pg.Panels[i+1:] {
					if q.Group == pn.Group && q.Col == pn.Col {
						below = true
						break
					}
				}
				if !below && !pn.ShowTicks {
					return fmt.Sprintf("page %d item %d: bottom of its column without ticks", pg.Number, pn.Item)
				}
			}
		}
		// Headings: a group with a heading has one above its first row on
		// every page it appears on, "(continued)" after its first page.
		for g := range groups {
			if groups[g].Heading == "" || !pagesOf[g][pi] {
				continue
			}
			var first *Panel
			for i := range pg.Panels {
				if pg.Panels[i].Group == g {
					first = &pg.Panels[i]
					break
				}
			}
			found := false
			for _, h := range pg.Headings {
				if h.Group == g {
					found = true
					cont := pi > 0 && pagesOf[g][pi-1]
					if h.Continued != cont || h.Box.Y0 < first.Label.Y1-1e-9 || first.Col != 0 {
						return fmt.Sprintf("page %d: heading %+v for first panel %+v", pg.Number, h, *first)
					}
				}
			}
			if !found {
				return fmt.Sprintf("page %d: group %d without heading", pg.Number, g)
			}
		}
		// Slack is not left at the bottom of a full page (as many rows as
		// a page holds, no headings); a page that ends early keeps a full
		// page's pitch instead and may leave room below its rows.
		capRows := p.RowsPerPage
		if pi == 0 {
			capRows = p.RowsFirstPage
		}
		if pi < len(p.Pages)-1 && len(rowsOnPage) >= 2 && len(rowsOnPage) == capRows && len(pg.Headings) == 0 && !p.isScroll() {
			low := math.Inf(1)
			for _, pn := range pg.Panels {
				y := pn.Plot.Y0
				if pn.ShowTicks {
					y = pn.Ticks.Y0
				}
				low = min(low, y)
			}
			if out.Ticks != specs.TicksEveryPanel {
				low = min(low, lowestRowBottom(pg)-p.TicksH)
			}
			if low-pg.Grid.Y0 > 1e-6 {
				return fmt.Sprintf("page %d: %.4f pt of slack left at the bottom", pg.Number, low-pg.Grid.Y0)
			}
		}
	}
	if next != len(groupOf) {
		return fmt.Sprintf("%d of %d items placed", next, len(groupOf))
	}
	if p.isScroll() {
		if msg := checkScroll(p, out, groups); msg != "" {
			return msg
		}
	}
	// A group spans pages only when it is larger than a page, or starts at
	// the top of the (shorter) first page, which would otherwise be empty,
	// or starts on a page less than half full, which moving it would leave
	// more than half empty.
	for g, gr := range groups {
		if len(pagesOf[g]) < 2 || p.Pages[0].Panels[0].Group == g {
			continue
		}
		start := -1
		for pi := range p.Pages {
			if pagesOf[g][pi] {
				start = pi
				break
			}
		}
		before := map[int]bool{}
		for _, pn := range p.Pages[start].Panels {
			if pn.Group != g {
				before[pn.Row] = true
			}
		}
		capRows := p.RowsPerPage
		if start == 0 {
			capRows = p.RowsFirstPage
		}
		// The solver decides before slack: grow makes rows taller, so a
		// page less than half full then may hold fewer rows in the end;
		// the bound allows for that.
		if 2*len(before) < capRows+capRows/2 {
			continue
		}
		rows := (gr.Count + p.Columns - 1) / p.Columns
		h := 0.0
		if gr.Heading != "" {
			h = hh
		}
		rowH := p.LabelH + p.PlotH
		tb := p.TicksH
		if out.Ticks == specs.TicksEveryPanel {
			rowH, tb = rowH+p.TicksH, 0
		}
		need := float64(rows)*rowH + float64(rows-1)*p.RowGap + h + tb
		if need <= p.Pages[len(p.Pages)-1].Grid.H()+1e-6 && len(p.Pages) > 1 {
			return fmt.Sprintf("group %d (%d rows, %.1f pt) split although a page holds %.1f pt", g, rows, need, p.Pages[len(p.Pages)-1].Grid.H())
		}
	}
	// Balanced, ungrouped: later pages differ by at most one row, and the
	// last is no lonelier than the rest.
	if out.Balance && len(groups) == 1 && len(p.Pages) > 1 && !p.isScroll() {
		lo, hi := math.MaxInt, 0
		for _, pg := range p.Pages[1:] {
			n := pg.Panels[len(pg.Panels)-1].Row + 1
			lo, hi = min(lo, n), max(hi, n)
		}
		first := p.Pages[0].Panels[len(p.Pages[0].Panels)-1].Row + 1
		if hi-lo > 1 || (first < lo-1 || first > hi+1) && first != p.RowsFirstPage {
			return fmt.Sprintf("balanced pages: first %d rows, later %d–%d", first, lo, hi)
		}
	}
	return ""
}

func (p *Plan) isScroll() bool { return p.Flow.Scrolls() }

// checkScroll tests what scrolling pages add: each is exactly as tall as
// its content (no room left under the lowest tick labels); with
// scroll-groups there is a page per group that has panels, holding only
// that group, the first page with the full header and the rest with the
// running head, every page with the colour key and the first page's
// source line.
func checkScroll(p *Plan, out *specs.Output, groups []Group) string {
	for _, pg := range p.Pages {
		if pg.Trim.W() != p.Pages[0].Trim.W() {
			return fmt.Sprintf("page %d is %.3f pt wide, page 1 %.3f pt", pg.Number, pg.Trim.W(), p.Pages[0].Trim.W())
		}
		if pg.Key.IsZero() || pg.KeyStrip.IsZero() {
			return fmt.Sprintf("page %d has no colour key", pg.Number)
		}
		if msg := checkKeyRepeats(p, out, pg); msg != "" {
			return msg
		}
		if len(pg.Panels) == 0 {
			continue
		}
		low := math.Inf(1)
		for _, pn := range pg.Panels {
			y := pn.Plot.Y0
			if pn.ShowTicks {
				y = pn.Ticks.Y0
			}
			low = min(low, y)
		}
		if math.Abs(low-pg.Grid.Y0) > 1e-6 {
			return fmt.Sprintf("scrolling page %d: the grid ends %.4f pt below the lowest panel", pg.Number, low-pg.Grid.Y0)
		}
	}
	if p.Flow != specs.FlowScrollGroups {
		if len(p.Pages) != 1 {
			return fmt.Sprintf("flow scroll gives %d pages", len(p.Pages))
		}
		return ""
	}
	var want []int // groups with panels
	for g, gr := range groups {
		if gr.Count > 0 {
			want = append(want, g)
		}
	}
	if len(p.Pages) != max(len(want), 1) {
		return fmt.Sprintf("%d pages for %d groups with panels", len(p.Pages), len(want))
	}
	roles := func(pg Page) map[TextRole]bool {
		m := map[TextRole]bool{}
		for _, t := range pg.Text {
			m[t.Role] = true
		}
		return m
	}
	r0 := roles(p.Pages[0])
	for i, pg := range p.Pages {
		if len(want) > 0 {
			for _, pn := range pg.Panels {
				if pn.Group != want[i] {
					return fmt.Sprintf("page %d holds item %d of group %d; it is group %d's page", pg.Number, pn.Item, pn.Group, want[i])
				}
			}
		}
		r := roles(pg)
		if i == 0 {
			if !r[RoleTitle] || r[RoleRunning] {
				return fmt.Sprintf("page 1 text roles %v: want the title, no running head", r)
			}
			continue
		}
		if !r[RoleRunning] || r[RoleTitle] || r[RoleDek] || r[RoleNote] || r[RoleFolio] || r[RoleSource] != r0[RoleSource] {
			return fmt.Sprintf("page %d text roles %v: want the running head and, as page 1 has one, the source line", pg.Number, r)
		}
	}
	return ""
}

// checkKeyRepeats tests the keys repeated down a scrolling page
// (key-every): every key band is as tall as the top one; a heading sits
// right on its group's first row, so no key comes between them; the tops
// of successive keys, and of the last key and the last row, are no more
// than key-every plus one row pitch (the row with its tick labels and the
// gap under it) apart. When key-every is shorter than a key band and a
// heading, a key stands before every row and the bound is that room
// instead of key-every. Heights are recomputed from the output.
func checkKeyRepeats(p *Plan, out *specs.Output, pg Page) string {
	lead := out.Type.Leading
	keyH := 1.6*out.Type.Key.Pt() + out.Type.Key.Pt()*lead
	kb := keyH + out.Type.Label.Pt()*lead // band and the gap under it
	hh := out.Type.Heading.Pt() * lead
	pitch := p.LabelH + p.PlotH + p.TicksH + p.RowGap
	keys := pg.Keys()
	for i, k := range keys {
		if math.Abs(k.Key.H()-keyH) > 1e-9 {
			return fmt.Sprintf("page %d key %d is %.4f pt tall, want %.4f", pg.Number, i, k.Key.H(), keyH)
		}
		if i > 0 && k.Key.Y1 >= keys[i-1].Key.Y0 {
			return fmt.Sprintf("page %d keys %d and %d out of order", pg.Number, i-1, i)
		}
	}
	for _, h := range pg.Headings {
		for _, pn := range pg.Panels {
			if pn.Group == h.Group {
				if math.Abs(h.Box.Y0-pn.Label.Y1) > 1e-6 {
					return fmt.Sprintf("page %d: heading %q %.4f pt above its first row", pg.Number, h.Text, h.Box.Y0-pn.Label.Y1)
				}
				break
			}
		}
	}
	if len(pg.Panels) == 0 {
		return ""
	}
	every := out.KeyEvery.Pt()
	if every == 0 {
		every = math.Inf(1)
	}
	bound := max(every, kb+hh) + pitch + 1e-6
	tops := make([]float64, 0, len(keys)+1)
	for _, k := range keys {
		tops = append(tops, k.Key.Y1)
	}
	tops = append(tops, pg.Panels[len(pg.Panels)-1].Label.Y1)
	for i := 1; i < len(tops); i++ {
		if d := tops[i-1] - tops[i]; d > bound {
			what := fmt.Sprintf("keys %d and %d", i-1, i)
			if i == len(tops)-1 {
				what = fmt.Sprintf("key %d and the last row", i-1)
			}
			return fmt.Sprintf("page %d: %s are %.3f pt apart; key-every %.3f pt and a row pitch %.3f pt allow %.3f",
				pg.Number, what, d, out.KeyEvery.Pt(), pitch, bound)
		}
	}
	return ""
}

// lowestRowBottom is the bottom of the lowest plot on the page.
func lowestRowBottom(pg Page) float64 {
	low := math.Inf(1)
	for _, pn := range pg.Panels {
		low = min(low, pn.Plot.Y0)
	}
	return low
}

// benchSolve solves groups for every output once per iteration.
func benchSolve(b *testing.B, outs []specs.Output, groups []Group) {
	fs := fontSet(b)
	spec := testSpec()
	for b.Loop() {
		for i := range outs {
			_, err := Solve(spec, &outs[i], fs, groups)
			require.NoError(b, err, "output %q", outs[i].Name)
		}
	}
}

// headedGroups is n groups of count panels, each with a heading.
func headedGroups(n, count int) []Group {
	groups := make([]Group, n)
	for i := range groups {
		groups[i] = Group{Heading: fmt.Sprintf("Group %d", i+1), Count: count}
	}
	return groups
}

// BenchmarkSolve10k solves 10,000 panels for three outputs: A4 print,
// Letter print and a 1200 px scrolling screen.
func BenchmarkSolve10k(b *testing.B) {
	benchSolve(b, []specs.Output{a4Print(), letterPrint(), webScroll()}, []Group{{Count: 10000}})
}

// BenchmarkSolve10kGrouped is the same with 50 headed groups of 200, and
// balanced pages.
func BenchmarkSolve10kGrouped(b *testing.B) {
	outs := []specs.Output{a4Print(), letterPrint(), webScroll()}
	for i := range outs {
		outs[i].Balance = true
	}
	benchSolve(b, outs, headedGroups(50, 200))
}

// BenchmarkSolve10kScrollGroups: 50 headed groups of 200 on a 1200 px
// screen output with a page per group.
func BenchmarkSolve10kScrollGroups(b *testing.B) {
	out := webScroll()
	out.Flow = specs.FlowScrollGroups
	benchSolve(b, []specs.Output{out}, headedGroups(50, 200))
}

// BenchmarkSolve10kKeyRepeats: 10,000 panels on a 1200 px scrolling page
// with the key repeated every 1600 px (138 repeats) and ticks on the
// bottom row, so each repeat also ends a block.
func BenchmarkSolve10kKeyRepeats(b *testing.B) {
	out := webScroll()
	out.KeyEvery = pxL(1600)
	out.Ticks = specs.TicksBottomRow
	benchSolve(b, []specs.Output{out}, []Group{{Count: 10000}})
}
