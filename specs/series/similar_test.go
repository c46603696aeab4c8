package series

import (
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
	"sheaf/specs/series/shape"
)

// shapedFeature writes a feature over 1900–2000 whose terms have the
// given yearly shares (per million words; totals 10⁶ a year) and returns
// the spec's path.
func shapedFeature(t *testing.T, terms map[string]func(year int) float64, extra string) string {
	t.Helper()
	dir := t.TempDir()
	var counts, totals strings.Builder
	counts.WriteString("term,year,count\n")
	totals.WriteString("year,total\n")
	names := make([]string, 0, len(terms))
	for k := range terms {
		names = append(names, k)
	}
	slices.Sort(names)
	for y := 1900; y <= 2000; y++ {
		fmt.Fprintf(&totals, "%d,1000000\n", y)
	}
	for _, n := range names {
		for y := 1900; y <= 2000; y++ {
			fmt.Fprintf(&counts, "%s,%d,%d\n", n, y, int(math.Round(terms[n](y)*1000)))
		}
	}
	write(t, filepath.Join(dir, "counts.csv"), counts.String())
	write(t, filepath.Join(dir, "totals.csv"), totals.String())
	spec := "title: T\ndata: {counts: counts.csv, totals: totals.csv}\nyears: {from: 1900, to: 2000}\nscale: {values: own-peak}\noutputs: {print: {kind: print}}\n" + extra
	path := filepath.Join(dir, "spec.yaml")
	write(t, path, spec)
	return path
}

func bump(centre, width float64) func(int) float64 {
	return func(y int) float64 { d := (float64(y) - centre) / width; return 1 + 100*math.Exp(-d*d/2) }
}

func logistic(mid float64, rising bool) func(int) float64 {
	return func(y int) float64 {
		v := 1 / (1 + math.Exp(-(float64(y)-mid)/4))
		if !rising {
			v = 1 - v
		}
		return 1 + 100*v
	}
}

// order: similarity puts bumps whose peaks march through the years in
// the order of their peaks (a Robinson set: see package shape), whatever
// the names say.
func TestOrderSimilarity(t *testing.T) {
	terms := map[string]func(int) float64{}
	want := []string{}
	for i, name := range []string{"zinc", "mica", "adze", "quoin", "brad", "kiln", "ogee", "jamb"} {
		terms[name] = bump(1910+float64(i)*10, 8)
		want = append(want, name)
	}
	set, err := load(t, shapedFeature(t, terms, "order: similarity\n"))
	require.NoError(t, err)
	var got []string
	for _, s := range set.Series {
		got = append(got, s.Term)
	}
	assert.Equal(t, want, got, "peaks 1910, 1920, … in order")
	require.Len(t, set.Groups, 1)
	assert.Empty(t, set.Groups[0].Heading)
}

// group: similarity: two families of shapes become two groups, headed by
// what their mean shape does; with another order, each group is sorted
// by it.
func TestGroupSimilarity(t *testing.T) {
	terms := map[string]func(int) float64{}
	rising := []string{"alpha", "delta", "gamma", "kappa", "omega", "sigma"}
	falling := []string{"beta", "epsilon", "eta", "iota", "lambda", "theta"}
	for i, n := range rising {
		terms[n] = logistic(1958+float64(i), true)
	}
	for i, n := range falling {
		terms[n] = logistic(1932+float64(i), false)
	}
	set, err := load(t, shapedFeature(t, terms, "order: alphabetical\ngroup: similarity\n"))
	require.NoError(t, err)
	require.Len(t, set.Groups, 2, "%+v", set.Groups)
	heads := map[string][]string{}
	for _, g := range set.Groups {
		var names []string
		for _, s := range set.Series[g.Start : g.Start+g.Count] {
			names = append(names, s.Term)
		}
		heads[g.Heading] = names
	}
	// Logistic midpoints 1958–1963 (rising) and 1932–1937 (falling): the
	// group means cross ½ about 1960 and 1935 — by the construction
	// above; the words are shape.Describe's.
	assert.Equal(t, rising, heads["Rising since 1960"], "%v", heads)
	assert.Equal(t, falling, heads["Falling since 1930"], "%v", heads)
}

// More panels than similarity handles is an error at the spec's key.
func TestSimilarityLimit(t *testing.T) {
	var counts strings.Builder
	counts.WriteString("term,year,count\n")
	for i := range MaxSimilar + 1 {
		fmt.Fprintf(&counts, "t%d,1900,1\n", i)
	}
	path := feature(t, "counts.csv", counts.String(), "", "group: similarity\n")
	s, err := specs.Load(path)
	require.NoError(t, err)
	_, err = Load(s)
	require.Error(t, err)
	assert.Regexp(t, `spec.yaml:7:1: group: similarity compares every two panels and takes at most 5000; the spec selects 5001 terms`, err.Error())
}

// order: similarity with group: peak-decade: decades as headings, the
// seriation's order within each.
func TestOrderSimilarityByDecade(t *testing.T) {
	terms := map[string]func(int) float64{}
	for i, name := range []string{"zinc", "mica", "adze", "quoin"} {
		terms[name] = bump(1912+float64(i)*2, 6) // peaks 1912–1918: one decade
	}
	terms["kiln"] = bump(1955, 6)
	set, err := load(t, shapedFeature(t, terms, "order: similarity\ngroup: peak-decade\n"))
	require.NoError(t, err)
	require.Len(t, set.Groups, 2)
	assert.Equal(t, "Peak in the 1910s", set.Groups[0].Heading)
	var got []string
	for _, s := range set.Series[:4] {
		got = append(got, s.Term)
	}
	assert.Equal(t, []string{"zinc", "mica", "adze", "quoin"}, got, "by peak within the decade: the seriation's order")
}

// The demo (examples/quillmere/similarity.yaml) has a group whose lines
// are of mixed kinds (some dip, some only wave): its heading says so,
// and every other heading's kind is that of most of its lines.
func TestDemoHeadingsHold(t *testing.T) {
	s, err := specs.Load("../../examples/quillmere/similarity.yaml")
	require.NoError(t, err)
	set, err := Load(s)
	require.NoError(t, err)
	shapes := set.Shapes()
	mixed := 0
	for _, g := range set.Groups {
		members := shapes[g.Start : g.Start+g.Count]
		kind := shape.Describe(shape.Mean(members), s.Years.From).Kind
		same := 0
		for _, m := range members {
			if shape.Describe(m, s.Years.From).Kind == kind {
				same++
			}
		}
		if strings.HasSuffix(g.Heading, "(mixed)") {
			mixed++
			assert.Less(t, 2*same, g.Count, g.Heading)
		} else {
			assert.GreaterOrEqual(t, 2*same, g.Count, g.Heading)
		}
	}
	assert.Positive(t, mixed, "the demo has a mixed group")
}
