package series

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// The tiny example feature shared by the repo: three invented terms over
// 1900–1905, totals lacking 1903.
const small = "../../testdata/small/spec.yaml"

func loadSmall(t *testing.T, mode specs.ScaleMode, yr specs.YRange) *Set {
	t.Helper()
	s, err := specs.Load(small)
	require.NoError(t, err)
	s.Scale = specs.Scale{Mode: mode, YRange: yr}
	set, err := Load(s)
	require.NoError(t, err)
	return set
}

const gap = -1 // marks an expected NaN in the tables below

func sameValues(t *testing.T, what string, got, want []float64) {
	t.Helper()
	if !assert.Len(t, got, len(want), "%s: values", what) {
		return
	}
	for i := range want {
		if want[i] == gap {
			assert.True(t, math.IsNaN(got[i]), "%s[%d] = %g, want a gap (NaN)", what, i, got[i])
			continue
		}
		assert.False(t, math.IsNaN(got[i]), "%s[%d] is a gap, want %.12g", what, i, want[i])
		assert.InDelta(t, want[i], got[i], 1e-9*math.Max(1, math.Abs(want[i])), "%s[%d]", what, i)
	}
}

// TestScaleSmall checks the scaling arithmetic on testdata/small, every
// value computed by hand from counts.csv and totals.csv (share = count /
// total × 10^6; the definition of "per million"):
//
//	boiler 1900: 50/100000×1e6 = 500; 1901: 40/120000×1e6 = 333.333…;
//	1902: 20/110000×1e6 = 181.818…; 1904, 1905: no row, totals has the
//	year, so 0. telegraph 1902 = 0 (totals has 1902, counts lack it);
//	1904: 30/130000×1e6 = 230.769…; 1905: 60/150000×1e6 = 400.
//	Maßstab 1900: 3/100000×1e6 = 30; 1905: 9/150000×1e6 = 60.
//	1903 is a gap (NaN) for every term: totals.csv has no 1903.
func TestScaleSmall(t *testing.T) {
	set := loadSmall(t, specs.ScaleShare, specs.YOwn)
	assert.Equal(t, "[1903]", fmt.Sprint(set.Gaps), "gap years")
	sameValues(t, "years", set.Years, []float64{1900, 1901, 1902, 1903, 1904, 1905})
	assert.Equal(t, 3, set.Terms, "terms")
	assert.Equal(t, 8, set.Rows, "rows")
	assert.Equal(t, "per million words", set.Unit, "unit")
	want := []struct {
		term     string
		values   []float64
		counts   []float64
		total    float64
		peak     float64
		peakYear int
	}{
		{"telegraph", []float64{0, 5e6 / 120000, 0, gap, 30e6 / 130000, 400}, []float64{0, 5, 0, gap, 30, 60}, 95, 400, 1905},
		{"boiler", []float64{500, 40e6 / 120000, 20e6 / 110000, gap, 0, 0}, []float64{50, 40, 20, gap, 0, 0}, 110, 500, 1900},
		{"Maßstab", []float64{30, 0, 0, gap, 0, 60}, []float64{3, 0, 0, gap, 0, 9}, 12, 60, 1905},
	}
	require.Len(t, set.Series, len(want), "series")
	for i, w := range want {
		sr := set.Series[i]
		if !assert.Equal(t, w.term, sr.Term, "series %d (order: listed)", i) {
			continue
		}
		sameValues(t, w.term+" values", sr.Values, w.values)
		sameValues(t, w.term+" counts", sr.Counts, w.counts)
		assert.Equal(t, w.total, sr.Total, "%s: total", w.term)
		assert.Equal(t, w.peak, sr.Peak, "%s: peak", w.term)
		assert.Equal(t, w.peakYear, sr.PeakYear, "%s: peak year", w.term)
		// Share over the span: the term's total over all words in the
		// span's totals, 100000+120000+110000+130000+150000 = 610000.
		assert.InDelta(t, w.total/610000, sr.Share, 1e-15, "%s: share", w.term)
		// Own y-range: the panel's top is its own peak.
		assert.Equal(t, w.peak, sr.YMax, "%s: own y-range top", w.term)
	}
	// The shared top is the largest peak, boiler's 500.
	assert.Equal(t, 500.0, set.YMax, "the set's shared top")
}

