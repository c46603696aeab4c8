package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
)

const bad = "../../testdata/bad/"

// TestCheckBadInput runs `sheaf check` on each file in testdata/bad and
// expects exit status 2, nothing on stdout, and on stderr exactly the
// listed problems, each at its file:line:col (counted by hand in the
// fixture; YAML 1.2 §5 and RFC 4180 lines, 1-based columns) with a
// message of this project's wording. No panic, no stack trace.
func TestCheckBadInput(t *testing.T) {
	tests := []struct {
		spec string
		want []string // "place: substring of the message", in order
	}{
		{"empty.yaml", []string{"empty.yaml:1:1: the spec is empty; it needs at least data, years and outputs"}},
		{"syntax.yaml", []string{"syntax.yaml:6:3: YAML syntax: did not find expected ',' or ']'"}},
		{"tab.yaml", []string{"tab.yaml:4:1: a tab is used for indentation; YAML needs spaces"}},
		{"types.yaml", []string{
			`types.yaml:3:77: data.fold-case must be true or false, not "sometimes"`,
			`types.yaml:4:15: years.from must be a whole number, not "nineteen hundred"`,
			`types.yaml:6:9: terms.list must be a list, not a mapping`,
			`types.yaml:10:14: outputs.print.columns must be a whole number, not "six"`,
			`types.yaml:11:13: outputs.print.facing must be a single value, not a list`,
		}},
		{"lengths.yaml", []string{
			"lengths.yaml:8:12: outputs.print.bleed must not be negative, not -3mm",
			"lengths.yaml:9:11: outputs.print.line must be greater than zero, not 0pt",
			"lengths.yaml:10:22: outputs.print.min-panel-width must be greater than zero, not 0mm",
			"lengths.yaml:11:19: outputs.print.type.label must be greater than zero, not -7pt",
		}},
		// A5 is 148 × 210 mm (ISO 216); 100 + 120 mm of margins is 220 mm.
		{"margins.yaml", []string{"margins.yaml:9:5: outputs.print: the top and bottom margins (220.0 mm together) leave no room on a 210.0 mm tall page"}},
		{"columns.yaml", []string{"columns.yaml:8:14: outputs.print.columns must be between 1 and 100, not 0"}},
		{"unit.yaml", []string{
			`unit.yaml:8:13: outputs.print.gutter: unknown unit "ems" in "2ems"; use mm, cm, in, pt, pc or px`,
			`unit.yaml:9:14: outputs.print.row-gap: "3" has no unit; write it with one, like 3mm or 3pt`,
		}},
		// The first list whose expansion passes the budget is l5 (9^6
		// leaves), on line 11, its anchor at column 5.
		{"alias-bomb.yaml", []string{"alias-bomb.yaml:11:5: the spec expands to too many values (YAML aliases that multiply)"}},
		{"unknown-key.yaml", []string{
			`unknown-key.yaml:8:5: unknown key "colums" in outputs.print; did you mean "columns"?`,
			`unknown-key.yaml:9:5: unknown key "trimm" in outputs.print; did you mean "trim"?`,
		}},
		{"one-column.yaml", []string{`one-column.csv:1:1: the header needs columns named term, year, count; it has "term"`}},
		{"no-data.yaml", []string{`no-data.yaml:4:3: data.counts: "missing/counts.csv" (resolved to ` + filepath.Join(bad, "missing/counts.csv") + ") does not exist"}},
		{"missing-term.yaml", []string{
			`missing-term.yaml:6:10: term "telegraf" is not in ../small/counts.csv; closest: "telegraph"`,
			`missing-term.yaml:6:28: term "Masstab" is not in ../small/counts.csv; closest: "Maßstab"`,
		}},
		{"bad-rows.yaml", []string{
			`bad-rows.csv:3:8: "boiler" has a second row for 1900`,
			`bad-rows.csv:4:16: count for "telegraph" in 1901: -5 is negative`,
			`bad-rows.csv:5:16: count for "telegraph" in 1902: "NaN" is not a finite number`,
			`bad-rows.csv:6:7: year 1899 is outside the span 1900–1905 set at ` + bad + `bad-rows.yaml:4:1`,
		}},
		{"", []string{": is a directory; give the spec's YAML file"}},
		{"no-such-spec.yaml", []string{"no-such-spec.yaml: spec file does not exist"}},
	}
	for _, tt := range tests {
		name := tt.spec
		if name == "" {
			name = "a directory"
		}
		t.Run(name, func(t *testing.T) {
			path := bad + tt.spec
			if tt.spec == "" {
				path = strings.TrimSuffix(bad, "/")
			}
			var out, errb bytes.Buffer
			code := run([]string{"check", path}, &out, &errb)
			assert.Equal(t, exitBadInput, code, "exit status")
			assert.Zero(t, out.Len(), "stdout: %s", out.String())
			stderr := errb.String()
			for _, trace := range []string{"panic", "goroutine ", "internal error", ".go:"} {
				assert.NotContains(t, stderr, trace, "stderr looks like a crash")
			}
			lines := strings.Split(strings.TrimRight(stderr, "\n"), "\n")
			assert.Len(t, lines, len(tt.want), "problems:\n%s", stderr)
			for i, w := range tt.want {
				if i >= len(lines) {
					break
				}
				// Every problem starts with the file as the user can open
				// it: the spec path as given, or a data path resolved
				// against the spec's folder.
				assert.True(t, strings.HasPrefix(lines[i], strings.TrimSuffix(bad, "/")), "problem %d starts with the file: %s", i+1, lines[i])
				assert.Contains(t, lines[i], w, "problem %d", i+1)
			}
		})
	}
}

