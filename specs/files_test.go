package specs

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// within fails the test when f has not returned in 20 s: the inputs here
// used to block forever (issue 20). It is a hang check, not a speed one.
func within(t *testing.T, f func()) {
	t.Helper()
	done := make(chan struct{})
	go func() { defer close(done); f() }()
	select {
	case <-done:
	case <-time.After(20 * time.Second):
		require.Fail(t, "still reading after 20 s: the input blocks or never ends")
	}
}

// TestLoadRefusesWhatIsNotARegularFile: a spec that is a FIFO with no
// writer, a device that never ends, or a file over MaxSpecSize is refused
// with its path, at once (issue 20; the limits are this project's own).
func TestLoadRefusesWhatIsNotARegularFile(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "spec.yaml")
	require.NoError(t, syscall.Mkfifo(fifo, 0o644))
	big := filepath.Join(dir, "big.yaml")
	require.NoError(t, os.WriteFile(big, nil, 0o644))
	require.NoError(t, os.Truncate(big, MaxSpecSize+1)) // sparse: costs no disk
	tests := []struct {
		path, want string
	}{
		{fifo, "is a named pipe (FIFO), not a regular file"},
		{"/dev/zero", "is a character device, not a regular file"},
		{big, "is 16777217 bytes, over the 16.0 MiB sheaf reads"},
	}
	for _, tt := range tests {
		t.Run(filepath.Base(tt.path), func(t *testing.T) {
			if _, err := os.Stat(tt.path); err != nil {
				t.Skip(err)
			}
			var err error
			within(t, func() { _, err = Load(tt.path) })
			require.Error(t, err)
			require.True(t, strings.HasPrefix(err.Error(), tt.path+": "), err.Error())
			require.Contains(t, err.Error(), tt.want)
		})
	}
}

// TestReadRegularLimit: a file longer than the limit is
// refused without reading it all.
func TestReadRegularLimit(t *testing.T) {
	p := filepath.Join(t.TempDir(), "f")
	require.NoError(t, os.WriteFile(p, []byte("12345"), 0o644))
	b, err := ReadRegular(p, 5)
	require.NoError(t, err)
	require.Equal(t, "12345", string(b))
	_, err = ReadRegular(p, 4)
	require.ErrorContains(t, err, "is 5 bytes, over the 4 bytes sheaf reads")
}

// TestFileKind: the names for file types io/fs defines (the Go
// standard library's FileMode bits), as the messages use them.
func TestFileKind(t *testing.T) {
	tests := []struct {
		mode fs.FileMode
		want string
	}{
		{fs.ModeDir | 0o755, "a folder"},
		{fs.ModeNamedPipe, "a named pipe (FIFO)"},
		{fs.ModeSocket, "a socket"},
		{fs.ModeDevice | fs.ModeCharDevice, "a character device"},
		{fs.ModeDevice, "a device"},
		{fs.ModeSymlink | 0o777, "a symbolic link"},
		{0o644, "a regular file"},
		{fs.ModeIrregular, "a special file"},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, FileKind(tt.mode), "%v", tt.mode)
	}
}
