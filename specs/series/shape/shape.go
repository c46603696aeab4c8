// Package shape compares the shapes of plotted series: how far apart two
// panels look, an order of panels in which neighbours look alike
// (seriation), clusters of alike panels with a plain description of what
// they share, and the pairs worth showing side by side (the most alike,
// and hand-overs, where one term falls as another rises).
//
// A shape is a series as its panel plots it: each value divided by the
// top of the panel's y-range, so 0 is the baseline and 1 the top of the
// plot. Years with no value (gaps) are bridged by a straight line between
// their neighbours, for comparison only; a series with no value at all is
// flat at 0. Everything here is a pure function of its inputs; ties are
// broken by index, so the same inputs give the same answers.
package shape

import (
	"math"
)

// Of returns the shape of a series plotted against a y-range from 0 to
// yMax: values ÷ yMax, gaps bridged.
func Of(values []float64, yMax float64) []float64 {
	out := make([]float64, len(values))
	if !(yMax > 0) || math.IsInf(yMax, 0) {
		yMax = 1
	}
	last := -1 // index of the last year with a value
	for i, v := range values {
		if math.IsNaN(v) {
			continue
		}
		out[i] = v / yMax
		if last < 0 {
			for k := 0; k < i; k++ { // leading gap: the first value
				out[k] = out[i]
			}
		} else {
			for k := last + 1; k < i; k++ {
				t := float64(k-last) / float64(i-last)
				out[k] = out[last] + t*(out[i]-out[last])
			}
		}
		last = i
	}
	if last >= 0 {
		for k := last + 1; k < len(out); k++ { // trailing gap
			out[k] = out[last]
		}
	}
	return out
}

// Distance is the root-mean-square difference of two shapes of one
// length: 0 for the same drawing, 1 for a line at the top against one at
// the baseline. It is a metric (the Euclidean distance scaled by 1/√n).
func Distance(a, b []float64) float64 {
	if len(a) == 0 {
		return 0
	}
	return math.Sqrt(sqDist(a, b) / float64(len(a)))
}

func sqDist(a, b []float64) float64 {
	b = b[:len(a)]
	var s0, s1 float64
	i := 0
	for ; i+1 < len(a); i += 2 {
		d0, d1 := a[i]-b[i], a[i+1]-b[i+1]
		s0 += d0 * d0
		s1 += d1 * d1
	}
	if i < len(a) {
		d := a[i] - b[i]
		s0 += d * d
	}
	return s0 + s1
}

// Matrix is a symmetric distance matrix stored as its lower triangle in
// float32 (half the memory of float64; shapes differ in the second digit,
// float32 keeps seven).
type Matrix struct {
	n int
	d []float32 // row i holds d(i, 0..i-1) at i(i-1)/2
}

// NewMatrix is an n × n matrix of zeros.
func NewMatrix(n int) *Matrix { return &Matrix{n: n, d: make([]float32, n*(n-1)/2)} }

// Len is n.
func (m *Matrix) Len() int { return m.n }

// At is d(i, j).
func (m *Matrix) At(i, j int) float64 {
	switch {
	case i == j:
		return 0
	case i < j:
		i, j = j, i
	}
	return float64(m.d[i*(i-1)/2+j])
}

// Set sets d(i, j) and d(j, i).
func (m *Matrix) Set(i, j int, v float64) {
	if i == j {
		return
	}
	if i < j {
		i, j = j, i
	}
	m.d[i*(i-1)/2+j] = float32(v)
}

// Distances is the matrix of Distance between every two shapes.
// Cost: n(n−1)/2 distances of y years each, rows shared among the
// processor's cores (each writes only its own rows).
func Distances(shapes [][]float64) *Matrix {
	m := NewMatrix(len(shapes))
	workers(len(shapes), func(rows func(func(int) bool)) struct{} {
		for i := range rows {
			for j := 0; j < i; j++ {
				m.Set(i, j, Distance(shapes[i], shapes[j]))
			}
		}
		return struct{}{}
	})
	return m
}

// Signature is what Seriate and Similar compare: the shape followed by
// its cumulative share of ink, c(t) = Σ_{s≤t} y(s) / Σ y (0 throughout
// for a shape with no ink). The distance between signatures is then half
// how differently the lines are drawn and half when their ink falls: the
// second half is the root-mean-square gap between the two cumulative
// curves, a relative of the earth mover's distance between the two
// lines' ink along the years. Without it two brief peaks eighty years
// apart are as close as two at the same decade (both are nearly all
// baseline), and every line with little ink looks like every other.
func Signature(y []float64) []float64 {
	out := make([]float64, 2*len(y))
	copy(out, y)
	var total float64
	for _, v := range y {
		total += v
	}
	if total > 0 {
		var run float64
		for t, v := range y {
			run += v
			out[len(y)+t] = run / total
		}
	}
	return out
}

// Signatures is Signature of each shape.
func Signatures(shapes [][]float64) [][]float64 {
	out := make([][]float64, len(shapes))
	for i, s := range shapes {
		out[i] = Signature(s)
	}
	return out
}
