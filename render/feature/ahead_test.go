package feature_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/specs"
)

// smallSpec writes testdata/small (three invented terms, six years) to a
// folder of its own with extra lines appended to the print output, and
// with counts replaced when counts is not "".
func smallSpec(t *testing.T, outputExtra, counts string) string {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []string{"spec.yaml", "counts.csv", "totals.csv"} {
		b, err := os.ReadFile(filepath.Join("../../testdata/small", f))
		require.NoError(t, err)
		if f == "spec.yaml" {
			b = append(b, []byte(outputExtra)...)
		}
		if f == "counts.csv" && counts != "" {
			b = []byte(counts)
		}
		require.NoError(t, os.WriteFile(filepath.Join(dir, f), b, 0o644))
	}
	return filepath.Join(dir, "spec.yaml")
}

// TestFontsLoadedAheadKeepErrorOrder: fonts load while the tables are
// read (LoadData), yet what the user is told stays what loading them one
// step after the other said: a data error first, and a font error when
// the output is prepared, in the same words a Set loaded afresh gives.
func TestFontsLoadedAheadKeepErrorOrder(t *testing.T) {
	badFont := "    fonts: {regular: no-such-face.ttf}\n"

	// Bad data and a bad font: the data error (file:line) wins.
	path := smallSpec(t, badFont, "term,year,count\nboiler,1900,x\n")
	_, err := feature.Load(path)
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), "counts.csv:2", "the data error, with its line")
	assert.NotContains(t, err.Error(), "no-such-face.ttf")

	// Good data, bad font: loading succeeds; preparing the output fails
	// with the font's error, as fonts.Load words it.
	path = smallSpec(t, badFont, "")
	job, err := feature.Load(path)
	require.NoError(t, err)
	_, err = job.PrepareAll()
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), `cannot read font "no-such-face.ttf"`)
	assert.Contains(t, err.Error(), "spec.yaml:", "the spec's place of the font")
	_, err2 := job.Fonts(&job.Spec.Outputs[0])
	require.Error(t, err2)
	assert.Equal(t, err.Error(), err2.Error(), "the same error however the output is asked for")
	_, err = job.Summarize()
	require.Error(t, err)
	assert.Contains(t, err.Error(), `cannot read font "no-such-face.ttf"`)
}

// TestSummarizeSideBySide: the report of check, whose outputs, inserts
// and palette checks are prepared side by side, is the one preparing
// them in turn gives (the demo: two outputs, four inserts), and every
// run gives the same report.
func TestSummarizeSideBySide(t *testing.T) {
	job, err := feature.Load("../../examples/quillmere/feature.yaml")
	require.NoError(t, err)
	r, err := job.Summarize()
	require.NoError(t, err)

	// In turn, by hand, from a job of its own.
	seq, err := feature.Load("../../examples/quillmere/feature.yaml")
	require.NoError(t, err)
	pal, err := seq.CheckPalette()
	require.NoError(t, err)
	var outs []*feature.Output
	for i := range seq.Spec.Outputs {
		o, err := seq.Prepare(&seq.Spec.Outputs[i])
		require.NoError(t, err)
		outs = append(outs, o)
	}
	ins, err := seq.PrepareInserts()
	require.NoError(t, err)
	findings, err := seq.Preflight(outs, ins...)
	require.NoError(t, err)

	require.Len(t, r.Outputs, len(outs))
	for i, o := range outs {
		assert.Equal(t, o.Plan.Summary(), r.Outputs[i].Summary, o.Spec.Name)
		assert.Equal(t, len(o.Plan.Pages), r.Outputs[i].Pages, o.Spec.Name)
		assert.Equal(t, pal[i].Scale.Name(), r.Outputs[i].Palette.Name)
	}
	require.Len(t, r.Inserts, len(ins))
	for i, in := range ins {
		assert.Equal(t, in.Name(), r.Inserts[i].Name)
	}
	assert.Equal(t, findings, r.Preflight, "preflight over outputs checked side by side, in the outputs' order")

	var a, b strings.Builder
	r.WriteText(&a)
	again, err := feature.Load("../../examples/quillmere/feature.yaml")
	require.NoError(t, err)
	r2, err := again.Summarize()
	require.NoError(t, err)
	r2.WriteText(&b)
	assert.Equal(t, a.String(), b.String())
}

// TestCheckPaletteOnce: the palette checks depend on the spec and the
// data's years only; a job runs them once and hands out the same result.
func TestCheckPaletteOnce(t *testing.T) {
	job, err := feature.Load(smallSpec(t, "", ""))
	require.NoError(t, err)
	a, err := job.CheckPalette()
	require.NoError(t, err)
	b, err := job.CheckPalette()
	require.NoError(t, err)
	require.NotEmpty(t, a)
	assert.Same(t, &a[0], &b[0])
}
