package series

import (
	"cmp"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	"sheaf/specs"
)

// Note says how the values were smoothed, for the key: "5-year rolling
// share" (or "mean" of raw counts), or "" without smoothing.
func (set *Set) Note() string {
	if set.Rolling < 2 {
		return ""
	}
	if set.totals == nil {
		return fmt.Sprintf("%d-year rolling mean", set.Rolling)
	}
	return fmt.Sprintf("%d-year rolling share", set.Rolling)
}

// Units of the plotted values, for the key and the check summary: the
// spec's phrase (text.unit) or its language's.
var unitPhrases = map[specs.ScaleMode]specs.PhraseID{
	specs.ScaleShare:   specs.PhraseUnitShare,
	specs.ScaleOwnPeak: specs.PhraseUnitOwnPeak,
	specs.ScaleRaw:     specs.PhraseUnitRaw,
}

// scale turns the raw counts into plotted values; totals are by year of
// the span from its first (see reader.spanTotals). Counts are pooled over
// the spec's rolling window first (Pool): with none, each year alone.
// Series are scaled in parallel, each alone, so the values do not depend
// on how they are shared out.
func scale(s *specs.Spec, totals []float64, aggs map[string]*agg, selected []string, set *Set) []Series {
	span := s.Years.Len()
	out := make([]Series, len(selected))
	set.Unit = s.Phrase(unitPhrases[s.Scale.Mode])
	set.unitFactor = 1e6
	if s.Scale.Mode == specs.ScaleRaw {
		set.unitFactor = 1
	} else {
		set.totals = totals
	}
	sc := scaler{s: s, set: set, span: span, values: make([]float64, len(selected)*span)}
	// Exposure pooled once: the same for every series with no gap of its
	// own (a NaN count in a year with exposure; with shares there is
	// none, as a count needs its year's total).
	sc.exposure = set.exposure(&Series{Counts: make([]float64, span)})
	sc.pooledExposure = make([]float64, span)
	PoolInto(make([]float64, span), sc.pooledExposure, make([]float64, span), sc.exposure, set.Rolling)
	for i, k := range selected {
		a := aggs[k]
		out[i] = Series{Term: a.term, Total: a.total, Share: a.share, Counts: set.counts[i]}
	}
	// Two or more goroutines for a few thousand series; one for a few.
	workers := min(runtime.GOMAXPROCS(0), max(1, len(out)/256))
	var wg sync.WaitGroup
	for w := range workers {
		lo, hi := w*len(out)/workers, (w+1)*len(out)/workers
		wg.Go(func() { sc.scale(out[lo:hi], lo) })
	}
	wg.Wait()
	for i := range out {
		set.YMax = math.Max(set.YMax, out[i].YMax)
	}
	if s.Scale.YRange == specs.YShared {
		for i := range out {
			out[i].YMax = set.YMax
		}
	}
	return out
}

// scaler scales series: scale's state, read-only while it runs.
type scaler struct {
	s                        *specs.Spec
	set                      *Set
	span                     int
	values                   []float64 // every series' values, series after series
	exposure, pooledExposure []float64
}

// scale fills the values, peaks and factors of out, the series from
// number first on.
func (sc *scaler) scale(out []Series, first int) {
	s, set, span := sc.s, sc.set, sc.span
	// pooled and exposure are scratch, reused from series to series.
	pooled, scratch := make([]float64, span), make([]float64, span)
	for i := range out {
		sr := &out[i]
		sr.Values = sc.values[(first+i)*span : (first+i+1)*span : (first+i+1)*span]
		sr.Factor = set.unitFactor
		exposure := sc.pooledExposure
		if !sc.pool(sr.Counts, pooled) {
			pooled, exposure = set.PooledInto(sr, pooled, scratch)
		}
		// The values and their peak (as peak finds it) in one pass.
		best, year := math.Inf(-1), s.Years.From
		for j, c := range pooled {
			var v float64
			switch {
			case math.IsNaN(c):
				v = math.NaN()
			case s.Scale.Mode == specs.ScaleRaw && set.Rolling == 0:
				v = c
			default:
				v = c / exposure[j] * set.unitFactor
			}
			sr.Values[j] = v
			if !math.IsNaN(v) && v > best {
				best, year = v, s.Years.From+j
			}
		}
		if math.IsInf(best, -1) {
			best, year = 0, s.Years.From
		}
		sr.Peak, sr.PeakYear = best, year
		if s.Scale.Mode == specs.ScaleOwnPeak && sr.Peak > 0 {
			for j := range sr.Values {
				sr.Values[j] /= sr.Peak
			}
			sr.Factor /= sr.Peak
			sr.Peak = 1
		}
		sr.YMax = sr.Peak
		if sr.YMax <= 0 {
			sr.YMax = 1
		}
	}
}

