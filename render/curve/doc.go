// Package curve turns a yearly series into the cubic Bézier segments of a
// smooth line that passes exactly through every data point.
//
// # The rule
//
// The curve is a monotone piecewise cubic Hermite interpolant whose
// slopes at the data points follow Fritsch & Butland (1984): at an interior
// point the slope is a weighted harmonic mean of the two neighbouring
// secants, and zero where the data turn (the secants differ in sign or one
// is zero); the two end points use a one-sided three-point estimate, limited
// so that it keeps the sign of the end secant and stays within three times
// it. The rule matches gonum.org/v1/gonum/interp.FritschButland, so the
// curve can be, and is, tested against that library.
//
// Why this rule: a reader of a small multiple trusts a line to show the
// data, no more. This interpolant is
//   - exact: it passes through every yearly value;
//   - shape-preserving: on every interval it is monotone, so it never
//     invents a peak or a dip between two years, never leaves the range of
//     the interval's two values (counts never go below zero), and keeps flat
//     runs flat (Fritsch & Carlson 1980 give the monotonicity region; the
//     Fritsch–Butland slopes lie inside it);
//   - local: a value moves the curve only on its neighbouring intervals;
//   - C¹: smooth, with no kinks at the years.
//
// A natural cubic spline is smoother (C²) but overshoots next to plateaus
// and steps; see the contrast test.
//
// Each interval [x_k, x_k+1] becomes one Bézier segment in plot coordinates.
// Its end points are exactly Map.Apply of the data points (bit for bit) and
// its control points sit at a third of the interval:
//
//	P1 = P0 + (h/3)·(1, d_k),  P2 = P3 − (h/3)·(1, d_k+1)
//
// so x is linear in the curve parameter t and t = (x − x_k)/h exactly; this
// is what lets later stages split a segment at a year (Bezier.SplitAtX).
// The slopes are computed in data coordinates and then mapped, so the same
// rule serves any x spacing and plots whose y axis points up (PDF) or down
// (SVG).
//
// # Gaps
//
// A y value of NaN marks a missing year: the line stops there and starts
// again at the next value, without bridging the gap. Each stretch of
// consecutive values is a Run. A run of one isolated value has no segments;
// the renderer draws it as a dot as wide as the line, so the value is not
// lost. A run of two values is a straight segment.
//
// References:
//   - F. N. Fritsch and J. Butland, A method for constructing local monotone
//     piecewise cubic interpolants, SIAM J. Sci. Stat. Comput. 5(2):300–304,
//     1984.
//   - F. N. Fritsch and R. E. Carlson, Monotone piecewise cubic
//     interpolation, SIAM J. Numer. Anal. 17(2):238–246, 1980.
package curve
