package palette

import (
	"math"
	"testing"
)

// Reference: testdata/ciede2000_sharma2005.csv — G. Sharma, W. Wu,
// E. N. Dalal, "The CIEDE2000 color-difference formula: implementation
// notes, supplementary test data, and mathematical observations", Color
// Res. Appl. 30(1):21–30, 2005, Table 1 (34 pairs, ΔE00 to 4 decimals).
func TestDeltaE00Sharma2005(t *testing.T) {
	rows := refRows(t, "ciede2000_sharma2005.csv", ",")
	if len(rows) != 34 {
		t.Fatalf("%d pairs, want 34", len(rows))
	}
	for _, r := range rows {
		x := Lab{num(t, r["L1"]), num(t, r["a1"]), num(t, r["b1"])}
		y := Lab{num(t, r["L2"]), num(t, r["a2"]), num(t, r["b2"])}
		want := num(t, r["de00"])
		// Published to 4 decimals: 1e-4 is the brief, 5e-5 the rounding.
		if got := DeltaE00(x, y); math.Abs(got-want) > 1e-4 {
			t.Errorf("pair %s: ΔE00 = %.6f, Sharma et al. (2005) Table 1 gives %.4f", r["pair"], got, want)
		}
		// The formula is symmetric (Sharma et al. 2005, §3).
		if got := DeltaE00(y, x); math.Abs(got-want) > 1e-4 {
			t.Errorf("pair %s reversed: ΔE00 = %.6f, want %.4f", r["pair"], got, want)
		}
	}
}

func TestDeltaE00Identity(t *testing.T) {
	for _, c := range []Lab{{0, 0, 0}, {50, 0, 0}, {50, 20, -30}, {100, 0, 0}} {
		if d := DeltaE00(c, c); d != 0 {
			t.Errorf("ΔE00(%v, itself) = %g", c, d)
		}
	}
}

func BenchmarkDeltaE00(b *testing.B) {
	x, y := Lab{50, 2.5, 0}, Lab{73, 25, -18}
	for b.Loop() {
		DeltaE00(x, y)
	}
}
