package production

import (
	"bytes"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/palette"
	"sheaf/render/pdf"
	"sheaf/render/tooltest"
)

// TestShadingsFollowThePalette reads the CMYK shadings back out of a
// demo page as written (stitching functions of linear pieces, ISO 32000-1
// §7.10.4, evaluated as a PDF consumer does) and checks the issue's
// requirement: at every year of the span the shading's colour prints
// within ΔE00 1 of that year's palette colour converted directly.
func TestShadingsFollowThePalette(t *testing.T) {
	profile := tooltest.ICCProfile(t, "default_cmyk.icc")
	j := demoJob(t, "    press: {profile: "+profile+"}\n")
	p, err := j.Prepare(j.Spec.Output("print"))
	require.NoError(t, err)
	require.NotNil(t, p.Press)
	var buf bytes.Buffer
	w := pdf.NewWriter(&buf, pdf.Options{Title: "t", Date: time.Unix(0, 0), Press: p.Press, Compression: pdf.Uncompressed})
	pg := &p.Plan.Pages[0]
	require.NoError(t, w.AddPage(pdf.PageSetup{Boxes: PageBoxes(pg), Press: p.Press},
		func(c *canvas.Canvas) error { return p.Feature.Draw(canvas.NewContext(c), 0) }))
	require.NoError(t, w.Close())
	doc := buf.String()

	fnRef := regexp.MustCompile(`/ShadingType 2 /ColorSpace /DeviceCMYK /Coords \[[^\]]*\] /Function (\d+) 0 R`)
	refs := map[string]bool{}
	for _, m := range fnRef.FindAllStringSubmatch(doc, -1) {
		refs[m[1]] = true
	}
	require.NotEmpty(t, refs, "no CMYK shading on the page")
	from, to := float64(j.Data.Span.From), float64(j.Data.Span.To)
	worst := 0.0
	for num := range refs {
		i := strings.Index(doc, "\n"+num+" 0 obj\n")
		require.GreaterOrEqual(t, i, 0)
		body := doc[i : i+strings.Index(doc[i:], "endobj")]
		f := parseStitching(t, body)
		for y := from; y <= to; y++ {
			got := f((y - from) / (to - from))
			want := p.Press.Convert(p.Feature.Palette.At(y).RGB())
			worst = math.Max(worst, palette.DeltaE00(p.Press.Printed(got), p.Press.Printed(want)))
		}
	}
	t.Logf("%d shading functions; worst ΔE00 %.3f", len(refs), worst)
	require.LessOrEqual(t, worst, 1.0)
}

// parseStitching reads a Type 3 function of Type 2 (N = 1) pieces with
// Encode [0 1 …] and returns it as a function of t.
func parseStitching(t *testing.T, body string) func(float64) []float64 {
	t.Helper()
	nums := func(s string) []float64 {
		var out []float64
		for _, f := range strings.Fields(s) {
			v, err := strconv.ParseFloat(f, 64)
			require.NoError(t, err, f)
			out = append(out, v)
		}
		return out
	}
	piece := regexp.MustCompile(`/C0 \[([^\]]*)\] /C1 \[([^\]]*)\] /N 1`)
	var c0, c1 [][]float64
	for _, m := range piece.FindAllStringSubmatch(body, -1) {
		c0 = append(c0, nums(m[1]))
		c1 = append(c1, nums(m[2]))
	}
	bm := regexp.MustCompile(`/Bounds \[([^\]]*)\]`).FindStringSubmatch(body)
	require.NotNil(t, bm)
	bounds := nums(bm[1])
	require.Len(t, bounds, len(c0)-1)
	return func(x float64) []float64 {
		k, lo, hi := 0, 0.0, 1.0
		for k < len(bounds) && x >= bounds[k] {
			k++
		}
		if k > 0 {
			lo = bounds[k-1]
		}
		if k < len(bounds) {
			hi = bounds[k]
		}
		u := 0.0
		if hi > lo {
			u = (x - lo) / (hi - lo)
		}
		out := make([]float64, len(c0[k]))
		for i := range out {
			out[i] = c0[k][i] + u*(c1[k][i]-c0[k][i])
		}
		return out
	}
}
