package palette

import (
	"fmt"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Spans the built-in palette is held to. 1868–2025 is the demo; the
// others are shorter and longer spans a feature might cover, up to 164
// years, the longest for which every palette check passes. The
// 20-year rule holds up to DefaultMaxSpan20 years (longer spans put more
// years on the same colours; see README).
var defaultSpans = [][2]float64{{1868, 2025}, {1900, 2000}, {1950, 2000}, {1990, 2025}, {1861, 2025}}

// The requirements on the built-in palette (issue 12, item 8):
//   - L* ≥ 35 and C* ≥ 30 at every year, so a 0.75 pt line stays coloured
//     (the project's thresholds, common practice: below them a thin line
//     reads as black or grey);
//   - WCAG 2.1 SC 1.4.11: 3:1 against white paper for graphical objects
//     (here 3.2:1, a margin for press drift);
//   - lightness strictly monotone (Zeileis, Hornik & Murrell 2009,
//     "Escaping RGBland": a sequential palette's lightness must change
//     monotonically);
//   - colours 20 years apart differ by ΔE00 ≥ 10 (the project's
//     threshold) for every span up to DefaultMaxSpan20 years;
//   - no CIELAB hue in 30°–110° (oranges, browns, ochres, olives, yellows:
//     they muddy or vanish as thin lines on white; hue ranges after the
//     CIE 15 hue-angle convention, the cut-offs common practice);
//   - in sRGB, and every palette check passes (steps, span, CVD).
func TestDefaultProperties(t *testing.T) {
	white := mustHex(t, "#ffffff")
	for _, span := range defaultSpans {
		name := fmt.Sprintf("%v–%v", span[0], span[1])
		s, err := Default(span[0], span[1])
		require.NoError(t, err)
		assert.Equal(t, DefaultName, s.Name())
		prevL := math.Inf(-1)
		for y := span[0]; y <= span[1]; y += 0.5 {
			c := s.At(y)
			lch := c.LCh()
			assert.True(t, c.InGamut(), "%s %v: %v outside sRGB", name, y, c.RGB())
			assert.GreaterOrEqual(t, ContrastRatio(c, white), 3.2, "%s %v: contrast on white", name, y)
			assert.GreaterOrEqual(t, lch.L, 35.0, "%s %v: %s too dark for a thin line", name, y, c.Hex())
			assert.GreaterOrEqual(t, lch.C, 30.0, "%s %v: %s too grey for a thin line", name, y, c.Hex())
			assert.Greater(t, lch.L, prevL, "%s %v: L* must rise", name, y)
			prevL = lch.L
			assert.False(t, lch.H > 30 && lch.H < 110, "%s %v: %s hue %.0f° is orange/brown/yellow", name, y, c.Hex(), lch.H)
			if y+20 <= span[1] && span[1]-span[0] <= DefaultMaxSpan20 {
				assert.GreaterOrEqual(t, c.DeltaE00(s.At(y+20)), 10.0, "%s: %v and %v", name, y, y+20)
			}
		}
		r, err := Check(s, white, 0.75, Print, DefaultThresholds())
		require.NoError(t, err)
		for _, f := range r.Findings {
			assert.NotEqual(t, Fail, f.Severity, "%s: %v", name, f)
		}
	}
}

// The 20-year rule and the spans it covers: DefaultMaxSpan20 is the
// longest span (whole years) for which it holds; one year more breaks it.
// Computed, not outside truth: it keeps README's number honest.
func TestDefaultMaxSpan20(t *testing.T) {
	min20 := func(years float64) float64 {
		s, err := Default(2025-years, 2025)
		require.NoError(t, err)
		worst := math.Inf(1)
		for y := 2025 - years; y+20 <= 2025; y += 0.25 {
			worst = math.Min(worst, s.At(y).DeltaE00(s.At(y+20)))
		}
		return worst
	}
	assert.GreaterOrEqual(t, min20(DefaultMaxSpan20), 10.0)
	assert.Less(t, min20(DefaultMaxSpan20+1), 10.0)
}

func TestDefaultErrors(t *testing.T) {
	for _, sp := range [][2]float64{{2000, 1900}, {1900, 1900}, {math.NaN(), 2000}, {1900, math.Inf(1)}} {
		_, err := Default(sp[0], sp[1])
		assert.Error(t, err, "Default(%v, %v)", sp[0], sp[1])
	}
}

// The anchor table must be what default.go's comment says it is: the key
// curve, chroma capped at 92% of the sRGB boundary, 13 even samples,
// placed by ΔE00 arc length. Rebuilding it here keeps comment and table
// honest.
func TestDefaultTableFollowsDesign(t *testing.T) {
	maxChroma := func(l, h float64) float64 {
		lo, hi := 0.0, 0.4
		for range 40 {
			m := (lo + hi) / 2
			if FromOKLCh(OKLCh{l, m, h}).InGamut() {
				lo = m
			} else {
				hi = m
			}
		}
		return lo
	}
	keys := defaultKeys
	curve := func(u float64) OKLCh {
		for i := 1; i < len(keys); i++ {
			if u <= keys[i].t || i == len(keys)-1 {
				a, b := keys[i-1], keys[i]
				v := (u - a.t) / (b.t - a.t)
				l, h := a.l+v*(b.l-a.l), math.Mod(a.h+v*(b.h-a.h)+720, 360)
				return OKLCh{l, math.Min(a.c+v*(b.c-a.c), 0.92*maxChroma(l, h)), h}
			}
		}
		panic("u out of range")
	}
	n := len(defaultTable)
	pts := make([]OKLCh, n)
	arc := make([]float64, n)
	for i := range n {
		pts[i] = curve(float64(i) / float64(n-1))
		if i > 0 {
			seg, _ := NewScale("seg", []Anchor{{0, FromOKLCh(pts[i-1])}, {1, FromOKLCh(pts[i])}}, nil)
			prev := seg.At(0)
			for j := 1; j <= 200; j++ {
				c := seg.At(float64(j) / 200)
				arc[i] += prev.DeltaE00(c)
				prev = c
			}
			arc[i] += arc[i-1]
		}
	}
	for i, a := range defaultTable {
		p := pts[i]
		assert.InDelta(t, p.L, a.color.L, 6e-5, "anchor %d: table L against the design", i)
		assert.InDelta(t, p.C, a.color.C, 6e-5, "anchor %d: table C against the design", i)
		assert.InDelta(t, p.H, a.color.H, 6e-3, "anchor %d: table h against the design", i)
		assert.InDelta(t, arc[i]/arc[n-1], a.at, 6e-5, "anchor %d: table position against the design's arc length", i)
	}
}