func TestCheckSmall(t *testing.T) {
	var out, errb bytes.Buffer
	require.Equal(t, exitOK, run([]string{"check", "../../testdata/small/spec.yaml"}, &out, &errb), errb.String())
	// A5 is 148 × 210 mm (ISO 216); default bleed 3 mm (common practice).
	for _, w := range []string{
		`"A small test feature"`,
		"3 selected of 3 in the data (8 rows), order listed",
		"1900–1905 (6 years; gaps: 1903)",
		"output print (print): 148.0 × 210.0 mm + 3.0 mm bleed",
	} {
		assert.Contains(t, out.String(), w, "summary")
	}

	out.Reset()
	require.Equal(t, exitOK, run([]string{"check", "../../testdata/small/spec.yaml", "--json"}, &out, &errb), errb.String())
	var rep feature.Report
	require.NoError(t, json.Unmarshal(out.Bytes(), &rep), "--json output is JSON")
	// A5 in points, 419.528 × 595.276 (print-facts.md, ISO 216); the
	// shared top is not asked for, so y_max is the largest own peak,
	// boiler's 500 per million (50/100000×1e6, hand-computed).
	assert.Equal(t, 3, rep.Terms.Selected, "terms selected")
	assert.Equal(t, []int{1903}, rep.Years.Gaps, "gaps")
	assert.Equal(t, 500.0, rep.Scale.YMax, "y_max: boiler's own peak, per million")
	require.Len(t, rep.Outputs, 1)
	assert.InDelta(t, 419.528, rep.Outputs[0].TrimPt[0], 0.0005, "A5 width, pt (ISO 216)")
	assert.InDelta(t, 595.276, rep.Outputs[0].TrimPt[1], 0.0005, "A5 height, pt (ISO 216)")
}

func TestCheckUsage(t *testing.T) {
	for _, args := range [][]string{{"check"}, {"check", "a.yaml", "b.yaml"}, {"check", "--no-such-flag", "a.yaml"}} {
		var out, errb bytes.Buffer
		assert.Equal(t, exitBadInput, run(args, &out, &errb), "%v", args)
	}
}

// TestCheckReadsLastBuildWidths: check reads the text widths the last
// build saved (in out/ beside the spec, or the folder --out names, as
// build takes it) and reports byte for byte what it reports without
// them (the reference: check before any build). That it reads them at
// all shows with a saved width made wrong on purpose (checksum redone):
// the label it belongs to no longer fits.
func TestCheckReadsLastBuildWidths(t *testing.T) {
	dir := t.TempDir()
	for _, f := range []string{"spec.yaml", "counts.csv", "totals.csv"} {
		b, err := os.ReadFile(filepath.Join("../../testdata/small", f))
		require.NoError(t, err)
		require.NoError(t, os.WriteFile(filepath.Join(dir, f), b, 0o644))
	}
	spec := filepath.Join(dir, "spec.yaml")
	check := func(extra ...string) string {
		t.Helper()
		var out, errb bytes.Buffer
		code := run(append([]string{"check", spec}, extra...), &out, &errb)
		return fmt.Sprintf("exit %d\n%s\n--- stderr\n%s", code, out.String(), errb.String())
	}
	other := filepath.Join(t.TempDir(), "elsewhere")
	text, js := check(), check("--json")
	textOther, jsOther := check("--out", other), check("--json", "--out", other)
	require.Equal(t, text, textOther)
	require.Equal(t, js, jsOther)
	for _, args := range [][]string{{"build", spec, "--quiet"}, {"build", spec, "--out", other, "--quiet"}} {
		var out, errb bytes.Buffer
		require.Equal(t, exitOK, run(args, &out, &errb), errb.String())
	}
	widths := filepath.Join(dir, "out", ".cache", "print", "text-widths")
	require.FileExists(t, widths)
	require.FileExists(t, filepath.Join(other, ".cache", "print", "text-widths"))
	assert.Equal(t, text, check(), "with out/'s widths")
	assert.Equal(t, js, check("--json"), "with out/'s widths")
	assert.Equal(t, text, check("--out", other), "with --out's widths")
	assert.Equal(t, js, check("--json", "--out", other), "with --out's widths")

	// "telegraph" in the file: its length (a uvarint) and bytes follow
	// its width (float64, little-endian); the file ends in the SHA-256
	// of the rest (fonts.Set.SaveWidths).
	b, err := os.ReadFile(widths)
	require.NoError(t, err)
	body := b[:len(b)-sha256.Size]
	n := 0
	for i := 0; ; {
		j := bytes.Index(body[i:], []byte("\x09telegraph"))
		if j < 0 {
			break
		}
		at := i + j - 8
		binary.LittleEndian.PutUint64(body[at:], math.Float64bits(1000))
		n++
		i += j + 1
	}
	require.Positive(t, n, "telegraph's width is saved")
	sum := sha256.Sum256(body)
	require.NoError(t, os.WriteFile(widths, append(body, sum[:]...), 0o644))
	wrong := check()
	assert.NotEqual(t, text, wrong, "check did not read the saved widths")
	assert.Contains(t, wrong, "telegraph")
	assert.Equal(t, text, check("--out", other), "another folder's widths are its own")
}
