package explore

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/examples/generate/corpus"
	"sheaf/render/feature"
	"sheaf/render/tooltest"
	"sheaf/specs"
)

// TestMain says at the end, in one line, how many checks were skipped for
// want of an outside program and which are missing.
func TestMain(m *testing.M) { tooltest.Main(m) }

const smallSpec = "../../testdata/small/spec.yaml"

func loadSmall(t testing.TB) *feature.Job {
	s, err := specs.Load(smallSpec)
	require.NoError(t, err)
	j, err := LoadData(s)
	require.NoError(t, err)
	return j
}

// Find on the small feature (three invented terms): every pair of the
// three is listed closest first, numbered from 1, and each entry pasted
// under inserts: in the spec loads and lays out as an insert — the point
// of printing it. Names are slugs (Maßstab → massstab, Unicode full case
// folding; render/slug).
func TestFindPastedInsertsLayOut(t *testing.T) {
	j := loadSmall(t)
	rep, err := Find(j, Options{Top: 3, PerTerm: 0})
	require.NoError(t, err)
	assert.Equal(t, 3, rep.Terms)
	require.Len(t, rep.Alike, 3, "three terms make three pairs")
	require.Len(t, rep.Pairs(), len(rep.Alike)+len(rep.HandOvers))
	for i, p := range rep.Pairs() {
		assert.Equal(t, i+1, p.Number)
	}
	for i := 1; i < len(rep.Alike); i++ {
		assert.LessOrEqual(t, rep.Alike[i-1].Distance, rep.Alike[i].Distance, "closest first")
	}
	assert.Equal(t, `alike-telegraph-massstab: {output: print, size: 90mm x 60mm, terms: ["telegraph", "Maßstab"], title: "telegraph and Maßstab"}`,
		rep.Alike[0].YAML, "the plotted lines of telegraph and Maßstab both rise late (testdata/small/counts.csv)")

	text, err := os.ReadFile(smallSpec)
	require.NoError(t, err)
	pasted := string(text) + "inserts:\n"
	for _, p := range rep.Pairs() {
		pasted += "  " + p.YAML + "\n"
	}
	s, err := specs.Parse(filepath.Join(filepath.Dir(smallSpec), "pasted.yaml"), []byte(pasted))
	require.NoError(t, err, "the pasted lines are valid inserts entries")
	require.Len(t, s.Inserts, 3)
	pj, err := feature.LoadData(s)
	require.NoError(t, err)
	_, err = pj.PrepareInserts()
	require.NoError(t, err, "each pasted insert lays out")

	gs, err := rep.Graphics()
	require.NoError(t, err)
	require.Len(t, gs, 3, "one graphic a pair")
	w, h := gs[0].Size()
	assert.InDelta(t, 255.118, w, 1e-3, "90 mm (1 in = 25.4 mm = 72 pt)")
	assert.InDelta(t, 170.079, h, 1e-3, "60 mm")
	assert.Equal(t, "1. telegraph and Maßstab", gs[0].Title(), "numbered as in the report")
}

// An option the job cannot honour is an *OptionError, marked bad input;
// its text follows the option's name, as the CLI prints it after "--".
func TestOptionErrors(t *testing.T) {
	j := loadSmall(t)
	for _, tc := range []struct {
		opt    Options
		option string
		text   string
	}{
		{Options{Top: 0}, "top", " 0: give 1 to 100"},
		{Options{Top: 101}, "top", " 101: give 1 to 100"},
		{Options{Top: 1, PerTerm: -1}, "per-term", " -1: give 0 or more"},
		{Options{Top: 1, Output: "nowhere"}, "output", " nowhere: the spec has no output of that name"},
		{Options{Top: 1, Size: "90mm"}, "size", `: "90mm" is not a size`},
	} {
		_, err := Find(j, tc.opt)
		require.Error(t, err, "%+v", tc.opt)
		var oe *OptionError
		require.ErrorAs(t, err, &oe)
		assert.Equal(t, tc.option, oe.Option)
		assert.True(t, strings.HasPrefix(oe.Text, tc.text), "%q", oe.Text)
		assert.True(t, specs.IsBadInput(err))
	}
	rep, err := Find(j, Options{Top: 1, Size: "5mm x 5mm"})
	require.NoError(t, err)
	_, err = rep.Graphics()
	var oe *OptionError
	require.ErrorAs(t, err, &oe, "a size too small for the plot shows when laid out")
	assert.Equal(t, "size", oe.Option)
	assert.Contains(t, oe.Text, " 5mm x 5mm is too small for pair 1: ")
	assert.True(t, specs.IsBadInput(err))
}

// A screen output's inserts are sized in CSS px (480 × 300 by default).
func TestFindScreenSize(t *testing.T) {
	j := loadSmall(t)
	j.Spec.Outputs = append(j.Spec.Outputs, specs.Output{Name: "web", Kind: specs.Screen})
	rep, err := Find(j, Options{Top: 1, Output: "web"})
	require.NoError(t, err)
	assert.Equal(t, "480px x 300px", rep.Alike[0].Insert.Size)
	assert.Equal(t, "web", rep.Alike[0].Insert.Output)
}

