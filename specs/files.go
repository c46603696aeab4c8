package specs

import (
	"fmt"
	"io"
	"io/fs"
	"os"
	"syscall"
)

// Limits on what sheaf reads, so that an endless or huge input (a device,
// a FIFO, a file of one enormous line) ends with a message instead of a
// hang or gigabytes of memory. README's Production section lists them.
const (
	// MaxSpecSize bounds a spec file: a spec of thousands of listed terms
	// is well under 1 MiB.
	MaxSpecSize = 16 << 20
	// MaxFontSize bounds a font file: the largest CJK OpenType
	// collections are a few tens of MiB.
	MaxFontSize = 256 << 20
	// MaxRecordSize bounds one record (line) of a data table.
	MaxRecordSize = 64 << 10
	// MaxTermSize bounds a term, in bytes of UTF-8: it becomes a label.
	MaxTermSize = 256
)

// OpenRegular opens path for reading when it is a regular file (after
// symbolic links), and refuses anything else — a folder, a FIFO, a
// device, a socket — with a message naming the path, without waiting:
// a FIFO is opened non-blocking, so one with no writer does not hang.
func OpenRegular(path string) (*os.File, error) {
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	fi, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, err
	}
	if !fi.Mode().IsRegular() {
		f.Close()
		return nil, &fs.PathError{Op: "read", Path: path, Err: fmt.Errorf("is %s, not a regular file", FileKind(fi.Mode()))}
	}
	return f, nil
}

// FileKind names the type of a file that is not a regular one, for
// messages: "a folder", "a named pipe (FIFO)", "a symbolic link", ….
func FileKind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeCharDevice != 0:
		return "a character device"
	case m&fs.ModeDevice != 0:
		return "a device"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m.IsRegular():
		return "a regular file"
	}
	return "a special file"
}

// ReadRegular reads a whole regular file of at most limit bytes (see
// OpenRegular). A larger file is refused without reading it; one that
// grows while read is cut off at limit+1 bytes and refused.
func ReadRegular(path string, limit int64) ([]byte, error) {
	f, err := OpenRegular(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	if fi, err := f.Stat(); err == nil && fi.Size() > limit {
		return nil, &fs.PathError{Op: "read", Path: path, Err: fmt.Errorf("is %d bytes, over the %s sheaf reads", fi.Size(), sizeText(limit))}
	}
	b, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(b)) > limit {
		return nil, &fs.PathError{Op: "read", Path: path, Err: fmt.Errorf("is larger than %s, the most sheaf reads", sizeText(limit))}
	}
	return b, nil
}

// sizeText writes a byte count in binary units.
func sizeText(n int64) string {
	switch {
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}
