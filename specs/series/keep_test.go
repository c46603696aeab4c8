package series

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestKeptCountsMatchSecondRead: a spec that can select every term has
// its counts kept from the first read; one that selects a few has them
// read again. Both must give the same series, to the bit: the same rows
// added in the same (file) order. The table is invented: 30 terms, some
// written in two cases (added together under fold-case), fractional
// counts (so the order of addition shows), and counts in 1903, a year the
// totals lack (kept as they are under raw scaling).
func TestKeptCountsMatchSecondRead(t *testing.T) {
	var b strings.Builder
	b.WriteString("term,year,count\n")
	for i := range 30 {
		for y := 1900; y <= 1905; y++ {
			if (i+y)%4 == 0 {
				continue // no row: 0, or a gap in 1903
			}
			fmt.Fprintf(&b, "term%02d,%d,%g\n", i, y, float64((i*7+y*3)%50)+0.1*float64(y%3))
			if i%5 == 0 {
				fmt.Fprintf(&b, "TERM%02d,%d,%g\n", i, y, 0.2+0.1*float64(i%3))
			}
		}
	}
	for _, mode := range []specs.ScaleMode{specs.ScaleRaw, specs.ScaleShare, specs.ScaleOwnPeak} {
		text := b.String()
		if mode != specs.ScaleRaw { // shares need a total for every count
			var kept []string
			for _, l := range strings.SplitAfter(text, "\n") {
				if !strings.Contains(l, ",1903,") {
					kept = append(kept, l)
				}
			}
			text = strings.Join(kept, "")
		}
		loadWith := func(extra string) *Set {
			s, err := specs.Load(feature(t, "counts.csv", text, "", extra))
			require.NoError(t, err, "loading the spec")
			s.Data.FoldCase = true
			s.Scale.Mode = mode
			set, err := Load(s)
			require.NoError(t, err, "loading the data (%s)", mode)
			return set
		}
		all := loadWith("")                  // can select every term: kept
		few := loadWith("terms: {top: 3}\n") // keeps at most 6 of 30: read again
		require.Equal(t, 30, all.Terms, "%s: terms", mode)
		require.Len(t, all.Series, 30, "%s: selected of all", mode)
		require.Len(t, few.Series, 3, "%s: selected of the top 3", mode)
		byTerm := map[string]*Series{}
		for i := range all.Series {
			byTerm[all.Series[i].Term] = &all.Series[i]
		}
		for _, sr := range few.Series {
			ref := byTerm[sr.Term]
			require.NotNil(t, ref, "%s: %q missing from the full selection", mode, sr.Term)
			for _, pair := range [][2][]float64{{sr.Counts, ref.Counts}, {sr.Values, ref.Values}} {
				for j := range pair[0] {
					assert.Equal(t, math.Float64bits(pair[1][j]), math.Float64bits(pair[0][j]),
						"%s: %q year %d: bits read again (%v) and kept (%v)", mode, sr.Term, 1900+j, pair[0][j], pair[1][j])
				}
			}
		}
	}
}
