package preflight

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestFactsWorkedOutOnce: findings made from facts worked out ahead
// (DataFacts, as a job does once for all its outputs) are the findings
// Check makes by itself, on the hand-worked test data of TestSparseCounts
// (Maßstab and flash sparse, flash's 1902 spike, silent empty); facts of
// other thresholds are not used.
func TestFactsWorkedOutOnce(t *testing.T) {
	in := prepareInput(t, specText("", ""))
	alone := check(t, in)
	_, ok := has(alone, IDSparse, "flash", 0)
	require.True(t, ok, "the test data's sparse term")
	_, ok = has(alone, IDSpike, "flash", 1902)
	require.True(t, ok, "the test data's spike")

	in.Facts = DataFacts(in.Spec, in.Data)
	assert.Equal(t, alone, check(t, in), "the same findings from facts worked out ahead")

	// Facts for other thresholds, or of other data, are not used: Check
	// works its own out. (Each is doctored so that using it would report
	// every term with counts as sparse.)
	doctor := func(f *Facts) *Facts {
		for i := range f.terms {
			f.terms[i].med, f.terms[i].medOK = 0, true
		}
		return f
	}
	other := *in.Spec
	other.Preflight.SpikeRatio++
	in.Facts = doctor(DataFacts(&other, in.Data))
	assert.Equal(t, alone, check(t, in), "facts of other thresholds are not used")
	copied := *in.Data
	in.Facts = doctor(DataFacts(in.Spec, &copied))
	assert.Equal(t, alone, check(t, in), "facts of other data are not used")
	in.Facts = doctor(DataFacts(in.Spec, in.Data))
	_, ok = has(check(t, in), IDSparse, "boiler", 0)
	assert.True(t, ok, "the doctored facts, were they used, would say so")
}
