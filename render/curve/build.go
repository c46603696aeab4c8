package curve

import (
	"fmt"
	"math"
	"sort"
)

// Run is one unbroken stretch of a series' line, in plot coordinates.
type Run struct {
	// First is the index in the input of the run's first point: segment i
	// spans input points First+i and First+i+1.
	First int
	// Start is the run's first point; for a dot, its only point.
	Start Point
	// Beziers holds one segment per interval between consecutive points,
	// in order of x. It is empty for a dot (an isolated value).
	Beziers []Bezier
}

// IsDot reports whether the run is a single isolated value, which the
// renderer draws as a dot as wide as the line.
func (r Run) IsDot() bool { return len(r.Beziers) == 0 }

// Points returns the number of data points in the run.
func (r Run) Points() int { return len(r.Beziers) + 1 }

// End returns the run's last point (Start for a dot).
func (r Run) End() Point {
	if len(r.Beziers) == 0 {
		return r.Start
	}
	return r.Beziers[len(r.Beziers)-1].P3
}

// YAt returns the line's plot y at plot x, and false when x lies outside
// the run.
func (r Run) YAt(x float64) (float64, bool) {
	if len(r.Beziers) == 0 {
		return r.Start.Y, x == r.Start.X
	}
	if !(x >= r.Start.X && x <= r.End().X) {
		return 0, false
	}
	i := sort.Search(len(r.Beziers), func(i int) bool { return r.Beziers[i].P3.X >= x })
	return r.Beziers[i].YAt(x), true
}

// A Builder turns series into runs, reusing its buffers so that building
// many series allocates only when a buffer must grow. The zero Builder is
// ready to use; a Builder must not be used by two goroutines at once.
//
// The Bézier segments of the runs it returns live in the Builder's storage
// and stay valid until Reset.
type Builder struct {
	d   []float64 // slopes of the current run
	bez []Bezier  // segments handed out since the last Reset
}

// Reset lets the Builder reuse the storage of every run it has returned;
// those runs must no longer be used.
func (b *Builder) Reset() { b.bez = b.bez[:0] }

// Build is Builder.Build with a fresh Builder: the runs own their storage.
func Build(xs, ys []float64, m Map, dst []Run) ([]Run, error) {
	var b Builder
	return b.Build(xs, ys, m, dst)
}

// Build appends to dst the runs of the line through the points (xs[i],
// ys[i]) mapped by m, and returns the extended slice. A NaN in ys is a gap:
// it ends the run before it. xs must be finite and strictly increasing
// (gap years included) and ys finite or NaN; otherwise Build returns dst
// unchanged and an error naming the first bad index.
func (b *Builder) Build(xs, ys []float64, m Map, dst []Run) ([]Run, error) {
	if err := check(xs, ys, m); err != nil {
		return dst, err
	}
	n := len(xs)
	// At most n−1 segments. A new block is made rather than growing the old
	// one, so runs already handed out keep their storage untouched.
	if need := n - 1; need > 0 && cap(b.bez)-len(b.bez) < need {
		b.bez = make([]Bezier, 0, max(need, 2*cap(b.bez)))
	}
	_, sy := m.Scale()
	sy3 := sy / 3 // plot rise per data rise, over the third of an interval
	orig, mark := len(dst), len(b.bez)
	for i := 0; i < n; {
		if math.IsNaN(ys[i]) {
			i++
			continue
		}
		j := i + 1
		for j < n && !math.IsNaN(ys[j]) {
			j++
		}
		r, err := b.run(xs[i:j], ys[i:j], i, m, sy3)
		if err != nil {
			b.bez = b.bez[:mark]
			return dst[:orig], err
		}
		dst = append(dst, r)
		i = j
	}
	return dst, nil
}

// run builds the run of points xs, ys (no gaps), which start at index first.
func (b *Builder) run(xs, ys []float64, first int, m Map, sy3 float64) (Run, error) {
	p0 := m.Apply(xs[0], ys[0])
	r := Run{First: first, Start: p0}
	if !finite(p0.X) || !finite(p0.Y) {
		return r, outside(first, xs[0], ys[0])
	}
	if len(xs) == 1 {
		return r, nil
	}
	b.d = slopes(xs, ys, b.d)
	d := b.d
	start := len(b.bez)
	for k := 0; k+1 < len(xs); k++ {
		p3 := m.Apply(xs[k+1], ys[k+1])
		if !finite(p3.X) || !finite(p3.Y) {
			return r, outside(first+k+1, xs[k+1], ys[k+1])
		}
		h := xs[k+1] - xs[k]
		third := (p3.X - p0.X) / 3
		y1 := p0.Y + sy3*(d[k]*h)
		y2 := p3.Y - sy3*(d[k+1]*h)
		// Fritsch–Butland slopes keep the control points between the end
		// points' heights (slope ≤ 3·secant); clamping only removes
		// rounding, so the segment provably stays in range.
		lo, hi := min(p0.Y, p3.Y), max(p0.Y, p3.Y)
		y1 = min(max(y1, lo), hi)
		y2 = min(max(y2, lo), hi)
		if !finite(y1) || !finite(y2) {
			// Only for data near the float64 limits (a secant overflows).
			return r, fmt.Errorf("curve: slope between points %d and %d is out of floating-point range", first+k, first+k+1)
		}
		b.bez = append(b.bez, Bezier{
			P0: p0,
			P1: Point{p0.X + third, y1},
			P2: Point{p3.X - third, y2},
			P3: p3,
		})
		p0 = p3
	}
	end := len(b.bez)
	r.Beziers = b.bez[start:end:end]
	return r, nil
}

// check validates a series before any output is made.
func check(xs, ys []float64, m Map) error {
	if len(xs) != len(ys) {
		return fmt.Errorf("curve: %d x values but %d y values", len(xs), len(ys))
	}
	if m.sx == 0 {
		return fmt.Errorf("curve: map is not set up (use NewMap)")
	}
	for i, x := range xs {
		if !finite(x) {
			return fmt.Errorf("curve: x[%d] = %v is not finite", i, x)
		}
		if i > 0 && !(x > xs[i-1]) {
			return fmt.Errorf("curve: x[%d] = %v does not exceed x[%d] = %v", i, x, i-1, xs[i-1])
		}
		y := ys[i]
		if math.IsInf(y, 0) {
			return fmt.Errorf("curve: y[%d] = %v is infinite (use NaN for a missing value)", i, y)
		}
	}
	return nil
}

func outside(i int, x, y float64) error {
	return fmt.Errorf("curve: point %d (%v, %v) maps outside the floating-point range", i, x, y)
}
