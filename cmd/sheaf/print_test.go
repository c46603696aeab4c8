package main

// End-to-end checks of the print build (issue 7): the demo's PDF read back
// with pdfcpu, curves sampled from the content stream, and our proofs
// compared with poppler's rendering of the same page.

import (
	"bytes"
	"image"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"

	"github.com/pdfcpu/pdfcpu/pkg/api"
	"github.com/pdfcpu/pdfcpu/pkg/pdfcpu/model"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/render/curve"
	"sheaf/render/feature"
	"sheaf/render/tooltest"
)

const demoSpec = "../../examples/quillmere/feature.yaml"

// demoBuild builds the demo once per test run into a temporary folder.
var demoBuild = sync.OnceValues(func() (string, error) {
	dir, err := os.MkdirTemp("", "sheaf-demo-*")
	if err != nil {
		return "", err
	}
	var out, errb bytes.Buffer
	if code := run([]string{"build", demoSpec, "--only", "print", "--out", dir}, &out, &errb); code != 0 {
		return "", &buildError{code, errb.String()}
	}
	return dir, nil
})

type buildError struct {
	code   int
	stderr string
}

func (e *buildError) Error() string { return "build exit " + strconv.Itoa(e.code) + ": " + e.stderr }

func demo(t *testing.T) (string, *feature.Output) {
	t.Helper()
	if testing.Short() {
		t.Skip("builds the demo; skipped with -short")
	}
	dir, err := demoBuild()
	require.NoError(t, err)
	j, err := feature.Load(demoSpec)
	require.NoError(t, err)
	p, err := j.Prepare(j.Spec.Output("print"))
	require.NoError(t, err)
	return dir, p
}

// TestDemoPDFBoxes reads the demo PDF with pdfcpu v0.15.0 (a
// general-purpose PDF library) in strict mode: page count as the grid
// solver planned, and every page's MediaBox, BleedBox and TrimBox equal to
// the solver's within 0.01 pt (ISO 32000-1 §14.11.2 page boundaries).
func TestDemoPDFBoxes(t *testing.T) {
	dir, p := demo(t)
	conf := model.NewDefaultConfiguration()
	conf.ValidationMode = model.ValidationStrict
	f, err := os.Open(filepath.Join(dir, "print", "print.pdf"))
	require.NoError(t, err)
	defer f.Close()
	ctx, err := api.ReadContext(f, conf)
	require.NoError(t, err)
	require.Equal(t, model.ValidationStrict, ctx.Conf.ValidationMode, "not reading in strict mode")
	require.NoError(t, api.ValidateContext(ctx), "pdfcpu strict validation")
	require.Equal(t, 8, ctx.PageCount, "PDF pages: the demo asks for 8")
	require.Len(t, p.Plan.Pages, ctx.PageCount, "the plan's pages vs the PDF's")
	pbs, err := ctx.PageBoundaries(nil)
	require.NoError(t, err)
	for i, pb := range pbs {
		pg := p.Plan.Pages[i]
		for _, c := range []struct {
			name string
			box  *model.Box
			want layout.Rect
		}{{"MediaBox", pb.Media, pg.Media}, {"BleedBox", pb.Bleed, pg.Bleed}, {"TrimBox", pb.Trim, pg.Trim}} {
			require.NotNil(t, c.box, "page %d has no %s", i+1, c.name)
			r := c.box.Rect
			assert.InDelta(t, c.want.X0, r.LL.X, 0.01, "page %d %s = %v, solver says %v: lower-left x (pt)", i+1, c.name, r, c.want)
			assert.InDelta(t, c.want.Y0, r.LL.Y, 0.01, "page %d %s = %v, solver says %v: lower-left y (pt)", i+1, c.name, r, c.want)
			assert.InDelta(t, c.want.X1, r.UR.X, 0.01, "page %d %s = %v, solver says %v: upper-right x (pt)", i+1, c.name, r, c.want)
			assert.InDelta(t, c.want.Y1, r.UR.Y, 0.01, "page %d %s = %v, solver says %v: upper-right y (pt)", i+1, c.name, r, c.want)
		}
	}
}

