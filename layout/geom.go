package layout

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
)

// Rect is an axis-aligned rectangle in points, y up: (X0, Y0) is the
// bottom-left corner and (X1, Y1) the top-right.
type Rect struct{ X0, Y0, X1, Y1 float64 }

// W is the rectangle's width.
func (r Rect) W() float64 { return r.X1 - r.X0 }

// H is the rectangle's height.
func (r Rect) H() float64 { return r.Y1 - r.Y0 }

// IsZero reports whether r is the zero Rect (an absent box).
func (r Rect) IsZero() bool { return r == Rect{} }

// eps absorbs floating-point rounding in containment tests: far below any
// printable distance (1e-6 pt ≈ 0.35 nm).
const eps = 1e-6

// Contains reports whether o lies inside r (edges may touch).
func (r Rect) Contains(o Rect) bool {
	return o.X0 >= r.X0-eps && o.Y0 >= r.Y0-eps && o.X1 <= r.X1+eps && o.Y1 <= r.Y1+eps
}

// Overlaps reports whether r and o share interior area; rectangles that
// only touch along an edge do not overlap.
func (r Rect) Overlaps(o Rect) bool {
	return r.X0 < o.X1-eps && o.X0 < r.X1-eps && r.Y0 < o.Y1-eps && o.Y0 < r.Y1-eps
}

// Inset returns r shrunk by d on every side (grown when d < 0).
func (r Rect) Inset(d float64) Rect { return Rect{r.X0 + d, r.Y0 + d, r.X1 - d, r.Y1 - d} }

// Translate returns r moved by (dx, dy).
func (r Rect) Translate(dx, dy float64) Rect { return Rect{r.X0 + dx, r.Y0 + dy, r.X1 + dx, r.Y1 + dy} }

func (r Rect) String() string {
	return fmt.Sprintf("[%s %s %s %s]", fmtPt(r.X0), fmtPt(r.Y0), fmtPt(r.X1), fmtPt(r.Y1))
}

// MarshalJSON writes r as [x0, y0, x1, y1], rounded to 0.001 pt: finer
// than any output device and short enough to read.
func (r Rect) MarshalJSON() ([]byte, error) {
	b := make([]byte, 0, 48)
	b = append(b, '[')
	for i, v := range [4]float64{r.X0, r.Y0, r.X1, r.Y1} {
		if i > 0 {
			b = append(b, ',')
		}
		b = appendPt(b, v)
	}
	return append(b, ']'), nil
}

// UnmarshalJSON reads the form MarshalJSON writes.
func (r *Rect) UnmarshalJSON(b []byte) error {
	var v [4]float64
	if err := json.Unmarshal(b, &v); err != nil {
		return fmt.Errorf("layout: rect must be [x0, y0, x1, y1]: %w", err)
	}
	*r = Rect{v[0], v[1], v[2], v[3]}
	return nil
}

// Point is a position in points, y up.
type Point struct {
	X float64 `json:"x"`
	Y float64 `json:"y"`
}

func round3(v float64) float64 {
	v = math.Round(v*1000) / 1000
	if v == 0 {
		return 0 // no "-0" in output
	}
	return v
}

func appendPt(b []byte, v float64) []byte {
	return strconv.AppendFloat(b, round3(v), 'f', -1, 64)
}

func fmtPt(v float64) string { return string(appendPt(nil, v)) }
