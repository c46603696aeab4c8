package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
)

// smallWith copies testdata/small into a temporary folder with extra
// spec text appended to its print output (out) and at the top level
// (top), and returns the spec's path.
func smallWith(t *testing.T, out, top string) string {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []string{"counts.csv", "totals.csv", "spec.yaml"} {
		b, err := os.ReadFile(filepath.Join("../../testdata/small", f))
		require.NoError(t, err)
		if f == "spec.yaml" {
			text := strings.Replace(string(b), "    kind: print\n", "    kind: print\n"+out, 1)
			b = []byte(text + top)
		}
		require.NoError(t, os.WriteFile(filepath.Join(dir, f), b, 0o644))
	}
	return filepath.Join(dir, "spec.yaml")
}

// TestCheckReportsSmoothing: `sheaf check` says the rolling window in its
// summary and in --json's scale section, and the band's level per output;
// without them, neither appears.
func TestCheckReportsSmoothing(t *testing.T) {
	spec := smallWith(t, "    band: 95%\n", "scale: {rolling: {years: 3}}\n")
	var out, errb bytes.Buffer
	require.Equal(t, exitOK, run([]string{"check", spec}, &out, &errb), errb.String())
	assert.Contains(t, out.String(), "values:  per-million (per million words), 3-year rolling share, own y-range")

	out.Reset()
	require.Equal(t, exitOK, run([]string{"check", spec, "--json"}, &out, &errb), errb.String())
	var rep feature.Report
	require.NoError(t, json.Unmarshal(out.Bytes(), &rep))
	assert.Equal(t, 3, rep.Scale.RollingYears)
	assert.Equal(t, "3-year rolling share", rep.Scale.Smoothing)
	require.Len(t, rep.Outputs, 1)
	assert.Equal(t, 0.95, rep.Outputs[0].Band)
	// Plotted values are smoothed: boiler's peak is the pooled 1900
	// window, (50+40)/(100000+120000)×1e6 = 409.09… (hand-worked; the
	// unsmoothed peak would be 500).
	assert.InDelta(t, 90e6/220000, rep.Scale.YMax, 1e-9)

	out.Reset()
	plain := smallWith(t, "", "")
	require.Equal(t, exitOK, run([]string{"check", plain, "--json"}, &out, &errb), errb.String())
	assert.NotContains(t, out.String(), "rolling_years")
	assert.NotContains(t, out.String(), `"band"`)
}

// TestBuildWithRollingAndBand: a build with smoothing and a band goes
// through and lists the sparse terms (testdata/small: Maßstab's counts
// 3 and 9, median pooled count 3 — hand-worked) for review.
func TestBuildWithRollingAndBand(t *testing.T) {
	spec := smallWith(t, "    band: 95%\n", "scale: {rolling: {years: 3}}\n")
	var so, se bytes.Buffer
	dir := filepath.Join(filepath.Dir(spec), "out")
	require.Equal(t, exitOK, run([]string{"build", spec, "--out", dir, "--no-proofs", "--quiet"}, &so, &se), se.String())
	assert.FileExists(t, filepath.Join(dir, "print", "print.pdf"))
	assert.Contains(t, se.String(), "sparse-counts")
	assert.Contains(t, se.String(), `"Maßstab"`)
}
