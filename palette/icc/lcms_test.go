package icc_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"

	"sheaf/palette"
	"sheaf/palette/icc"
	"sheaf/render/tooltest"
)

func loadProfile(t testing.TB, path string) *icc.Profile {
	t.Helper()
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	p, err := icc.Parse(b)
	require.NoError(t, err, path)
	return p
}

// testColours is 1,000 seeded random 8-bit sRGB colours, the primaries,
// secondaries and a grey ramp, and every year's colour of the default
// palette over the demo span (1868–2025) as 8-bit sRGB.
func testColours(t testing.TB) [][3]uint8 {
	t.Helper()
	rng := rand.New(rand.NewPCG(12, 2026))
	var cs [][3]uint8
	for i := 0; i < 1000; i++ {
		cs = append(cs, [3]uint8{uint8(rng.IntN(256)), uint8(rng.IntN(256)), uint8(rng.IntN(256))})
	}
	for _, v := range []uint8{0, 1, 26, 64, 128, 192, 254, 255} {
		cs = append(cs, [3]uint8{v, v, v})
	}
	cs = append(cs, [3]uint8{255, 0, 0}, [3]uint8{0, 255, 0}, [3]uint8{0, 0, 255},
		[3]uint8{0, 255, 255}, [3]uint8{255, 0, 255}, [3]uint8{255, 255, 0})
	scale, err := palette.Default(1868, 2025)
	require.NoError(t, err)
	for y := 1868; y <= 2025; y++ {
		r, g, b := scale.At(float64(y)).RGB().RGB8()
		cs = append(cs, [3]uint8{r, g, b})
	}
	return cs
}

// transicc runs LittleCMS's transicc in terse mode on lines of numbers
// and returns its rows.
func transicc(t testing.TB, bin string, args []string, rows [][]float64) [][]float64 {
	t.Helper()
	var in strings.Builder
	for _, r := range rows {
		for i, v := range r {
			if i > 0 {
				in.WriteByte(' ')
			}
			fmt.Fprintf(&in, "%.6f", v)
		}
		in.WriteByte('\n')
	}
	cmd := exec.Command(bin, append(args, "-n")...)
	cmd.Stdin = strings.NewReader(in.String())
	var stderr strings.Builder
	cmd.Stderr = &stderr // the banner goes there
	out, err := cmd.Output()
	require.NoError(t, err, "transicc %v: %s", args, stderr.String())
	var got [][]float64
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		var row []float64
		for _, f := range strings.Fields(line) {
			var v float64
			if _, err := fmt.Sscan(f, &v); err == nil {
				row = append(row, v)
			}
		}
		if len(row) > 0 {
			got = append(got, row)
		}
	}
	require.Len(t, got, len(rows), "transicc output:\n%s", out)
	return got
}

func writeTemp(t testing.TB, name string, b []byte) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	require.NoError(t, os.WriteFile(p, b, 0o644))
	return p
}

