package pdf

import (
	"bytes"
	"crypto/md5"
	"encoding/binary"
	"encoding/csv"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/tooltest"
)

type labRef struct {
	name, hex string
	L, a, b   float64
	tol       float64
	source    string
}

// loadLabRefs reads testdata/srgb_reference_d50.csv (copied from the
// project's reference folder; its header cites every source).
func loadLabRefs(t *testing.T) []labRef {
	t.Helper()
	raw, err := os.ReadFile("testdata/srgb_reference_d50.csv")
	require.NoError(t, err)
	var lines []string
	for _, l := range strings.Split(string(raw), "\n") {
		if l != "" && !strings.HasPrefix(l, "#") {
			lines = append(lines, l)
		}
	}
	recs, err := csv.NewReader(strings.NewReader(strings.Join(lines, "\n"))).ReadAll()
	require.NoError(t, err)
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	f := func(r []string, k string) float64 {
		v, err := strconv.ParseFloat(r[col[k]], 64)
		require.NoError(t, err, "%s in %v", k, r)
		return v
	}
	var out []labRef
	for _, r := range recs[1:] {
		out = append(out, labRef{r[col["name"]], r[col["hex"]], f(r, "L"), f(r, "a"), f(r, "b"), f(r, "tol"), r[col["source_key"]]})
	}
	return out
}

// TestICCProfileWithLittleCMS loads the built profile into LittleCMS
// (transicc, liblcms2-utils) and converts sRGB colours to D50 Lab.
//
// Sources (rows in testdata/srgb_reference_d50.csv):
//   - css_color4_fig: W3C CSS Color 4, figure sRGB-prim-sec.svg, D50 Lab
//     of the primaries and secondaries, tolerance 0.02 as tabulated.
//   - neutral: white and #777777 have a* = b* = 0 and the L* of the
//     HSLuv rev4 snapshot. The file's 1e-4 tolerance cannot hold for any
//     ICC profile: the ICC stores curve parameters and colorants as
//     s15Fixed16 (steps of 1.5e-5), which moves mid-grey L* by up to
//     ~5e-4 and white a*, b* by as much (computed here: dL*/dY ≈ 119 at
//     Y = 0.184, ΔY/Y ≈ 2.4 × 7e-6). The check uses 0.002 for them.
func TestICCProfileWithLittleCMS(t *testing.T) {
	tooltest.Require(t, "transicc", "liblcms2-utils")
	path := writeTemp(t, "sheaf-srgb.icc", SRGBProfile())
	refs := loadLabRefs(t)
	require.GreaterOrEqual(t, len(refs), 8, "only %d reference rows", len(refs))
	var in bytes.Buffer
	for _, r := range refs {
		var c [3]uint64
		for i := range c {
			c[i], _ = strconv.ParseUint(r.hex[1+2*i:3+2*i], 16, 8)
		}
		in.WriteString(strconv.FormatUint(c[0], 10) + " " + strconv.FormatUint(c[1], 10) + " " + strconv.FormatUint(c[2], 10) + "\n")
	}
	// -t1: relative colorimetric (a matrix/TRC profile gives the same for
	// every intent); -n: numbers only, one line per input line.
	cmd := exec.Command("transicc", "-i"+path, "-o*Lab", "-t1", "-n")
	cmd.Stdin = &in
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	require.NoError(t, cmd.Run(), "transicc: %s", errb.String())
	// transicc prints its banner on stderr and may leave the last line
	// without a newline; take every run of three numbers in order.
	fields := strings.Fields(out.String())
	require.Len(t, fields, 3*len(refs), "transicc gave %d numbers for %d colours:\n%s", len(fields), len(refs), out.String())
	for i, r := range refs {
		tol := r.tol
		if r.source == "neutral" {
			tol = 0.002
		}
		for j, want := range []float64{r.L, r.a, r.b} {
			got, err := strconv.ParseFloat(fields[3*i+j], 64)
			require.NoError(t, err)
			assert.InDelta(t, want, got, tol, "%s %s (%s): Lab[%d]", r.name, r.hex, r.source, j)
		}
	}
}

// TestICCProfileStructure checks the header fields ICC.1:2010 §7.2
// defines, and that the profile is the same bytes every time.
func TestICCProfileStructure(t *testing.T) {
	p := SRGBProfile()
	require.True(t, bytes.Equal(p, SRGBProfile()), "profile bytes differ between calls")
	be := binary.BigEndian
	checks := []struct {
		what string
		ok   bool
	}{
		{"size field = length (§7.2.2)", int(be.Uint32(p)) == len(p)},
		{"version 4.1 (§7.2.4)", be.Uint32(p[8:]) == 0x04100000},
		{"class mntr, RGB, PCS XYZ (§7.2.5–7.2.7)", string(p[12:24]) == "mntrRGB XYZ "},
		{"date zero: no clock", bytes.Equal(p[24:36], make([]byte, 12))},
		{"signature acsp (§7.2.9)", string(p[36:40]) == "acsp"},
		{"PCS illuminant D50 0xF6D6 0x10000 0xD32D (§7.2.16)", be.Uint32(p[68:]) == 0xF6D6 && be.Uint32(p[72:]) == 0x10000 && be.Uint32(p[76:]) == 0xD32D},
		{"length multiple of 4 (§7.1.2)", len(p)%4 == 0},
	}
	for _, c := range checks {
		assert.True(t, c.ok, "ICC header: %s", c.what)
	}
	q := append([]byte(nil), p...)
	clear(q[44:48])
	clear(q[64:68])
	clear(q[84:100])
	id := md5.Sum(q)
	assert.Equal(t, id[:], p[84:100], "profile ID is the MD5 of §7.2.18")
	assert.True(t, bytes.Contains(p, []byte{0, 's', 0, 'h', 0, 'e', 0, 'a', 0, 'f'}), "description does not name sheaf")
}