// pathPoints parses a PDF content stream (ISO 32000-1 §8.2 and Table 51:
// q, Q, cm, m, l, c) and returns every path point that ends a segment, in
// default user space (points), and every straight segment.
func pathPoints(content []byte) ([]curve.Point, [][2]curve.Point) {
	type matrix [6]float64
	mul := func(a, b matrix) matrix { // a then b
		return matrix{a[0]*b[0] + a[1]*b[2], a[0]*b[1] + a[1]*b[3], a[2]*b[0] + a[3]*b[2], a[2]*b[1] + a[3]*b[3],
			a[4]*b[0] + a[5]*b[2] + b[4], a[4]*b[1] + a[5]*b[3] + b[5]}
	}
	ctm := matrix{1, 0, 0, 1, 0, 0}
	var stack []matrix
	var nums []float64
	var pts []curve.Point
	var lines [][2]curve.Point
	apply := func(x, y float64) curve.Point {
		return curve.Point{X: ctm[0]*x + ctm[2]*y + ctm[4], Y: ctm[1]*x + ctm[3]*y + ctm[5]}
	}
	inText := false
	for _, tok := range strings.Fields(string(content)) {
		if v, err := strconv.ParseFloat(tok, 64); err == nil {
			nums = append(nums, v)
			continue
		}
		switch tok {
		case "BT":
			inText = true
		case "ET":
			inText = false
		case "q":
			stack = append(stack, ctm)
		case "Q":
			if len(stack) > 0 {
				ctm, stack = stack[len(stack)-1], stack[:len(stack)-1]
			}
		case "cm":
			if len(nums) >= 6 {
				n := nums[len(nums)-6:]
				ctm = mul(matrix{n[0], n[1], n[2], n[3], n[4], n[5]}, ctm)
			}
		case "m", "l":
			if !inText && len(nums) >= 2 {
				q := apply(nums[len(nums)-2], nums[len(nums)-1])
				if tok == "l" && len(pts) > 0 {
					lines = append(lines, [2]curve.Point{pts[len(pts)-1], q})
				}
				pts = append(pts, q)
			}
		case "c":
			if !inText && len(nums) >= 6 {
				pts = append(pts, apply(nums[len(nums)-2], nums[len(nums)-1]))
			}
		}
		nums = nums[:0]
	}
	return pts, lines
}

// onLine is the distance from w to the nearest straight segment.
func onLine(w curve.Point, lines [][2]curve.Point) float64 {
	best := math.Inf(1)
	for _, l := range lines {
		a, b := l[0], l[1]
		dx, dy := b.X-a.X, b.Y-a.Y
		t := 0.0
		if d := dx*dx + dy*dy; d > 0 {
			t = math.Max(0, math.Min(1, ((w.X-a.X)*dx+(w.Y-a.Y)*dy)/d))
		}
		best = math.Min(best, math.Hypot(a.X+t*dx-w.X, a.Y+t*dy-w.Y))
	}
	return best
}

// TestCurvesPassThroughData samples the Béziers of the demo's first page
// from the PDF's content stream and checks that every panel's curve passes
// through each yearly value: the monotone-cubic knots, mapped to the plot
// rectangle, within 1e-3 pt (our writer rounds to 0.001 pt).
func TestCurvesPassThroughData(t *testing.T) {
	dir, p := demo(t)
	ctx, err := api.ReadContextFile(filepath.Join(dir, "print", "print.pdf"))
	require.NoError(t, err)
	d, _, _, err := ctx.PageDict(1, false)
	require.NoError(t, err)
	content, err := ctx.PageContent(d, 1)
	require.NoError(t, err)
	pts, lines := pathPoints(content)
	require.GreaterOrEqual(t, len(pts), 1000, "path points on page 1")
	// Index the points on a 0.01 pt grid for lookup.
	type cell struct{ x, y int64 }
	grid := map[cell][]curve.Point{}
	key := func(x, y float64) cell { return cell{int64(math.Floor(x * 100)), int64(math.Floor(y * 100))} }
	for _, q := range pts {
		k := key(q.X, q.Y)
		grid[k] = append(grid[k], q)
	}
	near := func(w curve.Point) float64 {
		best := math.Inf(1)
		k := key(w.X, w.Y)
		for dx := int64(-1); dx <= 1; dx++ {
			for dy := int64(-1); dy <= 1; dy++ {
				for _, q := range grid[cell{k.x + dx, k.y + dy}] {
					best = math.Min(best, math.Hypot(q.X-w.X, q.Y-w.Y))
				}
			}
		}
		return best
	}
	data := p.Feature.Data
	checked := 0
	for _, pn := range p.Plan.Pages[0].Panels {
		sr := data.Series[pn.Item]
		m, err := p.Feature.PlotMap(pn)
		require.NoError(t, err)
		for i, v := range sr.Values {
			if math.IsNaN(v) {
				continue
			}
			// A zero with no non-zero neighbour is not drawn: it lies on
			// the baseline (README, "Absence").
			nonzero := func(j int) bool {
				return j >= 0 && j < len(sr.Values) && !math.IsNaN(sr.Values[j]) && sr.Values[j] != 0
			}
			if v == 0 && !nonzero(i-1) && !nonzero(i+1) {
				continue
			}
			// An isolated year between gaps is a dot, not a path point.
			prevGap := i == 0 || math.IsNaN(sr.Values[i-1])
			nextGap := i == len(sr.Values)-1 || math.IsNaN(sr.Values[i+1])
			if prevGap && nextGap {
				continue
			}
			want := m.Apply(data.Years[i], v)
			dist := near(want)
			if dist > 1e-3 {
				// canvas stores a straight cubic as a line and joins
				// collinear lines, so a knot on a flat run lies on a line.
				dist = onLine(want, lines)
			}
			if !assert.LessOrEqual(t, dist, 1e-3, "%q %d: distance in pt from %.3f,%.3f to the nearest curve point", sr.Term, int(data.Years[i]), want.X, want.Y) && checked > 20 {
				require.FailNow(t, "yearly points off the curve: stopping")
			}
			checked++
		}
	}
	assert.GreaterOrEqual(t, checked, 48*100, "yearly points checked")
}

