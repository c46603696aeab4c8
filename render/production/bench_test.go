package production

import (
	"context"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/examples/generate/corpus"
	"sheaf/render/feature"
	"sheaf/render/pdf"
	"sheaf/render/tooltest"
	"sheaf/specs"
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
	demo, err := os.ReadFile("../../examples/quillmere/feature.yaml")
	if err != nil {
		return "", err
	}
	spec := strings.Replace(string(demo), "top: 384", "top: 4000", 1)
	spec = strings.Replace(spec, "years: {from: 1868, to: 2025}", "years: {from: 1851, to: 2025}", 1)
	spec = strings.Replace(spec, "min-total: 200", "min-total: 0", 1)
	path := filepath.Join(dir, "catalog.yaml")
	return path, os.WriteFile(path, []byte(spec), 0o644)
})

func benchJob(b *testing.B, spec string) (*feature.Job, *feature.Output) {
	b.Helper()
	j, err := feature.Load(spec)
	require.NoError(b, err)
	p, err := j.Prepare(j.Spec.Output("print"))
	require.NoError(b, err)
	return j, p
}

// writeOnlyPDF writes the output's PDF, pages drawn and encoded in
// parallel by the writer, and returns its size.
func writeOnlyPDF(b *testing.B, j *feature.Job, p *feature.Output) int64 {
	var cw countingWriter
	w := pdf.NewWriter(&cw, pdf.Options{Title: j.Spec.Title, Version: Version, Date: time.Unix(0, 0), Press: p.Press})
	for i := range p.Plan.Pages {
		setup := pdf.PageSetup{Boxes: PageBoxes(&p.Plan.Pages[i]), Marks: &pdf.MarkOptions{}, Press: p.Press}
		require.NoError(b, w.AddPage(setup, func(c *canvas.Canvas) error { return p.Feature.Draw(canvas.NewContext(c), i) }))
	}
	require.NoError(b, w.Close())
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
	require.NoError(b, err)
	var size int64
	var pages int
	peak := heapPeak(func() {
		for b.Loop() {
			j, p := benchJob(b, spec)
			pages = len(p.Plan.Pages)
			size = writeOnlyPDF(b, j, p)
		}
	})
	b.ReportMetric(float64(pages), "pages")
	b.ReportMetric(float64(size)/float64(pages)/1024, "KB/page")
	b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MB")
}

