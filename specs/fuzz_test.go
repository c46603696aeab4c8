package specs

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"
)

// FuzzParse: any text is a spec or an error with a place; never a panic
// or a hang. Seeds are the example and test specs of the project.
func FuzzParse(f *testing.F) {
	for _, p := range []string{"../examples/quillmere/feature.yaml"} {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte("title: T\ndata: {counts: c.csv, totals: t.csv}\nyears: {from: 1900, to: 1905}\noutputs: {print: {kind: print, trim: A5}, web: {kind: screen, trim: 1200px}}\ninserts:\n  a: {output: print, size: 80mm x 45mm, terms: [w]}\n"))
	f.Add([]byte("a: &x [1, *x]\n"))
	f.Add([]byte("title: [\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Parse(filepath.Join("dir", "spec.yaml"), data)
		if err != nil {
			require.NotEmpty(t, err.Error(), "an empty error message")
			return
		}
		require.NotNil(t, s, "no spec and no error")
	})
}