func TestScaleModes(t *testing.T) {
	t.Run("own-peak", func(t *testing.T) {
		// Each share divided by the term's highest share (hand-computed):
		// boiler: 500/500, 333.33/500 = 2/3, 181.82/500 = 4/11.
		set := loadSmall(t, specs.ScaleOwnPeak, specs.YShared)
		sameValues(t, "boiler", set.Series[1].Values, []float64{1, 2.0 / 3, 4.0 / 11, gap, 0, 0})
		// telegraph: 41.667/400 = 5/48, 230.77/400 = 15/26, 400/400.
		sameValues(t, "telegraph", set.Series[0].Values, []float64{0, 5.0 / 48, 0, gap, 15.0 / 26, 1})
		sameValues(t, "Maßstab", set.Series[2].Values, []float64{0.5, 0, 0, gap, 0, 1})
		for _, sr := range set.Series {
			assert.Equal(t, 1.0, sr.Peak, "%s: peak", sr.Term)
			assert.Equal(t, 1.0, sr.YMax, "%s: ymax", sr.Term)
		}
		assert.Equal(t, "share of the term's own peak", set.Unit, "unit")
	})
	t.Run("raw shared", func(t *testing.T) {
		// Raw keeps the counts; the shared top is the largest count, 60.
		set := loadSmall(t, specs.ScaleRaw, specs.YShared)
		sameValues(t, "boiler", set.Series[1].Values, []float64{50, 40, 20, gap, 0, 0})
		sameValues(t, "telegraph", set.Series[0].Values, []float64{0, 5, 0, gap, 30, 60})
		for _, sr := range set.Series {
			assert.Equal(t, 60.0, sr.YMax, "%s: shared ymax", sr.Term)
		}
	})
	t.Run("per-million shared", func(t *testing.T) {
		set := loadSmall(t, specs.ScaleShare, specs.YShared)
		for _, sr := range set.Series {
			assert.Equal(t, 500.0, sr.YMax, "%s: shared ymax (boiler 1900)", sr.Term)
		}
	})
}

// feature writes a spec and its tables into a fresh folder and returns
// the spec's path. extra is added to the spec (terms, scale, …).
func feature(t testing.TB, countsName, counts, totals, extra string) string {
	t.Helper()
	dir := t.TempDir()
	if totals == "" {
		totals = "year,total\n1900,100000\n1901,120000\n1902,110000\n1904,130000\n1905,150000\n"
	}
	write(t, filepath.Join(dir, countsName), counts)
	write(t, filepath.Join(dir, "totals.csv"), totals)
	spec := fmt.Sprintf("title: T\ndata:\n  counts: %s\n  totals: totals.csv\nyears: {from: 1900, to: 1905}\noutputs: {print: {kind: print}}\n%s", countsName, extra)
	path := filepath.Join(dir, "spec.yaml")
	write(t, path, spec)
	return path
}

func write(t testing.TB, path, text string) {
	t.Helper()
	require.NoError(t, os.WriteFile(path, []byte(text), 0o644))
}

func load(t testing.TB, spec string) (*Set, error) {
	t.Helper()
	s, err := specs.Load(spec)
	require.NoError(t, err, "loading the spec")
	return Load(s)
}

// TestVariants reads the small counts table written six ways: the format
// rules are RFC 4180 (CSV, CRLF line ends), the IANA text/tab-separated-
// values registration (TSV), and Unicode §23.8 / RFC 3629 §6 (a UTF-8 BOM
// is allowed and is not part of the text). All must read identically.
func TestVariants(t *testing.T) {
	raw, err := os.ReadFile("../../testdata/small/counts.csv")
	require.NoError(t, err)
	csvText := strings.TrimPrefix(string(raw), "\ufeff")
	tsvText := strings.ReplaceAll(csvText, ",", "\t")
	crlf := func(s string) string { return strings.ReplaceAll(s, "\n", "\r\n") }
	reordered := "count,term,year\n" // columns are found by name
	for _, line := range strings.Split(strings.TrimSpace(csvText), "\n")[1:] {
		f := strings.Split(line, ",")
		reordered += f[2] + "," + f[0] + "," + f[1] + "\n"
	}
	variants := []struct{ name, file, text string }{
		{"plain CSV", "counts.csv", csvText},
		{"CSV with BOM", "counts.csv", "\ufeff" + csvText},
		{"CSV, CRLF, BOM", "counts.csv", "\ufeff" + crlf(csvText)},
		{"TSV", "counts.tsv", tsvText},
		{"TSV, CRLF, BOM", "counts.tsv", "\ufeff" + crlf(tsvText)},
		{"columns reordered, header in capitals", "counts.csv", strings.Replace(reordered, "count,term,year", "Count,TERM,Year", 1)},
	}
	extra := "terms: {list: [telegraph, boiler, Maßstab]}\n"
	var first *Set
	for _, v := range variants {
		set, err := load(t, feature(t, v.file, v.text, "", extra))
		if !assert.NoError(t, err, "loading %s", v.name) {
			continue
		}
		if first == nil {
			first = set
			continue
		}
		assert.Equal(t, describe(first), describe(set), "%s reads differently", v.name)
	}
}

// termsOf lists the selected terms in order.
func termsOf(set *Set) []string {
	var n []string
	for _, sr := range set.Series {
		n = append(n, sr.Term)
	}
	return n
}

func describe(set *Set) string {
	var b strings.Builder
	fmt.Fprintf(&b, "terms %d rows %d gaps %v ymax %g\n", set.Terms, set.Rows, set.Gaps, set.YMax)
	for _, sr := range set.Series {
		fmt.Fprintf(&b, "%q %v %v %g %g %d\n", sr.Term, sr.Values, sr.Counts, sr.Total, sr.Peak, sr.PeakYear)
	}
	return b.String()
}

