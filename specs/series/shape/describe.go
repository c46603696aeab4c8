package shape

import (
	"fmt"
	"math"
)

// Kind is the broad form of a shape.
type Kind string

const (
	Steady  Kind = "steady"  // never below 60 % of its top
	Rising  Kind = "rising"  // low at the start, high at the end
	Falling Kind = "falling" // high at the start, low at the end
	Peaked  Kind = "peaked"  // low at both ends
	Dipped  Kind = "dipped"  // high at both ends, low between
	Other   Kind = "other"
	Empty   Kind = "empty" // no ink at all
)

// Description is what Describe finds in a shape, with the words it uses.
type Description struct {
	Kind     Kind
	Text     string // "Rising since 1990": plain words, from the numbers below only
	PeakYear int    // the smoothed shape's highest year (first of equals)
	LowYear  int    // its lowest year between the ends (Dipped)
	Since    int    // Rising: the year its last climb above half the top began; Falling: the year its first fall below half began
	HighFrom int    // first year at or above half the top
	HighTo   int    // last year at or above half the top
}

// Describe puts a shape (one value per year from the year from) into
// plain words. It looks at the shape smoothed by a centred 9-year moving
// mean and divided by its top, r(t): the mean of r over the first and the
// last tenth of the span (at least 5 years) says whether it starts and
// ends high (≥ ½; ≥ 0.75 for a line still rising) or low; where r
// crosses ½ dates a rise or a fall. Years are given as their decade ("1990", "the 1920s"): the
// smoothing blurs single years. The thresholds are our own choice.
func Describe(y []float64, from int) Description {
	n := len(y)
	r := movingMean(y, 4)
	top := 0.0
	for _, v := range r {
		top = math.Max(top, v)
	}
	if n == 0 || !(top > 0) {
		return Description{Kind: Empty, Text: "No occurrences", PeakYear: from, HighFrom: from, HighTo: from}
	}
	d := Description{HighFrom: -1}
	low := 1.0
	for t := range r {
		r[t] /= top
		if r[t] == 1 && d.PeakYear == 0 {
			d.PeakYear = from + t
		}
		low = math.Min(low, r[t])
		if r[t] >= 0.5 {
			if d.HighFrom < 0 {
				d.HighFrom = from + t
			}
			d.HighTo = from + t
		}
	}
	edge := max(5, n/10)
	edge = min(edge, n)
	start, end := mean(r[:edge]), mean(r[n-edge:])
	decade := func(year int) int { return year / 10 * 10 }
	switch {
	case low >= 0.6:
		d.Kind, d.Text = Steady, "Steady throughout"
	case start < 0.5 && end >= 0.5:
		t := n - 1
		for t > 0 && r[t-1] >= 0.5 {
			t--
		}
		d.Since = from + t
		d.Kind, d.Text = Rising, fmt.Sprintf("Rising since %d", decade(d.Since))
		if end < 0.75 { // still high, but past its top
			d.Text = fmt.Sprintf("High since %d, peak in the %ds", decade(d.Since), decade(d.PeakYear))
		}
	case start >= 0.5 && end < 0.5:
		t := 0
		for t+1 < n && r[t+1] >= 0.5 {
			t++
		}
		d.Since = from + t + 1
		d.Kind, d.Text = Falling, fmt.Sprintf("Falling since %d", decade(d.Since))
	case start < 0.5 && end < 0.5:
		d.Kind = Peaked
		if d.HighTo-d.HighFrom+1 <= 20 {
			d.Text = fmt.Sprintf("Brief peak in the %ds", decade(d.PeakYear))
		} else {
			d.Text = fmt.Sprintf("Peak in the %ds", decade(d.PeakYear))
		}
	case start >= 0.5 && end >= 0.5:
		lt := edge
		for t := edge; t < n-edge; t++ {
			if r[t] < r[lt] {
				lt = t
			}
		}
		d.LowYear = from + lt
		d.Kind, d.Text = Dipped, fmt.Sprintf("Low in the %ds, high at both ends", decade(d.LowYear))
	default:
		d.Kind, d.Text = Other, fmt.Sprintf("Peak in the %ds", decade(d.PeakYear))
	}
	return d
}

// movingMean is the centred mean over t−h…t+h, cut at the ends.
func movingMean(y []float64, h int) []float64 {
	out := make([]float64, len(y))
	for t := range y {
		lo, hi := max(0, t-h), min(len(y)-1, t+h)
		out[t] = mean(y[lo : hi+1])
	}
	return out
}

func mean(y []float64) float64 {
	if len(y) == 0 {
		return 0
	}
	var s float64
	for _, v := range y {
		s += v
	}
	return s / float64(len(y))
}
