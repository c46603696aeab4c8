package palette

import (
	"fmt"
	"math"
	"sort"
	"strconv"
)

// Anchor pins a colour to a year.
type Anchor struct {
	Year  float64
	Color Color
}

// Era is one step of a discrete scale: the years From ≤ y < To share one
// colour (the last era also holds its To year).
type Era struct {
	From, To float64
	Color    Color
	last     bool
}

// Label names the era by the years it holds, e.g. "1868–1899" for an era
// that ends where the next begins in 1900; the last era holds its end year.
func (e Era) Label() string {
	to := e.To
	if !e.last && to == math.Trunc(to) && to-1 >= e.From {
		to-- // whole years: the boundary year belongs to the next era
	}
	return yearLabel(e.From) + "–" + yearLabel(to)
}

// Stop is one gradient stop for a renderer: a year and the clipped sRGB
// colour there.
type Stop struct {
	Year  float64
	Color RGB
}

// Scale maps a year to a colour: continuously, by straight lines in OKLab
// between anchors, or in discrete eras. Build one with NewScale or Default;
// the zero Scale has no anchors and maps every year to black.
type Scale struct {
	name    string
	anchors []Anchor
	eras    []Era
}

// DefaultStopError is the ΔE00 Stops keeps to when given maxErr ≤ 0: a
// quarter of a just-noticeable difference (CSS Color 4 takes one JND as
// ΔE2000 = 2), so the gradient a renderer draws is indistinguishable from
// the scale.
const DefaultStopError = 0.5

// NewScale makes a scale through anchors, which must hold at least two
// finite years in strictly increasing order. With eraBounds nil the scale
// is continuous. Otherwise eraBounds (at least two, strictly increasing)
// cut the time line into eras [b0,b1), [b1,b2), …; each era takes the
// continuous scale's colour at its mid-year, so an anchor placed at an
// era's mid-year gives that era exactly the anchor's colour.
func NewScale(name string, anchors []Anchor, eraBounds []float64) (Scale, error) {
	if len(anchors) < 2 {
		return Scale{}, fmt.Errorf("palette %q: need at least 2 anchors, have %d", name, len(anchors))
	}
	for i, a := range anchors {
		if !finite(a.Year) {
			return Scale{}, fmt.Errorf("palette %q: anchor %d: year %v is not a finite number", name, i+1, a.Year)
		}
		if ok := a.Color.ok; !finite(ok.L) || !finite(ok.A) || !finite(ok.B) {
			return Scale{}, fmt.Errorf("palette %q: anchor %d (year %s): colour is not finite", name, i+1, yearLabel(a.Year))
		}
		if i > 0 && !(a.Year > anchors[i-1].Year) {
			return Scale{}, fmt.Errorf("palette %q: anchor %d (year %s) must come after anchor %d (year %s)",
				name, i+1, yearLabel(a.Year), i, yearLabel(anchors[i-1].Year))
		}
	}
	s := Scale{name: name, anchors: append([]Anchor(nil), anchors...)}
	if eraBounds == nil {
		return s, nil
	}
	if len(eraBounds) < 2 {
		return Scale{}, fmt.Errorf("palette %q: eras need at least 2 boundary years, have %d", name, len(eraBounds))
	}
	for i, b := range eraBounds {
		if !finite(b) {
			return Scale{}, fmt.Errorf("palette %q: era boundary %d: year %v is not a finite number", name, i+1, b)
		}
		if i > 0 && !(b > eraBounds[i-1]) {
			return Scale{}, fmt.Errorf("palette %q: era boundary %d (year %s) must come after boundary %d (year %s)",
				name, i+1, yearLabel(b), i, yearLabel(eraBounds[i-1]))
		}
	}
	for i := 0; i+1 < len(eraBounds); i++ {
		from, to := eraBounds[i], eraBounds[i+1]
		s.eras = append(s.eras, Era{From: from, To: to, Color: s.continuous((from + to) / 2), last: i+2 == len(eraBounds)})
	}
	return s, nil
}

// Name returns the scale's name.
func (s Scale) Name() string { return s.name }

// Discrete reports whether the scale is made of eras.
func (s Scale) Discrete() bool { return len(s.eras) > 0 }

// Anchors returns a copy of the anchors.
func (s Scale) Anchors() []Anchor { return append([]Anchor(nil), s.anchors...) }

// Eras returns a copy of the eras, nil for a continuous scale.
func (s Scale) Eras() []Era { return append([]Era(nil), s.eras...) }

// Span returns the first and last year the scale defines: the era
// boundaries of a discrete scale, else the first and last anchor.
func (s Scale) Span() (from, to float64) {
	if len(s.eras) > 0 {
		return s.eras[0].From, s.eras[len(s.eras)-1].To
	}
	if len(s.anchors) == 0 {
		return 0, 0
	}
	return s.anchors[0].Year, s.anchors[len(s.anchors)-1].Year
}

