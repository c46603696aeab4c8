package palette

import "math"

// RelativeLuminance is WCAG 2.1's relative luminance of the clipped sRGB
// colour: 0.2126 R + 0.7152 G + 0.0722 B on components linearised with
// WCAG's own threshold 0.03928 (the 2.1 text). No 8-bit value lies between
// it and the sRGB standard's 0.04045, so both agree on 8-bit colours.
func RelativeLuminance(c Color) float64 {
	k := c.RGB().Clip()
	lin := func(v float64) float64 {
		if v <= 0.03928 {
			return v / 12.92
		}
		return math.Pow((v+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(k.R) + 0.7152*lin(k.G) + 0.0722*lin(k.B)
}

// ContrastRatio is WCAG 2.1's (L1 + 0.05) / (L2 + 0.05), lighter over
// darker, from 1 to 21.
func ContrastRatio(c, d Color) float64 {
	l1, l2 := RelativeLuminance(c), RelativeLuminance(d)
	if l1 < l2 {
		l1, l2 = l2, l1
	}
	return (l1 + 0.05) / (l2 + 0.05)
}
