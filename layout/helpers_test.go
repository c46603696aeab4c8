package layout

import (
	"testing"

	"github.com/stretchr/testify/require"

	"sheaf/layout/fonts"
	"sheaf/specs"
)

// Unit conversions used to build test outputs: 1 in = 25.4 mm exactly
// (1959 international yard and pound agreement), 1 pt = 1/72 in
// (ISO 32000-1 §8.3.2.3), 1 px = 1/96 in (CSS Values and Units Level 3).
func mmL(v float64) specs.Length { return specs.Length(v * 72 / 25.4) }
func inL(v float64) specs.Length { return specs.Length(v * 72) }
func pxL(v float64) specs.Length { return specs.Length(v * 72 / 96) }

func toMM(pt float64) float64 { return pt * 25.4 / 72 }

var testFonts *fonts.Set

func fontSet(t testing.TB) *fonts.Set {
	t.Helper()
	if testFonts == nil {
		fs, err := fonts.Default()
		require.NoError(t, err, "loading the default fonts")
		testFonts = fs
	}
	return testFonts
}

// testSpec is an invented feature.
func testSpec() *specs.Spec {
	return &specs.Spec{
		File:   "feature.yaml",
		Title:  "Words of the trade",
		Dek:    "How forty invented words rose and fell over two centuries of print, one small chart each.",
		Source: "Source: invented counts for a demonstration.",
		Notes:  []string{"Shares per million words of each year's total."},
	}
}

func printType() specs.TypeSizes {
	return specs.TypeSizes{Title: 18, Dek: 9, Label: 7, Ticks: 5.5, Key: 6, Notes: 6.5, Folio: 7, Heading: 8, Leading: 1.25}
}

// a4Print is an A4 print output: 20 mm side margins, 6 columns, 4 mm gutters.
func a4Print() specs.Output {
	return specs.Output{
		Name: "print", Kind: specs.Print,
		Trim:  specs.Size{W: mmL(210), H: mmL(297)},
		Bleed: mmL(3), Slug: mmL(10), Marks: true, SlugLine: true,
		Margins: specs.Margins{Top: mmL(15), Bottom: mmL(15), Inside: mmL(20), Outside: mmL(20)},
		Facing:  true,
		Columns: 6, Gutter: mmL(4), RowGap: mmL(3), PanelAspect: 1.4,
		Slack: specs.SlackSpread, Ticks: specs.TicksBottomRow,
		Type: printType(), Line: 0.6,
	}
}

// letterPrint is a US Letter print output with a 0.125 in bleed.
func letterPrint() specs.Output {
	o := a4Print()
	o.Name = "letter"
	o.Trim = specs.Size{W: inL(8.5), H: inL(11)}
	o.Bleed = inL(0.125)
	o.Slug = inL(0.375)
	o.Margins = specs.Margins{Top: inL(0.6), Bottom: inL(0.6), Inside: inL(0.75), Outside: inL(0.6)}
	o.Columns = 0
	o.MinPanelWidth = mmL(28)
	return o
}

// webScroll is a 1200 px wide scrolling screen output.
func webScroll() specs.Output {
	return specs.Output{
		Name: "web", Kind: specs.Screen, Flow: specs.FlowScroll,
		Trim:    specs.Size{W: pxL(1200)},
		Margins: specs.Margins{Top: pxL(24), Bottom: pxL(24), Inside: pxL(32), Outside: pxL(32)},
		Columns: 0, MinPanelWidth: pxL(160), Gutter: pxL(16), RowGap: pxL(12), PanelAspect: 1.6,
		Ticks: specs.TicksEveryPanel,
		Type:  specs.TypeSizes{Title: pxL(32), Dek: pxL(18), Label: pxL(14), Ticks: pxL(11), Key: pxL(12), Notes: pxL(12), Folio: pxL(12), Heading: pxL(16), Leading: 1.3},
	}
}

func solveT(t testing.TB, spec *specs.Spec, out specs.Output, groups []Group) *Plan {
	t.Helper()
	p, err := Solve(spec, &out, fontSet(t), groups)
	require.NoError(t, err, "solving output %q", out.Name)
	return p
}
