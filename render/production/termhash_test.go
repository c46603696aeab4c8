package production

import (
	"context"
	"fmt"
	"sort"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs/series"
)

// TestTermHashesInRuns: hashing terms one after another with one hasher
// gives each term the hash it has alone (termSum), for series of unequal
// lengths (a reused buffer must not leak one term's bytes into the
// next).
func TestTermHashesInRuns(t *testing.T) {
	d := termData(150)
	got := termHashes(context.Background(), d)
	require.Len(t, got, len(d.Series))
	want := make([]TermHash, len(d.Series))
	for i := range d.Series {
		want[i] = TermHash{Term: d.Series[i].Term, SHA256: termSum(&d.Series[i]), Peak: d.Series[i].PeakYear}
	}
	sort.Slice(want, func(i, j int) bool { return want[i].Term < want[j].Term })
	assert.Equal(t, want, got)
}

// termData makes n terms of 3 to 9 years, named in descending order.
func termData(n int) *series.Set {
	d := &series.Set{}
	for i := range n {
		sr := series.Series{Term: fmt.Sprintf("term %03d", n-1-i), PeakYear: 1900 + i}
		for y := range 3 + i%7 {
			sr.Counts = append(sr.Counts, float64(i*y))
			sr.Values = append(sr.Values, float64(i+y)/3)
		}
		d.Series = append(d.Series, sr)
	}
	return d
}
