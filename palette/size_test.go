package palette

import (
	"math"
	"testing"
)

// Reference: testdata/stone2014_jnd_guidance.csv — M. Stone, D. A. Szafir,
// V. Setlur, "An Engineering Model for Color Difference as a Function of
// Size", IS&T CIC 22, 2014; A and B corroborated by two public
// implementations (status corroborated_secondary), and the file's ND50
// rows computed from them.
func TestStoneModelAgainstReference(t *testing.T) {
	n := 0
	for _, r := range refRows(t, "stone2014_jnd_guidance.csv", ",") {
		switch r["kind"] {
		case "model":
			want := [2]float64{num(t, r["A"]), num(t, r["B"])}
			got := map[string][2]float64{"L": {stoneA.L, stoneB.L}, "a": {stoneA.A, stoneB.A}, "b": {stoneA.B, stoneB.B}}[r["axis"]]
			if got != want {
				t.Errorf("axis %s: A,B = %v, file (%s) gives %v", r["axis"], got, r["source"], want)
			}
			n++
		case "model50":
			// An independent 50% fit (S2): 0.5·A and 0.5·B agree to 1e-3.
			nd1 := NoticeableDifference(0.5, 1)
			nd6 := NoticeableDifference(0.5, 1e9) // B/s → 0 leaves 0.5·A
			got := map[string][2]float64{"L": {nd6.L, nd1.L - nd6.L}, "a": {nd6.A, nd1.A - nd6.A}, "b": {nd6.B, nd1.B - nd6.B}}[r["axis"]]
			if math.Abs(got[0]-num(t, r["A"])) > 1.5e-3 || math.Abs(got[1]-num(t, r["B"])) > 1.5e-3 {
				t.Errorf("axis %s: 50%% fit %v, S2 gives %s, %s", r["axis"], got, r["A"], r["B"])
			}
			n++
		case "nd":
			s := num(t, r["size_deg"])
			nd := NoticeableDifference(num(t, r["p"]), s)
			got := map[string]float64{"L": nd.L, "a": nd.A, "b": nd.B}[r["axis"]]
			want := num(t, r["value"])
			if math.Abs(got-want) > 0.006 { // file rounds to 2–3 decimals
				t.Errorf("ND50 %s at %g°: %.4f, file gives %v", r["axis"], s, got, want)
			}
			n++
		}
	}
	if n != 21 {
		t.Fatalf("checked %d rows, want 21", n)
	}
}

func TestVisualAngle(t *testing.T) {
	for _, tc := range []struct {
		widthPt float64
		m       Medium
		want    float64
		tol     float64
		src     string
	}{
		// CSS Values 4 §"reference pixel": 1 px (= 0.75 pt) at 28 in ≈ 0.0213°.
		{0.75, Screen, 0.0213, 5e-5, "CSS Values and Units 4, reference pixel"},
		// 72 pt = 25.4 mm at 350 mm: 2·atan(12.7/350) = 4.1563°, computed.
		{72, Print, 4.1563, 5e-4, "geometry, computed"},
	} {
		if got := VisualAngle(tc.widthPt, tc.m); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("%g pt on %v: %.5f°, want %.4f° (%s)", tc.widthPt, tc.m, got, tc.want, tc.src)
		}
	}
	if !math.IsNaN(VisualAngle(1, Medium(9))) {
		t.Error("unknown medium should give NaN")
	}
}

func TestNoticeable(t *testing.T) {
	nd := Lab{5, 6, 7}
	for _, tc := range []struct {
		x, y Lab
		want bool
	}{
		{Lab{50, 0, 0}, Lab{54.9, 5.9, 6.9}, false},
		{Lab{50, 0, 0}, Lab{55, 0, 0}, true},
		{Lab{50, 0, 0}, Lab{50, -6, 0}, true},
		{Lab{50, 0, 0}, Lab{50, 0, 7}, true},
	} {
		if got := Noticeable(tc.x, tc.y, nd); got != tc.want {
			t.Errorf("Noticeable(%v, %v) = %v", tc.x, tc.y, got)
		}
	}
}