// TestTermsAsWritten checks Unicode normalisation and case: terms are
// compared in NFC (Unicode Standard Annex #15: "e" + U+0301 COMBINING
// ACUTE ACCENT is canonically equivalent to U+00E9), and case matters
// unless fold-case is on (then Unicode default case folding, §3.13).
func TestTermsAsWritten(t *testing.T) {
	const decomposed, composed = "cafe\u0301", "caf\u00e9"
	t.Run("NFC", func(t *testing.T) {
		counts := "term,year,count\n" + decomposed + ",1900,7\n"
		set, err := load(t, feature(t, "counts.csv", counts, "", "terms: {list: ["+composed+"]}\n"))
		require.NoError(t, err)
		assert.Equal(t, composed, set.Series[0].Term, "the term's spelling (want composed)")
		assert.Equal(t, 7.0, set.Series[0].Counts[0], "the count in 1900")
		// The two spellings are one term, so two rows for 1900 clash.
		counts += composed + ",1900,3\n"
		_, err = load(t, feature(t, "counts.csv", counts, "", "terms: {list: ["+composed+"]}\n"))
		require.Error(t, err, "composed and decomposed rows for one year")
		assert.Contains(t, err.Error(), "counts.csv:3:7: \""+composed+"\" has a second row for 1900", "composed and decomposed rows for one year")
	})
	counts := "term,year,count\nboiler,1900,50\nBoiler,1900,10\nBoiler,1901,12\n"
	t.Run("case kept", func(t *testing.T) {
		set, err := load(t, feature(t, "counts.csv", counts, "", "terms: {list: [boiler, Boiler]}\n"))
		require.NoError(t, err)
		require.Equal(t, 2, set.Terms, "case-sensitive terms: %s", describe(set))
		assert.Equal(t, 50.0, set.Series[0].Counts[0], "case-sensitive boiler 1900")
		assert.Equal(t, 10.0, set.Series[1].Counts[0], "case-sensitive Boiler 1900")
		_, err = load(t, feature(t, "counts.csv", counts, "", "terms: {list: [BOILER]}\n"))
		require.Error(t, err, "BOILER without fold-case")
		assert.Contains(t, err.Error(), `term "BOILER" is not in counts.csv; closest: "Boiler", "boiler"`, "BOILER without fold-case")
	})
	t.Run("fold-case", func(t *testing.T) {
		spec := feature(t, "counts.csv", counts, "", "terms: {list: [BOILER]}\n")
		s, err := specs.Load(spec)
		require.NoError(t, err)
		s.Data.FoldCase = true
		set, err := Load(s)
		require.NoError(t, err)
		// boiler + Boiler in 1900: 50 + 10 = 60; 1901: 12 (hand-added).
		sr := set.Series[0]
		assert.Equal(t, 1, set.Terms, "fold-case terms")
		assert.Equal(t, "boiler", sr.Term, "fold-case term")
		assert.Equal(t, 60.0, sr.Counts[0], "fold-case count 1900")
		assert.Equal(t, 12.0, sr.Counts[1], "fold-case count 1901")
		assert.Equal(t, 72.0, sr.Total, "fold-case total")
		// 60/100000×1e6 = 600 per million.
		assert.Equal(t, 600.0, sr.Values[0], "fold-case 1900 value")
	})
}

