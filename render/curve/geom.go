package curve

import (
	"fmt"
	"math"
)

// Point is a position in plot coordinates (points), or in data
// coordinates where a function says so.
type Point struct{ X, Y float64 }

// Bezier is a cubic Bézier segment from P0 to P3 with control points P1 and P2.
type Bezier struct{ P0, P1, P2, P3 Point }

// At returns the point at parameter t in [0, 1], by de Casteljau's
// construction. At(0) is P0 and At(1) is P3 exactly, and a flat segment
// stays exactly flat.
func (b Bezier) At(t float64) Point {
	p01 := lerp(b.P0, b.P1, t)
	p12 := lerp(b.P1, b.P2, t)
	p23 := lerp(b.P2, b.P3, t)
	return lerp(lerp(p01, p12, t), lerp(p12, p23, t), t)
}

// Split cuts b at parameter t (de Casteljau) into the parts before and
// after it. The two parts share the cut point exactly.
func (b Bezier) Split(t float64) (Bezier, Bezier) {
	p01 := lerp(b.P0, b.P1, t)
	p12 := lerp(b.P1, b.P2, t)
	p23 := lerp(b.P2, b.P3, t)
	p012 := lerp(p01, p12, t)
	p123 := lerp(p12, p23, t)
	m := lerp(p012, p123, t)
	return Bezier{b.P0, p01, p012, m}, Bezier{m, p123, p23, b.P3}
}

// SplitAtX cuts b where its x coordinate equals x. For segments made by
// this package x is linear in t, so t = (x − P0.X)/(P3.X − P0.X) exactly,
// and the cut point's X is set to x itself so that it lines up bit for bit
// with, say, a year mapped by Map.X. x outside the segment is clamped to
// its ends (one part is then a single point).
func (b Bezier) SplitAtX(x float64) (Bezier, Bezier) {
	w := b.P3.X - b.P0.X
	var t float64
	switch {
	case w == 0 || x <= b.P0.X:
		t, x = 0, b.P0.X
	case x >= b.P3.X:
		t, x = 1, b.P3.X
	default:
		t = (x - b.P0.X) / w
	}
	l, r := b.Split(t)
	l.P3.X, r.P0.X = x, x
	return l, r
}

// YAt returns the curve's y where its x equals x, for x between P0.X and
// P3.X (see SplitAtX for why t follows from x directly).
func (b Bezier) YAt(x float64) float64 {
	switch {
	case x == b.P0.X:
		return b.P0.Y
	case x == b.P3.X:
		return b.P3.Y
	}
	return b.At((x - b.P0.X) / (b.P3.X - b.P0.X)).Y
}

func lerp(a, b Point, t float64) Point { return Point{lerp1(a.X, b.X, t), lerp1(a.Y, b.Y, t)} }

// lerp1 is exact at t = 0 and t = 1 and returns a when a == b, so end
// points and flat runs survive evaluation and splitting unchanged.
func lerp1(a, b, t float64) float64 {
	if t < 0.5 {
		return a + t*(b-a)
	}
	return b - (1-t)*(b-a)
}

// Map is the affine map from data space (years, values) to a panel's plot
// rectangle. The zero Map is not usable; make one with NewMap.
type Map struct {
	dx0, dy0 float64 // data origin
	sx, sy   float64 // plot units per data unit (sy < 0 when y points down)
	px0, px1 float64 // plot x at dataX0 and dataX1
	py0, py1 float64 // plot y at dataY0 and dataY1
	idw, idh float64 // 1/(dataX1−dataX0), 1/(dataY1−dataY0)
}

// NewMap returns the map taking dataX0→plotX0, dataX1→plotX1,
// dataY0→plotY0 and dataY1→plotY1. Time runs left to right, so both x
// ranges must increase; the y ranges may run either way, so plotY0 > plotY1
// gives a y axis pointing down (SVG) and plotY0 < plotY1 one pointing up
// (PDF). All values must be finite and no range may be empty.
func NewMap(dataX0, dataX1, dataY0, dataY1, plotX0, plotX1, plotY0, plotY1 float64) (Map, error) {
	for i, v := range [...]float64{dataX0, dataX1, dataY0, dataY1, plotX0, plotX1, plotY0, plotY1} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			names := [...]string{"dataX0", "dataX1", "dataY0", "dataY1", "plotX0", "plotX1", "plotY0", "plotY1"}
			return Map{}, fmt.Errorf("curve: map %s = %v is not finite", names[i], v)
		}
	}
	switch {
	case !(dataX1 > dataX0):
		return Map{}, fmt.Errorf("curve: map data x range [%v, %v] must increase", dataX0, dataX1)
	case !(plotX1 > plotX0):
		return Map{}, fmt.Errorf("curve: map plot x range [%v, %v] must increase", plotX0, plotX1)
	case dataY1 == dataY0:
		return Map{}, fmt.Errorf("curve: map data y range [%v, %v] is empty", dataY0, dataY1)
	case plotY1 == plotY0:
		return Map{}, fmt.Errorf("curve: map plot y range [%v, %v] is empty", plotY0, plotY1)
	}
	m := Map{
		dx0: dataX0, dy0: dataY0,
		px0: plotX0, px1: plotX1, py0: plotY0, py1: plotY1,
		idw: 1 / (dataX1 - dataX0), idh: 1 / (dataY1 - dataY0),
	}
	m.sx = (plotX1 - plotX0) * m.idw
	m.sy = (plotY1 - plotY0) * m.idh
	if math.IsInf(m.sx, 0) || math.IsInf(m.sy, 0) || m.sx == 0 || m.sy == 0 {
		return Map{}, fmt.Errorf("curve: map scale (%v, %v) is out of floating-point range", m.sx, m.sy)
	}
	return m, nil
}

// X maps a data x (a year) to plot x.
func (m Map) X(x float64) float64 { return mix(m.px0, m.px1, (x-m.dx0)*m.idw) }

// Y maps a data y (a value) to plot y.
func (m Map) Y(y float64) float64 { return mix(m.py0, m.py1, (y-m.dy0)*m.idh) }

// Apply maps a data point to plot coordinates.
func (m Map) Apply(x, y float64) Point { return Point{m.X(x), m.Y(y)} }

// Scale returns the plot units per data unit along x and y; the y scale is
// negative when the plot's y axis runs opposite to the data's.
func (m Map) Scale() (sx, sy float64) { return m.sx, m.sy }

// mix interpolates a→b by u in a form that is exact at u = 0 and u = 1, so
// the data range's corners land exactly on the plot rectangle's edges.
func mix(a, b, u float64) float64 { return (1-u)*a + u*b }
