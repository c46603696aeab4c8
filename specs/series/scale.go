package series

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

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
	// pooled and exposure are scratch, reused from series to series.
	pooled, exposure := make([]float64, span), make([]float64, span)
	for i, k := range selected {
		a := aggs[k]
		sr := Series{Term: a.term, Total: a.total, Share: a.share,
			Counts: set.counts[i], Values: make([]float64, span), PeakYear: s.Years.From, Factor: set.unitFactor}
		pooled, exposure = set.PooledInto(&sr, pooled[:cap(pooled)], exposure[:cap(exposure)])
		for j, c := range pooled {
			switch {
			case math.IsNaN(c):
				sr.Values[j] = math.NaN()
			case s.Scale.Mode == specs.ScaleRaw && set.Rolling == 0:
				sr.Values[j] = c
			default:
				sr.Values[j] = c / exposure[j] * set.unitFactor
			}
		}
		sr.Peak, sr.PeakYear = peak(sr.Values, s.Years.From)
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
		set.YMax = math.Max(set.YMax, sr.YMax)
		out[i] = sr
	}
	if s.Scale.YRange == specs.YShared {
		for i := range out {
			out[i].YMax = set.YMax
		}
	}
	return out
}

func peak(v []float64, from int) (float64, int) {
	best, year := math.Inf(-1), from
	for j, x := range v {
		if !math.IsNaN(x) && x > best {
			best, year = x, from+j
		}
	}
	if math.IsInf(best, -1) {
		return 0, from
	}
	return best, year
}

// arrange orders the series and cuts them into groups.
func arrange(s *specs.Spec, set *Set) {
	ser := set.Series
	switch s.Order {
	case specs.OrderAlpha:
		slices.SortStableFunc(ser, func(x, y Series) int {
			if c := strings.Compare(strings.ToLower(x.Term), strings.ToLower(y.Term)); c != 0 {
				return c
			}
			return strings.Compare(x.Term, y.Term)
		})
	case specs.OrderPeakYear:
		slices.SortStableFunc(ser, func(x, y Series) int {
			if c := cmp.Compare(x.PeakYear, y.PeakYear); c != 0 {
				return c
			}
			return strings.Compare(x.Term, y.Term)
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
	slices.SortStableFunc(ser, func(x, y Series) int { return cmp.Compare(x.PeakYear/10, y.PeakYear/10) })
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
