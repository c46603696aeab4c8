package specs

import (
	"encoding/csv"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Unit definitions, each from its standard:
//   - 1 in = 25.4 mm exactly: international yard and pound agreement (1959).
//   - 1 pt = 1/72 in: ISO 32000-1:2008 §8.3.2.3 (default user space unit).
//   - 1 pc = 12 pt: PostScript Language Reference, 3rd ed. §4.3.1 (via
//     print-facts.md "Units"), common practice in typesetting.
//   - 1 px = 1/96 in: CSS Values and Units Module Level 3, §5.2 absolute
//     lengths ("1px = 1/96th of 1in").
func TestParseLengthUnits(t *testing.T) {
	tests := []struct {
		in     string
		wantPt float64
		source string
	}{
		{"1in", 72, "ISO 32000-1 §8.3.2.3: 1 pt = 1/72 in"},
		{"25.4mm", 72, "yard and pound agreement 1959: 1 in = 25.4 mm"},
		{"2.54cm", 72, "1 cm = 10 mm; 1 in = 25.4 mm"},
		{"72pt", 72, "ISO 32000-1 §8.3.2.3"},
		{"6pc", 72, "1 pc = 12 pt (PostScript LRM 3rd ed.)"},
		{"96px", 72, "CSS Values L3 §5.2: 1 in = 96 px"},
		{"1px", 0.75, "CSS Values L3 §5.2: 1 px = 0.75 pt"},
		{"3mm", 3 * 72 / 25.4, "1 mm = 72/25.4 pt (8.504 pt), print bleed, common practice"},
		{"0.125in", 9, "US bleed 1/8 in = 9 pt (print-facts.md: Letter + 0.125 in = 630 × 810 pt)"},
		{"0.25 pt", 0.25, "space between number and unit allowed"},
		{" 1.5IN ", 108, "unit is case-insensitive, surrounding space trimmed"},
		{"0mm", 0, "zero is a length; callers decide whether it is allowed"},
		{"-2mm", -2 * 72 / 25.4, "ParseLength reads the sign; the spec decoder rejects negatives"},
	}
	for _, tt := range tests {
		got, err := ParseLength(tt.in)
		if !assert.NoError(t, err, "ParseLength(%q) [%s]", tt.in, tt.source) {
			continue
		}
		assert.InDelta(t, tt.wantPt, got.Pt(), 1e-9, "ParseLength(%q) in pt [%s]", tt.in, tt.source)
	}
}

func TestLengthConversions(t *testing.T) {
	// Same definitions as above, the other way round.
	l := Length(72)
	assert.InDelta(t, 25.4, l.Mm(), 1e-12, "72 pt in mm (1 in = 25.4 mm, 1959)")
	assert.InDelta(t, 96, l.Px(), 1e-12, "72 pt in px (CSS Values L3 §5.2)")
}

func TestParseLengthErrors(t *testing.T) {
	tests := []struct {
		in   string
		want string // substring of the message
	}{
		{"3", `"3" has no unit; write it with one, like 3mm or 3pt`},
		{"0.5", `like 0.5mm`},
		{"3furlongs", `unknown unit "furlongs" in "3furlongs"; use mm, cm, in, pt, pc or px`},
		{"3em", `unknown unit "em"`},
		{"mm", `"mm" is not a length`},
		{"", `empty length; write a number with a unit, like 3mm`},
		{"three mm", `is not a length`},
		{"NaNmm", `is not a length`},
		{"Infpt", `is not a length`},
		{"1e999mm", `is not a length`},
	}
	for _, tt := range tests {
		_, err := ParseLength(tt.in)
		assert.ErrorContains(t, err, tt.want, "ParseLength(%q)", tt.in)
	}
}

// TestNamedSizes checks the named trim sizes against the table in
// testdata/paper_sizes.csv (copied from print-facts.md: ISO 216 for the A
// series, ANSI for Letter and Tabloid), to 0.001 pt.
func TestNamedSizes(t *testing.T) {
	f, err := os.Open("testdata/paper_sizes.csv")
	require.NoError(t, err)
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	require.NoError(t, err)
	require.Len(t, rows, 6, "paper_sizes.csv rows: header + 5")
	num := func(s string) float64 {
		v, err := strconv.ParseFloat(s, 64)
		require.NoError(t, err)
		return v
	}
	for _, row := range rows[1:] {
		name, wmm, hmm, wpt, hpt := row[0], num(row[1]), num(row[2]), num(row[3]), num(row[4])
		for _, text := range []string{name, strings.ToUpper(name), name + " portrait"} {
			sz, err := ParseSize(text, false)
			if !assert.NoError(t, err, "ParseSize(%q)", text) {
				continue
			}
			assert.InDelta(t, wpt, sz.W.Pt(), 0.001, "ParseSize(%q) width in pt (print-facts.md, %s)", text, name)
			assert.InDelta(t, hpt, sz.H.Pt(), 0.001, "ParseSize(%q) height in pt (print-facts.md, %s)", text, name)
			assert.InDelta(t, wmm, sz.W.Mm(), 1e-9, "ParseSize(%q) width in mm (print-facts.md, %s)", text, name)
			assert.InDelta(t, hmm, sz.H.Mm(), 1e-9, "ParseSize(%q) height in mm (print-facts.md, %s)", text, name)
		}
		land, err := ParseSize(name+" landscape", false)
		if assert.NoError(t, err, "ParseSize(%q landscape)", name) {
			assert.InDelta(t, hpt, land.W.Pt(), 0.001, "ParseSize(%q landscape) width in pt", name)
			assert.InDelta(t, wpt, land.H.Pt(), 0.001, "ParseSize(%q landscape) height in pt", name)
		}
	}
}

func TestParseSize(t *testing.T) {
	mm := func(v float64) Length { return Length(v * 72 / 25.4) }
	tests := []struct {
		in       string
		heightOK bool
		want     Size
		source   string
	}{
		{"230mm x 300mm", false, Size{mm(230), mm(300)}, "W x H with units"},
		{"230mm×300mm", false, Size{mm(230), mm(300)}, "multiplication sign"},
		{"8.375in x 10.875in", false, Size{603, 783}, "US magazine trim 8.375 × 10.875 in (print-facts.md, common practice)"},
		{"1200px", true, Size{W: 900}, "screen width only: 1200 px = 900 pt (CSS Values L3)"},
		{"1200px x 1600px", true, Size{900, 1200}, "screen page"},
	}
	for _, tt := range tests {
		got, err := ParseSize(tt.in, tt.heightOK)
		if !assert.NoError(t, err, "ParseSize(%q) [%s]", tt.in, tt.source) {
			continue
		}
		assert.InDelta(t, tt.want.W.Pt(), got.W.Pt(), 1e-9, "ParseSize(%q) width in pt [%s]", tt.in, tt.source)
		assert.InDelta(t, tt.want.H.Pt(), got.H.Pt(), 1e-9, "ParseSize(%q) height in pt [%s]", tt.in, tt.source)
	}
	for _, bad := range []struct{ in, want string }{
		{"A4 sideways", `after a size name only "portrait" or "landscape" may follow`},
		{"A6", `is not a size; use A3, A4, A5, Letter, Tabloid`},
		{"230mm", `is not a size`},
		{"230 x 300mm", `"230" has no unit`},
		{"230mm x 300", `"300" has no unit`},
	} {
		_, err := ParseSize(bad.in, false)
		assert.ErrorContains(t, err, bad.want, "ParseSize(%q)", bad.in)
	}
}

func BenchmarkParseLength(b *testing.B) {
	for b.Loop() {
		_, err := ParseLength("12.5mm")
		require.NoError(b, err)
	}
}
