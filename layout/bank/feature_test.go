package bank

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/specs"
	"sheaf/specs/series"
)

// sineSet is a feature of n panels, each one period of a sine over 13
// years, lifted and scaled differently: each panel is plotted from 0 to
// its own top, so banking sees y = sin(2πx/12) in every panel, squeezed
// into the upper part of the plot by the lift.
func sineSet(n int) *series.Set {
	set := &series.Set{Span: specs.Span{From: 1900, To: 1912}}
	for y := 1900; y <= 1912; y++ {
		set.Years = append(set.Years, float64(y))
	}
	for i := range n {
		k := float64(i + 1)
		sr := series.Series{Term: string(rune('a' + i))}
		for x := range 13 {
			sr.Values = append(sr.Values, k*(1+math.Sin(2*math.Pi*float64(x)/12)))
		}
		sr.YMax = 2 * k
		set.Series = append(set.Series, sr)
	}
	set.Groups = []series.Group{{Count: n}}
	return set
}

// Pooling panels that are the same shape banks them as one: the sine's
// arc-length aspect, α = 0.493 (testdata/banking.md [COMPUTED]), so a
// plot width ÷ height of 1/0.493.
func TestFeatureBanksPooledPanels(t *testing.T) {
	ref := referenceAspects(t)
	b, err := Feature(sineSet(12))
	require.NoError(t, err)
	assert.InDelta(t, 1/ref["AL"], b.Aspect, 0.003, "1/α_AL (testdata/banking.md [COMPUTED])")
	assert.Equal(t, 12*12, b.Segments)
	assert.Equal(t, "arc-length", b.Method)
}

// Solve lays the output out at the banked aspect: every plot is that
// many times wider than tall, and the plan says what it chose.
func TestSolveFitsPanelsOfTheBankedAspect(t *testing.T) {
	fs, err := fonts.Default()
	require.NoError(t, err)
	mm := func(v float64) specs.Length { return specs.Length(v * 72 / 25.4) }
	out := specs.Output{
		Name: "print", Kind: specs.Print,
		Trim: specs.Size{W: mm(210), H: mm(297)}, Bleed: mm(3), Slug: mm(10),
		Margins: specs.Margins{Top: mm(15), Bottom: mm(15), Inside: mm(20), Outside: mm(20)},
		Columns: 3, Gutter: mm(4), RowGap: mm(3), PanelBank: true,
		Slack: specs.SlackSpread, Ticks: specs.TicksBottomRow, Line: 0.6,
		Type: specs.TypeSizes{Title: 18, Dek: 9, Label: 7, Ticks: 5.5, Key: 6, Notes: 6.5, Folio: 7, Heading: 8, Leading: 1.25},
	}
	spec := &specs.Spec{File: "feature.yaml", Title: "Banked", Outputs: []specs.Output{out}}
	set := sineSet(12)
	_, err = layout.Solve(spec, &out, fs, []layout.Group{{Count: 12}})
	require.Error(t, err, "layout alone cannot bank: it has no data")

	plan, err := Solve(spec, &out, fs, []layout.Group{{Count: 12}}, set)
	require.NoError(t, err)
	require.NotNil(t, plan.Banking)
	want := math.Round(100/0.49321) / 100 // α_AL, our value to five digits (bank_test), to two decimals as laid out
	assert.Equal(t, want, plan.Banking.Aspect)
	for _, pg := range plan.Pages {
		for _, p := range pg.Panels {
			assert.InDelta(t, want, p.Plot.W()/p.Plot.H(), 0.001, "plot width ÷ height is the banked aspect (rects rounded to 0.001 pt)")
		}
	}
	// At α_AL the sine's segments: 4 at each of three orientations; the
	// median is the mean of the middle two (Cleveland's median), both
	// atan(α·12·|Δsin|/2) for the middle step |Δsin| = 0.366.
	a := 1 / want
	mid := math.Atan(a*12*(math.Sin(math.Pi/3)-math.Sin(math.Pi/6))/2) * 180 / math.Pi
	assert.InDelta(t, mid, plan.Banking.MedianOrientation, 1e-9, "by hand from the sine's slopes")
	assert.Contains(t, plan.Summary(), "banked aspect 2.03")

	// slack: grow would undo the banking: spread instead, with a warning.
	out.Slack = specs.SlackGrow
	plan, err = Solve(spec, &out, fs, []layout.Group{{Count: 12}}, set)
	require.NoError(t, err)
	for _, p := range plan.Pages[0].Panels {
		assert.InDelta(t, want, p.Plot.W()/p.Plot.H(), 0.001, "still the banked aspect")
	}
	require.NotEmpty(t, plan.Warnings)
	assert.Equal(t, "slack", plan.Warnings[len(plan.Warnings)-1].Key)
	out.Slack = specs.SlackSpread

	// An output that does not bank is laid out as layout.Solve does.
	out.PanelBank, out.PanelAspect = false, 1.6
	plan, err = Solve(spec, &out, fs, []layout.Group{{Count: 12}}, set)
	require.NoError(t, err)
	assert.Nil(t, plan.Banking)
}

// Flat lines cannot be banked: an error at the spec's panel.aspect.
func TestFeatureOfFlatLines(t *testing.T) {
	set := sineSet(2)
	for i := range set.Series {
		for x := range set.Series[i].Values {
			set.Series[i].Values[x] = 1
		}
	}
	_, err := Feature(set)
	assert.ErrorContains(t, err, "flat")
}
