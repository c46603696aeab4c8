package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"github.com/stretchr/testify/require"

	"sheaf/examples/generate/corpus"
	"sheaf/render/production"
)

// BenchmarkRebuild builds the 4,000-term catalog (see catalog) in full and
// again after one term's count changed, with and without proofs. The
// issue's target: a one-term rebuild in at most 10 % of a full build.
//
//	go test ./cmd/sheaf -run '^$' -bench Rebuild -benchtime 3x
func BenchmarkRebuild(b *testing.B) {
	src, err := catalog()
	require.NoError(b, err)
	// A private copy: the one-term case edits the data.
	dir := b.TempDir()
	for _, f := range []string{"catalog.yaml", "data/counts.csv", "data/totals.csv"} {
		data, err := os.ReadFile(filepath.Join(filepath.Dir(src), f))
		require.NoError(b, err)
		if f == "catalog.yaml" {
			// The print pages only: BenchmarkDemoRebuild measures
			// screen outputs and inserts, reused whole.
			if i := bytes.Index(data, []byte("\ninserts:")); i >= 0 {
				data = data[:i+1]
			}
		}
		os.MkdirAll(filepath.Join(dir, filepath.Dir(f)), 0o755)
		require.NoError(b, os.WriteFile(filepath.Join(dir, f), data, 0o644))
	}
	spec := filepath.Join(dir, "catalog.yaml")
	build := func(b *testing.B, out string, flags ...string) {
		var o, e bytes.Buffer
		args := append([]string{"build", spec, "--out", out, "--only", "print", "--quiet"}, flags...)
		require.Equal(b, exitOK, run(args, &o, &e), "exit code; stderr: %s", &e)
	}
	for _, proofs := range []struct {
		name  string
		flags []string
	}{{"proofs", nil}, {"no-proofs", []string{"--no-proofs"}}} {
		out := filepath.Join(dir, "out-"+proofs.name)
		b.Run("full/"+proofs.name, func(b *testing.B) {
			for b.Loop() {
				build(b, out, append([]string{"--full"}, proofs.flags...)...)
			}
		})
		b.Run("one-term/"+proofs.name, func(b *testing.B) {
			build(b, out, proofs.flags...)
			m, err := production.ReadManifest(out)
			require.NoError(b, err)
			require.NotNil(b, m, "manifest")
			term := m.Outputs[0].Pages[len(m.Outputs[0].Pages)/2].Terms[0]
			for b.Loop() {
				b.StopTimer()
				nudgeCount(b, spec, term)
				b.StartTimer()
				build(b, out, proofs.flags...)
			}
		})
	}
}

// BenchmarkDemoRebuild builds the whole demo (print with proofs, the
// 1200 px scrolling web page with its PNGs and panel files, two inserts)
// once, then measures a rebuild with nothing changed and one after a
// count of "telegraph" changed (print page 1, the web page and both
// inserts show it).
//
//	go test ./cmd/sheaf -run '^$' -bench DemoRebuild -benchtime 3x
func BenchmarkDemoRebuild(b *testing.B) {
	dir := b.TempDir()
	for _, f := range []string{"feature.yaml", "data/counts.csv", "data/totals.csv"} {
		data, err := os.ReadFile(filepath.Join(filepath.Dir(demoSpec), f))
		require.NoError(b, err)
		os.MkdirAll(filepath.Join(dir, filepath.Dir(f)), 0o755)
		require.NoError(b, os.WriteFile(filepath.Join(dir, f), data, 0o644))
	}
	spec := filepath.Join(dir, "feature.yaml")
	out := filepath.Join(dir, "out")
	build := func(b *testing.B) {
		var o, e bytes.Buffer
		require.Equal(b, exitOK, run([]string{"build", spec, "--out", out, "--quiet"}, &o, &e), "exit code; stderr: %s", &e)
	}
	build(b)
	b.Run("unchanged", func(b *testing.B) {
		for b.Loop() {
			build(b)
		}
	})
	b.Run("one-term", func(b *testing.B) {
		for b.Loop() {
			b.StopTimer()
			nudgeCount(b, spec, "telegraph")
			b.StartTimer()
			build(b)
		}
	})
}

// BenchmarkDemoBuild: `sheaf build --only print` of the demo with proofs
// and contact sheet, into a fresh folder each time (nothing reused).
func BenchmarkDemoBuild(b *testing.B) {
	for b.Loop() {
		dir := b.TempDir() // a fresh folder: a full build every time
		var out, errb bytes.Buffer
		require.Equal(b, exitOK, run([]string{"build", demoSpec, "--only", "print", "--out", dir, "--quiet"}, &out, &errb), "exit code; stderr: %s", &errb)
	}
}

// catalog writes the benchmark catalog once: 4,000 invented terms over
// 1851–2025 (175 years) from the demo generator, with the demo's outputs.
var catalog = sync.OnceValues(func() (string, error) {
	dir, err := os.MkdirTemp("", "sheaf-catalog-*")
	if err != nil {
		return "", err
	}
	cfg := corpus.DefaultConfig()
	cfg.Terms = 4000
	cfg.From = 1851 // 175 years, as the issues' benchmarks ask
	if err := corpus.WriteDir(filepath.Join(dir, "data"), cfg); err != nil {
		return "", err
	}
	demo, err := os.ReadFile(demoSpec)
	if err != nil {
		return "", err
	}
	spec := strings.Replace(string(demo), "top: 384", "top: 4000", 1)
	spec = strings.Replace(spec, "years: {from: 1868, to: 2025}", "years: {from: 1851, to: 2025}", 1)
	spec = strings.Replace(spec, "min-total: 200", "min-total: 0", 1)
	path := filepath.Join(dir, "catalog.yaml")
	return path, os.WriteFile(path, []byte(spec), 0o644)
})

// BenchmarkTerms: `sheaf terms` on the 4,000-term catalog (700,000 rows),
// JSON to a buffer. The target: at most 300 ms.
//
//	go test ./cmd/sheaf -run '^$' -bench Terms -benchtime 5x
func BenchmarkTerms(b *testing.B) {
	spec, err := catalog()
	require.NoError(b, err)
	for b.Loop() {
		var o, e bytes.Buffer
		require.Equal(b, exitOK, run([]string{"terms", spec, "--json"}, &o, &e), "exit code; stderr: %s", &e)
	}
}