// Outside check, the acceptance test: sRGB → CMYK through
// Ghostscript's CMYK profiles with our engine and with LittleCMS 2
// (transicc, liblcms2-utils) for the same intent and black-point setting.
// Every channel within 0.5 on the 0–100 scale; and CMYK → Lab (the press
// round trip a soft proof shows) within ΔE00 0.5 of LittleCMS's.
func TestAgainstLittleCMS(t *testing.T) {
	bin := tooltest.Require(t, "transicc", "liblcms2-utils")
	srgbPath := writeTemp(t, "sheaf-srgb.icc", icc.SRGBBytes())
	src := icc.SRGB()
	colours := testColours(t)
	rows := make([][]float64, len(colours))
	for i, c := range colours {
		rows[i] = []float64{float64(c[0]), float64(c[1]), float64(c[2])}
	}
	cases := []struct {
		profile string
		intent  icc.Intent
		bpc     bool
		flag    string
	}{
		// default_cmyk.icc: ICC v2, Lab PCS, lut16 A2B and lut8 B2A.
		{"default_cmyk.icc", icc.RelativeColorimetric, true, "1"},
		{"default_cmyk.icc", icc.RelativeColorimetric, false, "1"},
		{"default_cmyk.icc", icc.Perceptual, false, "0"},
		{"default_cmyk.icc", icc.Perceptual, true, "0"},
		// ps_cmyk.icc: ICC v4, XYZ PCS, lut16 both ways with a matrix.
		{"ps_cmyk.icc", icc.RelativeColorimetric, true, "1"},
		{"ps_cmyk.icc", icc.Perceptual, false, "0"},
	}
	for _, c := range cases {
		t.Run(fmt.Sprintf("%s/%v/bpc=%v", c.profile, c.intent, c.bpc), func(t *testing.T) {
			path := tooltest.ICCProfile(t, c.profile)
			dst := loadProfile(t, path)
			xf, err := icc.NewTransform(src, dst, c.intent, c.bpc)
			require.NoError(t, err)
			args := []string{"-i" + srgbPath, "-o" + path, "-t" + c.flag, "-c0"}
			if c.bpc {
				args = append(args, "-b")
			}
			want := transicc(t, bin, args, rows)
			worst, worstAt := 0.0, 0
			var cmyks [][]float64
			for i, rgb := range rows {
				got := xf.Convert([]float64{rgb[0] / 255, rgb[1] / 255, rgb[2] / 255})
				for k := range got {
					if d := math.Abs(got[k]*100 - want[i][k]); d > worst {
						worst, worstAt = d, i
					}
				}
				cmyks = append(cmyks, []float64{want[i][0], want[i][1], want[i][2], want[i][3]})
			}
			t.Logf("worst CMYK channel difference %.4f at sRGB %v", worst, colours[worstAt])
			require.LessOrEqual(t, worst, 0.5, "sRGB %v: ours %v, LittleCMS %v", colours[worstAt],
				xf.Convert([]float64{rows[worstAt][0] / 255, rows[worstAt][1] / 255, rows[worstAt][2] / 255}), want[worstAt])

			// The press round trip: the same CMYK back to Lab (relative
			// colorimetric, what a soft proof shows).
			labs := transicc(t, bin, []string{"-i" + path, "-o*Lab", "-t1", "-c0"}, cmyks)
			worstDE := 0.0
			for i, k := range cmyks {
				l := dst.ToLab([]float64{k[0] / 100, k[1] / 100, k[2] / 100, k[3] / 100}, icc.RelativeColorimetric)
				d := palette.DeltaE00(palette.Lab{L: l.L, A: l.A, B: l.B}, palette.Lab{L: labs[i][0], A: labs[i][1], B: labs[i][2]})
				worstDE = math.Max(worstDE, d)
			}
			t.Logf("worst round-trip ΔE00 %.4f", worstDE)
			require.LessOrEqual(t, worstDE, 0.5)
		})
	}
}

// Outside check on the v4 table types the Ghostscript profiles lack
// (lutAToB and lutBToA with every element): an invented profile, through
// our engine and LittleCMS, both ways.
func TestInventedV4AgainstLittleCMS(t *testing.T) {
	bin := tooltest.Require(t, "transicc", "liblcms2-utils")
	b := inventedCMYK()
	path := writeTemp(t, "invented.icc", b)
	srgbPath := writeTemp(t, "sheaf-srgb.icc", icc.SRGBBytes())
	dst, err := icc.Parse(b)
	require.NoError(t, err)
	colours := testColours(t)
	rows := make([][]float64, len(colours))
	for i, c := range colours {
		rows[i] = []float64{float64(c[0]), float64(c[1]), float64(c[2])}
	}
	for _, bpc := range []bool{false, true} {
		xf, err := icc.NewTransform(icc.SRGB(), dst, icc.RelativeColorimetric, bpc)
		require.NoError(t, err)
		args := []string{"-i" + srgbPath, "-o" + path, "-t1", "-c0"}
		if bpc {
			args = append(args, "-b")
		}
		want := transicc(t, bin, args, rows)
		worst := 0.0
		for i, rgb := range rows {
			got := xf.Convert([]float64{rgb[0] / 255, rgb[1] / 255, rgb[2] / 255})
			for k := range got {
				worst = math.Max(worst, math.Abs(got[k]*100-want[i][k]))
			}
		}
		t.Logf("bpc=%v: worst CMYK channel difference %.4f", bpc, worst)
		require.LessOrEqual(t, worst, 0.5)
	}
	var cmyk [][]float64
	rng := rand.New(rand.NewPCG(7, 7))
	for i := 0; i < 500; i++ {
		cmyk = append(cmyk, []float64{100 * rng.Float64(), 100 * rng.Float64(), 100 * rng.Float64(), 100 * rng.Float64()})
	}
	labs := transicc(t, bin, []string{"-i" + path, "-o*Lab", "-t1", "-c0"}, cmyk)
	worst := 0.0
	for i, k := range cmyk {
		l := dst.ToLab([]float64{k[0] / 100, k[1] / 100, k[2] / 100, k[3] / 100}, icc.RelativeColorimetric)
		worst = math.Max(worst, palette.DeltaE00(palette.Lab{L: l.L, A: l.A, B: l.B}, palette.Lab{L: labs[i][0], A: labs[i][1], B: labs[i][2]}))
	}
	t.Logf("CMYK → Lab: worst ΔE00 %.4f", worst)
	require.LessOrEqual(t, worst, 0.5)
}
