package pdf

import (
	"bytes"
	"testing"

	"github.com/go-fonts/dejavu/dejavusanscondensed"
	"github.com/go-fonts/latin-modern/lmsans10regular"
	"github.com/stretchr/testify/require"
)

// BenchmarkDocumentFonts is BenchmarkDocument's 4,000-chart document set
// in a TrueType font (DejaVu Sans Condensed, the default face) and in a
// CFF OpenType font (Latin Modern Sans): time, and file size a page.
func BenchmarkDocumentFonts(b *testing.B) {
	d := newBenchData(b)
	for _, fc := range []struct {
		name string
		font []byte
	}{{"truetype", dejavusanscondensed.TTF}, {"cff", lmsans10regular.TTF}} {
		b.Run(fc.name, func(b *testing.B) {
			d.font = loadFont(b, fc.font)
			b.ReportAllocs()
			var size int
			for b.Loop() {
				var buf bytes.Buffer
				w := NewWriter(&buf, Options{Title: "bench", Date: testDate})
				for p := 0; p < pagesNeeded(); p++ {
					require.NoError(b, w.AddPage(PageSetup{Boxes: benchBoxes, Marks: &MarkOptions{}}, d.drawBenchPage(p*benchPerPage)))
				}
				require.NoError(b, w.Close())
				size = buf.Len()
			}
			b.ReportMetric(float64(size)/float64(pagesNeeded()), "bytes/page")
		})
	}
}
