package main

import (
	"bytes"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/tdewolff/canvas"

	"sheaf/examples/generate/corpus"
	"sheaf/render/pdf"
)

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

func benchJob(b *testing.B, spec string) (*job, *prepared) {
	b.Helper()
	j, err := loadJob(spec)
	if err != nil {
		b.Fatal(err)
	}
	p, err := prepare(j, j.spec.Output("print"))
	if err != nil {
		b.Fatal(err)
	}
	return j, p
}

// writeOnlyPDF writes the output's PDF, pages drawn and encoded in
// parallel by the writer, and returns its size.
func writeOnlyPDF(b *testing.B, j *job, p *prepared) int64 {
	var cw countingWriter
	w := pdf.NewWriter(&cw, pdf.Options{Title: j.spec.Title, Version: version, Date: time.Unix(0, 0)})
	for i := range p.plan.Pages {
		setup := pdf.PageSetup{Boxes: boxes(&p.plan.Pages[i]), Marks: &pdf.MarkOptions{}}
		if err := w.AddPage(setup, func(c *canvas.Canvas) error { return p.feat.Draw(canvas.NewContext(c), i) }); err != nil {
			b.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		b.Fatal(err)
	}
	return cw.n
}

type countingWriter struct{ n int64 }

func (c *countingWriter) Write(p []byte) (int, error) { c.n += int64(len(p)); return len(p), nil }

var _ io.Writer = (*countingWriter)(nil)

// BenchmarkCatalogPDF: the 4,000-term × 158-year catalog as one PDF
// (84 pages of 48 panels), proofs excluded: load, layout and the PDF.
// Reports the PDF's size per page and the peak heap.
func BenchmarkCatalogPDF(b *testing.B) {
	spec, err := catalog()
	if err != nil {
		b.Fatal(err)
	}
	var size int64
	var pages int
	peak := heapPeak(func() {
		for b.Loop() {
			j, p := benchJob(b, spec)
			pages = len(p.plan.Pages)
			size = writeOnlyPDF(b, j, p)
		}
	})
	b.ReportMetric(float64(pages), "pages")
	b.ReportMetric(float64(size)/float64(pages)/1024, "KB/page")
	b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MB")
}

// BenchmarkDemoBuild: `sheaf build --only print` of the demo with proofs
// and contact sheet, into a fresh folder each time (nothing reused).
func BenchmarkDemoBuild(b *testing.B) {
	for b.Loop() {
		dir := b.TempDir() // a fresh folder: a full build every time
		var out, errb bytes.Buffer
		if code := run([]string{"build", demoSpec, "--only", "print", "--out", dir, "--quiet"}, &out, &errb); code != 0 {
			b.Fatalf("exit %d: %s", code, errb.String())
		}
	}
}

// heapPeak runs f while sampling the heap in use every 5 ms and
// returns the largest sample.
func heapPeak(f func()) uint64 {
	done := make(chan struct{})
	var peak uint64
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		var ms runtime.MemStats
		t := time.NewTicker(5 * time.Millisecond)
		defer t.Stop()
		for {
			runtime.ReadMemStats(&ms)
			peak = max(peak, ms.HeapInuse)
			select {
			case <-done:
				return
			case <-t.C:
			}
		}
	}()
	f()
	close(done)
	wg.Wait()
	return peak
}
