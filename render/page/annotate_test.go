package page

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/render/curve"
	"sheaf/specs"
	"sheaf/specs/series"
)

const demoSpec = "../../examples/quillmere/feature.yaml"

// demoFeature prepares the demo's output name as a build does, with the
// spec edited first.
func demoFeature(t testing.TB, name string, edit func(s *specs.Spec, out *specs.Output)) *Feature {
	t.Helper()
	s, err := specs.Load(demoSpec)
	require.NoError(t, err)
	d, err := series.Load(s)
	require.NoError(t, err)
	s.DataGaps = d.Gaps
	out := s.Output(name)
	require.NotNil(t, out)
	if edit != nil {
		edit(s, out)
	}
	f, err := PrepareForTest(s, d, out)
	require.NoError(t, err)
	return f
}

// panelOf finds the panel of page (1-based) that shows item.
func panelOf(t testing.TB, f *Feature, page, item int) layout.Panel {
	t.Helper()
	for _, pn := range f.Plan.Pages[page-1].Panels {
		if pn.Item == item {
			return pn
		}
	}
	require.FailNow(t, "panel missing", "item %d is not on page %d", item, page)
	return layout.Panel{}
}

// curveSamples are points along the drawn curve, 16 on each Bézier.
func curveSamples(t testing.TB, f *Feature, pn layout.Panel) []curve.Point {
	m, err := f.PlotMap(pn)
	require.NoError(t, err)
	runs, err := curve.Build(f.Data.Years, f.plotted(&f.Data.Series[pn.Item]), m, nil)
	require.NoError(t, err)
	var pts []curve.Point
	for _, r := range runs {
		pts = append(pts, r.Start)
		for _, z := range r.Beziers {
			for k := 1; k <= 16; k++ {
				pts = append(pts, z.At(float64(k)/16))
			}
		}
	}
	return pts
}

func distToRect(p curve.Point, r layout.Rect) float64 {
	dx := math.Max(math.Max(r.X0-p.X, 0), p.X-r.X1)
	dy := math.Max(math.Max(r.Y0-p.Y, 0), p.Y-r.Y1)
	return math.Hypot(dx, dy)
}

