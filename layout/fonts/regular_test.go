package fonts

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestFontFilesMustBeRegularAndBounded: a font that is a FIFO with no
// writer, a device that never ends, or a file over specs.MaxFontSize is
// refused at once with its path (issue 20; the limit is this project's
// own: the largest CJK collections are a few tens of MiB, from memory).
func TestFontFilesMustBeRegularAndBounded(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, syscall.Mkfifo(filepath.Join(dir, "fifo.ttf"), 0o644))
	require.NoError(t, os.Symlink("/dev/zero", filepath.Join(dir, "zero.ttf")))
	big := filepath.Join(dir, "big.ttf")
	require.NoError(t, os.WriteFile(big, nil, 0o644))
	require.NoError(t, os.Truncate(big, specs.MaxFontSize+1)) // sparse
	spec := &specs.Spec{File: filepath.Join(dir, "feature.yaml"), Dir: dir}
	tests := []struct{ file, want string }{
		{"fifo.ttf", "is a named pipe (FIFO), not a regular file"},
		{"zero.ttf", "is a character device, not a regular file"},
		{"big.ttf", "over the 256.0 MiB sheaf reads"},
	}
	for _, tt := range tests {
		t.Run(tt.file, func(t *testing.T) {
			done := make(chan error, 1)
			go func() {
				_, err := Load(spec, &specs.Output{Name: "print", Fonts: specs.Fonts{Regular: tt.file}})
				done <- err
			}()
			select {
			case err := <-done:
				require.Error(t, err)
				require.Contains(t, err.Error(), filepath.Join(dir, tt.file))
				require.Contains(t, err.Error(), tt.want)
			case <-time.After(20 * time.Second): // a hang check, not a speed one
				require.Fail(t, "still reading after 20 s")
			}
		})
	}
}