// TestDataErrors checks every data problem is reported at its file, line
// and column (the field's first byte, RFC 4180 rows; line 1 is the
// header) with this project's wording.
func TestDataErrors(t *testing.T) {
	const hdr = "term,year,count\n"
	tests := []struct {
		name   string
		file   string // counts file name
		counts string
		totals string // "" for the small totals
		extra  string // added to the spec
		at     string // "file:line:col"; spec.yaml positions are in the generated spec
		want   string
	}{
		{"duplicate row", "counts.csv", hdr + "boiler,1900,50\nboiler,1901,5\nboiler,1900,5\n", "", "", "counts.csv:4:8", `"boiler" has a second row for 1900`},
		{"negative count", "counts.csv", hdr + "boiler,1900,-5\n", "", "", "counts.csv:2:13", `count for "boiler" in 1900: -5 is negative`},
		{"count not a number", "counts.csv", hdr + "boiler,1900,many\n", "", "", "counts.csv:2:13", `count for "boiler" in 1900: "many" is not a number`},
		{"count NaN", "counts.csv", hdr + "boiler,1900,NaN\n", "", "", "counts.csv:2:13", `"NaN" is not a finite number`},
		{"count Inf", "counts.csv", hdr + "boiler,1900,+Inf\n", "", "", "counts.csv:2:13", `"+Inf" is not a finite number`},
		{"year outside span", "counts.csv", hdr + "boiler,1890,5\n", "", "", "counts.csv:2:8", "year 1890 is outside the span 1900–1905 set at "},
		{"year not whole", "counts.csv", hdr + "boiler,19x0,5\n", "", "", "counts.csv:2:8", `year "19x0" is not a whole number`},
		{"count over total", "counts.csv", hdr + "boiler,1900,100001\n", "", "", "counts.csv:2:13", `count 100001 for "boiler" in 1900 is more than that year's total 100000`},
		{"totals lack the year", "counts.csv", hdr + "boiler,1903,5\n", "", "", "counts.csv:2:8", `"boiler" has a count in 1903 but the totals table has no total for 1903; per-million scaling needs it`},
		{"empty term", "counts.csv", hdr + " ,1900,5\n", "", "", "counts.csv:2:1", "the term is empty"},
		{"short row", "counts.csv", hdr + "boiler,1900\n", "", "", "counts.csv:2:1", "the row has 2 fields; the header asks for at least 3"},
		{"bare quote", "counts.csv", hdr + "bo\"iler,1900,5\n", "", "", "counts.csv:2:3", `bare " in non-quoted-field`},
		{"one column", "counts.csv", "term\nboiler\n", "", "", "counts.csv:1:1", `the header needs columns named term, year, count; it has "term"`},
		{"column twice", "counts.csv", "term,term,year,count\na,b,1900,5\n", "", "", "counts.csv:1:6", `column "term" appears twice in the header (also column 1)`},
		{"no header", "counts.csv", "boiler,1900,5\n", "", "", "counts.csv:1:1", `the header needs columns named term, year, count; it has "boiler", "1900", "5"`},
		{"empty counts", "counts.csv", "", "", "", "counts.csv:1:1", "the table is empty; it needs a header row with term, year, count"},
		{"wrong extension", "counts.xls", hdr, "", "", "spec.yaml:3:3", `data.counts: "counts.xls" must end in .csv or .txt (comma-separated) or .tsv or .tab (tab-separated)`},
		{"listed terms missing", "counts.csv", hdr + "telegraph,1900,5\nboiler,1900,5\n", "", "terms:\n  list: [telegraf, boiler, steem]\n", "spec.yaml:8:10", `term "telegraf" is not in counts.csv; closest: "telegraph"`},
		{"second missing term", "counts.csv", hdr + "telegraph,1900,5\nsteam,1900,5\n", "", "terms:\n  list: [telegraf, boiler, steem]\n", "spec.yaml:8:28", `term "steem" is not in counts.csv; closest: "steam"`},
		{"nothing selected", "counts.csv", hdr + "boiler,1900,5\n", "", "terms: {min-total: 10}\n", "spec.yaml:7:1", "no terms are selected: the data has 1 terms"},
		{"total duplicate", "counts.csv", hdr, "year,total\n1900,5\n1900,6\n", "", "totals.csv:3:1", "year 1900 is given twice (first on line 2)"},
		{"total zero", "counts.csv", hdr, "year,total\n1900,0\n", "", "totals.csv:2:6", "total for 1900 is 0"},
		{"total negative", "counts.csv", hdr, "year,total\n1900,-1\n", "", "totals.csv:2:6", "total for 1900: -1 is negative"},
		{"totals outside span", "counts.csv", hdr, "year,total\n1800,5\n", "", "spec.yaml:5:1", "no totals in "},
		// Issue 20 (this project's own rules): a row with more fields than
		// the header, a NUL, a byte order mark (U+FEFF, Unicode §23.8) or
		// a control character inside a term, a term or a record too long,
		// and nothing selected by a spec without terms are errors at
		// their place.
		{"extra field", "counts.csv", hdr + "steam,1900,1,250\n", "", "", "counts.csv:2:14", "the row has 4 fields; the header has 3"},
		{"extra field in totals", "counts.csv", hdr, "year,total\n1900,100,000\n", "", "totals.csv:2:10", "the row has 3 fields; the header has 2"},
		{"NUL in term", "counts.csv", hdr + "ste\x00am,1900,1\n", "", "", "counts.csv:2:1", "has a NUL byte at byte 4"},
		{"BOM in term", "counts.csv", hdr + "\ufeffsteam,1900,1\nboiler,1900,1\n", "", "", "counts.csv:2:1", "has a byte order mark (U+FEFF) at byte 1"},
		{"BOM inside a term after a good run", "counts.csv", hdr + "steam,1900,1\nst\ufeffeam,1901,1\n", "", "", "counts.csv:3:1", "has a byte order mark (U+FEFF) at byte 3"},
		{"control character in term", "counts.csv", hdr + "\"ste\ram\",1900,1\n", "", "", "counts.csv:2:1", "has the control character U+000D at byte 4"},
		{"term too long", "counts.csv", hdr + strings.Repeat("w", 257) + ",1900,1\n", "", "", "counts.csv:2:1", "is 257 bytes long; a term is at most 256 bytes"},
		{"record too long", "counts.csv", hdr + "steam,1900,1\n" + strings.Repeat("w", 70<<10) + ",1900,1\n", "", "", "counts.csv:3:1", "the record is longer than 64 KiB"},
		{"quoted record too long", "counts.csv", hdr + "\"" + strings.Repeat("w\n", 40<<10) + "\",1900,1\n", "", "", "counts.csv:2:1", "the record is longer than 64 KiB"},
		{"nothing selected, no terms key", "counts.csv", hdr, "", "", "spec.yaml:3:3", "no terms are selected: the data has 0 terms"},
		// Counts are decimal (this project's own rule): strconv.ParseFloat's
		// hexadecimal and underscored forms are refused.
		{"hexadecimal count", "counts.csv", hdr + "boiler,1900,0x1p3\n", "", "", "counts.csv:2:13", `count for "boiler" in 1900: "0x1p3" is not a number`},
		{"underscored count", "counts.csv", hdr + "boiler,1900,1_000\n", "", "", "counts.csv:2:13", `"1_000" is not a number`},

		// Text must be UTF-8 (RFC 3629 §3: 0xFF never appears; 0xE9 is
		// é in ISO 8859-1 but in UTF-8 a lead byte that needs two
		// continuation bytes). The error is at the field's first byte.
		{"term not UTF-8", "counts.csv", hdr + "bo\xffiler,1900,5\n", "", "", "counts.csv:2:1", `the term "bo\xffiler" is not valid UTF-8 text; save the table as UTF-8`},
		{"Latin-1 term after a good run", "counts.csv", hdr + "cafe,1900,5\ncafe,1901,5\ncaf\xe9,1902,5\n", "", "", "counts.csv:4:1", `the term "caf\xe9" is not valid UTF-8 text`},
		{"quoted term not UTF-8", "counts.csv", hdr + "boiler,1900,5\n\"caf\xe9, au lait\",1900,5\n", "", "", "counts.csv:3:1", `the term "caf\xe9, au lait" is not valid UTF-8 text`},
		{"TSV term not UTF-8", "counts.tsv", "term\tyear\tcount\nMa\xdfstab\t1900\t3\n", "", "", "counts.tsv:2:1", `the term "Ma\xdfstab" is not valid UTF-8 text`},
		{"header not UTF-8", "counts.csv", "term,ye\xe4r,count\nboiler,1900,5\n", "", "", "counts.csv:1:6", `the header "ye\xe4r" is not valid UTF-8 text; save the table as UTF-8`},
		// A UTF-16LE file starts FF FE (Unicode §23.8, byte order mark).
		{"UTF-16 table", "counts.csv", "\xff\xfet\x00e\x00r\x00m\x00,\x00y\x00", "", "", "counts.csv:1:1", `the header "\xff\xfet\x00e\x00r\x00m\x00" is not valid UTF-8 text`},
		{"totals header not UTF-8", "counts.csv", hdr, "year,t\xf6tal\n1900,5\n", "", "totals.csv:1:6", `the header "t\xf6tal" is not valid UTF-8 text`},

		// Term lists (this project's own rules): a term listed twice or
		// both listed and excluded, and an excluded term the data lacks,
		// are slips, reported at the entry. In the generated spec the
		// terms mapping starts on line 7; "  list: [" is 9 columns.
		{"listed twice, flow list", "counts.csv", hdr + "telegraph,1900,5\nboiler,1900,5\n", "", "terms:\n  list: [boiler, telegraph, boiler]\n", "spec.yaml:8:29", `term "boiler" is listed twice (first at line 8, column 10)`},
		{"listed twice, block list", "counts.csv", hdr + "telegraph,1900,5\nboiler,1900,5\n", "", "terms:\n  list:\n    - boiler\n    - telegraph\n    - boiler\n", "spec.yaml:11:7", `term "boiler" is listed twice (first at line 9)`},
		// NFC (Unicode Standard Annex #15): e + U+0301 is é, the same term.
		{"listed twice in two normal forms", "counts.csv", hdr + "caf\u00e9,1900,5\n", "", "terms:\n  list:\n    - caf\u00e9\n    - cafe\u0301\n", "spec.yaml:10:7", "term \"cafe\u0301\" is listed twice (first at line 9)"},
		{"listed twice, missing from the data", "counts.csv", hdr + "boiler,1900,5\n", "", "terms:\n  list: [steem, steem]\n", "spec.yaml:8:17", `term "steem" is listed twice (first at line 8, column 10)`},
		{"listed and excluded", "counts.csv", hdr + "telegraph,1900,5\nboiler,1900,5\n", "", "terms:\n  list: [boiler, telegraph]\n  exclude: [telegraph]\n", "spec.yaml:8:18", `term "telegraph" is both listed and excluded (exclude at line 9)`},
		{"listed and excluded, block lists", "counts.csv", hdr + "boiler,1900,5\n", "", "terms:\n  exclude:\n    - boiler\n  list:\n    - boiler\n", "spec.yaml:11:7", `term "boiler" is both listed and excluded (exclude at line 9)`},
		{"excluded term not in the data", "counts.csv", hdr + "telegraph,1900,5\nboiler,1900,5\n", "", "terms:\n  exclude: [the, telegraf]\n", "spec.yaml:8:13", `excluded term "the" is not in counts.csv`},
		{"excluded term misspelt", "counts.csv", hdr + "telegraph,1900,5\nboiler,1900,5\n", "", "terms:\n  exclude: [the, telegraf]\n", "spec.yaml:8:18", `excluded term "telegraf" is not in counts.csv; closest: "telegraph"`},
		{"excluded term given alone", "counts.csv", hdr + "boiler,1900,5\n", "", "terms:\n  exclude: boyler\n", "spec.yaml:8:3", `excluded term "boyler" is not in counts.csv; closest: "boiler"`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			spec := feature(t, tt.file, tt.counts, tt.totals, tt.extra)
			_, err := load(t, spec)
			require.Error(t, err, "loading %s", tt.name)
			want := filepath.Join(filepath.Dir(spec), tt.at)
			for _, line := range strings.Split(err.Error(), "\n") {
				rest, ok := strings.CutPrefix(line, want)
				if ok && (strings.HasPrefix(rest, ": ")) && strings.Contains(rest, tt.want) {
					return
				}
			}
			assert.Fail(t, "no error line at its place", "want %s: …%s…; got\n%v", tt.at, tt.want, err)
		})
	}
}

