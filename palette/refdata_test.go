package palette

import (
	"bufio"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// refRows reads a reference file from testdata: lines starting with # are
// the citation header, the first other line names the columns.
func refRows(t *testing.T, name string, sep string) []map[string]string {
	t.Helper()
	f, err := os.Open("testdata/" + name)
	require.NoError(t, err)
	defer f.Close()
	var cols []string
	var rows []map[string]string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.TrimSpace(line) == "" {
			continue
		}
		fields := strings.Split(line, sep)
		if cols == nil {
			cols = fields
			continue
		}
		row := map[string]string{}
		for i, c := range cols {
			if i < len(fields) {
				row[c] = fields[i]
			}
		}
		rows = append(rows, row)
	}
	require.NoError(t, sc.Err())
	require.False(t, len(rows) == 0, "%s: no rows", name)
	return rows
}

// num parses a decimal or a rational "p/q".
func num(t *testing.T, s string) float64 {
	t.Helper()
	if p, q, ok := strings.Cut(s, "/"); ok {
		return num(t, p) / num(t, q)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	require.NoError(t, err, "parse %q", s)
	return v
}

func mustHex(t testing.TB, s string) Color {
	t.Helper()
	c, err := ParseHex(s)
	require.NoError(t, err)
	return c
}
