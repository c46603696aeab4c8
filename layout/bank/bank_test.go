package bank

import (
	"math"
	"os"
	"regexp"
	"strconv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// sine is y = sin(2πx/12) at x = 0…12, as segments normalised by the
// data's ranges (x: 12, y: −1…1).
func sine() []Segment {
	var segs []Segment
	for x := 1; x <= 12; x++ {
		y0, y1 := math.Sin(2*math.Pi*float64(x-1)/12), math.Sin(2*math.Pi*float64(x)/12)
		segs = append(segs, Segment{DX: 1.0 / 12, DY: math.Abs(y1-y0) / 2})
	}
	return segs
}

// referenceAspects reads the worked values from testdata/banking.md
// (copied from the project's reference, with its citations).
func referenceAspects(t *testing.T) map[string]float64 {
	b, err := os.ReadFile("testdata/banking.md")
	require.NoError(t, err)
	out := map[string]float64{}
	for _, m := range regexp.MustCompile(`α_(MS|AO|AWO|AL) = ([0-9]+\.[0-9]+)`).FindAllStringSubmatch(string(b), -1) {
		v, err := strconv.ParseFloat(m[2], 64)
		require.NoError(t, err)
		out[m[1]] = v
	}
	require.Len(t, out, 4, "four worked values in testdata/banking.md")
	return out
}

// The worked values for the sine over one period: the reference marks
// them [COMPUTED] (worked out for the project, no publication prints
// them); given to three decimals, so checked to ±0.0005.
func TestSineWorkedValues(t *testing.T) {
	ref := referenceAspects(t)
	for _, tc := range []struct {
		key    string
		method func([]Segment) (float64, bool)
		source string
	}{
		{"MS", MedianSlope, "median absolute slope, Cleveland 1993 (testdata/banking.md [COMPUTED])"},
		{"AO", AverageOrientation, "average orientation 45° (testdata/banking.md [COMPUTED])"},
		{"AWO", AverageWeightedOrientation, "length-weighted average orientation 45° (testdata/banking.md [COMPUTED])"},
		{"AL", ArcLength, "arc length, Talbot, Gerth & Hanrahan 2011 (testdata/banking.md [COMPUTED])"},
	} {
		got, ok := tc.method(sine())
		require.True(t, ok, tc.key)
		assert.InDelta(t, ref[tc.key], got, 0.0005, tc.source)
	}
}

// Cleveland's definition on a hand-worked case: slopes 1, 2, 4 (dx = 1)
// have median 2, so α = 1/2 and the median segment is drawn at 45°.
func TestMedianSlopeDefinition(t *testing.T) {
	segs := []Segment{{1, 1}, {1, 2}, {1, 4}}
	a, ok := MedianSlope(segs)
	require.True(t, ok)
	assert.InDelta(t, 0.5, a, 1e-12, "Cleveland 1993: α = 1/median|s|; worked by hand")
	assert.InDelta(t, 45, MedianOrientation(segs, a), 1e-9, "the median segment at 45° (by hand)")
	// An even count takes the mean of the middle two: slopes 1, 3 → 2.
	a, _ = MedianSlope([]Segment{{1, 1}, {1, 3}})
	assert.InDelta(t, 0.5, a, 1e-12, "median of an even count: mean of the middle two (by hand)")
}

// Arc-length banking's objective at the minimum: the derivative
// Σ (α·dy² − dx²/α) / (2ℓᵢ) vanishes (Talbot et al. 2011, eq. for the
// constant-area length); checked on random segments.
func TestArcLengthIsStationary(t *testing.T) {
	segs := []Segment{{0.1, 0.3}, {0.2, 0.05}, {0.05, 0.5}, {0.3, 0.01}, {0.1, 0.1}}
	a, ok := ArcLength(segs)
	require.True(t, ok)
	var g float64
	for _, s := range segs {
		l := math.Sqrt(s.DX*s.DX/a + a*s.DY*s.DY)
		g += (a*s.DY*s.DY - s.DX*s.DX/a) / (2 * l)
	}
	assert.InDelta(t, 0, g, 1e-7, "first-order condition of the arc-length minimum (calculus)")
	// A single segment is shortest when drawn at 45°: α = dx/dy.
	a, _ = ArcLength([]Segment{{0.2, 0.5}})
	assert.InDelta(t, 0.4, a, 1e-6, "one segment: √(dx²/α + α dy²) is least at α = dx/dy (by hand)")
}

// Flat lines have no banked aspect: the solver says so rather than
// returning a search limit as if it were an answer.
func TestFlatLinesCannotBeBanked(t *testing.T) {
	_, ok := ArcLength([]Segment{{0.5, 0}, {0.5, 0}})
	assert.False(t, ok)
	_, ok = MedianSlope([]Segment{{0.5, 0}, {0.5, 0}, {0.5, 1}})
	assert.False(t, ok, "median slope 0")
	_, ok = ArcLength(nil)
	assert.False(t, ok)
}

// Lines: gaps break segments; each line is scaled by its own yMax.
func TestLines(t *testing.T) {
	nan := math.NaN()
	segs := Lines([][]float64{{0, 2, nan, 4, 2}, {1, 1}}, []float64{4, 2})
	assert.Equal(t, []Segment{{0.25, 0.5}, {0.25, 0.5}, {1, 0}}, segs, "by hand: dx = 1/4; |2−0|/4, |2−4|/4; the gap drops two")
}
