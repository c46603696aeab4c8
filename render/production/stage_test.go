package production

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"sheaf/render/tooltest"
)

// TestStaleStageRemoved: a stage left by a process that no longer exists
// (killed with SIGKILL) is removed by the next build; one of a live
// process is not.
func TestStaleStageRemoved(t *testing.T) {
	parent := t.TempDir()
	out := filepath.Join(parent, "out")
	dead := exec.Command(tooltest.Require(t, "true", "coreutils"))
	require.NoError(t, dead.Run())
	stale := filepath.Join(parent, ".out"+StageMark+fmt.Sprint(dead.Process.Pid)+"-1")
	live := filepath.Join(parent, ".out"+StageMark+fmt.Sprint(os.Getpid())+"-2")
	os.MkdirAll(stale, 0o755)
	os.MkdirAll(live, 0o755)
	s, err := newStage(out)
	require.NoError(t, err)
	defer s.abort()
	assert.NoDirExists(t, stale, "the stale stage is removed")
	assert.DirExists(t, live, "a live build's stage is kept")
}
