package main

import (
	"bytes"
	"encoding/json"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// `sheaf check` on the demo ordered by shape with a banked web page: the
// order and the generated group headings reach the summary, and the
// banked aspect and median orientation reach the web output's summary
// line and its layout JSON, whose plots have that aspect. (The banking
// itself is checked against worked values in layout/bank.)
func TestCheckShowsSimilarityAndBanking(t *testing.T) {
	const spec = "../../examples/quillmere/similarity.yaml"
	var out, errb bytes.Buffer
	require.Equal(t, exitOK, run([]string{"check", spec, "--json"}, &out, &errb), errb.String())
	var rep struct {
		Terms struct {
			Order  string   `json:"order"`
			Groups []string `json:"groups"`
		} `json:"terms"`
		Outputs []struct {
			Name    string `json:"name"`
			Summary string `json:"summary"`
			Layout  struct {
				Banking *struct {
					Method            string  `json:"method"`
					Aspect            float64 `json:"aspect"`
					MedianOrientation float64 `json:"median_orientation_deg"`
				} `json:"banking"`
				Pages []struct {
					Panels []struct {
						Plot [4]float64 `json:"plot"`
					} `json:"panels"`
				} `json:"pages"`
			} `json:"layout"`
		} `json:"outputs"`
	}
	require.NoError(t, json.Unmarshal(out.Bytes(), &rep))
	assert.Equal(t, "similarity", rep.Terms.Order)
	assert.GreaterOrEqual(t, len(rep.Terms.Groups), 2)
	require.Len(t, rep.Outputs, 2)
	assert.Nil(t, rep.Outputs[0].Layout.Banking, "print has a fixed aspect")
	web := rep.Outputs[1]
	require.NotNil(t, web.Layout.Banking)
	assert.Equal(t, "arc-length", web.Layout.Banking.Method)
	assert.Contains(t, web.Summary, "banked aspect")
	assert.Contains(t, web.Summary, "median orientation")
	assert.Greater(t, web.Layout.Banking.MedianOrientation, 0.0)
	for _, p := range web.Layout.Pages[0].Panels {
		w, h := p.Plot[2]-p.Plot[0], p.Plot[3]-p.Plot[1]
		assert.InDelta(t, web.Layout.Banking.Aspect, w/h, 0.001*web.Layout.Banking.Aspect, "each plot has the banked aspect (rects to 0.001 pt)")
	}

	var text bytes.Buffer
	require.Equal(t, exitOK, run([]string{"check", spec}, &text, &errb))
	assert.Contains(t, text.String(), "banked aspect")
	assert.Contains(t, text.String(), "order similarity")
}
