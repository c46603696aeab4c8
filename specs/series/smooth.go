package series

import (
	"math"
	"sync"
)

// Pool sums counts and exposure over a centred window of years years
// around each year: the pooled estimate of year j is counts ÷ exposure
// over its window (a ratio of sums, not a mean of yearly ratios, so a
// year with a small total weighs as little as its words). A window is cut
// where the run of years it sits in ends — at the span's ends and at a gap
// year (NaN count or exposure) —, so it shrinks there and never reaches
// across a gap. Gap years stay NaN. years of 0 or 1 pools nothing: each
// year alone.
func Pool(counts, exposure []float64, years int) (pooled, pooledExposure []float64) {
	n := len(counts)
	return PoolInto(make([]float64, n), make([]float64, n), counts, exposure, years)
}

// PoolInto is Pool writing into pooled and pooledExposure (new slices
// where they are shorter than counts), returning them cut to its length:
// a caller that pools thousands of series one after the other (scaling,
// preflight) reuses two slices instead of allocating two a series.
func PoolInto(pooled, pooledExposure, counts, exposure []float64, years int) ([]float64, []float64) {
	n := len(counts)
	if cap(pooled) < n {
		pooled = make([]float64, n)
	}
	if cap(pooledExposure) < n {
		pooledExposure = make([]float64, n)
	}
	pooled, pooledExposure = pooled[:n], pooledExposure[:n]
	half := 0
	if years > 1 {
		half = years / 2
	}
	for j := 0; j < n; {
		if math.IsNaN(counts[j]) || math.IsNaN(exposure[j]) {
			pooled[j], pooledExposure[j] = math.NaN(), math.NaN()
			j++
			continue
		}
		// The run of years with data that j starts: [start, end).
		end := j + 1
		for end < n && !math.IsNaN(counts[end]) && !math.IsNaN(exposure[end]) {
			end++
		}
		windowSums(pooled[j:end], counts[j:end], half)
		windowSums(pooledExposure[j:end], exposure[j:end], half)
		j = end
	}
	return pooled, pooledExposure
}

// windowSums sets each sums[i] to the sum of xs over the window of half
// years either side of i, cut at the ends of xs: 0 plus xs[lo], plus
// xs[lo+1], … up to xs[hi], in that order. When every x is a whole
// number of at most 2^53 ÷ the window (counts and totals almost always
// are), every partial sum is a whole number below 2^53, exact, so a
// running sum that adds the year entering the window and subtracts the
// one leaving gives those same sums in fewer steps.
func windowSums(sums, xs []float64, half int) {
	n := len(xs)
	if half == 0 {
		for i, x := range xs {
			sums[i] = 0 + x // as the sum of one: 0 + -0 is +0
		}
		return
	}
	limit := float64(1<<53) / float64(2*half+1)
	whole := true
	for _, x := range xs {
		// Within ±limit, x converts to int64 and back unchanged exactly
		// when it is a whole number; NaN fails the first test.
		if !(x >= -limit && x <= limit) || x != float64(int64(x)) {
			whole = false
			break
		}
	}
	if !whole {
		for i := range n {
			lo, hi := max(0, i-half), min(n-1, i+half)
			var c float64
			for _, x := range xs[lo : hi+1] {
				c += x
			}
			sums[i] = c
		}
		return
	}
	var c float64
	for k := range min(half, n) {
		c += xs[k]
	}
	for i := range n {
		if k := i + half; k < n {
			c += xs[k]
		}
		if k := i - half - 1; k >= 0 {
			c -= xs[k]
		}
		sums[i] = c
	}
}

// exposure is what a count is divided by in each year: the year's total
// words for shares, one year for raw counts (so that a pooled raw count
// is a mean per year). NaN where the year is a gap.
func (set *Set) exposure(sr *Series) []float64 {
	if set.totals != nil {
		return set.totals
	}
	e := make([]float64, len(sr.Counts))
	for j := range e {
		e[j] = 1
	}
	return e
}

// Pooled returns a series' counts summed over each year's rolling window
// and what they are divided by (the window's total words, or its number
// of years with raw counts); without smoothing, each year's own. The
// plotted value is pooled ÷ exposure × sr.Factor.
func (set *Set) Pooled(sr *Series) (pooled, exposure []float64) {
	return Pool(sr.Counts, set.exposure(sr), set.Rolling)
}

// PooledInto is Pooled writing into pooled and exposure (see PoolInto).
func (set *Set) PooledInto(sr *Series, pooled, exposure []float64) ([]float64, []float64) {
	return PoolInto(pooled, exposure, sr.Counts, set.exposure(sr), set.Rolling)
}

// Yearly returns a series' values year by year before any smoothing, in
// the unit of the feature before own-peak scaling: per million words (or
// raw counts). A one-year spike is a property of these.
// A series built by hand without counts has only its values.
func (set *Set) Yearly(sr *Series) []float64 {
	return set.YearlyInto(sr, nil)
}

// YearlyInto is Yearly writing into v (a new slice where it is shorter
// than the series), for a caller that reads thousands of series one
// after the other. A series without counts gives its own Values, not v.
func (set *Set) YearlyInto(sr *Series, v []float64) []float64 {
	if len(sr.Counts) == 0 {
		return sr.Values
	}
	e := set.exposure(sr)
	f := set.unitFactor
	if f == 0 {
		f = 1
	}
	if cap(v) < len(sr.Counts) {
		v = make([]float64, len(sr.Counts))
	}
	v = v[:len(sr.Counts)]
	for j, c := range sr.Counts {
		v[j] = c / e[j] * f
	}
	return v
}

// Band returns the limits of the exact Poisson interval at iv's level
// around every plotted value of sr: each year's pooled count's interval
// (PoissonInterval), divided by its exposure and scaled as the line is.
// NaN in gap years; nil for a series without counts.
func (set *Set) Band(sr *Series, iv *Intervals) (lo, hi []float64) {
	if len(sr.Counts) == 0 || iv == nil {
		return nil, nil // built by hand without counts: no band
	}
	pooled, exposure := set.Pooled(sr)
	lo, hi = make([]float64, len(pooled)), make([]float64, len(pooled))
	for j, k := range pooled {
		if math.IsNaN(k) {
			lo[j], hi[j] = math.NaN(), math.NaN()
			continue
		}
		l, u := iv.Of(k)
		lo[j] = l / exposure[j] * sr.Factor
		hi[j] = u / exposure[j] * sr.Factor
	}
	return lo, hi
}

// Intervals remembers PoissonInterval at one confidence level by count:
// counts repeat across thousands of terms (most are small whole
// numbers), so each is solved once. It is safe for concurrent use.
type Intervals struct {
	Level float64
	mu    sync.Mutex
	known map[float64][2]float64
}

// NewIntervals returns an empty memo for level (0.95 for 95 %).
func NewIntervals(level float64) *Intervals {
	return &Intervals{Level: level, known: map[float64][2]float64{}}
}

// Of returns the interval of count k.
func (iv *Intervals) Of(k float64) (lo, hi float64) {
	iv.mu.Lock()
	v, ok := iv.known[k]
	iv.mu.Unlock()
	if ok {
		return v[0], v[1]
	}
	lo, hi = PoissonInterval(k, iv.Level)
	iv.mu.Lock()
	iv.known[k] = [2]float64{lo, hi}
	iv.mu.Unlock()
	return lo, hi
}
