package layout

import (
	"fmt"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestLabelBand: an output laid out with a label band of n lines
// (specs.Output.LabelBand, set when some label wraps) gives every panel
// the same band, n label lines tall (label size × leading each), over a
// plot of the same height as with one line when the aspect sets it, or
// one line shorter when the panel height does; the label's baseline stays
// in the last line, as far above the plot as with one line, so a label
// that does not wrap sits where it always did against its plot. Panel
// widths do not change (render/feature relies on it: the labels wrap the
// same in both plans). Common practice: a label sits close to what it
// names.
func TestLabelBand(t *testing.T) {
	groups := []Group{{Count: 120}}
	outs := map[string]func() specs.Output{
		"a4 aspect": a4Print,
		"a4 height": func() specs.Output { o := a4Print(); o.PanelHeight = mmL(30); return o },
		"web":       webScroll,
	}
	for name, mk := range outs {
		for _, n := range []int{2, 3} {
			t.Run(fmt.Sprintf("%s, %d lines", name, n), func(t *testing.T) {
				one := solveT(t, testSpec(), mk(), groups)
				o := mk()
				o.LabelBand = n
				wide := solveT(t, testSpec(), o, groups)
				la := o.Type.Label.Pt() * o.Type.Leading
				assert.Equal(t, 1, one.LabelLines)
				assert.Equal(t, n, wide.LabelLines)
				assert.InDelta(t, one.LabelH, la, 1e-9, "one label line")
				assert.InDelta(t, float64(n)*la, wide.LabelH, 1e-9, "n label lines")
				assert.Equal(t, one.PanelW, wide.PanelW, "panel width")
				if o.PanelHeight > 0 {
					assert.InDelta(t, one.PlotH-float64(n-1)*la, wide.PlotH, 1e-9, "the band comes out of a fixed panel height")
				} else {
					assert.InDelta(t, one.PlotH, wide.PlotH, 1e-9, "the aspect keeps the plot")
				}
				require.NotEmpty(t, one.Pages[0].Panels)
				p1, pn := one.Pages[0].Panels[0], wide.Pages[0].Panels[0]
				assert.InDelta(t, p1.LabelBaseline-p1.Plot.Y1, pn.LabelBaseline-pn.Plot.Y1, 1e-9, "baseline to plot")
				for _, pg := range wide.Pages {
					for _, p := range pg.Panels {
						assert.InDelta(t, wide.LabelH, p.Label.H(), 1e-9, "label box")
						assert.InDelta(t, wide.PlotH, p.Plot.H(), 1e-9, "plot")
						assert.Equal(t, p.Label.Y0, p.Plot.Y1, "label box on the plot")
						assert.Greater(t, p.LabelBaseline, p.Label.Y0, "baseline inside the box")
						assert.Less(t, p.LabelBaseline, p.Label.Y0+la, "baseline in the last line")
					}
				}
				assert.LessOrEqual(t, wide.RowsPerPage, one.RowsPerPage, "a taller band never fits more rows")
			})
		}
	}
}
