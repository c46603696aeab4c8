package palette

import (
	"math"
	"testing"
)

// WCAG 2.1, "relative luminance" and "contrast ratio" definitions. The
// expected values are computed from those definitions (not quoted).
func TestContrastRatio(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		want float64
		tol  float64
		src  string
	}{
		{"#ffffff", "#000000", 21, 1e-5, "WCAG 2.1 definition: (1+0.05)/(0+0.05), computed"},
		{"#767676", "#ffffff", 4.54, 0.005, "WCAG 2.1 definition, computed (the usual lightest grey passing 4.5:1)"},
		{"#777777", "#ffffff", 4.48, 0.005, "WCAG 2.1 definition, computed (one step lighter fails 4.5:1)"},
		{"#ffffff", "#ffffff", 1, 1e-9, "WCAG 2.1 definition, computed"},
	} {
		if got := ContrastRatio(mustHex(t, tc.a), mustHex(t, tc.b)); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("%s on %s: %.4f, want %.2f (%s)", tc.a, tc.b, got, tc.want, tc.src)
		}
	}
	if got := RelativeLuminance(mustHex(t, "#00ff00")); math.Abs(got-0.7152) > 1e-6 {
		t.Errorf("green luminance %.6f, WCAG 2.1 coefficient 0.7152", got)
	}
}
