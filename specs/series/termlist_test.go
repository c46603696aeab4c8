package series

import (
	"bytes"
	"regexp"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
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

// The table: the term column as wide as the longest term (in runes),
// every column two spaces from the last, numbers right-aligned, whole counts without a fraction, "–" for a term
// with no peak year; share per million (cmd/sheaf's TestTerms works the
// values by hand).
func TestWriteTermTable(t *testing.T) {
	var b bytes.Buffer
	require.NoError(t, WriteTermTable(&b, []TermStats{
		{Term: "alpha", Total: 100, Share: 0.02, PeakYear: 2001, Median: 25, Years: 4, Selected: true},
		{Term: "Maßstab", Total: 2.5, Share: 0.0005, Median: 1.25, Years: 1},
	}))
	assert.Equal(t, ""+
		"  term     total  per million  peak  median  years  selected\n"+
		"  alpha      100     20000.00  2001      25      4       yes\n"+
		"  Maßstab    2.5       500.00     –     1.2      1        no\n", b.String())
}
