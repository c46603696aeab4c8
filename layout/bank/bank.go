// Package bank chooses a plot's aspect ratio from its data by banking:
// making the line segments' slopes readable, which judgements of slope
// are best near 45° (Cleveland, McGill & McGill 1988, "The shape
// parameter of a two-variable graph", JASA 83(402):289–300).
//
// Aspects here are α = height ÷ width of the plot, as in the banking
// literature; the spec's panel aspect is width ÷ height, 1/α. Segments
// are measured in units of their plot's ranges: dx of the x range, dy of
// the y-range, both as absolute values, so a segment across the whole
// plot is 1 long, and its slope on the page at aspect α is α·dy/dx.
//
// Four methods are here; a feature is banked with ArcLength (Talbot,
// Gerth & Hanrahan 2011, who recommend it as the default: it needs no
// choice of which segments count and changes smoothly with the data).
// The other three are the classic ones it is checked against.
package bank

import (
	"math"
	"slices"
)

// Segment is one straight piece of a plotted line, in units of the
// plot's ranges (absolute values).
type Segment struct{ DX, DY float64 }

// usable drops segments with no length or no finite size.
func usable(segs []Segment) []Segment {
	out := make([]Segment, 0, len(segs))
	for _, s := range segs {
		dx, dy := math.Abs(s.DX), math.Abs(s.DY)
		if dx+dy > 0 && !math.IsInf(dx+dy, 0) && !math.IsNaN(dx+dy) {
			out = append(out, Segment{dx, dy})
		}
	}
	return out
}

// Limits on the aspect α the solvers search: a plot 1000 times wider
// than tall or the reverse is no chart.
const (
	MinAspect = 1e-3
	MaxAspect = 1e3
)

// MedianSlope is Cleveland's median-absolute-slope banking (Cleveland
// 1993, Visualizing Data, §3.1; Cleveland, McGill & McGill 1988): α =
// 1 / median |dy/dx| over segments with dx > 0, so that the median
// absolute slope on the page is 1 (45°). ok is false when the median
// slope is 0 or no segment has dx > 0.
func MedianSlope(segs []Segment) (alpha float64, ok bool) {
	var s []float64
	for _, g := range usable(segs) {
		if g.DX > 0 {
			s = append(s, g.DY/g.DX)
		}
	}
	if len(s) == 0 {
		return 0, false
	}
	m := median(s)
	if !(m > 0) {
		return 0, false
	}
	return clamp(1 / m), true
}

// AverageOrientation banks so that the mean absolute orientation of the
// segments on the page, mean |atan(α·dy/dx)|, is 45° (Cleveland 1993;
// as in Heer & Agrawala 2006, "Multi-scale banking to 45°", IEEE TVCG
// 12(5)). The mean grows with α, so bisection finds it.
func AverageOrientation(segs []Segment) (alpha float64, ok bool) {
	segs = usable(segs)
	return solveIncreasing(func(a float64) float64 {
		var sum float64
		for _, g := range segs {
			sum += math.Atan2(a*g.DY, g.DX)
		}
		return sum/float64(len(segs)) - math.Pi/4
	}, len(segs) > 0)
}

// AverageWeightedOrientation is AverageOrientation with each segment
// weighted by its length on the page (Cleveland 1993; Heer & Agrawala
// 2006): Σ θᵢℓᵢ / Σ ℓᵢ = 45°, ℓᵢ = √(dx² + (α·dy)²).
func AverageWeightedOrientation(segs []Segment) (alpha float64, ok bool) {
	segs = usable(segs)
	return solveIncreasing(func(a float64) float64 {
		var sum, w float64
		for _, g := range segs {
			l := math.Hypot(g.DX, a*g.DY)
			sum += math.Atan2(a*g.DY, g.DX) * l
			w += l
		}
		return sum/w - math.Pi/4
	}, len(segs) > 0)
}

// ArcLength is the arc-length banking of Talbot, Gerth & Hanrahan
// (2011), "Arc length-based aspect ratio selection", IEEE TVCG 17(12):
// the α that minimises the total length of the line on a plot of fixed
// area, Σ √(dx²/α + α·dy²) (width 1/√α, height √α). As a function of
// log α each term is the square root of a log-convex function, so the
// sum is convex and golden-section search finds its minimum. ok is false
// when the minimum is at a search limit (all segments flat, or all
// upright).
func ArcLength(segs []Segment) (alpha float64, ok bool) {
	segs = usable(segs)
	if len(segs) == 0 {
		return 0, false
	}
	f := func(t float64) float64 {
		a := math.Exp(t)
		var sum float64
		for _, g := range segs {
			sum += math.Sqrt(g.DX*g.DX/a + a*g.DY*g.DY)
		}
		return sum
	}
	lo, hi := math.Log(MinAspect), math.Log(MaxAspect)
	phi := (math.Sqrt(5) - 1) / 2
	x1, x2 := hi-phi*(hi-lo), lo+phi*(hi-lo)
	f1, f2 := f(x1), f(x2)
	for hi-lo > 1e-10 {
		if f1 <= f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - phi*(hi-lo)
			f1 = f(x1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + phi*(hi-lo)
			f2 = f(x2)
		}
	}
	t := (lo + hi) / 2
	const edge = 1e-6
	if t-math.Log(MinAspect) < edge || math.Log(MaxAspect)-t < edge {
		return clamp(math.Exp(t)), false
	}
	return math.Exp(t), true
}

// MedianOrientation is the median absolute orientation, in degrees, of
// the segments drawn at aspect α: 45 when half the segments are steeper
// than 45° and half flatter.
func MedianOrientation(segs []Segment, alpha float64) float64 {
	segs = usable(segs)
	if len(segs) == 0 {
		return 0
	}
	th := make([]float64, len(segs))
	for i, g := range segs {
		th[i] = math.Atan2(alpha*g.DY, g.DX) * 180 / math.Pi
	}
	return median(th)
}

// solveIncreasing finds where an increasing function of α crosses 0, by
// bisection on log α.
func solveIncreasing(f func(float64) float64, any bool) (float64, bool) {
	if !any {
		return 0, false
	}
	lo, hi := math.Log(MinAspect), math.Log(MaxAspect)
	if f(math.Exp(lo)) > 0 {
		return MinAspect, false
	}
	if f(math.Exp(hi)) < 0 {
		return MaxAspect, false
	}
	for range 200 {
		mid := (lo + hi) / 2
		if f(math.Exp(mid)) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Exp((lo + hi) / 2), true
}

func median(v []float64) float64 {
	s := slices.Clone(v)
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

func clamp(a float64) float64 { return math.Max(MinAspect, math.Min(MaxAspect, a)) }

// Lines turns plotted lines into segments: each line has one value per
// x step over the whole x range (len(ys[i]) − 1 steps) and is plotted
// from 0 to its yMax; a NaN value is a gap, and no segment touches it.
func Lines(ys [][]float64, yMax []float64) []Segment {
	var out []Segment
	for i, y := range ys {
		if len(y) < 2 || !(yMax[i] > 0) {
			continue
		}
		dx := 1 / float64(len(y)-1)
		for t := 1; t < len(y); t++ {
			if math.IsNaN(y[t-1]) || math.IsNaN(y[t]) {
				continue
			}
			out = append(out, Segment{DX: dx, DY: math.Abs(y[t]-y[t-1]) / yMax[i]})
		}
	}
	return out
}