// BenchmarkCatalogPDFCMYK is BenchmarkCatalogPDF with a printing
// condition (Ghostscript's default_cmyk.icc): every colour converted, every
// gradient refined into a CMYK ramp, type and rules as black ink — the
// issue asks for at most 1.2× the RGB build (conversions are cached per
// colour and per gradient).
func BenchmarkCatalogPDFCMYK(b *testing.B) {
	spec, err := catalog()
	require.NoError(b, err)
	profile := tooltest.ICCProfile(b, "default_cmyk.icc")
	text, err := os.ReadFile(spec)
	require.NoError(b, err)
	cmyk := filepath.Join(filepath.Dir(spec), "catalog-cmyk.yaml")
	withPress := strings.Replace(string(text), "    kind: print\n", "    kind: print\n    press: {profile: "+profile+"}\n", 1)
	require.NotEqual(b, string(text), withPress, "the catalog spec has no print output to give a press")
	require.NoError(b, os.WriteFile(cmyk, []byte(withPress), 0o644))
	var size int64
	var pages int
	peak := heapPeak(func() {
		for b.Loop() {
			j, p := benchJob(b, cmyk)
			require.NotNil(b, p.Press, "no printing condition")
			pages = len(p.Plan.Pages)
			size = writeOnlyPDF(b, j, p)
		}
	})
	b.ReportMetric(float64(pages), "pages")
	b.ReportMetric(float64(size)/float64(pages)/1024, "KB/page")
	b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MB")
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

// catalogJob loads the 4,000-term catalog once per benchmark.
func catalogJob(b *testing.B) *feature.Job {
	b.Helper()
	spec, err := catalog()
	require.NoError(b, err)
	j, err := feature.Load(spec)
	require.NoError(b, err)
	return j
}

// screenBench prepares the catalog's web output (the demo's, 1200 px
// wide, minimum panel width 150 px: six columns) without embedded fonts,
// scrolling or, with pageH > 0, in pages of that height.
func screenBench(b *testing.B, j *feature.Job, pageH float64) *feature.Output {
	b.Helper()
	out := *j.Spec.Output("web")
	out.Fonts.Embed = false
	out.MinPanelWidth = specs.Length(150 * 0.75)
	if pageH > 0 {
		out.Trim.H = specs.Length(pageH * 0.75)
		out.Flow = specs.FlowPages
	}
	p, err := j.Prepare(&out)
	require.NoError(b, err)
	return p
}

// BenchmarkCatalogScrollSVG: the catalog as one 1200 px scrolling SVG
// (layout done once, outside the loop). Reports its size and the size a
// 48-panel share of it takes.
func BenchmarkCatalogScrollSVG(b *testing.B) {
	j := catalogJob(b)
	p := screenBench(b, j, 0)
	var cw countingWriter
	for b.Loop() {
		cw = countingWriter{}
		pg := p.Plan.Pages[0].Trim
		require.NoError(b, drawSVG(context.Background(), &cw, pg, screenSVGOptions(j, p), func(ctx *canvas.Context) error { return p.Feature.Draw(ctx, 0) }))
	}
	n := p.Plan.Panels()
	b.ReportMetric(float64(n), "panels")
	b.ReportMetric(float64(cw.n)/(1<<20), "MB")
	b.ReportMetric(float64(cw.n)/float64(n)*48/1024, "KB/48-panels")
}

// BenchmarkCatalogPanelFiles: one SVG per term for the whole catalog,
// written to memory. Reports the total and the mean file size.
func BenchmarkCatalogPanelFiles(b *testing.B) {
	j := catalogJob(b)
	p := screenBench(b, j, 0)
	var total int64
	n := 0
	for b.Loop() {
		total, n = 0, 0
		for _, pn := range p.Plan.Pages[0].Panels {
			pn, win := panelWindow(p.Plan, pn)
			var cw countingWriter
			require.NoError(b, drawSVG(context.Background(), &cw, win, screenSVGOptions(j, p), func(ctx *canvas.Context) error { return p.Feature.DrawPanel(ctx, pn) }))
			total += cw.n
			n++
		}
	}
	b.ReportMetric(float64(n), "files")
	b.ReportMetric(float64(total)/(1<<20), "MB-total")
	b.ReportMetric(float64(total)/float64(n)/1024, "KB/file")
}

// BenchmarkCatalogPageSVG: the catalog in 1200 px wide pages of 6 × 8 =
// 48 panels (after the first page; minimum panel width 150 px, the
// shortest page height that holds eight rows); reports a full page's size.
func BenchmarkCatalogPageSVG(b *testing.B) {
	j := catalogJob(b)
	var p *feature.Output
	for h := 1200.0; ; h += 10 {
		p = screenBench(b, j, h)
		if p.Plan.RowsPerPage >= 8 && p.Plan.Columns == 6 || h > 3000 {
			break
		}
	}
	i := 1 // a page after the first: no title, all panels
	var cw countingWriter
	for b.Loop() {
		cw = countingWriter{}
		require.NoError(b, drawSVG(context.Background(), &cw, p.Plan.Pages[i].Trim, screenSVGOptions(j, p), func(ctx *canvas.Context) error { return p.Feature.Draw(ctx, i) }))
	}
	b.ReportMetric(float64(len(p.Plan.Pages[i].Panels)), "panels/page")
	b.ReportMetric(float64(cw.n)/1024, "KB/page")
}
