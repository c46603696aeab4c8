package production

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
)

// demoJob loads a print spec over the demo's data (the 60 most used
// terms on A5 pages), written into a fresh folder; extra is added at the
// top level of the spec.
func demoJob(t testing.TB, extra string) *feature.Job {
	t.Helper()
	data, err := filepath.Abs("../../examples/quillmere/data")
	require.NoError(t, err)
	spec := `title: Production test
date: 2026-01-15
data: {counts: ` + filepath.Join(data, "counts.csv") + `, totals: ` + filepath.Join(data, "totals.csv") + `}
years: {from: 1868, to: 2025}
terms: {top: 60}
scale: {values: own-peak}
outputs:
  print:
    kind: print
    trim: A5
    columns: 4
    slug-line: true
    proofs: 40
` + extra
	return loadSpec(t, spec)
}

// loadSpec writes spec into a fresh folder and loads it.
func loadSpec(t testing.TB, spec string) *feature.Job {
	t.Helper()
	path := filepath.Join(t.TempDir(), "spec.yaml")
	require.NoError(t, os.WriteFile(path, []byte(spec), 0o644))
	j, err := feature.Load(path)
	require.NoError(t, err)
	return j
}