// TestRawNeedsNoTotal: raw counts need no total, so with values: raw a
// count in a year the totals lack is kept and plotted as it is (this
// project's own rule; the share check in TestDataErrors does not apply).
// The year stays a gap of the table, and a term with no row there still
// breaks its line.
func TestRawNeedsNoTotal(t *testing.T) {
	spec := feature(t, "counts.csv", "term,year,count\nboiler,1903,5\nboiler,1904,2\ntelegraph,1900,2\n", "",
		"terms: {list: [boiler, telegraph]}\nscale: {values: raw}\n")
	set, err := load(t, spec)
	require.NoError(t, err)
	assert.Equal(t, "[1903]", fmt.Sprint(set.Gaps), "gap years")
	boiler, telegraph := set.Series[0], set.Series[1]
	sameValues(t, "boiler values", boiler.Values, []float64{0, 0, 0, 5, 2, 0})
	sameValues(t, "boiler counts", boiler.Counts, []float64{0, 0, 0, 5, 2, 0})
	assert.Equal(t, 7.0, boiler.Total, "boiler total")
	assert.Equal(t, 5.0, boiler.Peak, "boiler peak")
	assert.Equal(t, 1903, boiler.PeakYear, "boiler peak year")
	sameValues(t, "telegraph values", telegraph.Values, []float64{2, 0, 0, gap, 0, 0})
}

