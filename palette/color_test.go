package palette

import (
	"math"
	"testing"

	"github.com/lucasb-eyer/go-colorful"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Reference: testdata/srgb_reference.csv (IEC 61966-2-1:1999 matrices;
// CSS Color Module Level 4 sample code and examples; HSLuv snapshot rev4;
// Lindbloom; CSS Color 4 figure; color.js tests; WPT lab-001), each row
// with its own tolerance and source key.

func TestSRGBMatrixAgainstReference(t *testing.T) {
	tol := map[string]float64{
		"IEC61966-2-1_RGB_to_XYZ_4dp":       5e-5,  // published to 4 decimals
		"CSS4_lin_sRGB_to_XYZ_D65_rational": 1e-12, // exact rationals
		"Lindbloom_sRGB_to_XYZ_D65":         3e-4,  // derived from the ASTM white 0.95047: differs by ≤ 2.3e-4
	}
	n := 0
	for _, r := range refRows(t, "srgb_reference.csv", ",") {
		tl, ok := tol[r["name"]]
		if r["kind"] != "matrix" || !ok {
			continue
		}
		i, j := int(num(t, r["i"])), int(num(t, r["j"]))
		var unit [3]float64
		unit[j] = 1
		x := LinearRGB{unit[0], unit[1], unit[2]}.XYZ()
		got := [3]float64{x.X, x.Y, x.Z}[i]
		assert.InDelta(t, num(t, r["value"]), got, tl, "%s [%d][%d] (%s)", r["name"], i, j, r["source_key"])
		n++
	}
	require.Equal(t, 27, n, "checked %d matrix entries, want 27", n)
}

func TestXYZInverseMatrix(t *testing.T) {
	// IEC 61966-2-1:1999 XYZ→RGB matrix, 4 decimals.
	for _, r := range refRows(t, "srgb_reference.csv", ",") {
		if r["name"] != "IEC61966-2-1_XYZ_to_RGB_4dp" {
			continue
		}
		i, j := int(num(t, r["i"])), int(num(t, r["j"]))
		var unit [3]float64
		unit[j] = 1
		l := XYZ{unit[0], unit[1], unit[2]}.LinearRGB()
		got := [3]float64{l.R, l.G, l.B}[i]
		assert.InDelta(t, num(t, r["value"]), got, 5e-4, "XYZ→RGB [%d][%d] (IEC 61966-2-1:1999, 4 decimals)", i, j)
	}
}

func TestXYZAndLabAgainstReference(t *testing.T) {
	n := 0
	for _, r := range refRows(t, "srgb_reference.csv", ",") {
		if r["kind"] != "xyz" && r["kind"] != "lab" {
			continue
		}
		c := mustHex(t, r["hex"])
		tol := num(t, r["tol"])
		name := r["name"] + " " + r["hex"] + " " + r["white"] + " (" + r["source_key"] + ")"
		check := func(what string, got float64, col string) {
			if r[col] == "" {
				return
			}
			want := num(t, r[col])
			d := math.Abs(got - want)
			if col == "h" {
				d = math.Abs(math.Remainder(got-want, 360))
			}
			assert.LessOrEqual(t, d, tol, "%s %s: got %.6f want %.6f ±%g", name, what, got, want, tol)
			n++
		}
		switch {
		case r["kind"] == "xyz" && r["white"] == "D65":
			x := c.XYZ()
			check("X", x.X, "X")
			check("Y", x.Y, "Y")
			check("Z", x.Z, "Z")
		case r["kind"] == "xyz" && r["white"] == "D50":
			x := c.XYZ().adaptD50()
			check("X", x.X, "X")
			check("Y", x.Y, "Y")
			check("Z", x.Z, "Z")
		case r["kind"] == "lab":
			lab := c.Lab()
			if r["white"] == "D50" {
				lab = c.LabD50()
			}
			check("L*", lab.L, "L")
			check("a*", lab.A, "a")
			check("b*", lab.B, "b")
			check("h", lab.LCh().H, "h")
		}
	}
	require.GreaterOrEqual(t, n, 60, "only %d values checked", n)
}

// Why CIELAB is ours: go-colorful's ASTM white leaves sRGB white with
// b* ≈ -0.014 (×100 scale), beyond the 1e-4 neutral tolerance of
// srgb_reference.csv ("neutral" rows). If go-colorful changes, this test
// says so and the package doc needs revisiting.
func TestGoColorfulLabWhiteIsOff(t *testing.T) {
	_, _, b := colorful.Color{R: 1, G: 1, B: 1}.Lab()
	assert.GreaterOrEqual(t, math.Abs(b*100), 1e-3, "go-colorful white b* = %g: its Lab now looks usable; reconsider our own", b*100)
	// Our colours pass through OKLab (10-decimal matrices), so 1e-4 as in
	// the file's neutral rows.
	lab := mustHex(t, "#ffffff").Lab()
	assert.InDelta(t, 0, lab.A, 1e-4, "our white: a*")
	assert.InDelta(t, 0, lab.B, 1e-4, "our white: b*")
}

func TestRoundTrips(t *testing.T) {
	for _, hex := range []string{"#000000", "#ffffff", "#ff0000", "#00ff00", "#0000ff", "#7654cd", "#010203", "#fefdfc", "#767676"} {
		c := mustHex(t, hex)
		assert.Equal(t, hex, c.Hex(), "%s → OKLab → hex", hex)
		assert.True(t, c.InGamut(), "%s reported out of gamut: %+v", hex, c.RGB())
		assert.Equal(t, hex, FromLab(c.Lab()).Hex(), "%s → Lab → hex", hex)
		assert.Equal(t, hex, FromXYZ(c.XYZ()).Hex(), "%s → XYZ → hex", hex)
		assert.Equal(t, hex, FromOKLCh(c.OKLCh()).Hex(), "%s → OKLCh → hex", hex)
	}
}

func TestParseHex(t *testing.T) {
	// CSS Color 4, hex notation (§5.2, from memory): #rgb is #rrggbb with each digit doubled.
	for _, tc := range []struct{ in, want string }{{"#0f8", "#00ff88"}, {"7654CD", "#7654cd"}} {
		c, err := ParseHex(tc.in)
		if assert.NoError(t, err, tc.in) {
			assert.Equal(t, tc.want, c.Hex(), tc.in)
		}
	}
	for _, bad := range []string{"", "#", "#12345", "#gg0000", "#1234567", "red"} {
		_, err := ParseHex(bad)
		assert.ErrorContains(t, err, "colour", "ParseHex(%q): the error names the colour", bad)
	}
}

func TestGamutAndClip(t *testing.T) {
	// OKLCh(0.7, 0.3, 140) is a green far outside sRGB.
	c := FromOKLCh(OKLCh{0.7, 0.3, 140})
	require.False(t, c.InGamut(), "%+v should be outside sRGB", c.RGB())
	k := c.Clip()
	assert.True(t, k.InGamut(), "clipped colour %+v still outside", k.RGB())
	assert.Equal(t, RGB{0, 1, 0}, (RGB{-0.5, 2, math.NaN()}).Clip(), "Clip")
}
