package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/specs/series"
)

// termsJob writes a tiny data set whose statistics are worked by hand.
func termsJob(t *testing.T) string {
	dir := t.TempDir()
	require.NoError(t, os.MkdirAll(filepath.Join(dir, "data"), 0o755))
	// Totals: 1000 words a year, 2000 in 2003.
	totals := "year,total\n2000,1000\n2001,1000\n2002,1000\n2003,2000\n"
	// alpha: 10, 30, 20, 40 → total 100; rates .01 .03 .02 .02: peak 2001;
	//        median of 10 20 30 40 = (20+30)/2 = 25.
	// beta:  5, 0, 7 (2002 absent) → present 5 and 7 (a zero is not
	//        present): median 6, 2 years; rates .005, .0035: peak 2000.
	// gamma: 1 in 2003 only → median 1, 1 year, peak 2003.
	counts := "term,year,count\nalpha,2000,10\nalpha,2001,30\nalpha,2002,20\nalpha,2003,40\n" +
		"beta,2000,5\nbeta,2001,0\nbeta,2003,7\ngamma,2003,1\n"
	require.NoError(t, os.WriteFile(filepath.Join(dir, "data", "totals.csv"), []byte(totals), 0o644))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "data", "counts.csv"), []byte(counts), 0o644))
	spec := `title: Terms test
data: {counts: data/counts.csv, totals: data/totals.csv}
years: {from: 2000, to: 2003}
terms: {top: 2}
outputs:
  print: {kind: print}
`
	path := filepath.Join(dir, "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(spec), 0o644))
	return path
}

func termsJSON(t *testing.T, args ...string) []series.TermStats {
	t.Helper()
	var o, e bytes.Buffer
	require.Equal(t, exitOK, run(append([]string{"terms"}, args...), &o, &e), e.String())
	var got []series.TermStats
	require.NoError(t, json.Unmarshal(o.Bytes(), &got), o.String())
	return got
}

// TestTerms: the statistics, worked by hand; the median of an even count
// is the mean of the two middle values (NIST/SEMATECH e-Handbook of
// Statistical Methods, §1.3.5.1, "Measures of Location").
func TestTerms(t *testing.T) {
	spec := termsJob(t)
	got := termsJSON(t, spec, "--json", "--sort", "term")
	words := 5000.0 // all words over the span
	want := []series.TermStats{
		{Term: "alpha", Total: 100, Share: 100 / words, PeakYear: 2001, Median: 25, Years: 4, Selected: true},
		{Term: "beta", Total: 12, Share: 12 / words, PeakYear: 2000, Median: 6, Years: 2, Selected: true},
		{Term: "gamma", Total: 1, Share: 1 / words, PeakYear: 2003, Median: 1, Years: 1, Selected: false}, // top: 2 leaves it out
	}
	assert.Equal(t, want, got)

	names := func(ts []series.TermStats) []string {
		var out []string
		for _, x := range ts {
			out = append(out, x.Term)
		}
		return out
	}
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"--sort", "share"}, []string{"alpha", "beta", "gamma"}},
		{[]string{"--sort", "peak"}, []string{"gamma", "alpha", "beta"}},
		{[]string{"--sort", "peak", "--reverse"}, []string{"beta", "alpha", "gamma"}},
		{[]string{"--sort", "median"}, []string{"alpha", "beta", "gamma"}},
		{[]string{"--sort", "selected"}, []string{"alpha", "beta", "gamma"}},
		{[]string{"--match", "MM"}, []string{"gamma"}},
		{[]string{"--pattern", "^(a|b)"}, []string{"alpha", "beta"}},
		{[]string{"--selected", "--sort", "years", "--reverse"}, []string{"beta", "alpha"}},
		{[]string{"--limit", "1"}, []string{"alpha"}},
		{[]string{"--match", "zzz"}, nil},
	} {
		assert.Equal(t, c.want, names(termsJSON(t, append([]string{spec, "--json"}, c.args...)...)), "%v", c.args)
	}

	// The table: a header and one row per term.
	var o, e bytes.Buffer
	require.Equal(t, exitOK, run([]string{"terms", spec}, &o, &e))
	lines := strings.Split(strings.TrimRight(o.String(), "\n"), "\n")
	require.Len(t, lines, 4)
	assert.Regexp(t, `^\s*term\s+total\s+per million\s+peak\s+median\s+years\s+selected$`, lines[0])
	assert.Regexp(t, `^\s*alpha\s+100\s+20000\.00\s+2001\s+25\s+4\s+yes$`, lines[1])
	assert.Contains(t, e.String(), "3 of 3 terms shown; the spec selects 2")

	// Bad flags are usage errors.
	for _, bad := range [][]string{{"--sort", "colour"}, {"--pattern", "("}, {"--limit", "-1"}} {
		e.Reset()
		assert.Equal(t, exitBadInput, run(append([]string{"terms", spec}, bad...), &o, &e), "%v", bad)
		assert.Contains(t, e.String(), bad[0])
	}
}
