package curve

import (
	"fmt"
	"math"
)

// Slopes returns dy/dx at each point of one run of data (no gaps) by the
// Fritsch–Butland rule, appended to dst[:0]. xs must strictly increase and
// every value must be finite. One point gets slope 0 (a dot); two points
// share the secant (a straight segment).
func Slopes(xs, ys, dst []float64) ([]float64, error) {
	if len(xs) != len(ys) {
		return dst[:0], fmt.Errorf("curve: %d x values but %d y values", len(xs), len(ys))
	}
	for i := range xs {
		if !finite(xs[i]) {
			return dst[:0], fmt.Errorf("curve: x[%d] = %v is not finite", i, xs[i])
		}
		if !finite(ys[i]) {
			return dst[:0], fmt.Errorf("curve: y[%d] = %v is not finite (Slopes takes one run; Build splits at gaps)", i, ys[i])
		}
		if i > 0 && !(xs[i] > xs[i-1]) {
			return dst[:0], fmt.Errorf("curve: x[%d] = %v does not exceed x[%d] = %v", i, xs[i], i-1, xs[i-1])
		}
	}
	return slopes(xs, ys, dst), nil
}

// slopes is Slopes on checked input.
func slopes(xs, ys, dst []float64) []float64 {
	n := len(xs)
	dst = grow(dst, n)
	switch n {
	case 0:
		return dst
	case 1:
		dst[0] = 0
		return dst
	case 2:
		s := (ys[1] - ys[0]) / (xs[1] - xs[0])
		dst[0], dst[1] = s, s
		return dst
	}
	// Interior: weighted harmonic mean of the neighbouring secants
	// (Fritsch & Butland 1984; weights 2h_k+h_k−1 and h_k+2h_k−1), zero at
	// a turn or next to a flat interval. Written in the same operation
	// order as gonum's FritschButland so the two agree to rounding; the
	// sign test differs from gonum's product test only where that product
	// would underflow to zero.
	sPrev := (ys[1] - ys[0]) / (xs[1] - xs[0])
	for i := 1; i < n-1; i++ {
		s := (ys[i+1] - ys[i]) / (xs[i+1] - xs[i])
		if sameSign(sPrev, s) {
			dst[i] = 3 * (xs[i+1] - xs[i-1]) /
				((2*xs[i+1]-xs[i-1]-xs[i])/sPrev + (xs[i+1]+xs[i]-2*xs[i-1])/s)
		} else {
			dst[i] = 0
		}
		sPrev = s
	}
	dst[0] = endSlope(xs[0], xs[1], xs[2], ys[0], ys[1], ys[2])
	dst[n-1] = endSlope(xs[n-1], xs[n-2], xs[n-3], ys[n-1], ys[n-2], ys[n-3])
	return dst
}

// endSlope is the one-sided three-point slope at the end point e, with m
// the next point inward and i the one after: the derivative at e of the
// parabola through the three points, set to zero if its sign differs from
// the end secant's and limited to three times that secant when the data
// turn at m, so the end interval stays monotone (Fritsch & Carlson 1980).
// This is the end rule of gonum's FritschButland; it reads the same from
// either end because the parabola's slope does not depend on direction.
func endSlope(xe, xm, xi, ye, ym, yi float64) float64 {
	hE := xm - xe // negative at the right end, as are the two below
	h := xi - xe
	dE := (ym - ye) / hE
	dI := (yi - ym) / (xi - xm)
	g := ((hE+h)*dE - hE*dI) / h
	if !sameSign(g, dE) {
		return 0
	}
	if !sameSign(dE, dI) && math.Abs(g) > 3*math.Abs(dE) {
		return 3 * dE
	}
	return g
}

// sameSign reports whether a and b are both positive or both negative.
// Unlike a*b > 0 it cannot underflow for tiny slopes.
func sameSign(a, b float64) bool { return (a > 0 && b > 0) || (a < 0 && b < 0) }

// finite reports whether v is neither NaN nor infinite (both make v−v NaN).
func finite(v float64) bool { return v-v == 0 }

// grow returns s[:n], reallocating only when its capacity is short.
func grow[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	return s[:n]
}
