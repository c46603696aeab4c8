package production

import (
	"context"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestOnlyDrawsItsInserts: `--only OUTPUT` draws the inserts that borrow
// OUTPUT and no other (a print build does not rasterize the web's
// inserts); an insert of another output keeps the last build's files and
// manifest entry, and into a fresh folder it is left out. This project's
// own rule (README, Inserts and Speed).
func TestOnlyDrawsItsInserts(t *testing.T) {
	job := demoJob(t, "  web:\n    kind: screen\n    trim: 1200px\n"+
		"inserts:\n"+
		"  column: {output: print, size: 60mm x 45mm, terms: [telegraph]}\n"+
		"  screen: {output: web, size: 480px x 300px, terms: [telegraph, telephone]}\n")
	date := time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC)
	build := func(dir string, opts Options) []string {
		var drawn []string
		opts.Dir, opts.Date, opts.NoProofs = dir, date, true
		opts.Hooks.BeforeDraw = func(unit string) error {
			drawn = append(drawn, unit)
			return nil
		}
		_, err := Build(context.Background(), job, opts)
		require.NoError(t, err)
		return drawn
	}
	insertFiles := func(dir string) (names []string, m *Manifest) {
		m, err := ReadManifest(dir)
		require.NoError(t, err)
		for _, f := range m.Files {
			if strings.HasPrefix(f.Path, "inserts/") {
				names = append(names, f.Path)
			}
		}
		return names, m
	}

	dir := filepath.Join(t.TempDir(), "out")
	drawn := build(dir, Options{})
	assert.Subset(t, drawn, []string{"insert column", "insert screen", "web"})
	before, m0 := insertFiles(dir)
	assert.Equal(t, []string{"inserts/column.pdf", "inserts/screen.png", "inserts/screen.svg", "inserts/screen@2x.png"}, before)

	drawn = build(dir, Options{Only: "print", Full: true})
	assert.Contains(t, drawn, "insert column")
	assert.NotContains(t, drawn, "insert screen", "--only print drew a web insert")
	after, m1 := insertFiles(dir)
	assert.Equal(t, before, after, "the web insert's files were not kept")
	require.NotNil(t, m1.Insert("screen"))
	assert.Equal(t, *m0.Insert("screen"), *m1.Insert("screen"))
	for _, f := range m0.FilesOf("", "screen") {
		if g := m1.File(f.Path); assert.NotNil(t, g, f.Path) {
			assert.Equal(t, f.SHA256, g.SHA256, f.Path)
		}
	}

	fresh := filepath.Join(t.TempDir(), "out")
	drawn = build(fresh, Options{Only: "print"})
	assert.False(t, slices.Contains(drawn, "insert screen"), "--only print drew a web insert")
	names, m2 := insertFiles(fresh)
	assert.Equal(t, []string{"inserts/column.pdf"}, names)
	assert.Nil(t, m2.Insert("screen"))
}
