package main

import (
	"math"
	"os"
	"runtime"
	"runtime/debug"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestDeferFirstCollection: collection is off until the first one, which
// the soft limit starts; after it the runtime's default pacing is back
// (GOGC=100, no memory limit), so a long build's heap is paced as
// before. The values are runtime/debug's own (SetGCPercent and
// SetMemoryLimit return the previous setting; a negative percent is
// "off", math.MaxInt64 is "no limit").
func TestDeferFirstCollection(t *testing.T) {
	if os.Getenv("GOGC") != "" || os.Getenv("GOMEMLIMIT") != "" {
		t.Skip("GOGC or GOMEMLIMIT is set: the command leaves them alone")
	}
	before := debug.SetGCPercent(100)
	beforeLimit := debug.SetMemoryLimit(-1)
	t.Cleanup(func() {
		debug.SetGCPercent(before)
		debug.SetMemoryLimit(beforeLimit)
	})

	deferFirstCollection(1 << 40)
	assert.Equal(t, -1, debug.SetGCPercent(-1), "off until the first collection")
	assert.Equal(t, int64(1<<40), debug.SetMemoryLimit(-1), "the first collection's heap size")

	runtime.GC() // stands in for reaching the limit
	restored := false
	for range 100 {
		runtime.GC() // finalizers run on their own goroutine after a cycle
		if debug.SetMemoryLimit(-1) == math.MaxInt64 {
			restored = true
			break
		}
		time.Sleep(time.Millisecond)
	}
	require.True(t, restored, "no memory limit after the first collection")
	assert.Equal(t, 100, debug.SetGCPercent(100), "the default pacing after the first collection")
}
