package tooltest

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestModuleFile: a dependency's file is read from the module cache; a
// module or file that is not there skips, or fails under
// SHEAF_REQUIRE_TOOLS=1, like the outside programs.
func TestModuleFile(t *testing.T) {
	tests := []struct {
		name, module, rel, require string
		found, skip, fail          bool
	}{
		// testify is in go.mod (this test imports it); LICENSE is in its
		// module root.
		{"present", "github.com/stretchr/testify", "LICENSE", "", true, false, false},
		{"no such file, skip", "github.com/stretchr/testify", "no-such-file", "", false, true, false},
		{"no such file, required", "github.com/stretchr/testify", "no-such-file", "1", false, false, true},
		{"no such module, required", "example.invalid/none", "x", "1", false, false, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			t.Setenv(EnvRequire, tc.require)
			r := &recorder{TB: t}
			got := ModuleFile(r, tc.module, tc.rel)
			assert.Equal(t, tc.fail, r.failed, "failed")
			if tc.fail {
				return
			}
			assert.Equal(t, tc.found, len(got) > 0, "read the file")
			assert.Equal(t, tc.skip, r.skipped, "skipped")
		})
	}
}