// TestFractionalCounts: counts and totals may be fractional (weighted or
// estimated counts; this project's own rule). Each is kept as the nearest
// float64 to its decimal text (IEEE 754-2008 §5.12.2 round to nearest, as
// strconv.ParseFloat reads it), not rounded to a whole number; the values
// below are exact in binary except 0.1, whose nearest double is Go's
// constant 0.1.
func TestFractionalCounts(t *testing.T) {
	tests := []struct {
		text string
		want float64
	}{
		{"5.5", 5.5},
		{"0.25", 0.25},
		{".75", 0.75},
		{"7.", 7},
		{"2.5e1", 25},
		{"1E-2", 0.01},
		{"0.1", 0.1},
		{" 3.5 ", 3.5},                           // RFC 4180 §2.4 keeps the spaces; the number is read without them
		{"12345678901234567", 12345678901234568}, // 17 digits: past 2^53, rounded to even
	}
	var counts strings.Builder
	counts.WriteString("term,year,count\n")
	for i, tt := range tests {
		fmt.Fprintf(&counts, "t%d,1900,%s\n", i, tt.text)
	}
	// A fractional total too: 200000.5 words in 1900.
	totals := "year,total\n1900,1e17\n1901,200000.5\n"
	spec := feature(t, "counts.csv", counts.String()+"t0,1901,1.5\n", totals, "order: alphabetical\n")
	set, err := load(t, spec)
	require.NoError(t, err)
	for i, tt := range tests {
		sr := set.Series[i]
		require.Equal(t, fmt.Sprintf("t%d", i), sr.Term, "series %d", i)
		assert.Equal(t, math.Float64bits(tt.want), math.Float64bits(sr.Counts[0]), "bits of %q read (%v, want %v)", tt.text, sr.Counts[0], tt.want)
		assert.Equal(t, tt.want/1e17*1e6, sr.Values[0], "%q per million", tt.text)
	}
	assert.Equal(t, 1.5/200000.5*1e6, set.Series[0].Values[1], "1.5 of 200000.5 words per million")
}

