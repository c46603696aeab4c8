//go:build !linux

package production

import (
	"errors"
	"os"
)

// exchange is not available here; commit renames the old folder aside.
func exchange(a, b string) error { return errors.New("no atomic exchange on this system") }

// processAlive cannot tell here, so a stale stage is never removed
// automatically.
func processAlive(pid int) bool { return true }

// writable cannot ask the system here: the swap's clean-up reports what
// it could not remove.
func writable(path string) bool { return true }

// device is not known here: mount points are not looked for.
func device(fi os.FileInfo) (uint64, bool) { return 0, false }
