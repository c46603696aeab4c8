package series

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/require"

	"sheaf/specs"
)

// TestTablesMustBeRegularFiles: a counts table that is a FIFO with no
// writer or a device that never ends (/dev/zero) is refused at once with
// its path, at the spec's data line (issue 20; this project's own rule).
func TestTablesMustBeRegularFiles(t *testing.T) {
	tests := []struct {
		name string
		make func(t *testing.T, path string) // makes the counts file
		want string
	}{
		{"fifo", func(t *testing.T, p string) { require.NoError(t, syscall.Mkfifo(p, 0o644)) }, "is a named pipe (FIFO), not a regular file"},
		{"device", func(t *testing.T, p string) {
			if err := os.Symlink("/dev/zero", p); err != nil {
				t.Skip(err)
			}
		}, "is a character device, not a regular file"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			spec := feature(t, "counts.csv", "term,year,count\n", "", "")
			counts := filepath.Join(filepath.Dir(spec), "counts.csv")
			require.NoError(t, os.Remove(counts))
			tt.make(t, counts)
			s, err := specs.Load(spec)
			require.NoError(t, err)
			done := make(chan error, 1)
			go func() { _, err := Load(s); done <- err }()
			select {
			case err := <-done:
				require.Error(t, err)
				require.Contains(t, err.Error(), spec+":3:3: data.counts")
				require.Contains(t, err.Error(), tt.want)
			case <-time.After(20 * time.Second): // a hang check, not a speed one
				require.Fail(t, "still reading after 20 s")
			}
		})
	}
}
