package production

import (
	"testing"

	"sheaf/render/tooltest"
)

// TestMain says at the end, in one line, how many checks were skipped for
// want of an outside program and which are missing.
func TestMain(m *testing.M) { tooltest.Main(m) }
