package palette

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/lucasb-eyer/go-colorful"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Reference: testdata/ciede2000_sharma2005.csv — G. Sharma, W. Wu,
// E. N. Dalal, "The CIEDE2000 color-difference formula: implementation
// notes, supplementary test data, and mathematical observations", Color
// Res. Appl. 30(1):21–30, 2005, Table 1 (34 pairs, ΔE00 to 4 decimals).
func TestDeltaE00Sharma2005(t *testing.T) {
	rows := refRows(t, "ciede2000_sharma2005.csv", ",")
	require.Len(t, rows, 34, "%d pairs, want 34", len(rows))
	for _, r := range rows {
		x := Lab{num(t, r["L1"]), num(t, r["a1"]), num(t, r["b1"])}
		y := Lab{num(t, r["L2"]), num(t, r["a2"]), num(t, r["b2"])}
		want := num(t, r["de00"])
		// Published to 4 decimals: 1e-4 is the brief, 5e-5 the rounding.
		assert.InDelta(t, want, DeltaE00(x, y), 1e-4, "pair %s: ΔE00 against Sharma et al. (2005) Table 1", r["pair"])
		// The formula is symmetric (Sharma et al. 2005, §3).
		assert.InDelta(t, want, DeltaE00(y, x), 1e-4, "pair %s reversed", r["pair"])
	}
}

func TestDeltaE00Identity(t *testing.T) {
	for _, c := range []Lab{{0, 0, 0}, {50, 0, 0}, {50, 20, -30}, {100, 0, 0}} {
		assert.Zero(t, DeltaE00(c, c), "ΔE00(%v, itself)", c)
	}
}

func BenchmarkDeltaE00(b *testing.B) {
	x, y := Lab{50, 2.5, 0}, Lab{73, 25, -18}
	for b.Loop() {
		DeltaE00(x, y)
	}
}

