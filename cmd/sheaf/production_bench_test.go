package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// BenchmarkRebuild builds the 4,000-term catalog (see catalog) in full and
// again after one term's count changed, with and without proofs. The
// issue's target: a one-term rebuild in at most 10 % of a full build.
//
//	go test ./cmd/sheaf -run '^$' -bench Rebuild -benchtime 3x
func BenchmarkRebuild(b *testing.B) {
	src, err := catalog()
	if err != nil {
		b.Fatal(err)
	}
	// A private copy: the one-term case edits the data.
	dir := b.TempDir()
	for _, f := range []string{"catalog.yaml", "data/counts.csv", "data/totals.csv"} {
		data, err := os.ReadFile(filepath.Join(filepath.Dir(src), f))
		if err != nil {
			b.Fatal(err)
		}
		if f == "catalog.yaml" {
			// The print pages only: BenchmarkDemoRebuild measures
			// screen outputs and inserts, reused whole.
			if i := bytes.Index(data, []byte("\ninserts:")); i >= 0 {
				data = data[:i+1]
			}
		}
		os.MkdirAll(filepath.Join(dir, filepath.Dir(f)), 0o755)
		if err := os.WriteFile(filepath.Join(dir, f), data, 0o644); err != nil {
			b.Fatal(err)
		}
	}
	spec := filepath.Join(dir, "catalog.yaml")
	build := func(b *testing.B, out string, flags ...string) {
		var o, e bytes.Buffer
		args := append([]string{"build", spec, "--out", out, "--only", "print", "--quiet"}, flags...)
		if code := run(args, &o, &e); code != exitOK {
			b.Fatalf("exit %d: %s", code, e.String())
		}
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
			m, err := readManifest(out)
			if err != nil || m == nil {
				b.Fatal(err)
			}
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
		if err != nil {
			b.Fatal(err)
		}
		os.MkdirAll(filepath.Join(dir, filepath.Dir(f)), 0o755)
		if err := os.WriteFile(filepath.Join(dir, f), data, 0o644); err != nil {
			b.Fatal(err)
		}
	}
	spec := filepath.Join(dir, "feature.yaml")
	out := filepath.Join(dir, "out")
	build := func(b *testing.B) {
		var o, e bytes.Buffer
		if code := run([]string{"build", spec, "--out", out, "--quiet"}, &o, &e); code != exitOK {
			b.Fatalf("exit %d: %s", code, e.String())
		}
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
