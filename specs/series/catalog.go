package series

import (
	"math"
	"slices"

	"golang.org/x/text/cases"

	"sheaf/specs"
)

// TermStats describes one term of the counts table over the spec's span,
// for choosing terms (`sheaf terms`).
type TermStats struct {
	Term     string  `json:"term"`     // as first written in the data, NFC
	Total    float64 `json:"total"`    // occurrences over the span
	Share    float64 `json:"share"`    // Total ÷ all words printed over the span
	PeakYear int     `json:"peak"`     // the first year of the highest rate (count ÷ the year's total; the count where there is no total)
	Median   float64 `json:"median"`   // median yearly count over the years present
	Years    int     `json:"years"`    // years with a count above zero
	Selected bool    `json:"selected"` // the spec's terms selection takes it
}

// Catalog reads the data a spec names and describes every term in it, in
// the order of the counts table, each marked with whether the spec
// selects it. Problems come back as specs.Errors with file and line, as
// from Load.
func Catalog(s *specs.Spec) ([]TermStats, error) {
	var errs specs.Errors
	totals, ok := readTotals(s, &errs)
	if !ok {
		return nil, errs
	}
	r := &reader{spec: s, totals: totals, errs: &errs, fold: s.Data.FoldCase, keepAll: true}
	if s.Data.FoldCase {
		r.folder = cases.Fold()
	}
	aggs, order := r.pass1()
	if len(errs) > 0 {
		return nil, errs
	}
	selected := map[string]bool{}
	for _, k := range r.selectTerms(aggs, order) {
		selected[k] = true
	}
	if len(errs) > 0 {
		return nil, errs
	}
	spanTotals := r.spanTotals()
	out := make([]TermStats, len(order))
	buf := make([]float64, 0, s.Years.Len())
	for i, k := range order {
		a := aggs[k]
		st := TermStats{Term: a.term, Total: a.total, Share: a.share, Selected: selected[k]}
		best := math.Inf(-1)
		buf = buf[:0]
		for j, c := range a.counts {
			if math.IsNaN(c) || c <= 0 {
				continue
			}
			buf = append(buf, c)
			rate := c
			if t := spanTotals[j]; !math.IsNaN(t) && t > 0 {
				rate = c / t
			}
			if rate > best {
				best, st.PeakYear = rate, s.Years.From+j
			}
		}
		st.Years = len(buf)
		if n := len(buf); n > 0 {
			slices.Sort(buf)
			st.Median = buf[n/2]
			if n%2 == 0 {
				st.Median = (buf[n/2-1] + buf[n/2]) / 2
			}
		}
		out[i] = st
	}
	return out, nil
}
