package palette

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

// Published pairs, quoted with their sources: the expected ratios are the
// numbers printed there. The W3C pages cut ratios to the digits shown
// (3.657 is printed "3.6:1", 9.398 "9.39:1", 3.860 "3.85:1"), so their
// ratio must lie in [printed, printed + one unit of the last digit);
// WebAIM rounds (3.998 is "4:1"), so there it is ± half a unit. The pure red and pure blue rows
// pin the R and B luminance coefficients: with the two swapped, red on
// white would come out 8.6:1 and blue 4.0:1, and #0000EE 4.6:1.
func TestContrastRatioPublishedPairs(t *testing.T) {
	const (
		act = "W3C ACT Rules, 'Text has minimum contrast' (afw4f7), https://www.w3.org/WAI/standards-guidelines/act/rules/afw4f7/ " +
			"(source: github.com/act-rules/act-rules.github.io _rules/text-contrast-afw4f7.md)"
		understanding = "W3C, Understanding WCAG 2.1, Graphics Contrast draft (github.com/w3c/wcag understanding/21/graphics-contrast.html): " +
			"'thicker lines (3px or more) have 3:1 contrast (#949494 on #FFFFFF)'"
		webaim = "WebAIM, 'Contrast and Color Accessibility' (webaim.org/articles/contrast/): 'Pure red (#FF0000) has a ratio of 4:1 … " +
			"Pure blue (#0000FF) has a contrast ratio of 8.6:1' (secondary source, not W3C: no W3C page found that prints a " +
			"pure red or pure blue pair; the sentence as quoted in public test code, a C# colour-services test whose repository the index does not name)"
	)
	for _, tc := range []struct {
		fg, bg string
		want   float64 // as printed
		unit   float64 // one unit of the last printed digit
		cut    bool    // printed cut to its digits (else rounded)
		src    string
	}{
		{"#333333", "#ffffff", 12.6, 0.1, true, act + ", Passed Example 1: 'a contrast ratio of 12.6:1 on the white background'"},
		{"#000000", "#666666", 3.6, 0.1, true, act + ", Passed Example 5: 'black text has a contrast ratio of 3.6:1 on the gray background'"},
		{"#000000", "#ffffff", 21, 1, true, act + ", Passed Example 8: 'black text on a white background, which has a contrast ratio of 21:1'"},
		{"#0000ee", "#ffffff", 9.39, 0.01, true, act + ", Passed Example 10: '#0000EE and white. This results in a contrast ratio of 9.39:1'"},
		{"#aaaaaa", "#ffffff", 2.3, 0.1, true, act + ", Failed Example 1: 'light gray text has a contrast ratio of 2.3:1 on the white background'"},
		{"#777777", "#eeeeee", 3.85, 0.01, true, act + ", Failed Example 9: 'a contrast ratio of 3.85:1'"},
		{"#949494", "#ffffff", 3, 0.1, true, understanding},
		{"#ff0000", "#ffffff", 4, 0.1, false, webaim},
		{"#0000ff", "#ffffff", 8.6, 0.1, false, webaim},
	} {
		got := ContrastRatio(mustHex(t, tc.fg), mustHex(t, tc.bg))
		lo, hi := tc.want-tc.unit/2, tc.want+tc.unit/2
		if tc.cut {
			lo, hi = tc.want-1e-6, tc.want+tc.unit // 1e-6: float noise at exact values such as 21
		}
		assert.True(t, got >= lo && got < hi, "%s on %s: %.4f:1, want %g:1 as printed by %s", tc.fg, tc.bg, got, tc.want, tc.src)
		// The ratio is symmetric: lighter over darker (WCAG 2.1 definition).
		assert.InDelta(t, got, ContrastRatio(mustHex(t, tc.bg), mustHex(t, tc.fg)), 1e-12)
	}
}

// The coefficients themselves, as WCAG 2.1 prints them in the definition
// of relative luminance: L = 0.2126 R + 0.7152 G + 0.0722 B. A primary
// at full intensity linearises to 1, so its luminance is its coefficient.
func TestRelativeLuminanceCoefficients(t *testing.T) {
	for _, tc := range []struct {
		hex  string
		want float64
	}{
		{"#ff0000", 0.2126}, // WCAG 2.1, "relative luminance"
		{"#00ff00", 0.7152}, // same
		{"#0000ff", 0.0722}, // same
		{"#ffffff", 1},      // same: the three sum to 1
		{"#000000", 0},      // same
	} {
		assert.InDelta(t, tc.want, RelativeLuminance(mustHex(t, tc.hex)), 1e-7, tc.hex) // colours are held as OKLab: float round trip
	}
}
