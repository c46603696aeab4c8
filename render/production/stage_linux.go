package production

import (
	"errors"
	"os"
	"syscall"

	"golang.org/x/sys/unix"
)

// exchange swaps two folders in one step (renameat2 RENAME_EXCHANGE,
// Linux 3.15+): at every moment DIR is either the old build or the new.
func exchange(a, b string) error {
	return unix.Renameat2(unix.AT_FDCWD, a, unix.AT_FDCWD, b, unix.RENAME_EXCHANGE)
}

// processAlive reports whether a process with this id exists (signal 0
// checks without sending anything).
func processAlive(pid int) bool {
	err := syscall.Kill(pid, 0)
	return err == nil || errors.Is(err, syscall.EPERM)
}

// writable reports whether this process may create and remove entries
// in the folder at path (write and search permission, as the kernel
// decides for this user: root passes).
func writable(path string) bool {
	return unix.Faccessat(unix.AT_FDCWD, path, unix.W_OK|unix.X_OK, unix.AT_EACCESS) == nil
}

// device is the file system a file lies on.
func device(fi os.FileInfo) (uint64, bool) {
	st, ok := fi.Sys().(*syscall.Stat_t)
	if !ok {
		return 0, false
	}
	return uint64(st.Dev), true
}
