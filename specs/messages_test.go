package specs

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestIssue20SpecMessages: an empty terms.list is refused at its line
// (it silently meant every term); a long list with no alias is not blamed
// on aliases (issue 20; this project's own rules).
func TestIssue20SpecMessages(t *testing.T) {
	base := "title: T\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1900, to: 1905}\noutputs: {print: {kind: print}}\n"
	long := "terms:\n  exclude:\n" + strings.Repeat("    - w\n", maxNodes+10)
	tests := []struct {
		name, extra, at, want, not string
	}{
		{"empty list", "terms:\n  list: []\n", "s.yaml:6:9", "terms.list is empty", ""},
		{"long plain list", long, "s.yaml:", "the spec has more than 200000 values", "alias"},
		{"insert twice", "inserts:\n  a: {output: print, size: 80mm x 45mm, terms: [w]}\n  a: {output: print, size: 80mm x 45mm, terms: [v]}\n", "s.yaml:7:3", `insert "a" is given twice (first at line 6)`, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse("s.yaml", []byte(base+tt.extra))
			require.Error(t, err)
			require.Contains(t, err.Error(), tt.at)
			require.Contains(t, err.Error(), tt.want)
			if tt.not != "" {
				require.NotContains(t, err.Error(), tt.not)
			}
		})
	}
}

// TestOutputNamedInserts: with inserts in the spec, an output may not be
// named "inserts" (its folder): an insert named page-001 would overwrite
// its first page (issue 20). The error is at the output's line.
func TestOutputNamedInserts(t *testing.T) {
	spec := "title: T\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1900, to: 1905}\noutputs:\n  inserts: {kind: print}\ninserts:\n  page-001: {output: inserts, size: 80mm x 45mm, terms: [w]}\n"
	_, err := Parse("s.yaml", []byte(spec))
	require.ErrorContains(t, err, `s.yaml:5:3: output "inserts": the spec has inserts`)
	_, err = Parse("s.yaml", []byte(spec[:strings.Index(spec, "inserts:\n  page")]))
	require.NoError(t, err, "an output named inserts without inserts is fine")
}
