package main

import (
	"os/exec"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/tooltest"
)

// TestLayers keeps the pipeline readable top to bottom (DEVELOPERS.md):
// specs → layout → palette → render → render/feature → render/production
// → render/explore → cmd. A package may import only
// packages of its own layer or a lower one. The rule is this project's
// own; `go list -deps` is the Go tool's account of the imports.
func TestLayers(t *testing.T) {
	if testing.Short() {
		t.Skip("runs go list; skipped with -short")
	}
	goTool := tooltest.Require(t, "go", "golang-go")
	layer := func(pkg string) int {
		p := strings.TrimPrefix(pkg, "sheaf/")
		switch {
		case strings.HasPrefix(p, "specs"):
			return 0
		case strings.HasPrefix(p, "layout"):
			return 1
		case strings.HasPrefix(p, "palette"):
			return 2
		case strings.HasPrefix(p, "render/feature"):
			return 4
		case strings.HasPrefix(p, "render/production"):
			return 5
		case strings.HasPrefix(p, "render/explore"):
			return 6
		case strings.HasPrefix(p, "render"):
			return 3
		case strings.HasPrefix(p, "cmd"):
			return 7
		}
		return -1 // examples: the demo's generator stands apart
	}
	out, err := exec.Command(goTool, "list", "-f", `{{.ImportPath}}{{range .Imports}} {{.}}{{end}}`, "sheaf/...").Output()
	require.NoError(t, err, "go list")
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		f := strings.Fields(line)
		from := layer(f[0])
		for _, imp := range f[1:] {
			if !strings.HasPrefix(imp, "sheaf/") || from < 0 {
				continue
			}
			assert.LessOrEqual(t, layer(imp), from, "%s imports %s, a higher layer", f[0], imp)
		}
	}
}
