package curve_test

import (
	"os"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestCitedFactsArePresent: the worked values reference_test.go cites as
// srcWorked (and the Fritsch–Carlson rules it cites via print-facts.md)
// are in this package's copy of that section, testdata/print-facts.md,
// so the pointer beside each value leads to a line that says it.
func TestCitedFactsArePresent(t *testing.T) {
	b, err := os.ReadFile("testdata/print-facts.md")
	require.NoError(t, err)
	facts := string(b)
	for _, quoted := range []string{
		"## Monotone cubic interpolation",
		// srcWorked: slopes and values of the two worked series.
		"x = [0,2,3,4,5,6], y = [0,1,1.5,2.5,3,4]",
		"d = [0.5, 0.5, 0.666667, 0.666667, 0.666667, 1.25]",
		"y(2.5) = 1.2291667, y(3.5) = 2, y(5.5) = 3.4270833",
		"x = [1..5], y = [0,0,1,4,4]: d = [0,0,1.5,0,0], y(2.5) = 0.3125, y(3.5) = 2.6875",
		// srcFC rules quoted in the tests' comments.
		"the disc α²+β² ≤ 9 lies in M; Δ_k = 0 ⇒ d_k = d_k+1 = 0",
		"Implemented by gonum.org/v1/gonum/interp `FritschButland` (v0.17.0",
	} {
		require.Contains(t, facts, quoted, "testdata/print-facts.md (copied from the project's print-facts.md)")
	}
}