// TestProofMatchesPoppler compares our proof of page 1 with poppler's
// pdftoppm rendering of the same PDF page at the same resolution, cropped
// to the trim box. Poppler is an independent PDF renderer; the proofs come
// from canvas's rasterizer with our flattening and gradient fixes, so a
// blob-filled curve or a missing gradient shows up as a large difference.
// Thresholds: antialiasing, hinting and pixel conventions differ between
// renderers, so the limits are proofNoiseMultiple (1.5) × the difference
// between two independent renderers, Ghostscript and pdftoppm, on this
// page (gsPopplerMean, gsPopplerStrong, gsPopplerPanel: noise_test.go,
// which also checks today's floor).
func TestProofMatchesPoppler(t *testing.T) {
	pdftoppm := tooltest.Require(t, "pdftoppm", "poppler-utils")
	dir, p := demo(t)
	dpi := p.Spec.Proofs
	pg := p.Plan.Pages[0]
	px := func(v float64) int { return int(math.Round(v * dpi / 72)) }
	x, y := px(pg.Trim.X0), px(pg.Media.H()-pg.Trim.Y1)
	w, h := px(pg.Trim.X1)-x, px(pg.Media.H()-pg.Trim.Y0)-y
	prefix := filepath.Join(t.TempDir(), "poppler")
	cmd := exec.Command(pdftoppm, "-r", strconv.FormatFloat(dpi, 'f', -1, 64), "-f", "1", "-l", "1", "-singlefile",
		"-x", strconv.Itoa(x), "-y", strconv.Itoa(y), "-W", strconv.Itoa(w), "-H", strconv.Itoa(h),
		"-png", filepath.Join(dir, "print", "print.pdf"), prefix)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "pdftoppm: %s", out)
	theirs := tooltest.ReadPNG(t, prefix+".png")
	ours := tooltest.ReadPNG(t, filepath.Join(dir, "print", "proofs", "page-001.png"))
	require.Equal(t, ours.Bounds().Size(), theirs.Bounds().Size(), "poppler %v, proof %v", theirs.Bounds().Size(), ours.Bounds().Size())
	mean, strong := tooltest.CompareImages(ours, theirs, 64)
	t.Logf("proof vs pdftoppm: mean |Δ| %.3f/255, %.3f%% of pixels differ by more than 64", mean, strong*100)
	assert.LessOrEqual(t, mean, proofNoiseMultiple*gsPopplerMean, "proof differs from poppler's rendering: mean |Δ| out of 255")
	assert.LessOrEqual(t, strong, proofNoiseMultiple*gsPopplerStrong, "proof differs from poppler's rendering: share of strongly different pixels")
	// Panel by panel, so one curve filled as a blob cannot hide in the
	// page's average: the plot areas hold only the curve and a hairline.
	worst, where := 0.0, ""
	for _, pn := range pg.Panels {
		r := image.Rect(px(pn.Plot.X0)-x, px(pg.Media.H()-pn.Plot.Y1)-y, px(pn.Plot.X1)-x, px(pg.Media.H()-pn.Plot.Y0)-y)
		_, s := tooltest.CompareImages(tooltest.SubImage(ours, r), tooltest.SubImage(theirs, r), 64)
		if s > worst {
			worst, where = s, p.Feature.Data.Series[pn.Item].Term
		}
	}
	t.Logf("worst panel %q: %.2f%% strongly different pixels", where, worst*100)
	assert.LessOrEqual(t, worst, proofNoiseMultiple*gsPopplerPanel, "panel %q differs from poppler's rendering: share of its plot's pixels strongly different; a curve drawn wrongly?", where)
}
