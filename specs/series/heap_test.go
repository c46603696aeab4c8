package series

import (
	"os"
	"os/exec"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// heapMapped is the address space the Go heap has mapped, from
// runtime/metrics: objects, unused span space, free and released pages,
// stacks (the /memory/classes/heap/ classes partition it). The runtime
// never unmaps heap arenas (it releases pages to the OS but keeps them
// counted under released), so the sum never falls: read after a run, it
// bounds from above every heap size the run reached — no sampling can
// miss a peak.
func heapMapped() uint64 {
	s := []metrics.Sample{
		{Name: "/memory/classes/heap/objects:bytes"},
		{Name: "/memory/classes/heap/unused:bytes"},
		{Name: "/memory/classes/heap/free:bytes"},
		{Name: "/memory/classes/heap/released:bytes"},
		{Name: "/memory/classes/heap/stacks:bytes"},
	}
	metrics.Read(s)
	var sum uint64
	for _, x := range s {
		sum += x.Value.Uint64()
	}
	return sum
}

// heapChildEnv names the spec a child test process loads for
// heapGrowthBound.
const heapChildEnv = "SHEAF_TEST_HEAP_CHILD"

// heapGrowthBound loads spec in a fresh test process (so no earlier
// test's heap counts) and returns an upper bound of how far the heap grew
// above the live heap before the load: the mapped heap after it, less the
// heap in use before it.
func heapGrowthBound(t *testing.T, spec string) uint64 {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^"+t.Name()+"$", "-test.count=1")
	cmd.Env = append(os.Environ(), heapChildEnv+"="+spec)
	out, err := cmd.CombinedOutput()
	require.NoError(t, err, "child: %s", out)
	for _, line := range strings.Split(string(out), "\n") {
		if v, ok := strings.CutPrefix(line, "heap-growth-bound "); ok {
			n, err := strconv.ParseUint(strings.TrimSpace(v), 10, 64)
			require.NoError(t, err)
			return n
		}
	}
	require.Failf(t, "no bound", "the child printed no bound:\n%s", out)
	return 0
}

// heapChild is the child's side of heapGrowthBound; it reports whether
// this process is the child (and has done its work).
func heapChild(t *testing.T) bool {
	spec := os.Getenv(heapChildEnv)
	if spec == "" {
		return false
	}
	// A tight collector (GOGC 20 instead of 100) lets garbage reach a fifth
	// of the live heap rather than all of it before a cycle, so the bound
	// measures the reader's memory, not how late a cycle happened to run
	// (with GOGC 100 the same load bounded at 7.4 to 11.7 MB run to run).
	defer debug.SetGCPercent(debug.SetGCPercent(20))
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	base := ms.HeapInuse
	set, err := load(t, spec)
	require.NoError(t, err)
	bound := heapMapped() - base
	runtime.KeepAlive(set)
	os.Stdout.WriteString("heap-growth-bound " + strconv.FormatUint(bound, 10) + "\n")
	return true
}
