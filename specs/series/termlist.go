package series

import (
	"fmt"
	"io"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"
	"unicode/utf8"
)

// TermColumns are the columns a term list can be sorted by (SortTerms),
// in table order.
func TermColumns() []string {
	return []string{"term", "total", "share", "peak", "median", "years", "selected"}
}

// TermFilter says which of a catalog's terms to keep; the zero value
// keeps all.
type TermFilter struct {
	Match    string         // only terms containing this, in any case
	Pattern  *regexp.Regexp // only terms it matches (nil: any)
	Selected bool           // only the terms the spec selects
}

// FilterTerms returns the rows the filter keeps, in their order, in a new
// slice (nil when none).
func FilterTerms(rows []TermStats, f TermFilter) []TermStats {
	needle := strings.ToLower(f.Match)
	var out []TermStats
	for _, t := range rows {
		if f.Selected && !t.Selected || needle != "" && !strings.Contains(strings.ToLower(t.Term), needle) || f.Pattern != nil && !f.Pattern.MatchString(t.Term) {
			continue
		}
		out = append(out, t)
	}
	return out
}

// SortTerms orders rows by a column of TermColumns: term A→Z, selected
// first, numbers largest first; ties by term, so the order is the same
// every time. An unknown column sorts by term.
func SortTerms(rows []TermStats, by string, reverse bool) {
	key := func(t *TermStats) float64 {
		switch by {
		case "total":
			return t.Total
		case "share":
			return t.Share
		case "peak":
			return float64(t.PeakYear)
		case "median":
			return t.Median
		case "years":
			return float64(t.Years)
		case "selected":
			if t.Selected {
				return 1
			}
		}
		return 0
	}
	less := func(a, b *TermStats) bool {
		if by != "term" {
			if ka, kb := key(a), key(b); ka != kb {
				return ka > kb
			}
		}
		return a.Term < b.Term
	}
	sort.SliceStable(rows, func(i, j int) bool {
		if reverse {
			return less(&rows[j], &rows[i])
		}
		return less(&rows[i], &rows[j])
	})
}

// WriteTermTable prints rows for a person, as `sheaf terms` does: a
// header and a row a term — total, share per million, peak year, median,
// years present, selected — numbers aligned right.
func WriteTermTable(w io.Writer, rows []TermStats) error {
	// Numbers align right; the term, padded to the longest, stays left.
	wide := len("term")
	for _, t := range rows {
		wide = max(wide, utf8.RuneCountInString(t.Term))
	}
	pad := func(s string) string { return s + strings.Repeat(" ", wide-utf8.RuneCountInString(s)) }
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, pad("term")+"\ttotal\tper million\tpeak\tmedian\tyears\tselected\t")
	for _, t := range rows {
		yes := "no"
		if t.Selected {
			yes = "yes"
		}
		peak := "–"
		if t.PeakYear != 0 {
			peak = strconv.Itoa(t.PeakYear)
		}
		fmt.Fprintf(tw, "%s\t%s\t%.2f\t%s\t%s\t%d\t%s\t\n", pad(t.Term), countText(t.Total), t.Share*1e6, peak, countText(t.Median), t.Years, yes)
	}
	return tw.Flush()
}

// countText writes a count: whole numbers without a fraction.
func countText(v float64) string {
	if v == float64(int64(v)) {
		return strconv.FormatInt(int64(v), 10)
	}
	return strconv.FormatFloat(v, 'f', 1, 64)
}
