package palette

import (
	"math"
	"testing"
)

// The requirements on the built-in palette come from the project brief;
// the limits are WCAG 2.1 SC 1.4.11 (3:1 for graphical objects) and
// Zeileis, Hornik & Murrell (2009), "Escaping RGBland" (lightness of a
// sequential palette must change monotonically).
func TestDefaultProperties(t *testing.T) {
	white := mustHex(t, "#ffffff")
	for _, span := range [][2]float64{{1868, 2025}, {1900, 2000}, {1825, 2025}, {1950, 2000}} {
		s, err := Default(span[0], span[1])
		if err != nil {
			t.Fatal(err)
		}
		if s.Name() != DefaultName {
			t.Errorf("name %q", s.Name())
		}
		prevL := math.Inf(1)
		for y := span[0]; y <= span[1]; y += 0.5 {
			c := s.At(y)
			lch := c.LCh()
			if !c.InGamut() {
				t.Errorf("%v: %v outside sRGB", y, c.RGB())
			}
			if cr := ContrastRatio(c, white); cr < 3.2 { // 3:1 plus a margin for print drift
				t.Errorf("%v: contrast %.2f on white", y, cr)
			}
			if !(lch.L < prevL) {
				t.Errorf("%v: L* %.3f does not fall (previous %.3f)", y, lch.L, prevL)
			}
			prevL = lch.L
			// Not grey, brown, orange or yellow: chroma stays up and CIELAB
			// hue stays out of 35°–110°, where orange, brown and yellow
			// live (hues from CIE 15 hue-angle convention; range common practice).
			if lch.C < 15 || (lch.H > 35 && lch.H < 110) {
				t.Errorf("%v: %s has C* %.1f h %.0f: grey or in the brown/orange/yellow range", y, c.Hex(), lch.C, lch.H)
			}
		}
		if d := s.At(span[0]).DeltaE00(s.At(span[1])); d < 30 {
			t.Errorf("%v: first vs last ΔE00 %.1f", span, d)
		}
	}
}

func TestDefaultErrors(t *testing.T) {
	for _, sp := range [][2]float64{{2000, 1900}, {1900, 1900}, {math.NaN(), 2000}, {1900, math.Inf(1)}} {
		if _, err := Default(sp[0], sp[1]); err == nil {
			t.Errorf("Default(%v, %v): no error", sp[0], sp[1])
		}
	}
}

// The anchor table must be what default.go's comment says it is: the key
// curve, chroma capped at 92% of the sRGB boundary, 13 even samples,
// placed by ΔE00 arc length. Rebuilding it here keeps comment and table
// honest.
func TestDefaultTableFollowsDesign(t *testing.T) {
	keys := []struct{ t, l, c, h float64 }{
		{0, 0.665, 0.17, 22}, {0.42, 0.51, 0.18, -68}, {0.72, 0.43, 0.12, -135}, {1, 0.31, 0.11, -215},
	}
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
	curve := func(u float64) OKLCh {
		for i := 1; i < len(keys); i++ {
			if u <= keys[i].t {
				a, b := keys[i-1], keys[i]
				v := (u - a.t) / (b.t - a.t)
				l, h := a.l+v*(b.l-a.l), math.Mod(a.h+v*(b.h-a.h)+360, 360)
				return OKLCh{l, math.Min(a.c+v*(b.c-a.c), 0.92*maxChroma(l, h)), h}
			}
		}
		panic("u out of range")
	}
	n := len(tidewater)
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
	for i, a := range tidewater {
		p := pts[i]
		if math.Abs(a.color.L-p.L) > 6e-5 || math.Abs(a.color.C-p.C) > 6e-5 || math.Abs(a.color.H-p.H) > 6e-3 || math.Abs(a.at-arc[i]/arc[n-1]) > 6e-5 {
			t.Errorf("anchor %d: table %.4f %+v, design gives %.4f %+v", i, a.at, a.color, arc[i]/arc[n-1], p)
		}
	}
}
