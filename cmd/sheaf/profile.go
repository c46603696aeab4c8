package main

import (
	"fmt"
	"os"
	"runtime"
	"runtime/pprof"
	"runtime/trace"
)

// startProfiles starts the profiles the environment asks for, for measuring
// the whole command (README's Speed section): SHEAF_CPUPROFILE,
// SHEAF_MEMPROFILE (allocations, every one sampled) and SHEAF_TRACE each name
// a file to write. The returned function stops them and writes the files;
// with none set it does nothing.
func startProfiles() (stop func()) {
	var stops []func()
	fail := func(what string, err error) {
		fmt.Fprintf(os.Stderr, "sheaf: %s: %v\n", what, err)
	}
	if path := os.Getenv("SHEAF_CPUPROFILE"); path != "" {
		if f, err := os.Create(path); err != nil {
			fail("SHEAF_CPUPROFILE", err)
		} else if err := pprof.StartCPUProfile(f); err != nil {
			fail("SHEAF_CPUPROFILE", err)
			f.Close()
		} else {
			stops = append(stops, func() { pprof.StopCPUProfile(); f.Close() })
		}
	}
	if path := os.Getenv("SHEAF_TRACE"); path != "" {
		if f, err := os.Create(path); err != nil {
			fail("SHEAF_TRACE", err)
		} else if err := trace.Start(f); err != nil {
			fail("SHEAF_TRACE", err)
			f.Close()
		} else {
			stops = append(stops, func() { trace.Stop(); f.Close() })
		}
	}
	if path := os.Getenv("SHEAF_MEMPROFILE"); path != "" {
		runtime.MemProfileRate = 1
		stops = append(stops, func() {
			f, err := os.Create(path)
			if err != nil {
				fail("SHEAF_MEMPROFILE", err)
				return
			}
			defer f.Close()
			if err := pprof.Lookup("allocs").WriteTo(f, 0); err != nil {
				fail("SHEAF_MEMPROFILE", err)
			}
		})
	}
	return func() {
		for _, s := range stops {
			s()
		}
	}
}
