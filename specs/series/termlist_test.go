package series

import (
	"regexp"
	"testing"

	"github.com/stretchr/testify/assert"
)

// The rows of cmd/sheaf's TestTerms, worked by hand there (alpha: total
// 100, peak 2001, median 25, 4 years; beta: 12, 2000, 6, 2; gamma: 1,
// 2003, 1, 1, not selected), plus delta to tie alpha's share: ties are
// broken by term, so the order never depends on the input's.
func TestSortAndFilterTerms(t *testing.T) {
	rows := func() []TermStats {
		return []TermStats{
			{Term: "gamma", Total: 1, Share: 0.0002, PeakYear: 2003, Median: 1, Years: 1},
			{Term: "delta", Total: 100, Share: 0.02, PeakYear: 2001, Median: 25, Years: 4},
			{Term: "beta", Total: 12, Share: 0.0024, PeakYear: 2000, Median: 6, Years: 2, Selected: true},
			{Term: "alpha", Total: 100, Share: 0.02, PeakYear: 2001, Median: 25, Years: 4, Selected: true},
		}
	}
	names := func(ts []TermStats) []string {
		var out []string
		for _, x := range ts {
			out = append(out, x.Term)
		}
		return out
	}
	for _, tc := range []struct {
		by      string
		reverse bool
		want    []string
	}{
		{"term", false, []string{"alpha", "beta", "delta", "gamma"}},
		{"term", true, []string{"gamma", "delta", "beta", "alpha"}},
		{"share", false, []string{"alpha", "delta", "beta", "gamma"}},
		{"total", false, []string{"alpha", "delta", "beta", "gamma"}},
		{"peak", false, []string{"gamma", "alpha", "delta", "beta"}},
		{"peak", true, []string{"beta", "delta", "alpha", "gamma"}},
		{"median", false, []string{"alpha", "delta", "beta", "gamma"}},
		{"years", true, []string{"gamma", "beta", "delta", "alpha"}},
		{"selected", false, []string{"alpha", "beta", "delta", "gamma"}},
	} {
		r := rows()
		SortTerms(r, tc.by, tc.reverse)
		assert.Equal(t, tc.want, names(r), "%s reverse=%v", tc.by, tc.reverse)
	}
	assert.Equal(t, []string{"term", "total", "share", "peak", "median", "years", "selected"}, TermColumns(), "README's terms table, in order")

	for _, tc := range []struct {
		f    TermFilter
		want []string
	}{
		{TermFilter{}, []string{"gamma", "delta", "beta", "alpha"}},
		{TermFilter{Match: "MM"}, []string{"gamma"}},
		{TermFilter{Pattern: regexp.MustCompile("^(a|b)")}, []string{"beta", "alpha"}},
		{TermFilter{Selected: true}, []string{"beta", "alpha"}},
		{TermFilter{Match: "A", Selected: true, Pattern: regexp.MustCompile("ph")}, []string{"alpha"}},
		{TermFilter{Match: "zzz"}, nil},
	} {
		assert.Equal(t, tc.want, names(FilterTerms(rows(), tc.f)), "%+v", tc.f)
	}
}
