package main

import (
	"math"
	"os"
	"runtime"
	"runtime/debug"
)

// firstCollectionAt is the heap size of the first garbage collection.
// The Go runtime starts collecting at 4 MB and doubles from there, so a
// short command like check spends a quarter of its CPU time marking a
// heap it is about to drop at exit; a build, whose heap is larger and
// lives longer, needs the usual pacing after that. 128 MiB covers a
// 4,000-term catalog's check (75 MB allocated in all); README, Speed.
const firstCollectionAt = 128 << 20

// deferFirstCollection turns collection off until the heap reaches
// limit, then back to the runtime's default pacing (GOGC=100) for the
// rest of the process: the soft memory limit starts the first
// collection, and a finalizer, which runs after it, restores the
// default. A user's GOGC or GOMEMLIMIT is left alone.
func deferFirstCollection(limit int64) {
	if os.Getenv("GOGC") != "" || os.Getenv("GOMEMLIMIT") != "" {
		return
	}
	debug.SetGCPercent(-1)
	debug.SetMemoryLimit(limit)
	sentinel := new([16]byte)
	runtime.SetFinalizer(sentinel, func(*[16]byte) {
		debug.SetGCPercent(100)
		debug.SetMemoryLimit(math.MaxInt64)
	})
}
