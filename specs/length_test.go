package specs

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
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
		if err != nil {
			t.Errorf("ParseLength(%q) [%s]: %v", tt.in, tt.source, err)
			continue
		}
		if math.Abs(got.Pt()-tt.wantPt) > 1e-9 {
			t.Errorf("ParseLength(%q) = %.9f pt, want %.9f pt [%s]", tt.in, got.Pt(), tt.wantPt, tt.source)
		}
	}
}

func TestLengthConversions(t *testing.T) {
	// Same definitions as above, the other way round.
	l := Length(72)
	if got := l.Mm(); math.Abs(got-25.4) > 1e-12 {
		t.Errorf("72 pt = %v mm, want 25.4 (1 in = 25.4 mm, 1959)", got)
	}
	if got := l.Px(); math.Abs(got-96) > 1e-12 {
		t.Errorf("72 pt = %v px, want 96 (CSS Values L3 §5.2)", got)
	}
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
		if err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("ParseLength(%q) error = %v, want it to contain %q", tt.in, err, tt.want)
		}
	}
}

// TestNamedSizes checks the named trim sizes against the table in
// testdata/paper_sizes.csv (copied from print-facts.md: ISO 216 for the A
// series, ANSI for Letter and Tabloid), to 0.001 pt.
func TestNamedSizes(t *testing.T) {
	f, err := os.Open("testdata/paper_sizes.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 6 {
		t.Fatalf("paper_sizes.csv has %d rows, want header + 5", len(rows))
	}
	num := func(s string) float64 {
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for _, row := range rows[1:] {
		name, wmm, hmm, wpt, hpt := row[0], num(row[1]), num(row[2]), num(row[3]), num(row[4])
		for _, text := range []string{name, strings.ToUpper(name), name + " portrait"} {
			sz, err := ParseSize(text, false)
			if err != nil {
				t.Errorf("ParseSize(%q): %v", text, err)
				continue
			}
			if math.Abs(sz.W.Pt()-wpt) > 0.001 || math.Abs(sz.H.Pt()-hpt) > 0.001 {
				t.Errorf("ParseSize(%q) = %.3f × %.3f pt, want %.3f × %.3f (print-facts.md, %s)", text, sz.W.Pt(), sz.H.Pt(), wpt, hpt, name)
			}
			if math.Abs(sz.W.Mm()-wmm) > 1e-9 || math.Abs(sz.H.Mm()-hmm) > 1e-9 {
				t.Errorf("ParseSize(%q) = %g × %g mm, want %g × %g", text, sz.W.Mm(), sz.H.Mm(), wmm, hmm)
			}
		}
		land, err := ParseSize(name+" landscape", false)
		if err != nil || math.Abs(land.W.Pt()-hpt) > 0.001 || math.Abs(land.H.Pt()-wpt) > 0.001 {
			t.Errorf("ParseSize(%q landscape) = %v, %v; want %.3f × %.3f", name, land, err, hpt, wpt)
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
		if err != nil {
			t.Errorf("ParseSize(%q): %v [%s]", tt.in, err, tt.source)
			continue
		}
		if math.Abs(got.W.Pt()-tt.want.W.Pt()) > 1e-9 || math.Abs(got.H.Pt()-tt.want.H.Pt()) > 1e-9 {
			t.Errorf("ParseSize(%q) = %v, want %v [%s]", tt.in, got, tt.want, tt.source)
		}
	}
	for _, bad := range []struct{ in, want string }{
		{"A4 sideways", `after a size name only "portrait" or "landscape" may follow`},
		{"A6", `is not a size; use A3, A4, A5, Letter, Tabloid`},
		{"230mm", `is not a size`},
		{"230 x 300mm", `"230" has no unit`},
		{"230mm x 300", `"300" has no unit`},
	} {
		if _, err := ParseSize(bad.in, false); err == nil || !strings.Contains(err.Error(), bad.want) {
			t.Errorf("ParseSize(%q) error = %v, want it to contain %q", bad.in, err, bad.want)
		}
	}
}

func BenchmarkParseLength(b *testing.B) {
	for b.Loop() {
		if _, err := ParseLength("12.5mm"); err != nil {
			b.Fatal(err)
		}
	}
}
