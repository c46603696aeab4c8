package tooltest

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// recorder stands in for a test so RequireFile's skip and failure can be
// watched without ending the real test.
type recorder struct {
	testing.TB
	skipped, failed bool
}

func (r *recorder) Helper()               {}
func (r *recorder) Skip(...any)           { r.skipped = true }
func (r *recorder) Fatalf(string, ...any) { r.failed = true }

func TestRequireFile(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "words")
	require.NoError(t, os.WriteFile(file, []byte("gear\n"), 0o644))
	tests := []struct {
		name          string
		path, require string
		want          string
		skip, fail    bool
	}{
		{"present", file, "", file, false, false},
		{"missing, skip", filepath.Join(dir, "none"), "", "", true, false},
		{"missing, required", filepath.Join(dir, "none"), "1", "", false, true},
		{"a folder is not a file", dir, "", "", true, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			t.Setenv(EnvRequire, tc.require)
			r := &recorder{TB: t}
			got := RequireFile(r, tc.path, "wamerican")
			assert.Equal(t, tc.fail, r.failed, "failed")
			if tc.fail {
				return // a real test stops at Fatalf; the recorder goes on
			}
			assert.Equal(t, tc.want, got)
			assert.Equal(t, tc.skip, r.skipped, "skipped")
		})
	}
}