// TestFoldCaseListedTwice: with fold-case, spellings that differ only in
// case (Unicode default case folding, §3.13) are one term, so listing
// both is listing it twice.
func TestFoldCaseListedTwice(t *testing.T) {
	s, err := specs.Load(feature(t, "counts.csv", "term,year,count\nboiler,1900,5\n", "", "terms: {list: [boiler, BOILER]}\n"))
	require.NoError(t, err)
	s.Data.FoldCase = true
	_, err = Load(s)
	require.Error(t, err, "BOILER listed twice under fold-case")
	assert.True(t, strings.HasSuffix(err.Error(), `spec.yaml:7:24: term "BOILER" is listed twice (first at line 7, column 16)`), "got %v", err)
	s.Data.FoldCase = false // two terms then; BOILER is not in the data
	_, err = Load(s)
	require.Error(t, err, "BOILER without fold-case")
	assert.Contains(t, err.Error(), `term "BOILER" is not in counts.csv`, "without fold-case")
}

func TestMissingFiles(t *testing.T) {
	dir := t.TempDir()
	write(t, filepath.Join(dir, "totals.csv"), "year,total\n1900,5\n")
	require.NoError(t, os.Mkdir(filepath.Join(dir, "folder.csv"), 0o755))
	for _, tt := range []struct{ counts, want string }{
		{"../elsewhere/counts.csv", `data.counts: "../elsewhere/counts.csv" (resolved to ` + filepath.Join(dir, "../elsewhere/counts.csv") + ") does not exist"},
		{"folder.csv", `data.counts: "folder.csv" (resolved to ` + filepath.Join(dir, "folder.csv") + ") is a directory, not a table"},
	} {
		spec := filepath.Join(dir, "spec.yaml")
		write(t, spec, "title: T\ndata:\n  counts: "+tt.counts+"\n  totals: totals.csv\nyears: {from: 1900, to: 1905}\noutputs: {print: {kind: print}}\n")
		_, err := load(t, spec)
		if assert.Error(t, err, "counts %s", tt.counts) {
			assert.Equal(t, spec+":3:3: "+tt.want, err.Error(), "counts %s", tt.counts)
		}
	}
}

func TestOrderAndGroups(t *testing.T) {
	s, err := specs.Load(small)
	require.NoError(t, err)
	names := func(set *Set) string {
		var n []string
		for _, sr := range set.Series {
			n = append(n, sr.Term)
		}
		return strings.Join(n, " ")
	}
	for _, tt := range []struct {
		order specs.Order
		want  string
	}{
		{specs.OrderListed, "telegraph boiler Maßstab"},
		// Case-folded code-point order: boiler < maßstab < telegraph.
		{specs.OrderAlpha, "boiler Maßstab telegraph"},
		// Peak years 1900, 1905, 1905; ties by code point (M < t).
		{specs.OrderPeakYear, "boiler Maßstab telegraph"},
	} {
		s.Order = tt.order
		set, err := Load(s)
		require.NoError(t, err)
		assert.Equal(t, tt.want, names(set), "order %s", tt.order)
	}
	s.Order, s.Group = specs.OrderListed, specs.GroupPeakDecade
	set, err := Load(s)
	require.NoError(t, err)
	require.Len(t, set.Groups, 1, "groups by peak decade")
	assert.Equal(t, "Peak in the 1900s", set.Groups[0].Heading, "group heading")
	assert.Equal(t, 3, set.Groups[0].Count, "group count")
}

func TestTopAndExclude(t *testing.T) {
	// Overall shares (hand-computed): boiler 110, telegraph 95, Maßstab 12
	// occurrences over the same 610000 words, so top 2 is boiler, telegraph.
	s, err := specs.Load(small)
	require.NoError(t, err)
	s.Terms = specs.Terms{Top: 2}
	set, err := Load(s)
	require.NoError(t, err)
	assert.Equal(t, []string{"boiler", "telegraph"}, termsOf(set), "top 2")
	s.Terms = specs.Terms{Top: 2, Exclude: []string{"boiler"}}
	set, err = Load(s)
	require.NoError(t, err)
	assert.Equal(t, []string{"telegraph", "Maßstab"}, termsOf(set), "top 2 without boiler")
}

// bigFeature writes a counts table of terms × years rows (deterministic
// invented words and counts) and returns the spec path and the file size.
// The spec selects the top 24 terms.
func bigFeature(t testing.TB, terms, years int) (string, int64) {
	return bigFeatureWith(t, terms, years, "terms: {top: 24}\n")
}