// pool is PoolInto for counts whose gaps are the exposure's: it sums
// the counts over the same windows, in the same order, and reports
// false, having done nothing, for counts with a gap of their own.
func (sc *scaler) pool(counts, pooled []float64) bool {
	e := sc.exposure
	for j, c := range counts {
		if math.IsNaN(c) && !math.IsNaN(e[j]) {
			return false
		}
	}
	half, n := 0, len(counts)
	if r := sc.set.Rolling; r > 1 {
		half = r / 2
	}
	for j := 0; j < n; {
		if math.IsNaN(e[j]) {
			pooled[j] = math.NaN()
			j++
			continue
		}
		end := j + 1
		for end < n && !math.IsNaN(e[end]) {
			end++
		}
		windowSums(pooled[j:end], counts[j:end], half)
		j = end
	}
	return true
}

// arrange orders the series and cuts them into groups.
func arrange(s *specs.Spec, set *Set) {
	ser := set.Series
	switch s.Order {
	case specs.OrderAlpha:
		lower := make([]string, len(ser))
		for i := range ser {
			lower[i] = strings.ToLower(ser[i].Term)
		}
		sortStable(ser, func(x, y int) int {
			if c := strings.Compare(lower[x], lower[y]); c != 0 {
				return c
			}
			return strings.Compare(ser[x].Term, ser[y].Term)
		})
	case specs.OrderPeakYear:
		sortStable(ser, func(x, y int) int {
			if c := cmp.Compare(ser[x].PeakYear, ser[y].PeakYear); c != 0 {
				return c
			}
			return strings.Compare(ser[x].Term, ser[y].Term)
		})
	}
	if s.Group == specs.GroupSimilarity {
		bySimilarity(s, set)
		return
	}
	if s.Order == specs.OrderSimilarity {
		seriate(set) // then grouped by decade below, if asked, keeping this order within
	}
	if s.Group != specs.GroupPeakDecade {
		set.Groups = []Group{{Start: 0, Count: len(ser)}}
		return
	}
	sortStable(ser, func(x, y int) int { return cmp.Compare(ser[x].PeakYear/10, ser[y].PeakYear/10) })
	for i := 0; i < len(ser); {
		dec := ser[i].PeakYear / 10 * 10
		j := i
		for j < len(ser) && ser[j].PeakYear/10*10 == dec {
			j++
		}
		set.Groups = append(set.Groups, Group{Heading: specs.Fill(s.Phrase(specs.PhraseGroupHeading), "decade", strconv.Itoa(dec)), Start: i, Count: j - i})
		i = j
	}
}

// sortStable sorts ser as slices.SortStableFunc would with cmp, which
// compares the series at two indices of ser as it is on entry (see
// stableOrder).
func sortStable(ser []Series, cmp func(x, y int) int) {
	idx := stableOrder(len(ser), cmp)
	sorted := make([]Series, len(ser))
	for i, j := range idx {
		sorted[i] = ser[j]
	}
	copy(ser, sorted)
}

// stableOrder returns the indices 0 to n-1 in the order a stable sort
// by cmp (a consistent ordering of the indices' items) leaves them: cmp,
// then the index, is a total order, which allows one order only, so the
// faster unstable sort finds it, and each item moves once.
func stableOrder(n int, cmp func(x, y int) int) []int {
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	slices.SortFunc(idx, func(x, y int) int {
		if c := cmp(x, y); c != 0 {
			return c
		}
		return x - y
	})
	return idx
}
