package main

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/explore"
	"sheaf/render/feature"
	"sheaf/render/tooltest"
	"sheaf/specs"
)

// sheaf pairs on the demo: the JSON's rows are numbered, each insert
// line pasted under the spec's inserts key loads and lays out as an
// insert (the point of printing it), the sheet is a PNG and a PDF of one
// page per pair (read back with poppler's pdfinfo), and a second run
// gives the same bytes.
func TestPairsDemo(t *testing.T) {
	dir := t.TempDir()
	var out, errb bytes.Buffer
	code := run([]string{"pairs", demoSpec, "--json", "--top", "3", "--out", dir}, &out, &errb)
	require.Equal(t, exitOK, code, errb.String())
	var rep struct {
		Terms     int `json:"terms"`
		Alike     []explore.Pair
		HandOvers []explore.Pair `json:"hand_overs"`
		Files     []string
	}
	require.NoError(t, json.Unmarshal(out.Bytes(), &rep))
	assert.Equal(t, 384, rep.Terms, "the demo selects 384 terms (examples/quillmere/feature.yaml)")
	require.Len(t, rep.Alike, 3)
	require.Len(t, rep.HandOvers, 3)
	for i, r := range append(rep.Alike, rep.HandOvers...) {
		assert.Equal(t, i+1, r.Number)
		assert.Len(t, r.Terms, 2)
	}
	for i := 1; i < 3; i++ {
		assert.LessOrEqual(t, rep.Alike[i-1].Distance, rep.Alike[i].Distance, "closest first")
		assert.GreaterOrEqual(t, rep.HandOvers[i-1].Strength, rep.HandOvers[i].Strength, "strongest first")
	}
	for _, h := range rep.HandOvers {
		assert.GreaterOrEqual(t, h.Crossing, 1868, "crossing year inside the span")
		assert.LessOrEqual(t, h.Crossing, 2025, "crossing year inside the span")
	}

	// Paste every row under inserts: in a copy of the demo spec.
	demo, err := os.ReadFile(demoSpec)
	require.NoError(t, err)
	text := string(demo) + "\n"
	for _, r := range append(rep.Alike, rep.HandOvers...) {
		text += "  " + r.YAML + "\n"
	}
	spec, err := specs.Parse(filepath.Join(filepath.Dir(demoSpec), "pasted.yaml"), []byte(text))
	require.NoError(t, err, "the pasted lines are valid inserts entries")
	demoSpecParsed, err := specs.Parse(demoSpec, demo)
	require.NoError(t, err)
	require.Len(t, spec.Inserts, len(demoSpecParsed.Inserts)+6, "the demo's inserts and the six pasted")
	j, err := feature.LoadData(spec)
	require.NoError(t, err)
	_, err = j.PrepareInserts()
	require.NoError(t, err, "each pasted insert lays out")

	require.Equal(t, []string{filepath.Join(dir, "pairs.png"), filepath.Join(dir, "pairs.pdf")}, rep.Files)
	png1, err := os.ReadFile(rep.Files[0])
	require.NoError(t, err)
	pdf1, err := os.ReadFile(rep.Files[1])
	require.NoError(t, err)
	assert.True(t, bytes.HasPrefix(png1, []byte("\x89PNG\r\n\x1a\n")), "PNG signature (ISO/IEC 15948 §5.2)")
	pdfinfo := tooltest.Require(t, "pdfinfo", "poppler-utils")
	info, err := exec.Command(pdfinfo, rep.Files[1]).Output()
	require.NoError(t, err)
	assert.Regexp(t, `Pages:\s+6\n`, string(info), "one page per pair")
	assert.Regexp(t, `Page size:\s+255.118 x 170.079 pts`, string(info), "90 mm × 60 mm (1 in = 25.4 mm, 72 pt)")

	var out2 bytes.Buffer
	require.Equal(t, exitOK, run([]string{"pairs", demoSpec, "--json", "--top", "3", "--out", dir}, &out2, &errb))
	assert.Equal(t, out.String(), out2.String(), "same inputs, same report")
	png2, _ := os.ReadFile(rep.Files[0])
	pdf2, _ := os.ReadFile(rep.Files[1])
	assert.Equal(t, png1, png2, "same PNG bytes")
	assert.Equal(t, pdf1, pdf2, "same PDF bytes")
}

// Bad usage is exit 2 with a message, and writes nothing.
func TestPairsBadInput(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "a-file")
	require.NoError(t, os.WriteFile(file, []byte("x"), 0o644))
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"pairs", demoSpec, "--top", "0"}, "--top must be 1 to 100"},
		{[]string{"pairs", demoSpec, "--output", "nowhere"}, "no output of that name"},
		{[]string{"pairs", demoSpec, "--size", "90mm"}, "--size"},
		{[]string{"pairs", demoSpec, "--out", file}, "is a file"},
		{[]string{"pairs", demoSpec, "--size", "5mm x 5mm", "--out", dir}, "sheaf pairs: --size 5mm x 5mm"},
		{[]string{"pairs"}, "give exactly one spec file"},
	} {
		var out, errb bytes.Buffer
		assert.Equal(t, exitBadInput, run(tc.args, &out, &errb), "%v", tc.args)
		assert.Contains(t, errb.String(), tc.want, "%v", tc.args)
	}
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	assert.Len(t, entries, 1, "nothing written beside the file")
}

// The table names each pair and its paste-ready entry.
func TestPairsTable(t *testing.T) {
	var out, errb bytes.Buffer
	require.Equal(t, exitOK, run([]string{"pairs", demoSpec, "--top", "2", "--no-sheet"}, &out, &errb), errb.String())
	s := out.String()
	assert.Contains(t, s, "Most alike")
	assert.Contains(t, s, "Strongest hand-overs")
	assert.Equal(t, 4, strings.Count(s, ": {output: print, size: 90mm x 60mm, terms: ["))
	assert.NotContains(t, s, "pairs.png", "--no-sheet writes nothing")
}
