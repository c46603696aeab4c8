package raster_test

import (
	"math"
	"math/rand/v2"
	"sheaf/render/tooltest"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/canvas"

	"sheaf/render/curve"
	"sheaf/render/raster"
)

// walk is a seeded random-walk series of 175 yearly values, like a
// term's counts, built into the cubic Béziers render/curve makes and
// mapped to a 120 × 40 pt plot at (10, 10) on a 140 × 60 pt page. It
// returns the path in millimetres and its length in points.
func walk(t testing.TB, seed uint64) (*canvas.Path, float64) {
	t.Helper()
	r := rand.New(rand.NewPCG(seed, 7))
	xs, ys := make([]float64, 175), make([]float64, 175)
	v, top := 20.0, 0.0
	for i := range xs {
		xs[i] = float64(1800 + i)
		v = math.Abs(v + 3*r.NormFloat64())
		ys[i], top = v, max(top, v)
	}
	m, err := curve.NewMap(1800, 1974, 0, top, 10, 130, 10, 50)
	require.NoError(t, err)
	runs, err := curve.Build(xs, ys, m, nil)
	require.NoError(t, err)
	p := &canvas.Path{}
	length := 0.0
	for _, run := range runs {
		p.MoveTo(run.Start.X*mm, run.Start.Y*mm)
		for _, z := range run.Beziers {
			p.CubeTo(z.P1.X*mm, z.P1.Y*mm, z.P2.X*mm, z.P2.Y*mm, z.P3.X*mm, z.P3.Y*mm)
			prev := z.P0
			for k := 1; k <= 64; k++ {
				q := z.At(float64(k) / 64)
				length += math.Hypot(q.X-prev.X, q.Y-prev.Y)
				prev = q
			}
		}
	}
	return p, length
}

const (
	walkW, walkH = 140.0, 60.0 // page, points
	walkLine     = 0.7         // stroke width, points
	walkDPI      = 100
)

// blobSeed is a walk whose stroke canvas's rasterizer fills as a solid
// blob when the Béziers are stroked as they are (ink 3.2 × length ×
// width; found by searching seeds 0–399, one of them).
const blobSeed = 397

// walkSeeds are the walks the tests stroke.
func walkSeeds() []uint64 {
	n := uint64(120)
	if testing.Short() {
		n = 20
	}
	seeds := []uint64{blobSeed}
	for s := range n {
		seeds = append(seeds, s)
	}
	return seeds
}

// strokedArea is the area, in device pixels, of a stroke of the given
// length and width (points) with round caps: length × width plus the two
// half-disc caps. Turns sharper than the width overlap the stroke on
// itself, so the inked area is a little less.
func strokedArea(length, width, dpi float64) float64 {
	k := dpi / 72
	return length*k*width*k + math.Pi*(width*k)*(width*k)/4
}

// TestStrokesAreFlattened strokes random-walk curves at 0.7 pt and
// 100 dpi and checks that the inked area stays close to length × width.
// canvas strokes some long Bézier paths into an outline that fills as a
// solid blob (ink several times length × width): "canvas rasterizer
// defect observed by this project (issue 7)"; the renderer flattens
// strokes to avoid it. The bounds, 0.85–1.10 of length × width, are set
// here: measured 0.937–0.983 over 400 walks with the workaround, 3.19 for
// blobSeed without it.
func TestStrokesAreFlattened(t *testing.T) {
	lo, hi := math.Inf(1), 0.0
	for _, seed := range walkSeeds() {
		p, length := walk(t, seed)
		img, err := raster.Draw(walkW, walkH, walkDPI, white, func(ctx *canvas.Context) error {
			stroke(ctx, p, walkLine)
			return nil
		})
		require.NoError(t, err)
		ratio := ink(img) / strokedArea(length, walkLine, walkDPI)
		lo, hi = min(lo, ratio), max(hi, ratio)
		assert.True(t, ratio >= 0.85 && ratio <= 1.10, "walk %d: inked %.2f × length × width (want 0.85–1.10): a stroke filled as a blob?", seed, ratio)
	}
	t.Logf("ink / (length × width): %.3f–%.3f", lo, hi)
}

// TestStrokesMatchPoppler renders a handful of the walks, written as PDF
// by sheaf/render/pdf, with poppler's pdftoppm, an independent renderer
// that strokes the Béziers itself, and compares the ink. Poppler inks
// thin lines heavier than their width (measured 1.09–1.11 × ours at
// 0.7 pt and 100 dpi), so the limits, set here, are 1.0–1.2 of our ink,
// and at most 0.5 % of pixels off by more than 96/255; a blob breaks both.
func TestStrokesMatchPoppler(t *testing.T) {
	seeds := []uint64{blobSeed, 0, 1, 2, 3, 4}
	var pages []page
	for _, seed := range seeds {
		p, _ := walk(t, seed)
		pages = append(pages, page{w: walkW, h: walkH, draw: func(ctx *canvas.Context) error {
			stroke(ctx, p, walkLine)
			return nil
		}})
	}
	theirs := poppler(t, writePDF(t, pages...), walkDPI)
	require.Len(t, theirs, len(pages), "pdftoppm gave %d pages, want %d", len(theirs), len(pages))
	for i, seed := range seeds {
		ours, err := raster.Draw(walkW, walkH, walkDPI, white, pages[i].draw)
		require.NoError(t, err)
		// pdftoppm rounds the page's pixel size up, Draw to the nearest;
		// both put the page's top-left corner at pixel (0, 0).
		require.True(t, ours.Bounds().In(theirs[i].Bounds()), "walk %d: size %v, poppler %v", seed, ours.Bounds().Size(), theirs[i].Bounds().Size())
		cut := tooltest.SubImage(theirs[i], ours.Bounds())
		ratio := ink(cut) / ink(ours)
		_, share := tooltest.CompareImages(ours, cut, 96)
		t.Logf("walk %d: poppler inks %.3f × ours; %.2f%% pixels off by > 96", seed, ratio, share*100)
		assert.True(t, ratio >= 1.0 && ratio <= 1.2, "walk %d: poppler inks %.2f × ours (want 1.0–1.2)", seed, ratio)
		assert.LessOrEqual(t, share, 0.005, "walk %d: share of pixels off", seed)
	}
}

// BenchmarkStrokeWalk measures stroking one 175-year curve at 0.7 pt and
// 100 dpi, flattening included: the cost of a proof's panel.
func BenchmarkStrokeWalk(b *testing.B) {
	p, _ := walk(b, 1)
	draw := func(ctx *canvas.Context) error {
		stroke(ctx, p, walkLine)
		return nil
	}
	for b.Loop() {
		_, err := raster.Draw(walkW, walkH, walkDPI, white, draw)
		require.NoError(b, err)
	}
}