// At returns the colour for year. Years before or after the span take the
// colour at its nearer end (NaN takes the first), so a chart whose data
// overrun the palette still draws.
func (s Scale) At(year float64) Color {
	if len(s.eras) == 0 {
		return s.continuous(year)
	}
	i := sort.Search(len(s.eras), func(i int) bool { return year < s.eras[i].To })
	return s.eras[min(i, len(s.eras)-1)].Color
}

// continuous interpolates linearly in OKLab between the anchors around year.
func (s Scale) continuous(year float64) Color {
	n := len(s.anchors)
	switch {
	case n == 0:
		return Color{}
	case !(year > s.anchors[0].Year):
		return s.anchors[0].Color
	case year >= s.anchors[n-1].Year:
		return s.anchors[n-1].Color
	}
	i := sort.Search(n, func(i int) bool { return s.anchors[i].Year > year }) // 1 ≤ i < n
	a, b := s.anchors[i-1], s.anchors[i]
	t := (year - a.Year) / (b.Year - a.Year)
	p, q := a.Color.ok, b.Color.ok
	return Color{OKLab{p.L + t*(q.L-p.L), p.A + t*(q.A-p.A), p.B + t*(q.B-p.B)}}
}

// Stops returns gradient stops from year from to year to, with colours
// clipped to sRGB. For a continuous scale they are dense enough that
// straight-line interpolation in encoded sRGB between consecutive stops —
// what PDF axial shadings and SVG gradients do — stays within maxErr ΔE00
// of the scale (maxErr ≤ 0 means DefaultStopError); every anchor inside
// the range is a stop. For a discrete scale, each inner era boundary gives
// two stops at the same year, the colour before and after, so the
// gradient steps hard. Stops returns nil unless from < to, both finite.
func (s Scale) Stops(from, to, maxErr float64) []Stop {
	if !finite(from) || !finite(to) || !(from < to) || len(s.anchors) == 0 {
		return nil
	}
	if !(maxErr > 0) {
		maxErr = DefaultStopError
	}
	stop := func(y float64) Stop { return Stop{y, s.At(y).RGB().Clip()} }
	if len(s.eras) > 0 {
		stops := []Stop{stop(from)}
		for i := 0; i+1 < len(s.eras); i++ {
			if b := s.eras[i].To; b > from && b < to {
				stops = append(stops, Stop{b, s.eras[i].Color.RGB().Clip()}, Stop{b, s.eras[i+1].Color.RGB().Clip()})
			}
		}
		// The last stop takes the era the range ends in, even when to is
		// itself a boundary (At(to) would give the next era).
		last := s.eras[0]
		for _, e := range s.eras {
			if e.From < to {
				last = e
			}
		}
		return append(stops, Stop{to, last.Color.RGB().Clip()})
	}
	knots := []float64{from}
	for _, a := range s.anchors {
		if a.Year > from && a.Year < to {
			knots = append(knots, a.Year)
		}
	}
	knots = append(knots, to)
	stops := []Stop{stop(from)}
	for i := 0; i+1 < len(knots); i++ {
		stops = s.refine(stops, stop(knots[i]), stop(knots[i+1]), maxErr, 0)
	}
	return stops
}

// maxStopDepth bounds subdivision at 2^12 stops per anchor segment, so a
// tiny maxErr costs memory, not a hang.
const maxStopDepth = 12

// refine appends b and, before it, the stops needed between a and b. The
// sRGB-interpolation error is smooth between anchors, except where
// clipping to the gamut puts kinks in it, so seven probes per interval
// find it; tests confirm with dense sampling.
func (s Scale) refine(stops []Stop, a, b Stop, maxErr float64, depth int) []Stop {
	if depth < maxStopDepth && s.stopError(a, b) > maxErr {
		mid := (a.Year + b.Year) / 2
		m := Stop{mid, s.At(mid).RGB().Clip()}
		stops = s.refine(stops, a, m, maxErr, depth+1)
		return s.refine(stops, m, b, maxErr, depth+1)
	}
	return append(stops, b)
}

// stopError is the largest ΔE00 at seven probes between the scale and the
// straight sRGB line from a to b.
func (s Scale) stopError(a, b Stop) float64 {
	worst := 0.0
	for k := 1; k < 8; k++ {
		t := float64(k) / 8
		y := a.Year + t*(b.Year-a.Year)
		want := s.At(y).RGB().Clip()
		got := RGB{a.Color.R + t*(b.Color.R-a.Color.R), a.Color.G + t*(b.Color.G-a.Color.G), a.Color.B + t*(b.Color.B-a.Color.B)}
		worst = math.Max(worst, DeltaE00(FromRGB(want).Lab(), FromRGB(got).Lab()))
	}
	return worst
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// yearLabel prints whole years without decimals and others with one.
func yearLabel(y float64) string {
	if y == math.Trunc(y) && math.Abs(y) < 1e15 {
		return strconv.FormatFloat(y, 'f', 0, 64)
	}
	return strconv.FormatFloat(y, 'f', 1, 64)
}
