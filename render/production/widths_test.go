package production

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/feature"
)

// TestLentOutputWidths: `--only print` lays out the web's inserts without
// building the web, and keeps the widths it measured for them in the
// web's cache when that has none (so the next such build parses no face
// for them); a widths file the web's own build left is kept as it was,
// and a damaged one is replaced. This project's own rule (README, Speed).
func TestLentOutputWidths(t *testing.T) {
	date := time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC)
	spec := "  web:\n    kind: screen\n    trim: 1200px\n" +
		"inserts:\n" +
		"  screen: {output: web, size: 480px x 300px, terms: [telegraph, telephone]}\n"
	build := func(dir string, opts Options) {
		t.Helper()
		opts.Dir, opts.Date, opts.NoProofs = dir, date, true
		_, err := Build(context.Background(), demoJob(t, spec), opts) // a job a build, as the command has
		require.NoError(t, err)
	}
	dir := filepath.Join(t.TempDir(), "out")
	webWidths := filepath.Join(dir, CacheDir, "web", widthsFile)
	loads := func(what string) []byte {
		t.Helper()
		b, err := os.ReadFile(webWidths)
		require.NoError(t, err, what)
		j := demoJob(t, spec)
		fs, err := j.Fonts(j.Spec.Output("web"))
		require.NoError(t, err)
		f, err := os.Open(webWidths)
		require.NoError(t, err)
		defer f.Close()
		assert.NoError(t, fs.LoadWidths(f), "%s: the web's widths file does not load", what)
		return b
	}

	build(dir, Options{Only: "print"})
	first := loads("--only print into a fresh folder")
	build(dir, Options{Only: "print"})
	assert.Equal(t, first, loads("--only print again"), "the same build left other widths")

	build(dir, Options{})
	whole := loads("the whole build")
	assert.Greater(t, len(whole), len(first), "the web's own build measured no more than its insert")
	build(dir, Options{Only: "print"})
	assert.Equal(t, whole, loads("--only print after the whole build"), "the web's own widths were replaced")
	build(dir, Options{Only: "print", Full: true})
	assert.Equal(t, whole, loads("--only print --full after the whole build"), "the web's own widths were replaced")

	require.NoError(t, os.WriteFile(webWidths, []byte("damaged"), 0o644))
	build(dir, Options{Only: "print"})
	assert.Equal(t, first, loads("--only print over a damaged file"))
}

// TestSavedWidthsCoverDrawing: the widths a build saves (those asked
// before any page is drawn) are every width drawing all the pages asks
// for, so a rebuild that draws some pages measures nothing and parses no
// face for its measuring shaper. This project's own rule (README, Speed).
func TestSavedWidthsCoverDrawing(t *testing.T) {
	job := demoJob(t, "")
	dir := filepath.Join(t.TempDir(), "out")
	_, err := Build(context.Background(), job, Options{Dir: dir, Date: time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC), NoProofs: true, Only: "print"})
	require.NoError(t, err)
	saved, err := os.ReadFile(filepath.Join(dir, CacheDir, "print", widthsFile))
	require.NoError(t, err)
	fs, err := job.Fonts(job.Spec.Output("print"))
	require.NoError(t, err)
	var asked bytes.Buffer // every width asked in the build, drawing included
	require.NoError(t, fs.SaveWidths(&asked))
	assert.Equal(t, len(saved), asked.Len(), "drawing the pages asked widths the build did not save")
	assert.Equal(t, saved, asked.Bytes())
}

// TestReuseWidths: a job given the widths of the last build into a
// folder (as `check` is) reports the same as one that measures every
// width (the reference: the same job without them), found through a
// symbolic link to the folder as a build finds it; a folder that holds
// no build gives none.
func TestReuseWidths(t *testing.T) {
	spec := "  web:\n    kind: screen\n    trim: 1200px\n" +
		"inserts:\n" +
		"  screen: {output: web, size: 480px x 300px, terms: [telegraph, telephone]}\n"
	report := func(j *feature.Job) []byte {
		t.Helper()
		r, err := j.Summarize()
		require.NoError(t, err)
		b, err := json.Marshal(r)
		require.NoError(t, err)
		return bytes.ReplaceAll(b, []byte(j.Spec.Dir), []byte("SPEC")) // each job its own folder
	}
	want := report(demoJob(t, spec))
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	assert.Empty(t, ReuseWidths(demoJob(t, spec), dir), "no build yet")
	_, err := Build(context.Background(), demoJob(t, spec), Options{Dir: dir, Date: time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC), NoProofs: true, Only: "print"})
	require.NoError(t, err)
	link := filepath.Join(root, "link")
	require.NoError(t, os.Symlink(dir, link))
	for _, d := range []string{dir, link} {
		j := demoJob(t, spec)
		// The web's widths are those its insert asked in the print build.
		assert.Equal(t, []string{"print", "web"}, ReuseWidths(j, d), d)
		assert.Equal(t, string(want), string(report(j)), "%s: the report changed with the saved widths", d)
	}
	require.NoError(t, os.WriteFile(filepath.Join(dir, CacheDir, "print", widthsFile), []byte("damaged"), 0o644))
	assert.Equal(t, []string{"web"}, ReuseWidths(demoJob(t, spec), dir), "a damaged file gives nothing")
}
