package feature_test

import (
	"slices"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout/fonts"
	"sheaf/render/feature"
	"sheaf/render/preflight"
)

// TestDemoLabelsWrap prepares the German demo (examples/quillmere/de.yaml:
// six columns of A4 with the peak value beside every peak year, where
// two-word labels do not fit one line) and checks the rules of issue 16,
// item 5 on every panel, from the plan's geometry: the output reserves
// one label band of two lines, every plot has one height, a wrapped label
// never leaves its label box (so it meets neither the plot below nor the
// neighbours beside), a row keeps one label size, a label that fits is
// untouched, a single long word is never broken, and preflight's
// label-wrapped findings name exactly the wrapped labels, with their
// pages. `sheaf check --json` reports the same labels (labels_wrapped).
func TestDemoLabelsWrap(t *testing.T) {
	job, err := feature.Load("../../examples/quillmere/de.yaml")
	require.NoError(t, err)
	outs, err := job.PrepareAll()
	require.NoError(t, err)
	o := outs[0]
	plan, fs, labels := o.Plan, o.Fonts, o.Feature.Labels()
	size := o.Spec.Type.Label.Pt()
	require.Equal(t, 2, plan.LabelLines, "a band of two label lines")

	wrapped := map[string]int{} // term → page
	pageOf := map[int]int{}
	for _, pg := range plan.Pages {
		rows := map[int][]float64{}
		for _, pn := range pg.Panels {
			pageOf[pn.Item] = pg.Number
			l := labels[pn.Item]
			rows[pn.Row] = append(rows[pn.Row], l.Size)
			assert.InDelta(t, plan.PlotH, pn.Plot.H(), 1e-9, "every plot one height")
			assert.InDelta(t, plan.LabelH, pn.Label.H(), 1e-9, "every label box one height")
			m := fs.Metrics(fonts.Bold, l.Size)
			lines := l.Drawn()
			pitch := l.Size * 1.25 // the print output's leading (de.yaml keeps the default)
			top := pn.LabelBaseline + float64(len(lines)-1)*pitch + m.Ascent
			assert.LessOrEqual(t, top, pn.Label.Y1+1e-9, "%q: first line inside the label box", l.Term)
			assert.GreaterOrEqual(t, pn.LabelBaseline-m.Descent, pn.Plot.Y1-1e-9, "%q: last line clear of the plot", l.Term)
			for _, s := range lines {
				assert.LessOrEqual(t, fs.Width(fonts.Bold, l.Size, s), pn.Label.W()+1e-9, "%q: line %q inside its column", l.Term, s)
			}
			if l.Wrapped() {
				wrapped[l.Term] = pg.Number
				assert.Len(t, l.Lines, 2, "%q: at most label-lines (2) lines", l.Term)
				assert.Contains(t, l.Term, " ", "%q: broken at a space (no demo term needs a hyphen break)", l.Term)
			}
			if !slices.Contains([]rune(l.Term), ' ') && !slices.Contains([]rune(l.Term), '-') {
				assert.False(t, l.Wrapped(), "a single word %q is never broken", l.Term)
			}
		}
		for r, sizes := range rows {
			assert.Equal(t, slices.Min(sizes), slices.Max(sizes), "page %d row %d keeps one label size", pg.Number, r)
		}
	}
	require.NotEmpty(t, wrapped, "the German demo wraps some labels")
	untouched := 0
	for _, l := range labels {
		if !l.Shrunk && !l.NoPeak && !l.Truncated && !l.Wrapped() {
			assert.Equal(t, l.Term, l.Text, "an untouched label is its term")
			assert.Equal(t, size, l.Size)
			untouched++
		}
	}
	assert.Greater(t, untouched, len(labels)/2, "most labels fit as they are")

	findings, err := job.Preflight(outs)
	require.NoError(t, err)
	found := map[string]int{}
	for _, f := range findings {
		if f.ID == preflight.IDLabelWrap {
			assert.Equal(t, preflight.Info, f.Severity)
			assert.Equal(t, o.Name(), f.Output)
			_, dup := found[f.Term]
			assert.False(t, dup, "one finding per wrapped label: %q", f.Term)
			found[f.Term] = f.Page
		}
	}
	assert.Equal(t, wrapped, found, "label-wrapped names exactly the wrapped labels, on their pages")

	r, err := job.Summarize()
	require.NoError(t, err)
	var reported []string
	for _, l := range r.Outputs[0].Wrapped {
		reported = append(reported, l.Term)
		assert.Equal(t, wrapped[l.Term], pageOf[l.Item], "%q on its page", l.Term)
	}
	assert.ElementsMatch(t, keys(wrapped), reported, "check --json labels_wrapped")
}

func keys(m map[string]int) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	return out
}
