package production

import (
	"context"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
	"sheaf/specs"
)

// TestBuildLoadsFontsBesideData: Build loads a job's fonts while it reads
// the data (a job given without data), and still reports what it did
// before, in the same order: a data error before a font error, a font
// error at its place when the data is good; and a build that loaded them
// so draws the same files as one given a loaded job.
func TestBuildLoadsFontsBesideData(t *testing.T) {
	data, err := filepath.Abs("../../examples/quillmere/data")
	require.NoError(t, err)
	write := func(t *testing.T, counts, font string) *specs.Spec {
		dir := t.TempDir()
		spec := filepath.Join(dir, "spec.yaml")
		fonts := ""
		if font != "" {
			fonts = ", fonts: {regular: " + font + "}"
		}
		require.NoError(t, os.WriteFile(spec, []byte("title: T\ndate: 2026-01-15\ndata: {counts: "+counts+", totals: "+filepath.Join(data, "totals.csv")+
			"}\nyears: {from: 1868, to: 2025}\nterms: {top: 12}\noutputs: {print: {kind: print, trim: A5, columns: 3"+fonts+"}}\n"), 0o644))
		s, err := specs.Load(spec)
		require.NoError(t, err)
		return s
	}
	counts := filepath.Join(data, "counts.csv")
	build := func(s *specs.Spec, job *feature.Job) error {
		_, err := Build(context.Background(), job, Options{Dir: filepath.Join(s.Dir, "out"), NoProofs: true})
		return err
	}

	s := write(t, "missing.csv", "missing.ttf")
	err = build(s, &feature.Job{Spec: s})
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), "missing.csv", "the data's error comes first, as when data was read before fonts")
	assert.NotContains(t, err.Error(), "missing.ttf")

	s = write(t, counts, "missing.ttf")
	err = build(s, &feature.Job{Spec: s})
	require.Error(t, err)
	assert.True(t, specs.IsBadInput(err))
	assert.Contains(t, err.Error(), "fonts.regular", "the font's error at its place in the spec")
	assert.Contains(t, err.Error(), "missing.ttf")

	s = write(t, counts, "")
	require.NoError(t, build(s, &feature.Job{Spec: s}))
	loaded, err := feature.LoadData(s)
	require.NoError(t, err)
	other := filepath.Join(t.TempDir(), "out")
	_, err = Build(context.Background(), loaded, Options{Dir: other, NoProofs: true})
	require.NoError(t, err)
	for _, f := range []string{"print/print.pdf", ManifestFile, filepath.Join(CacheDir, "print", widthsFile)} {
		a, err := os.ReadFile(filepath.Join(s.Dir, "out", f))
		require.NoError(t, err)
		b, err := os.ReadFile(filepath.Join(other, f))
		require.NoError(t, err)
		assert.Equal(t, a, b, "%s: fonts loaded beside the data, or after", f)
	}
}
