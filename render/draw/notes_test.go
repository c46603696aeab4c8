package draw

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/render/curve"
	"sheaf/specs"
)

// TestSegmentGeometry: the leader tests on segments worked by hand —
// crossing diagonals of a square cross, parallel and disjoint segments
// do not; a segment through a rectangle hits it, one beside it does not
// (Liang–Barsky clipping, Liang & Barsky 1984, the parametric test
// worked by hand for these cases).
func TestSegmentGeometry(t *testing.T) {
	p := func(x, y float64) curve.Point { return curve.Point{X: x, Y: y} }
	assert.True(t, intersects(segment{p(0, 0), p(10, 10)}, segment{p(0, 10), p(10, 0)}), "the diagonals of a square cross at (5, 5)")
	assert.False(t, intersects(segment{p(0, 0), p(10, 0)}, segment{p(0, 1), p(10, 1)}), "parallel, 1 apart")
	assert.False(t, intersects(segment{p(0, 0), p(4, 4)}, segment{p(6, 4), p(10, 0)}), "would cross at (5, 5), past both ends")
	r := []layout.Rect{{X0: 4, Y0: 4, X1: 6, Y1: 6}}
	assert.True(t, segHitsAny(segment{p(0, 5), p(10, 5)}, r), "through the middle")
	assert.False(t, segHitsAny(segment{p(0, 7), p(10, 7)}, r), "above it")
	assert.False(t, segHitsAny(segment{p(0, 0), p(3, 3)}, r), "stops short of it")
	assert.Equal(t, p(5, 5), shorten(segment{p(2, 1), p(5, 5)}, 5).a, "a 3-4-5 segment shortened by its length is its end")
}

// TestPlaceNotesOverlaid: on a plot with two crossing lines, a note on
// one line at their crossing keeps its text clear of both (by half the line width and the
// pad, the project's rule) and its leader crosses neither away from its
// mark; a second note does not land on the first.
func TestPlaceNotesOverlaid(t *testing.T) {
	out := specs.DefaultOutput("web", specs.Print)
	fs, err := fonts.Load(&specs.Spec{}, &out)
	require.NoError(t, err)
	st := NoteStyle{Fonts: fs, Size: 6, Leading: 1.2, Rule: 0.25, Line: 1}
	years := make([]float64, 21)
	up, down := make([]float64, 21), make([]float64, 21)
	for i := range years {
		years[i] = float64(1900 + i)
		up[i], down[i] = float64(i), float64(20-i)
	}
	plot := layout.Rect{X0: 0, Y0: 0, X1: 200, Y1: 100}
	m, err := curve.NewMap(1900, 1920, 0, 20, plot.X0, plot.X1, plot.Y0, plot.Y1)
	require.NoError(t, err)
	p := NotePlot{Plot: plot, Map: m, Years: years, Terms: []string{"up", "down"}, Lines: [][]float64{up, down}}
	anns := []specs.Annotation{{Term: "up", From: 1910, To: 1910, Text: "first note"}, {Term: "down", From: 1912, To: 1914, Text: "second note"}}
	ns := PlaceNotes(st, p, anns, []int{0, 1})
	require.Len(t, ns, 2)
	lines := [][2]curve.Point{{m.Apply(1900, 0), m.Apply(1920, 20)}, {m.Apply(1900, 20), m.Apply(1920, 0)}}
	for _, n := range ns {
		require.True(t, n.Placed, "%q: %s", n.Text, n.Why)
		assert.True(t, plot.Contains(n.Box), "%q inside the plot", n.Text)
		for _, l := range lines {
			// Distance from the straight line to the box: its corners all lie
			// on one side, at least half the line plus the pad away.
			d, side := math.Inf(1), 0.0
			for _, c := range []curve.Point{{X: n.Box.X0, Y: n.Box.Y0}, {X: n.Box.X1, Y: n.Box.Y0}, {X: n.Box.X0, Y: n.Box.Y1}, {X: n.Box.X1, Y: n.Box.Y1}} {
				sd := distToLine(c, l[0], l[1])
				assert.True(t, side == 0 || sd*side > 0, "%q: text %v lies across a line", n.Text, n.Box)
				side = sd
				d = math.Min(d, math.Abs(sd))
			}
			assert.GreaterOrEqual(t, d, 0.5-1e-9, "%q: text %v within half the line width of a line", n.Text, n.Box)
			ld := segment{curve.Point{X: n.Leader[0].X, Y: n.Leader[0].Y}, curve.Point{X: n.Leader[1].X, Y: n.Leader[1].Y}}
			assert.False(t, intersects(shorten(ld, 2), segment{l[0], l[1]}), "%q: its leader crosses a line", n.Text)
		}
	}
	assert.False(t, Overlaps(ns[0].Box, ns[1].Box), "the notes do not overlap")
	assert.Equal(t, "up", ns[0].Term)
	assert.InDelta(t, m.X(float64(anns[0].From)), (ns[0].Mark.X0+ns[0].Mark.X1)/2, 1e-9, "a year's mark stands at its year")
	assert.InDelta(t, m.X(1912), ns[1].Mark.X0, 1e-9, "a span's bracket starts at its first year")
	assert.InDelta(t, m.X(1914), ns[1].Mark.X1, 1e-9, "and ends at its last")
}

// distToLine is the signed distance from c to the infinite line through
// a and b (the sign says the side).
func distToLine(c, a, b curve.Point) float64 {
	return ((b.X-a.X)*(a.Y-c.Y) - (a.X-c.X)*(b.Y-a.Y)) / math.Hypot(b.X-a.X, b.Y-a.Y)
}
