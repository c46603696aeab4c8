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