// The sheet: a PNG and a PDF of one page per pair at the insert's size
// (read back with poppler's pdfinfo); the same bytes twice; nothing else
// in the folder touched; a cancelled context writes nothing.
func TestWriteSheets(t *testing.T) {
	j := loadSmall(t)
	rep, err := Find(j, Options{Top: 3})
	require.NoError(t, err)
	gs, err := rep.Graphics()
	require.NoError(t, err)
	dir := t.TempDir()
	require.NoError(t, os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("mine"), 0o644))
	date := feature.FallbackDate

	_, err = WriteSheets(canceled(), rep, gs, dir, date)
	require.ErrorIs(t, err, context.Canceled)
	entries, _ := os.ReadDir(dir)
	assert.Len(t, entries, 1, "cancelled: nothing written")

	files, err := WriteSheets(context.Background(), rep, gs, dir, date)
	require.NoError(t, err)
	require.Equal(t, []string{filepath.Join(dir, "pairs.png"), filepath.Join(dir, "pairs.pdf")}, files)
	png1, err := os.ReadFile(files[0])
	require.NoError(t, err)
	assert.True(t, bytes.HasPrefix(png1, []byte("\x89PNG\r\n\x1a\n")), "PNG signature (ISO/IEC 15948 §5.2)")
	pdf1, err := os.ReadFile(files[1])
	require.NoError(t, err)
	pdfinfo := tooltest.Require(t, "pdfinfo", "poppler-utils")
	info, err := exec.Command(pdfinfo, files[1]).Output()
	require.NoError(t, err)
	assert.Regexp(t, `Pages:\s+3\n`, string(info), "one page per pair")
	assert.Regexp(t, `Page size:\s+255.118 x 170.079 pts`, string(info), "90 mm × 60 mm (1 in = 25.4 mm, 72 pt)")

	_, err = WriteSheets(context.Background(), rep, gs, dir, date)
	require.NoError(t, err)
	png2, _ := os.ReadFile(files[0])
	pdf2, _ := os.ReadFile(files[1])
	assert.Equal(t, png1, png2, "same PNG bytes")
	assert.Equal(t, pdf1, pdf2, "same PDF bytes")
	notes, _ := os.ReadFile(filepath.Join(dir, "notes.txt"))
	assert.Equal(t, "mine", string(notes))
	entries, _ = os.ReadDir(dir)
	assert.Len(t, entries, 3, "no stray temporary file")
}

func canceled() context.Context {
	ctx, cancel := context.WithCancelCause(context.Background())
	cancel(context.Canceled)
	return ctx
}

// LoadData leaves the caller's spec as it was.
func TestLoadDataKeepsSpec(t *testing.T) {
	s, err := specs.Load(smallSpec)
	require.NoError(t, err)
	s.Order = specs.OrderSimilarity
	_, err = LoadData(s)
	require.NoError(t, err)
	assert.Equal(t, specs.OrderSimilarity, s.Order)
}

// pairsCatalog writes the benchmark catalog of the issues once: 4,000
// invented terms over 1851–2025 (175 years) from the demo generator,
// with the demo's outputs.
var pairsCatalog = sync.OnceValues(func() (string, error) {
	dir, err := os.MkdirTemp("", "sheaf-pairs-catalog-*")
	if err != nil {
		return "", err
	}
	cfg := corpus.DefaultConfig()
	cfg.Terms, cfg.From = 4000, 1851
	if err := corpus.WriteDir(filepath.Join(dir, "data"), cfg); err != nil {
		return "", err
	}
	demo, err := os.ReadFile("../../examples/quillmere/feature.yaml")
	if err != nil {
		return "", err
	}
	spec := strings.NewReplacer("top: 384", "top: 4000", "years: {from: 1868, to: 2025}", "years: {from: 1851, to: 2025}",
		"min-total: 200", "min-total: 0").Replace(string(demo))
	path := filepath.Join(dir, "catalog.yaml")
	return path, os.WriteFile(path, []byte(spec), 0o644)
})

// BenchmarkPairsCatalog: the pair search on the 4,000-term catalog
// (175 years), data loaded once: shapes, the most alike pairs and the
// strongest hand-overs (top 8 of each).
//
//	go test ./render/explore -run '^$' -bench PairsCatalog -benchtime 3x
func BenchmarkPairsCatalog(b *testing.B) {
	spec, err := pairsCatalog()
	require.NoError(b, err)
	j, err := feature.Load(spec)
	require.NoError(b, err)
	for b.Loop() {
		rep, err := Find(j, Options{Top: 8, PerTerm: 2, Size: "90mm x 60mm"})
		require.NoError(b, err)
		// Top 8 of each: the catalog always has 8 alike pairs; hand-overs are
		// only those past the search's threshold, so there may be fewer.
		require.Len(b, rep.Alike, 8)
		require.LessOrEqual(b, len(rep.HandOvers), 8)
		require.Len(b, rep.Pairs(), len(rep.Alike)+len(rep.HandOvers), "one table row per pair")
	}
}

// The table: each list under its heading, "none" for an empty one, each
// pair's entry below it (the small feature has no hand-over: boiler's
// fall and telegraph's rise overlap too little).
func TestWriteTable(t *testing.T) {
	rep, err := Find(loadSmall(t), Options{Top: 1})
	require.NoError(t, err)
	var b bytes.Buffer
	rep.WriteTable(&b)
	want := "../../testdata/small/spec.yaml: 3 terms compared as plotted\n\n" +
		"Most alike (distance: root-mean-square difference of the lines as plotted and of their cumulative ink; 0 is the same line)\n" +
		"  1  0.2870  telegraph · Maßstab\n" +
		"     " + rep.Alike[0].YAML + "\n" +
		"\nStrongest hand-overs (strength: the smaller of the first term's fall and the second's rise, in plot heights)\n" +
		"  none\n" +
		"\nPaste a line under inserts: in the spec; `sheaf build` then draws it.\n"
	assert.Equal(t, want, b.String())
}