// TestNotesPlacedClear is a property test on the demo's data: notes of
// random years, spans and lengths on 120 terms, in print and on screen.
// Every placed note lies inside its plot; its text keeps clear of the drawn
// curve (half the line width at least, sampled along every Bézier), of the
// peak dot, of every mark and of the other notes' texts; its leader runs
// from its mark to the edge of its text. The rules are this project's
// (the issue asks that a note collide with nothing). Two thirds must find
// a place, or the test would pass by placing none (random years often fall
// where the line is busiest and panels get three notes; about 73 % placed
// in print, 80 % on screen).
func TestNotesPlacedClear(t *testing.T) {
	words := []string{"strike", "war orders", "new works open", "patent lapses", "price falls", "ban", "first sold", "tariff"}
	for _, name := range []string{"print", "web"} {
		r := rand.New(rand.NewPCG(16, 1))
		f := demoFeature(t, name, func(s *specs.Spec, _ *specs.Output) {
			s.Annotations = nil
			for i := 0; i < 120; i++ {
				sr := i * 3
				from := 1868 + r.IntN(140)
				to := from
				if i%3 == 0 {
					to = from + 1 + r.IntN(6)
				}
				n := 1 + r.IntN(2)
				if i%4 == 0 {
					n = 3 // a crowded panel
				}
				for k := 0; k < n; k++ {
					s.Annotations = append(s.Annotations, specs.Annotation{Term: "", From: from + 5*k, To: to + 5*k,
						Text: words[r.IntN(len(words))], Path: fmt.Sprintf("annotations.%d", len(s.Annotations))})
					s.Annotations[len(s.Annotations)-1].Term = fmt.Sprint(sr) // set below, once the data is loaded
				}
			}
		})
		// Terms by index, now that the selection is known.
		for i := range f.Spec.Annotations {
			var k int
			fmt.Sscan(f.Spec.Annotations[i].Term, &k)
			f.Spec.Annotations[i].Term = f.Data.Series[k].Term
		}
		notes := f.Notes()
		require.NotEmpty(t, notes)
		placed := 0
		lw := f.Output.Line.Pt()
		byPanel := map[[2]int][]Note{}
		for _, n := range notes {
			byPanel[[2]int{n.Page, n.Item}] = append(byPanel[[2]int{n.Page, n.Item}], n)
		}
		for key, ns := range byPanel {
			pn := panelOf(t, f, key[0], key[1])
			pts := curveSamples(t, f, pn)
			sr := &f.Data.Series[pn.Item]
			m, _ := f.PlotMap(pn)
			pk := m.Apply(float64(sr.PeakYear), sr.Peak)
			for i, n := range ns {
				if !n.Placed {
					assert.NotEmpty(t, n.Why)
					continue
				}
				placed++
				b := n.Box
				where := fmt.Sprintf("%s p. %d %q %q", name, n.Page, n.Term, n.Text)
				assert.True(t, b.X0 >= pn.Plot.X0 && b.X1 <= pn.Plot.X1 && b.Y0 >= pn.Plot.Y0 && b.Y1 <= pn.Plot.Y1, "%s: box %v leaves the plot %v", where, b, pn.Plot)
				nearest, at := math.Inf(1), curve.Point{}
				for _, p := range pts {
					if d := distToRect(p, b); d < nearest {
						nearest, at = d, p
					}
				}
				assert.GreaterOrEqual(t, nearest, lw/2, "%s: text %v is this close to the curve at %.1f,%.1f (pt; half the line)", where, b, at.X, at.Y)
				if f.Output.PeakDot {
					assert.GreaterOrEqual(t, distToRect(pk, b), f.peakRadius(), "%s: text over the peak dot", where)
				}
				for j, o := range ns {
					assert.False(t, Overlaps(b, o.Mark), "%s: text over the mark of note %d", where, j)
					if j != i && o.Placed {
						assert.False(t, Overlaps(b, o.Box), "%s: text over note %q", where, o.Text)
					}
				}
				end := curve.Point{X: n.Leader[1].X, Y: n.Leader[1].Y}
				assert.InDelta(t, 0, distToRect(end, b), 1e-9, "%s: the leader ends on the text", where)
				assert.InDelta(t, 0, distToRect(curve.Point{X: n.Leader[0].X, Y: n.Leader[0].Y}, n.Mark), 1e-9, "%s: the leader starts at the mark", where)
			}
		}
		assert.Greater(t, placed, len(notes)*2/3, "%s: only %d of %d notes placed", name, placed, len(notes))
		t.Logf("%s: %d of %d notes placed", name, placed, len(notes))
	}
}

// TestNoteTooLong: a note wider than any panel can hold is bad input at
// its spec line, saying the room.
func TestNoteTooLong(t *testing.T) {
	s, err := specs.Load(demoSpec)
	require.NoError(t, err)
	d, err := series.Load(s)
	require.NoError(t, err)
	s.Annotations = []specs.Annotation{{Term: d.Series[0].Term, From: 1900, To: 1900,
		Text: strings.Repeat("a long note ", 8), Path: "annotations.0"}}
	_, err = PrepareForTest(s, d, s.Output("print"))
	require.Error(t, err)
	assert.Contains(t, err.Error(), s.Where("annotations.0.text").String()+": annotations.0.text:")
	assert.Regexp(t, `its panels leave [0-9.]+ pt \(about [0-9]+ characters\): shorten it`, err.Error())
}

