package palette

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Reference: testdata/oklab_reference.csv — B. Ottosson, "A perceptual
// color space for image processing" (2020, matrices updated 2021-01-25):
// matrices, and the post's table of example XYZ/OKLab pairs (3 decimals);
// sRGB colours from color.js test/conversions.js (6 significant digits).

func TestOKLabMatrices(t *testing.T) {
	ours := map[string][3][3]float64{
		"sRGBlin_to_LMS": oklabFromLinear,
		"M2_LMSp_to_Lab": oklabM2,
		"Lab_to_LMSp":    oklabM2Inv,
		"LMS_to_sRGBlin": oklabToLinear,
	}
	n := 0
	for _, r := range refRows(t, "oklab_reference.csv", ",") {
		m, ok := ours[r["name"]]
		if r["kind"] != "matrix" || !ok {
			continue
		}
		i, j := int(num(t, r["i"])), int(num(t, r["j"]))
		assert.Equal(t, num(t, r["value"]), m[i][j], "%s[%d][%d] against Ottosson (2020)", r["name"], i, j)
		n++
	}
	require.Equal(t, 36, n, "checked %d entries, want 36", n)
}

func TestOKLabAgainstReference(t *testing.T) {
	n := 0
	for _, r := range refRows(t, "oklab_reference.csv", ",") {
		var c Color
		switch r["kind"] {
		case "xyz_pair":
			c = FromXYZ(XYZ{num(t, r["X"]), num(t, r["Y"]), num(t, r["Z"])})
		case "srgb_colour":
			c = mustHex(t, r["hex"])
		default:
			continue
		}
		tol := num(t, r["tol"])
		if r["kind"] == "xyz_pair" {
			tol = 1e-3 // table rounded to 3 decimals; the file advises ~1e-3
		}
		got := c.OKLab()
		want := OKLab{num(t, r["L"]), num(t, r["a"]), num(t, r["b"])}
		assert.InDeltaSlice(t, []float64{want.L, want.A, want.B}, []float64{got.L, got.A, got.B}, tol, "%s %s (%s): OKLab", r["kind"], r["name"], r["source_key"])
		n++
	}
	require.Equal(t, 12, n, "checked %d colours, want 12", n)
}

func TestOKLChPolar(t *testing.T) {
	// Hue is atan2(b, a) in degrees, [0, 360) (Ottosson 2020, "OKLCh").
	for _, tc := range []struct {
		lab OKLab
		lch OKLCh
	}{
		{OKLab{0.5, 0.1, 0}, OKLCh{0.5, 0.1, 0}},
		{OKLab{0.5, 0, 0.1}, OKLCh{0.5, 0.1, 90}},
		{OKLab{0.5, -0.1, 0}, OKLCh{0.5, 0.1, 180}},
		{OKLab{0.5, 0, -0.1}, OKLCh{0.5, 0.1, 270}},
	} {
		got := tc.lab.OKLCh()
		assert.InDelta(t, tc.lch.C, got.C, 1e-12, "%+v → C", tc.lab)
		assert.InDelta(t, tc.lch.H, got.H, 1e-9, "%+v → h", tc.lab)
		back := got.OKLab()
		assert.InDeltaSlice(t, []float64{tc.lab.A, tc.lab.B}, []float64{back.A, back.B}, 1e-12, "%+v → %+v → a, b", tc.lab, got)
	}
}
