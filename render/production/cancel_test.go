package production

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// tree lists the files under dir with their contents.
func tree(t *testing.T, dir string) map[string]string {
	t.Helper()
	out := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		out[p] = string(b)
		return err
	})
	require.NoError(t, err)
	return out
}

// TestCancelDuringTallPNG: a build cancelled (Ctrl-C in the CLI) once the
// 2× PNG of a scrolling web page has begun stops with the context's
// error, leaves the output folder exactly as the last build left it and
// removes its stage. How fast it stops is measured, never asserted: the
// rasterizer drops every path after the cancel (raster's
// TestDrawStopsWhenCancelled) and the PNG encoder stops at its next write.
func TestCancelDuringTallPNG(t *testing.T) {
	job := demoJob(t, "  web:\n    kind: screen\n    trim: 1200px\n")
	dir := filepath.Join(t.TempDir(), "out")
	date := time.Date(2026, 1, 15, 0, 0, 0, 0, time.UTC)
	_, err := Build(context.Background(), job, Options{Dir: dir, Date: date, NoProofs: true})
	require.NoError(t, err)
	before := tree(t, dir)

	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	began := make(chan struct{})
	var once sync.Once
	cancelled := make(chan time.Time, 1)
	go func() {
		<-began
		cancelled <- time.Now()
		cancel() // while the tall PNG is being drawn
	}()
	hooks := Hooks{BeforeRaster: func(file string) error {
		if strings.HasSuffix(file, filepath.Join("web", "page-001@2x.png")) {
			once.Do(func() { close(began) })
		}
		return nil
	}}
	_, err = Build(ctx, job, Options{Dir: dir, Date: date, NoProofs: true, Full: true, Hooks: hooks})
	require.ErrorIs(t, err, context.Canceled)
	select {
	case at := <-cancelled:
		t.Logf("stopped %v after the cancel (measured, not asserted)", time.Since(at))
	default:
		require.FailNow(t, "the 2× web PNG never began")
	}
	assert.Equal(t, before, tree(t, dir), "the folder is as the last build left it")
	stages, _ := filepath.Glob(filepath.Join(filepath.Dir(dir), ".out"+StageMark+"*"))
	assert.Empty(t, stages, "no stage left")
}