// bigFeatureWith is bigFeature with the spec's selection and scaling
// lines.
func bigFeatureWith(t testing.TB, terms, years int, selection string) (string, int64) {
	t.Helper()
	dir := t.TempDir()
	f, err := os.Create(filepath.Join(dir, "counts.csv"))
	require.NoError(t, err)
	w := bufio.NewWriterSize(f, 1<<20)
	w.WriteString("term,year,count\n")
	var buf []byte
	x := uint64(88172645463325252) // xorshift64 state: fixed, so the file is the same every run
	for i := range terms {
		for y := range years {
			x ^= x << 13
			x ^= x >> 7
			x ^= x << 17
			buf = append(buf[:0], "word"...)
			buf = strconv.AppendInt(buf, int64(i), 36)
			buf = append(buf, ',')
			buf = strconv.AppendInt(buf, int64(1700+y), 10)
			buf = append(buf, ',')
			buf = strconv.AppendUint(buf, x%100000, 10)
			buf = append(buf, '\n')
			w.Write(buf)
		}
	}
	require.NoError(t, w.Flush())
	st, _ := f.Stat()
	f.Close()
	var tot strings.Builder
	tot.WriteString("year,total\n")
	for y := range years {
		fmt.Fprintf(&tot, "%d,1000000000\n", 1700+y)
	}
	write(t, filepath.Join(dir, "totals.csv"), tot.String())
	spec := filepath.Join(dir, "spec.yaml")
	write(t, spec, fmt.Sprintf("title: T\ndata: {counts: counts.csv, totals: totals.csv}\nyears: {from: 1700, to: %d}\n%soutputs: {print: {kind: print}}\n", 1700+years-1, selection))
	return spec, st.Size()
}

// peakHeap runs f while sampling the heap in use, and returns the highest
// sample above the heap in use before f started.
func peakHeap(f func()) uint64 {
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	base := ms.HeapInuse
	peak := base
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		tick := time.NewTicker(2 * time.Millisecond)
		defer tick.Stop()
		for {
			var m runtime.MemStats
			runtime.ReadMemStats(&m)
			peak = max(peak, m.HeapInuse)
			select {
			case <-done:
				return
			case <-tick.C:
			}
		}
	}()
	f()
	close(done)
	wg.Wait()
	runtime.ReadMemStats(&ms)
	return max(peak, ms.HeapInuse) - base
}

// TestLargeTableStreams reads a 2.4-million-row counts table (~45 MB) and
// checks the heap never grows by more than a quarter of the file: the
// tables are streamed, and memory follows the distinct and the selected
// terms, not the rows. Holding the rows, even packed into 32 bytes each,
// would take 77 MB. The bound is not tighter because the Go collector
// lets garbage reach its minimum heap goal of 4 MB before it runs
// (runtime/mgcpacer.go, heapMinimum), so a few MB measure the collector,
// not the reader. The peak is bounded with runtime/metrics in a fresh
// process (heapGrowthBound), not sampled. No timing is asserted.
func TestLargeTableStreams(t *testing.T) {
	if heapChild(t) {
		return
	}
	if testing.Short() {
		t.Skip("writes a ~45 MB file")
	}
	spec, size := bigFeature(t, 6000, 400)
	set, err := load(t, spec)
	require.NoError(t, err)
	require.Equal(t, 2_400_000, set.Rows, "rows")
	require.Equal(t, 6000, set.Terms, "terms")
	require.Len(t, set.Series, 24, "selected")
	peak := heapGrowthBound(t, spec)
	t.Logf("file %.1f MB, heap growth at most %.1f MB", float64(size)/1e6, float64(peak)/1e6)
	assert.LessOrEqual(t, peak, uint64(size)/4, "heap growth (upper bound) reading a %.1f MB file; want under a quarter of the file", float64(size)/1e6)
}

func BenchmarkLoadLarge(b *testing.B) {
	spec, size := bigFeature(b, 6000, 400)
	b.SetBytes(size)
	var peak uint64
	for b.Loop() {
		peak = max(peak, peakHeap(func() {
			_, err := load(b, spec)
			require.NoError(b, err)
		}))
	}
	b.ReportMetric(float64(peak)/1e6, "peak-heap-MB")
	b.ReportMetric(float64(size)/1e6, "file-MB")
}

// BenchmarkLoadCatalog reads a table the size of issue 22's catalog
// (4,000 terms × 134 years, 536,000 rows) and selects every term as its
// spec does: counts kept from the one read, own-peak values pooled over
// 5 years, ordered by peak year. Read and Select are timed apart.
func BenchmarkLoadCatalog(b *testing.B) {
	spec, size := bigFeatureWith(b, 4000, 134, "terms: {top: 4000, min-total: 0}\norder: peak-year\nscale: {values: own-peak, y-range: shared, rolling: {years: 5}}\n")
	s, err := specs.Load(spec)
	require.NoError(b, err)
	b.Run("read", func(b *testing.B) {
		b.SetBytes(size)
		for b.Loop() {
			_, err := ReadTable(s)
			require.NoError(b, err)
		}
	})
	b.Run("select", func(b *testing.B) {
		t, err := ReadTable(s)
		require.NoError(b, err)
		for b.Loop() {
			_, err := t.Select(s)
			require.NoError(b, err)
		}
	})
}

func BenchmarkLoadSmall(b *testing.B) {
	s, err := specs.Load(small)
	require.NoError(b, err)
	for b.Loop() {
		_, err := Load(s)
		require.NoError(b, err)
	}
}