// TestPlottedZeros: a zero with no non-zero neighbour is left out (it lies
// on the baseline); every other value is kept.
func TestPlottedZeros(t *testing.T) {
	nan := math.NaN()
	tests := []struct{ in, want []float64 }{
		{[]float64{5, 0, 0, 0, 3}, []float64{5, 0, nan, 0, 3}},
		{[]float64{0, 0, 2, 0}, []float64{nan, 0, 2, 0}},
		{[]float64{0, nan, 0}, []float64{nan, nan, nan}},
		{[]float64{1, 2, 3}, []float64{1, 2, 3}},
	}
	f := &Feature{}
	for _, tt := range tests {
		got := f.plotted(&series.Series{Values: tt.in})
		require.Len(t, got, len(tt.want))
		for i := range got {
			if math.IsNaN(tt.want[i]) {
				assert.True(t, math.IsNaN(got[i]), "%v at %d", tt.in, i)
			} else {
				assert.Equal(t, tt.want[i], got[i], "%v at %d", tt.in, i)
			}
		}
	}
}

// TestTickLabelsKeepClear: on a US Letter page of four columns with a
// narrow gutter (the case in the issue: "2025 1875"), the year labels of
// neighbouring panels keep at least an em of the tick size between them
// (common practice: at least a word space between separate numbers).
func TestTickLabelsKeepClear(t *testing.T) {
	for _, gutter := range []float64{2, 4, 8} {
		f := demoFeature(t, "print", func(_ *specs.Spec, out *specs.Output) {
			out.Trim = specs.Size{W: 612, H: 792} // US Letter, 8.5 × 11 in
			out.Columns = 4
			out.Gutter = specs.Length(gutter * 72 / 25.4)
			out.Ticks = specs.TicksEveryPanel
		})
		em := f.Output.Type.Ticks.Pt()
		pg := f.Plan.Pages[0]
		checked := 0
		for i := 0; i+1 < len(pg.Panels); i++ {
			a, b := pg.Panels[i], pg.Panels[i+1]
			if a.Row != b.Row {
				continue
			}
			ma, _ := f.PlotMap(a)
			mb, _ := f.PlotMap(b)
			la, lb := f.tickLabels(a, ma), f.tickLabels(b, mb)
			require.NotEmpty(t, la)
			require.NotEmpty(t, lb)
			gap := lb[0].X0 - la[len(la)-1].X1
			assert.GreaterOrEqual(t, gap, em-1e-9, "gutter %g mm: %s and %s are %.2f pt apart", gutter, la[len(la)-1].Text, lb[0].Text, gap)
			checked++
		}
		require.Positive(t, checked)
	}
}

// TestDotsInsideSides: with the peak at the first or the last year, the
// peak dot (and its ring) stays inside the plot's sides.
func TestDotsInsideSides(t *testing.T) {
	f := demoFeature(t, "print", nil)
	for _, pn := range f.Plan.Pages[0].Panels[:6] {
		sr := &f.Data.Series[pn.Item]
		for _, year := range []int{f.Data.Span.From, f.Data.Span.To} {
			m, err := f.PlotMap(pn)
			require.NoError(t, err)
			x := m.X(float64(year))
			reach := f.peakRadius() + f.Rule()/2
			assert.GreaterOrEqual(t, x-reach, pn.Plot.X0-1e-9, "%q", sr.Term)
			assert.LessOrEqual(t, x+reach, pn.Plot.X1+1e-9, "%q", sr.Term)
		}
	}
}

// TestRowKeepsOneLabelSize: every label of a row is set at one size.
func TestRowKeepsOneLabelSize(t *testing.T) {
	f := demoFeature(t, "print", nil)
	labels := f.Labels()
	for _, pg := range f.Plan.Pages {
		sizes := map[int]float64{}
		for _, pn := range pg.Panels {
			s := labels[pn.Item].Size
			if prev, ok := sizes[pn.Row]; ok {
				assert.Equal(t, prev, s, "page %d row %d: %q", pg.Number, pn.Row, labels[pn.Item].Term)
			}
			sizes[pn.Row] = s
		}
	}
}
