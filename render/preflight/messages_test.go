package preflight

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/layout"
	"sheaf/layout/fonts"
	"sheaf/palette"
	"sheaf/render/page"
	"sheaf/render/tooltest"
	"sheaf/specs"
)

// The messages checked here are the ones README's Preflight table and
// `sheaf check` print; the numbers in them come from the spec (the
// floors are common practice, testdata/print-facts.md "Rules, type,
// ink") or are set by the test itself.

// prepareInput loads text with the test data (testdata/README.md) and
// returns the prepared Input, for tests that change one part of it.
func prepareInput(t *testing.T, text string) Input {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []string{"counts.csv", "totals.csv"} {
		b, err := os.ReadFile(filepath.Join("testdata", f))
		require.NoError(t, err)
		require.NoError(t, os.WriteFile(filepath.Join(dir, f), b, 0o644))
	}
	path := filepath.Join(dir, "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(text), 0o644))
	in, err := PrepareForTest(path)
	require.NoError(t, err)
	return in
}

func check(t *testing.T, in Input) []Finding {
	t.Helper()
	fs, err := Check(in)
	require.NoError(t, err)
	return fs
}

// only returns the findings with id.
func only(fs []Finding, id string) []Finding {
	var out []Finding
	for _, f := range fs {
		if f.ID == id {
			out = append(out, f)
		}
	}
	return out
}

// TestSeverityText: the names JSON carries (`check --json`), both ways;
// README's Preflight table lists these four.
func TestSeverityText(t *testing.T) {
	for _, tt := range []struct {
		sev  Severity
		name string
	}{{Info, "info"}, {Review, "review"}, {Warning, "warning"}, {Error, "error"}} {
		b, err := json.Marshal(Finding{ID: "x", Severity: tt.sev})
		require.NoError(t, err)
		assert.Contains(t, string(b), `"severity":"`+tt.name+`"`)
		var f Finding
		require.NoError(t, json.Unmarshal(b, &f))
		assert.Equal(t, tt.sev, f.Severity, "round trip of %s", tt.name)
	}
	assert.Equal(t, "Severity(7)", Severity(7).String())
	var s Severity
	assert.EqualError(t, s.UnmarshalText([]byte("fatal")), `preflight: unknown severity "fatal"`)
}

// TestCheckNeedsItsInput: a half-prepared output is the caller's bug,
// said plainly, not a panic.
func TestCheckNeedsItsInput(t *testing.T) {
	_, err := Check(Input{})
	assert.EqualError(t, err, "preflight: Check needs a spec, an output, a plan, data and fonts")
}

// TestFindingWhere: the place column of `sheaf check` and the one-line
// form with the spec position.
func TestFindingWhere(t *testing.T) {
	f := Finding{ID: IDSpike, Severity: Review, Output: "print", Page: 3, Term: "flash", Year: 1902,
		At: "spec.yaml:4:2", Message: "m"}
	assert.Equal(t, `print p. 3 "flash" 1902`, f.Where())
	assert.Equal(t, `review spike print p. 3 "flash" 1902: m (spec.yaml:4:2)`, f.String())
	assert.Equal(t, "print", Finding{Output: "print"}.Where())
}

// TestLayoutWarnings: the layout's warnings pass through with their spec
// position; those about type sizes and the line are left to the
// floors' own findings, so nothing is said twice.
func TestLayoutWarnings(t *testing.T) {
	in := prepareInput(t, specText("", ""))
	in.Plan.Warnings = append(in.Plan.Warnings,
		layout.Warning{Key: "bleed", Pos: specs.Pos{File: "spec.yaml", Line: 9, Col: 5}, Message: "bleed is wider than the slug"},
		layout.Warning{Key: "gutter", Message: "no position"},
		layout.Warning{Key: "type.label", Pos: specs.Pos{File: "spec.yaml", Line: 11, Col: 12}, Message: "said by type-floor"},
		layout.Warning{Key: "line", Message: "said by line-floor"})
	got := only(check(t, in), IDLayout)
	require.Len(t, got, 2, list(got))
	assert.Equal(t, Finding{ID: IDLayout, Severity: Warning, Output: "print", At: "spec.yaml:9:5", Message: "bleed is wider than the slug"}, got[0])
	assert.Equal(t, Finding{ID: IDLayout, Severity: Warning, Output: "print", Message: "no position"}, got[1])
}

// TestLabelBandRefused: the layout's note that labels could not wrap (no
// room for a taller label band; render/feature) is no fault — the labels
// are set as before — so it is an info under label-wrapped, not a layout
// warning that would stop a strict build.
func TestLabelBandRefused(t *testing.T) {
	in := prepareInput(t, specText("", ""))
	in.Plan.Warnings = append(in.Plan.Warnings,
		layout.Warning{Key: "label-lines", Pos: specs.Pos{File: "spec.yaml", Line: 12, Col: 5}, Message: "labels that would wrap onto 2 lines are shrunk on one instead"})
	fs := check(t, in)
	assert.Empty(t, only(fs, IDLayout), list(fs))
	got := only(fs, IDLabelWrap)
	require.Len(t, got, 1, list(fs))
	assert.Equal(t, Finding{ID: IDLabelWrap, Severity: Info, Output: "print", At: "spec.yaml:12:5", Message: "labels that would wrap onto 2 lines are shrunk on one instead"}, got[0])
}

// TestLabelFindings: each way a label was fitted (page.Label) and what
// preflight says about it, with its page and term. The print label size
// of specText's output is the default; floors as above.
func TestLabelFindings(t *testing.T) {
	base := prepareInput(t, specText("", ""))
	size := base.Output.Type.Label.Pt()
	tests := []struct {
		name  string
		label page.Label
		want  map[string]string // id → message
	}{
		{"fits", page.Label{Size: size}, map[string]string{}},
		{"shrunk", page.Label{Size: 5.5, Shrunk: true},
			map[string]string{IDLabelShrunk: "set at 5.5 pt instead of " + num(size) + " pt to fit its panel"}},
		{"shrunk to match its row", page.Label{Size: 5.5, Shrunk: true, ForRow: true},
			map[string]string{IDLabelShrunk: "set at 5.5 pt instead of " + num(size) + " pt to match the smallest label of its row"}},
		{"shrunk, no peak", page.Label{Size: 5.5, Shrunk: true, NoPeak: true},
			map[string]string{IDLabelShrunk: "set at 5.5 pt instead of " + num(size) + " pt to fit its panel, without its peak year (the dot marks the peak)"}},
		{"no peak", page.Label{Size: size, NoPeak: true},
			map[string]string{IDLabelShrunk: "fits its panel without its peak year beside it (the dot marks the peak)"}},
		{"cut", page.Label{Size: 5, Truncated: true, Text: "boi…"},
			map[string]string{IDLabelCut: `does not fit its panel: cut to "boi…" at 5 pt`}},
		{"wrapped", page.Label{Size: size, Lines: []string{"boiler", "house"}},
			map[string]string{IDLabelWrap: `set on 2 lines to fit its panel: "boiler / house"`}},
		{"wrapped and shrunk", page.Label{Size: 5.5, Shrunk: true, Lines: []string{"boiler", "house"}},
			map[string]string{IDLabelWrap: `set on 2 lines to fit its panel: "boiler / house"`,
				IDLabelShrunk: "set at 5.5 pt instead of " + num(size) + " pt to fit its panel"}},
		{"shrunk below the floor", page.Label{Size: 4.5, Shrunk: true},
			map[string]string{IDLabelShrunk: "set at 4.5 pt instead of " + num(size) + " pt to fit its panel",
				IDTypeFloor: "label shrunk to 4.5 pt, below the 5 pt floor"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := prepareInput(t, specText("", ""))
			l := tt.label
			l.Item, l.Term = 0, "boiler"
			in.Labels = []page.Label{l}
			fs := check(t, in)
			for _, id := range []string{IDLabelShrunk, IDLabelCut, IDTypeFloor, IDLabelWrap} {
				got := only(fs, id)
				msg, want := tt.want[id]
				if !want {
					assert.Empty(t, got, id)
					continue
				}
				require.Len(t, got, 1, id)
				assert.Equal(t, msg, got[0].Message, id)
				assert.Equal(t, "boiler", got[0].Term, id)
				assert.Equal(t, 1, got[0].Page, "boiler is on the first page")
			}
		})
	}
}

// num writes a size in points as the checker does for a print output.
func num(pt float64) string {
	c := checker{in: Input{Output: &specs.Output{Kind: specs.Print}}}
	return strings.TrimSuffix(c.units(pt), " pt")
}

// TestScreenFloorInPixels: a screen output's floor is 10 px (common
// practice for figure text, README's Preflight table) and its messages
// speak pixels, 96 per inch (CSS Values and Units 3: 1 px = 0.75 pt).
func TestScreenFloorInPixels(t *testing.T) {
	text := strings.Replace(specText("", ""), "    kind: print\n    trim: A5\n    columns: 2\n",
		"    kind: screen\n    trim: 600px\n    columns: 2\n    type: {label: 8px}\n", 1)
	fs := check(t, prepareInput(t, text))
	got := only(fs, IDTypeFloor)
	require.Len(t, got, 1, list(fs))
	assert.Equal(t, "type.label is 8 px, below the 10 px floor; it may not be legible", got[0].Message)
	assert.True(t, strings.HasSuffix(got[0].At, "spec.yaml:11:12"), got[0].At)
	assert.Empty(t, only(fs, IDLineFloor), "screens have no rule floor")
	assert.Empty(t, only(fs, IDRGB), "the printing-condition note is for print")
}

// TestGlyphMissingInPlacedText: a character the font lacks in placed
// text (here the page's first line, set by the test) is reported once,
// with the text around it cut to 40 characters. U+2E3B (THREE-EM DASH,
// Unicode 7) is not in DejaVu Sans Condensed, the built-in face (the test
// checks that first with the font's cmap).
func TestGlyphMissingInPlacedText(t *testing.T) {
	line := "A long first line with a three-em dash ⸻ and ⸻ more words after it"
	in := prepareInput(t, specText("", ""))
	require.NotEmpty(t, in.Plan.Pages[0].Text)
	pt := &in.Plan.Pages[0].Text[0]
	pt.Text = line
	require.Zero(t, in.Fonts.Font(pt.Style).SFNT.GlyphIndex('⸻'), "the face lacks U+2E3B")
	var got []Finding
	for _, f := range only(check(t, in), IDGlyph) {
		if strings.Contains(f.Message, "U+2E3B") {
			got = append(got, f)
		}
	}
	require.Len(t, got, 1, "said once per face, however often it is drawn")
	f := got[0]
	assert.Equal(t, Error, f.Severity)
	assert.Equal(t, 1, f.Page)
	assert.Empty(t, f.Term)
	// clip keeps 39 characters and an ellipsis.
	want := "'⸻' (U+2E3B) is not in " + in.Fonts.Name(pt.Style) + " (" + pt.Style.String() + "); it would print as an empty box, in \"" + string([]rune(line)[:39]) + "…\""
	assert.Equal(t, want, f.Message)
}

// TestPaletteVerdicts: the palette report's verdict and its findings
// (palette.Report, as `sheaf palette` prints it) become preflight's,
// gamut under its own id, a year only where the finding names one.
func TestPaletteVerdicts(t *testing.T) {
	tests := []struct {
		name    string
		finds   []palette.Finding
		verdict string
		want    []Finding
	}{
		{"passes", nil, "palette S passes its checks", nil},
		{"warns", []palette.Finding{
			{Check: palette.CheckGamut, Label: "1903", Year: 1903, Severity: palette.Warn, Message: "colour is outside sRGB"},
			{Check: palette.CheckStep, Year: math.NaN(), Severity: palette.Warn, Message: "steps too small"},
			{Check: palette.CheckLightness, Year: 1900, Severity: palette.Warn, Message: "whole scale"}, // no label: about the whole scale
			{Check: palette.CheckSize, Year: math.NaN(), Severity: palette.Info, Message: "for the record"},
		}, "palette S fails no check but has 3 warning(s); 4 distinguishable classes at the line width, the key labels 5 eras",
			[]Finding{
				{ID: IDGamut, Severity: Warning, Year: 1903, Message: "gamut: colour is outside sRGB"},
				{ID: IDPalette, Severity: Warning, Message: "step: steps too small"},
				{ID: IDPalette, Severity: Warning, Message: "lightness: whole scale"},
			}},
		{"fails", []palette.Finding{{Check: palette.CheckSpan, Year: math.NaN(), Severity: palette.Fail, Message: "span too small"}},
			"palette S fails a check (run sheaf palette for the table)",
			[]Finding{{ID: IDPalette, Severity: Warning, Message: "span: span too small"}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in := prepareInput(t, specText("", ""))
			in.Palette = &palette.Report{Scale: "S", Classes: 4, KeyEras: 5, Findings: tt.finds}
			in.Press = nil
			fs := only(check(t, in), IDPalette)
			fs = append(fs, only(check(t, in), IDGamut)...)
			var verdicts, rest []Finding
			for _, f := range fs {
				if f.Severity == Info {
					verdicts = append(verdicts, f)
					continue
				}
				f.Output, f.At = "", ""
				rest = append(rest, f)
			}
			require.Len(t, verdicts, 1)
			assert.Equal(t, tt.verdict, verdicts[0].Message)
			assert.ElementsMatch(t, tt.want, rest)
		})
	}
}

// TestPressPaletteChecks: the palette checks redone on the colours as
// Ghostscript's coated CMYK profile prints them (default_cmyk.icc,
// Debian ghostscript), for a stepped (eras) palette. A span threshold
// no palette can meet (ΔE00 200 first to last, the loader's maximum; CIEDE2000 between black
// and white is 100, Sharma et al. 2005) must fail on press too, with the
// press position.
func TestPressPaletteChecks(t *testing.T) {
	profile := tooltest.ICCProfile(t, "default_cmyk.icc")
	text := specText("    press: {profile: "+profile+"}\n",
		"palette: {eras: [1902, 1904], checks: {min-span: 200}}\n")
	fs := check(t, prepareInput(t, text))
	got := only(fs, IDPressPalette)
	require.NotEmpty(t, got, list(fs))
	var span *Finding
	for i := range got {
		if strings.HasPrefix(got[i].Message, "on press, span: ") {
			span = &got[i]
		}
	}
	require.NotNil(t, span, list(got))
	assert.Equal(t, Warning, span.Severity)
	assert.True(t, strings.HasSuffix(span.At, "spec.yaml:11:5"), "at the output's press key: %s", span.At)
}

// TestYearRanges: the compact year lists in press messages.
func TestYearRanges(t *testing.T) {
	for _, tt := range []struct {
		years []int
		want  string
	}{
		{[]int{1903}, "year 1903"},
		{[]int{1868, 1869, 1870, 1871, 1903, 1990, 1991}, "years 1868–1871, 1903, 1990–1991"},
		{[]int{1900, 1902}, "years 1900, 1902"},
	} {
		assert.Equal(t, tt.want, yearRanges(tt.years))
	}
}

// TestGlyphMissingInEditorsWords: the key's caption (the spec's own or its
// language's), the periods' names and the annotations' text are drawn on
// the pages too, so a character the face lacks in any of them is reported
// (each once, naming the text). The characters are Unicode 7's TWO-EM and
// THREE-EM DASH and Unicode 7's DOUBLE HYPHEN; the test checks each
// is missing from the built-in face's cmap before relying on it.
func TestGlyphMissingInEditorsWords(t *testing.T) {
	in := prepareInput(t, specText("", ""))
	tests := []struct {
		name  string
		r     rune
		style fonts.Style
		set   func(text string)
	}{
		{"key caption", '⸺', fonts.Bold, func(s string) { in.Spec.Text.KeyTitle = s }},
		{"period name", '⸻', fonts.Regular, func(s string) {
			in.Spec.Periods = append(in.Spec.Periods, specs.Period{From: 1900, To: 1910, Label: s})
		}},
		{"annotation", '⹀', fonts.Regular, func(s string) {
			in.Spec.Annotations = append(in.Spec.Annotations, specs.Annotation{Term: in.Data.Series[0].Term, From: 1900, To: 1900, Text: s})
		}},
	}
	for _, tt := range tests {
		require.Zero(t, in.Fonts.Font(tt.style).SFNT.GlyphIndex(tt.r), "%s: the face lacks %U", tt.name, tt.r)
		tt.set(tt.name + " " + string(tt.r))
	}
	got := only(check(t, in), IDGlyph)
	for _, tt := range tests {
		n := 0
		for _, f := range got {
			if strings.Contains(f.Message, fmt.Sprintf("%U", tt.r)) {
				n++
				assert.Contains(t, f.Message, tt.name, "%s: the finding quotes the text", tt.name)
				assert.Equal(t, Error, f.Severity, tt.name)
			}
		}
		assert.Equal(t, 1, n, "%s: one finding for %U", tt.name, tt.r)
	}
}
