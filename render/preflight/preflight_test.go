package preflight

import (
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"github.com/tdewolff/font"
	"golang.org/x/image/font/gofont/goregular"

	"sheaf/examples/generate/corpus"
	"sheaf/render/tooltest"
)

// specText is a small print spec over testdata (see testdata/README.md).
// extra is appended to the print output's keys; top to the top level.
func specText(extra, top string) string {
	return `title: Preflight test
data: {counts: counts.csv, totals: totals.csv}
years: {from: 1900, to: 1905}
terms: {list: [boiler, Maßstab, flash, silent]}
scale: {values: raw}
outputs:
  print:
    kind: print
    trim: A5
    columns: 2
` + extra + top
}

// prepare loads the spec with the test data and runs Check.
func prepare(t *testing.T, text string) []Finding {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []string{"counts.csv", "totals.csv"} {
		b, err := os.ReadFile(filepath.Join("testdata", f))
		require.NoError(t, err)
		require.NoError(t, os.WriteFile(filepath.Join(dir, f), b, 0o644))
	}
	return checkSpec(t, dir, text)
}

func checkSpec(t *testing.T, dir, text string) []Finding {
	t.Helper()
	path := filepath.Join(dir, "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(text), 0o644))
	in, err := PrepareForTest(path)
	require.NoError(t, err)
	got, err := Check(in)
	require.NoError(t, err)
	return got
}

// PrepareForTest loads the spec at path and prepares its first output as
// a build does (package feature: fonts, layout, the spec's palette and
// its check, fitted labels). Package feature imports this one, so only
// an external test package can call it: feature_test.go sets it.
var PrepareForTest func(path string) (Input, error)

// has reports whether a finding with id (and, if given, term and year)
// is in fs, and returns it.
func has(fs []Finding, id, term string, year int) (Finding, bool) {
	for _, f := range fs {
		if f.ID == id && (term == "" || f.Term == term) && (year == 0 || f.Year == year) {
			return f, true
		}
	}
	return Finding{}, false
}

// TestFindings runs Check over small specs, each made to trip (or not)
// one check. Floors: 5 pt type and 0.25 pt rules in print are common
// practice (testdata/print-facts.md, "Rules, type, ink"; no standard sets them);
// the spike ratios are hand-computed in testdata/README.md.
func TestFindings(t *testing.T) {
	tests := []struct {
		name     string
		extra    string // output keys
		top      string // top-level keys
		want     []string
		wantNot  []string
		severity map[string]Severity
	}{
		{name: "defaults: spike and empty panel only",
			want:     []string{"spike flash 1902", "no-data silent", "palette"},
			wantNot:  []string{"spike boiler", "spike Maßstab", "type-floor", "line-floor", "hairline-floor", "glyph-missing"},
			severity: map[string]Severity{"spike": Review, "no-data": Warning, "palette": Info}},
		{name: "4 pt label and 0.1 pt line",
			extra:    "    type: {label: 4pt}\n    line: 0.1pt\n",
			want:     []string{"type-floor", "line-floor"},
			severity: map[string]Severity{"type-floor": Warning, "line-floor": Warning}},
		{name: "exactly at the floors is fine",
			extra:   "    type: {label: 5pt, ticks: 5pt, key: 5pt, notes: 5pt, folio: 5pt}\n    line: 0.25pt\n",
			wantNot: []string{"type-floor", "line-floor", "hairline-floor"}},
		{name: "a higher rule floor catches the page's 0.25 pt hairlines",
			top:  "preflight: {min-line: 0.3pt}\n",
			want: []string{"hairline-floor"}, wantNot: []string{"line-floor"}},
		{name: "spike ratio 2.5 catches Maßstab (9 vs 3)",
			top:  "preflight: {spike-ratio: 2.5}\n",
			want: []string{"spike Maßstab 1905", "spike flash 1902"}},
		{name: "spike ratio 10 is not exceeded by flash (exactly 10×)",
			top:     "preflight: {spike-ratio: 10}\n",
			wantNot: []string{"spike flash"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := prepare(t, specText(tt.extra, tt.top))
			for _, w := range tt.want {
				id, term, year := split(w)
				f, ok := has(got, id, term, year)
				if !assert.True(t, ok, "missing %q in\n%s", w, list(got)) {
					continue
				}
				if sev, ok := tt.severity[id]; ok {
					assert.Equal(t, sev, f.Severity, "%s: severity", w)
				}
				assert.Equal(t, "print", f.Output, "%s: output", w)
				assert.NotEmpty(t, f.Message, "%s: message", w)
			}
			for _, w := range tt.wantNot {
				id, term, year := split(w)
				f, ok := has(got, id, term, year)
				assert.False(t, ok, "unexpected %v", f)
			}
		})
	}
}

func split(w string) (id, term string, year int) {
	parts := strings.Fields(w)
	id = parts[0]
	if len(parts) > 1 {
		term = parts[1]
	}
	if len(parts) > 2 {
		for _, c := range parts[2] {
			year = year*10 + int(c-'0')
		}
	}
	return
}

func list(fs []Finding) string {
	var b strings.Builder
	for _, f := range fs {
		b.WriteString("  " + f.String() + "\n")
	}
	return b.String()
}

// TestFloorMessages checks the 4 pt label finding points at the spec line
// that set it and names both sizes.
func TestFloorMessages(t *testing.T) {
	got := prepare(t, specText("    type: {label: 4pt}\n    line: 0.1pt\n", ""))
	f, _ := has(got, IDTypeFloor, "", 0)
	// "label" is on line 11 of specText, column 12, "line" on 12:5.
	assert.True(t, strings.HasSuffix(f.At, "spec.yaml:11:12"), "type finding's place: %v", f)
	assert.Contains(t, f.Message, "type.label is 4 pt, below the 5 pt floor", "type finding")
	l, _ := has(got, IDLineFloor, "", 0)
	assert.True(t, strings.HasSuffix(l.At, "spec.yaml:12:5"), "line finding's place: %v", l)
	assert.Contains(t, l.Message, "0.1 pt, below the 0.25 pt floor", "line finding")
	assert.True(t, Stops(got), "Stops with warnings")
	// Said once: the layout's own warnings about type and lines are left out.
	d, ok := has(got, IDLayout, "", 0)
	assert.False(t, ok, "the same problem reported twice: %v", d)
}

// TestMissingGlyph builds a font without "ß": Go Regular subset to
// printable ASCII with github.com/tdewolff/font, written to a TTF.
// fontconfig's fc-query confirms independently that U+00DF is in Go
// Regular's charset and not in the subset's. The term "Maßstab" must then
// be reported, and no ASCII term.
func TestMissingGlyph(t *testing.T) {
	sf, err := font.ParseSFNT(goregular.TTF, 0)
	require.NoError(t, err)
	ids := []uint16{0}
	for r := rune(0x20); r < 0x7f; r++ {
		if id := sf.GlyphIndex(r); id != 0 {
			ids = append(ids, id)
		}
	}
	sub, err := sf.Subset(ids, font.SubsetOptions{Tables: font.KeepMinTables})
	require.NoError(t, err)
	dir := t.TempDir()
	ttf := filepath.Join(dir, "ascii.ttf")
	require.NoError(t, os.WriteFile(ttf, sub.Write(), 0o644))
	full := filepath.Join(dir, "goregular.ttf")
	require.NoError(t, os.WriteFile(full, goregular.TTF, 0o644))
	for _, f := range []string{"counts.csv", "totals.csv"} {
		b, _ := os.ReadFile(filepath.Join("testdata", f))
		os.WriteFile(filepath.Join(dir, f), b, 0o644)
	}
	got := checkSpec(t, dir, specText("    fonts: {regular: goregular.ttf, bold: ascii.ttf}\n", ""))
	f, ok := has(got, IDGlyph, "Maßstab", 0)
	require.True(t, ok, "no glyph finding for Maßstab in\n%s", list(got))
	assert.Equal(t, Error, f.Severity, "glyph finding's severity")
	assert.Contains(t, f.Message, "U+00DF", "glyph finding")
	assert.Equal(t, 1, f.Page, "glyph finding's page")
	assert.True(t, Errs(got), "a missing glyph must make check exit 1 (Errs)")
	assert.True(t, Stops(got), "a missing glyph must make check exit 1 (Stops)")
	for _, term := range []string{"boiler", "flash", "silent"} {
		g, ok := has(got, IDGlyph, term, 0)
		assert.False(t, ok, "ASCII term reported: %v", g)
	}
	// The regular face is the full Go font: the title, in bold, is ASCII
	// and the unit line in regular has "·", which Go Regular has.
	for _, g := range got {
		assert.False(t, g.ID == IDGlyph && g.Term == "", "unexpected %v", g)
	}

	fcq := tooltest.Require(t, "fc-query", "fontconfig")
	charset := func(path string) string {
		out, err := exec.Command(fcq, "--format=%{charset}", path).Output()
		require.NoError(t, err, "fc-query %s", path)
		return string(out)
	}
	// fc-query prints ranges of hex code points, like "20-7e a0-17f".
	assert.False(t, covers(charset(ttf), 0xdf), "fc-query disagrees: the subset %q covers U+00DF", charset(ttf))
	assert.True(t, covers(charset(full), 0xdf), "fc-query disagrees: the full font %q lacks U+00DF", charset(full))
}

// covers reads fontconfig's charset text ("20-7e a0-ff …") and reports
// whether r is in it.
func covers(charset string, r rune) bool {
	for _, f := range strings.Fields(charset) {
		lo, hi, _ := strings.Cut(f, "-")
		if hi == "" {
			hi = lo
		}
		a, err1 := strconv.ParseInt(lo, 16, 32)
		b, err2 := strconv.ParseInt(hi, 16, 32)
		if err1 == nil && err2 == nil && int64(r) >= a && int64(r) <= b {
			return true
		}
	}
	return false
}

// TestSpike checks Spike on hand-computed cases.
func TestSpike(t *testing.T) {
	nan := math.NaN()
	tests := []struct {
		values      []float64
		top, second float64
		index       int
	}{
		{[]float64{2, 3, 40, 3, 2, 4}, 40, 4, 2},
		{[]float64{3, 0, 0, 0, 0, 9}, 9, 3, 5},
		{[]float64{nan, 5, nan, 5}, 5, 5, 1}, // ties: the first, and the other counts as next
		{[]float64{0, nan, 0}, 0, 0, -1},
		{[]float64{0, 7, 0}, 7, 0, 1},
		{nil, 0, 0, -1},
	}
	for _, tt := range tests {
		top, second, i := Spike(tt.values)
		assert.Equal(t, tt.top, top, "Spike(%v): top", tt.values)
		assert.Equal(t, tt.second, second, "Spike(%v): second", tt.values)
		assert.Equal(t, tt.index, i, "Spike(%v): index", tt.values)
	}
}

// TestSpikesInDemoCorpus checks the spike finding against the demo
// generator's own record of the one-year spikes it planted
// (corpus.Term.SpikeYear, set where one long article multiplied a year's
// count 5–20×). Every planted spike that stands more than 4× above the
// term's next-highest year must be reported, at its year; with raw counts
// the plotted value is the count.
func TestSpikesInDemoCorpus(t *testing.T) {
	if testing.Short() {
		t.Skip("generates the demo corpus")
	}
	cfg := corpus.DefaultConfig()
	c, err := corpus.Generate(cfg)
	require.NoError(t, err)
	dir := t.TempDir()
	require.NoError(t, corpus.WriteDir(dir, cfg))
	got := checkSpec(t, dir, fmt.Sprintf(`title: Spikes
data: {counts: %s, totals: %s}
years: {from: %d, to: %d}
scale: {values: raw}
outputs:
  print: {kind: print, trim: A3, columns: 12}
`, corpus.CountsFile, corpus.TotalsFile, cfg.From, cfg.To))
	planted, checked := 0, 0
	for _, term := range c.Terms {
		if term.SpikeYear == 0 {
			continue
		}
		planted++
		var top, next float64
		for i, n := range term.Counts {
			if c.Years[i] == term.SpikeYear {
				top = float64(n)
			} else {
				next = max(next, float64(n))
			}
		}
		if top <= 4*next {
			continue // planted, but the term has a busier year elsewhere
		}
		checked++
		_, ok := has(got, IDSpike, term.Name, term.SpikeYear)
		assert.True(t, ok, "planted spike %q %d (%.0f vs next %.0f) not reported", term.Name, term.SpikeYear, top, next)
	}
	require.Positive(t, planted, "spikes the corpus planted")
	require.Positive(t, checked, "planted spikes above 4× the next-highest year")
	t.Logf("%d planted spikes, %d above 4× the next-highest year, all reported", planted, checked)
}

// TestErrsAndStops: errors always fail check; warnings only under strict;
// review and info never (the severities' documented meaning).
func TestErrsAndStops(t *testing.T) {
	for _, c := range []struct {
		sev         Severity
		errs, stops bool
	}{{Info, false, false}, {Review, false, false}, {Warning, false, true}, {Error, true, true}} {
		fs := []Finding{{ID: "x", Severity: c.sev}}
		assert.Equal(t, c.errs, Errs(fs), "%v: Errs", c.sev)
		assert.Equal(t, c.stops, Stops(fs), "%v: Stops", c.sev)
	}
}

// TestPaperTint: a print output whose paper is not white gets its paper
// painted over the bleed box, a tint of ink on every page — worth a
// warning (common practice: a press proof for tints); white paper and
// screen outputs get none.
func TestPaperTint(t *testing.T) {
	got := prepare(t, specText("", "palette: {paper: \"#fbfaf7\"}\n"))
	f, ok := has(got, IDPaperTint, "", 0)
	if assert.True(t, ok, "paper tint finding") {
		assert.Equal(t, Warning, f.Severity, "paper tint severity")
		assert.Contains(t, f.Message, "#fbfaf7", "paper tint message")
		assert.NotEmpty(t, f.At, "paper tint place")
	}
	_, ok = has(prepare(t, specText("", "")), IDPaperTint, "", 0)
	assert.False(t, ok, "white paper reported as a tint")
}
