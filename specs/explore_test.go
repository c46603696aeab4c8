package specs

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// The keys of issue 17: order and group by similarity, and a banked
// panel aspect; a wrong value is an error at its place.
func TestSimilarityAndBankKeys(t *testing.T) {
	base := "title: T\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1900, to: 1950}\n"
	s, err := Parse("f.yaml", []byte(base+"order: similarity\ngroup: similarity\noutputs:\n  p: {kind: print, panel: {aspect: bank}}\n  w: {kind: screen, panel: {aspect: 2}}\n"))
	require.NoError(t, err)
	assert.Equal(t, OrderSimilarity, s.Order)
	assert.Equal(t, GroupSimilarity, s.Group)
	assert.True(t, s.Outputs[0].PanelBank)
	assert.Zero(t, s.Outputs[0].PanelAspect, "chosen later, from the data")
	assert.False(t, s.Outputs[1].PanelBank)
	assert.Equal(t, 2.0, s.Outputs[1].PanelAspect)

	for _, tc := range []struct{ text, want string }{
		{"outputs: {p: {kind: print, panel: {aspect: banked}}}\n", `f.yaml:4:44: outputs.p.panel.aspect must be a number (plot width ÷ height) or bank, not "banked"`},
		{"outputs: {p: {kind: print, panel: {aspect: bank, height: 30mm}}}\n", "f.yaml:4:35: outputs.p.panel: give aspect or height, not both"},
		{"order: similar\noutputs: {p: {kind: print}}\n", `f.yaml:4:8: order must be one of listed, alphabetical, peak-year, similarity, not "similar"`},
	} {
		_, err := Parse("f.yaml", []byte(base+tc.text))
		require.Error(t, err, tc.text)
		assert.Contains(t, err.Error(), tc.want)
	}
}
