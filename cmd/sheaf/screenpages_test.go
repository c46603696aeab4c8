package main

// Screen outputs reused per page (issue 15, item 7): a paged screen
// output redraws only the pages whose panels changed, and the PNG bands
// of a page that did not change are the last build's.

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/production"
)

func TestScreenPagesReused(t *testing.T) {
	spec := newJob(t, jobSpec(`  web:
    kind: screen
    trim: 900px x 1200px
    panel-files: true
order: alphabetical
`))
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet")
	m := loadManifest(t, out)
	web := m.Output("web")
	require.Greater(t, len(web.Pages), 2, "a paged web output")
	stat := func(name string) os.FileInfo {
		fi, err := os.Stat(filepath.Join(out, "web", name))
		require.NoError(t, err)
		return fi
	}
	before := map[string]os.FileInfo{}
	names := []string{"page-001.svg", "page-001.png", "page-001@2x.png", "page-002.svg", "page-002.png", "page-003.svg"}
	for _, n := range names {
		before[n] = stat(n)
	}
	old := snapshot(t, out)
	nudgeCount(t, spec, web.Pages[1].Terms[0]) // a term on web page 2
	buildInto(t, spec, out, "--quiet")
	r := loadChanges(t, out)
	var st production.OutputStats
	for _, w := range r.Work {
		if w.Output == "web" && w.Kind == "screen" {
			st = w
		}
	}
	assert.Greater(t, st.BandsReused, 0, "bands of unchanged pages reused: %+v", st)
	assert.Greater(t, st.BandsDrawn, 0)
	for _, n := range []string{"page-001.svg", "page-003.svg"} {
		assert.True(t, os.SameFile(before[n], stat(n)), "%s is the last build's file", n)
	}
	now := snapshot(t, out)
	for _, n := range []string{"web/page-001.png", "web/page-001@2x.png", "web/page-003.png"} {
		assert.Equal(t, old[n], now[n], "%s: made of the last build's bands, the same bytes", n)
	}
	for _, n := range []string{"page-002.svg", "page-002.png"} {
		assert.False(t, os.SameFile(before[n], stat(n)), "%s was drawn again", n)
	}
	// The same bytes as a clean full build.
	clean := filepath.Join(t.TempDir(), "clean")
	buildInto(t, spec, clean, "--quiet", "--full")
	skip := func(p string) bool { return p == production.ChangesJSON || p == production.ChangesText }
	sameTree(t, snapshot(t, clean), snapshot(t, out), skip)
}
