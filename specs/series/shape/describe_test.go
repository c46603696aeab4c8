package shape

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Describe on shapes built to a known form over 1868–2025. The words and
// thresholds are our own rule (see Describe); the years follow from the
// construction: a logistic with midpoint m crosses ½ at m, a Gaussian's
// half-maximum width is 2.355σ (2√(2 ln 2)σ, a property of the normal
// curve), so σ = 5 gives 12 years and σ = 25 gives 59.
func TestDescribe(t *testing.T) {
	const from, to = 1868, 2025
	mk := func(f func(y float64) float64) []float64 {
		out := make([]float64, to-from+1)
		for i := range out {
			out[i] = f(float64(from + i))
		}
		return out
	}
	logistic := func(mid float64, up bool) func(float64) float64 {
		return func(y float64) float64 {
			v := 1 / (1 + math.Exp(-(y-mid)/5))
			if !up {
				v = 1 - v
			}
			return v
		}
	}
	gauss := func(c, s float64) func(float64) float64 {
		return func(y float64) float64 { return math.Exp(-(y - c) * (y - c) / (2 * s * s)) }
	}
	for _, tc := range []struct {
		name string
		y    []float64
		kind Kind
		text string
	}{
		{"logistic rise, midpoint 1993", mk(logistic(1993, true)), Rising, "Rising since 1990"},
		{"logistic fall, midpoint 1915.5", mk(logistic(1915.5, false)), Falling, "Falling since 1910"},
		{"Gaussian peak 1925, σ = 5 (half-max 12 years)", mk(gauss(1925, 5)), Peaked, "Brief peak in the 1920s"},
		{"Gaussian peak 1945, σ = 25 (half-max 59 years)", mk(gauss(1945, 25)), Peaked, "Peak in the 1940s"},
		{"flat at 0.8 with a ripple of ±0.1", mk(func(y float64) float64 { return 0.8 + 0.1*math.Sin(y) }), Steady, "Steady throughout"},
		{"U: 1 − Gaussian at 1955, σ = 20", mk(func(y float64) float64 { return 1 - gauss(1955, 20)(y) }), Dipped, "Low in the 1950s, high at both ends"},
		{"rise to 1 about 1955, back to 0.6 by 2025", mk(func(y float64) float64 { return logistic(1955, true)(y) - 0.4*logistic(2000, true)(y) }), Rising, "High since 1950, peak in the 1980s"},
		{"nothing", make([]float64, to-from+1), Empty, "No occurrences"},
	} {
		d := Describe(tc.y, from)
		assert.Equal(t, tc.kind, d.Kind, tc.name)
		assert.Equal(t, tc.text, d.Text, tc.name)
	}
	d := Describe(mk(gauss(1925, 5)), from)
	assert.Equal(t, 1925, d.PeakYear, "the Gaussian's centre")
	assert.InDelta(t, 12, d.HighTo-d.HighFrom+1, 3, "half-max width 2.355σ ≈ 12 years, blurred by the 9-year mean")
}

// Two groups whose means read alike get the years they stay above half
// their top, so no two headings are the same.
func TestHeadingsDistinct(t *testing.T) {
	const from = 1868
	g := func(c, s float64) []float64 {
		out := make([]float64, 158)
		for i := range out {
			d := float64(from+i) - c
			out[i] = math.Exp(-d * d / (2 * s * s))
		}
		return out
	}
	shapes := [][]float64{g(1922, 12), g(1924, 12), g(1925, 30), g(1926, 30)}
	heads := Headings(shapes, []int{0, 1, 2, 3}, []Run{{0, 2}, {2, 2}}, from)
	require.Len(t, heads, 2)
	assert.NotEqual(t, heads[0], heads[1])
	assert.Regexp(t, `^Peak in the 1920s \(high 19\d\d–19\d\d\)$`, heads[0])
	assert.Regexp(t, `^Peak in the 1920s \(high 18\d\d–19\d\d\)$`, heads[1])
}

// Described: every heading is true of most of its group's lines (the
// mean's kind is that of half or more of them) or says it is mixed; the
// groups cover the order.
func TestDescribedHeadingsHold(t *testing.T) {
	const from, years = 1868, 158
	r := rand.New(rand.NewPCG(4, 4))
	var shapes [][]float64
	for i := range 120 {
		s := make([]float64, years)
		mid := 20 + r.Float64()*118
		for t := range s {
			v := 1 / (1 + math.Exp(-(float64(t)-mid)/6))
			switch i % 3 {
			case 1:
				v = 1 - v
			case 2:
				v = 0.7 + 0.3*math.Sin(float64(t)/(5+r.Float64()))
			}
			s[t] = math.Max(0, v+0.05*r.NormFloat64())
		}
		shapes = append(shapes, s)
	}
	sr := Seriate(shapes)
	runs, heads := sr.Described(shapes, from)
	require.Len(t, heads, len(runs))
	total := 0
	for g, run := range runs {
		total += run.Count
		members := make([][]float64, run.Count)
		for p := range run.Count {
			members[p] = shapes[sr.Order[run.Start+p]]
		}
		kind := Describe(Mean(members), from).Kind
		same := 0
		for _, m := range members {
			if Describe(m, from).Kind == kind {
				same++
			}
		}
		if 2*same < run.Count {
			assert.Contains(t, heads[g], "(mixed)", "group %d: %d of %d share the mean's kind", g, same, run.Count)
		} else {
			assert.NotContains(t, heads[g], "(mixed)")
		}
	}
	assert.Equal(t, len(shapes), total)
}

// Groups equal even in their high years are counted.
func TestHeadingsCounted(t *testing.T) {
	flat := make([]float64, 50)
	for i := range flat {
		flat[i] = 0.9
	}
	heads := Headings([][]float64{flat, flat, flat}, []int{0, 1, 2}, []Run{{0, 1}, {1, 1}, {2, 1}}, 1900)
	assert.Equal(t, []string{"Steady throughout, 1 of 3", "Steady throughout, 2 of 3", "Steady throughout, 3 of 3"}, heads)
}