// Independent implementation: go-colorful's DistanceCIEDE2000
// (github.com/lucasb-eyer/go-colorful v1.4.1, colors.go), which follows
// the same paper (Sharma, Wu & Dalal 2005). Read before use: it takes
// colorful.Color (sRGB) and converts to its own CIELAB (D65 white
// 0.95047, 1, 1.08883) with L in 0–1, so we feed it Lab through its own
// colorful.Lab(L/100, a/100, b/100) — a round trip Lab → XYZ → RGB →
// XYZ → Lab of its own, unclamped and exact to about 1e-13 — and scale
// its result, which it returns ×0.01. Its formula has no clamping; hue is
// atan2 in [0°, 360°), set to 0 when a′ = b = 0, Δh′ and the mean hue
// take the same branches as Sharma et al. eqs. (10) and (14). Known
// divergence: where a colour is exactly neutral, its round trip can
// leave a chroma of ~1e-14 and so a defined hue, which changes the mean
// hue; the terms it feeds are multiplied by √(C′1C′2) ≈ 1e-7, far below
// the 1e-4 tolerance. At |h′1 − h′2| = 180° exactly (Sharma pairs 10 and
// 14) the round-trip noise can pick the other branch; random pairs never
// land there, and the edge pairs below sit 0.5° or more away.
func TestDeltaE00AgainstGoColorful(t *testing.T) {
	colorfulDE := func(x, y Lab) float64 {
		return 100 * colorful.Lab(x.L/100, x.A/100, x.B/100).DistanceCIEDE2000(colorful.Lab(y.L/100, y.A/100, y.B/100))
	}
	rng := rand.New(rand.NewPCG(2005, 34)) // fixed seed: the same pairs every run
	polar := func(l, c, h float64) Lab {
		return Lab{l, c * math.Cos(h*math.Pi/180), c * math.Sin(h*math.Pi/180)}
	}
	type pair struct {
		x, y Lab
		kind string
	}
	var pairs []pair
	// Random pairs over the whole CIELAB box sRGB and print use.
	for range 4000 {
		pairs = append(pairs, pair{
			Lab{100 * rng.Float64(), 256*rng.Float64() - 128, 256*rng.Float64() - 128},
			Lab{100 * rng.Float64(), 256*rng.Float64() - 128, 256*rng.Float64() - 128}, "random"})
	}
	// Close pairs (ΔE00 under about 5), where palette steps live.
	for range 2000 {
		x := Lab{100 * rng.Float64(), 200*rng.Float64() - 100, 200*rng.Float64() - 100}
		pairs = append(pairs, pair{x, Lab{x.L + 4*rng.NormFloat64(), x.A + 4*rng.NormFloat64(), x.B + 4*rng.NormFloat64()}, "close"})
	}
	// Every hue branch: hue pairs chosen so that |Δh| ≤ 180°, |Δh| > 180°
	// with h1 + h2 < 360° and with h1 + h2 ≥ 360° (Sharma eqs. 10 and 14),
	// each in both orders, at chroma 5–100.
	for _, hh := range [][2]float64{{10, 60}, {100, 250}, {20, 200.5}, {30, 230}, {170, 355}, {200, 10}, {300, 100}, {359, 1}, {0.5, 181}, {90, 270.5}} {
		for _, c := range []float64{5, 20, 45, 100} {
			for _, o := range [][2]float64{{0, 1}, {1, 0}} {
				x, y := polar(50, c, hh[int(o[0])]), polar(60, c*0.8, hh[int(o[1])])
				pairs = append(pairs, pair{x, y, "hue branch"})
			}
		}
	}
	// Near-neutral colours: exact greys against colours, and chroma below 1.
	for range 500 {
		g := Lab{100 * rng.Float64(), 0, 0}
		c := polar(100*rng.Float64(), 2*rng.Float64(), 360*rng.Float64())
		pairs = append(pairs, pair{g, c, "near neutral"}, pair{c, polar(c.L+rng.NormFloat64(), rng.Float64(), 360*rng.Float64()), "near neutral"})
	}
	// The blue region, where the rotation term R_T peaks (mean hue near
	// 275°, Sharma eq. 19): hues 230°–320°, chroma 10–90.
	for range 1500 {
		h := 230 + 90*rng.Float64()
		c := 10 + 80*rng.Float64()
		l := 10 + 80*rng.Float64()
		pairs = append(pairs, pair{polar(l, c, h), polar(l+6*rng.NormFloat64(), c+10*rng.NormFloat64(), h+10*rng.NormFloat64()), "blue"})
	}
	// Which mean-hue branch each pair takes (Sharma eq. 14), to show every
	// branch is exercised; h′ as Sharma eqs. (2)–(7) define it.
	branch := func(x, y Lab) string {
		cm := (math.Hypot(x.A, x.B) + math.Hypot(y.A, y.B)) / 2
		g := 0.5 * (1 - math.Sqrt(math.Pow(cm, 7)/(math.Pow(cm, 7)+math.Pow(25, 7))))
		h1, h2 := hueDeg(x.B, (1+g)*x.A), hueDeg(y.B, (1+g)*y.A)
		switch {
		case math.Hypot((1+g)*x.A, x.B)*math.Hypot((1+g)*y.A, y.B) == 0:
			return "neutral"
		case math.Abs(h1-h2) <= 180:
			return "|Δh′| ≤ 180°"
		case h1+h2 < 360:
			return "|Δh′| > 180°, Σh′ < 360°"
		}
		return "|Δh′| > 180°, Σh′ ≥ 360°"
	}
	counts := map[string]int{}
	for _, p := range pairs {
		counts[branch(p.x, p.y)]++
		got, want := DeltaE00(p.x, p.y), colorfulDE(p.x, p.y)
		assert.InDelta(t, want, got, 1e-4, "%s pair %v %v: ours %.6f, go-colorful %.6f", p.kind, p.x, p.y, got, want)
		counts[p.kind]++
	}
	require.GreaterOrEqual(t, len(pairs), 8000)
	for _, b := range []string{"neutral", "|Δh′| ≤ 180°", "|Δh′| > 180°, Σh′ < 360°", "|Δh′| > 180°, Σh′ ≥ 360°"} {
		require.GreaterOrEqual(t, counts[b], 20, "branch %s", b)
	}
	t.Logf("pairs per kind and per mean-hue branch: %v", counts)
}
