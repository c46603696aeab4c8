package specs

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// bigSpec returns a valid spec padded with n comment-free notes, about
// width bytes each, so a fault placed after it sits deep in a long file.
func bigSpec(n, width int) string {
	var b strings.Builder
	b.WriteString("title: T\nnotes:\n")
	note := strings.Repeat("x", width)
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "  - %s\n", note)
	}
	return b.String()
}

// A syntax fault deep in a long spec is found at its own line, not at the
// line where yaml.v3 says the enclosing mapping began (line 1 or 2), and
// not by giving up on long files as the old prefix search did past 2,000
// lines.
func TestSyntaxErrorDeepInLongSpec(t *testing.T) {
	cases := []struct {
		name  string
		n     int
		fault string
		at    string
		want  string
	}{
		{"mapping in plain scalar", 5000, "dek: a: b\n", "5003:1", "mapping values are not allowed in this context"},
		{"bad indentation", 5000, "data:\n  counts: a\n totals: b\n", "5005:2", "did not find expected key"},
		{"unclosed flow list", 3000, "data: [a, b\nyears: 1\n", "3003:1", "did not find expected ',' or ']'"},
		{"tab indentation", 4000, "data:\n\tcounts: a.csv\n", "4004:1", "a tab is used for indentation"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("big.yaml", []byte(bigSpec(c.n, 20)+c.fault))
			var errs Errors
			require.True(t, errors.As(err, &errs), "want spec Errors, got %v", err)
			require.Len(t, errs, 1, "errors reported")
			require.Equal(t, c.at, fmt.Sprintf("%d:%d", errs[0].Pos.Line, errs[0].Pos.Col), "line:col of %q", errs[0].Msg)
			require.Contains(t, errs[0].Msg, c.want, "the syntax error message")
		})
	}
}

// BenchmarkSyntaxErrorLine measures finding the line of a syntax fault at
// the end of a 5 MB spec (issue: the old prefix search took 82 s on 4.8 MB).
func BenchmarkSyntaxErrorLine(b *testing.B) {
	text := []byte(bigSpec(5<<20/80, 74) + "dek: a: b\n")
	b.SetBytes(int64(len(text)))
	for b.Loop() {
		_, err := Parse("big.yaml", text)
		require.Error(b, err, "want an error")
	}
}
