package production

import (
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// TestStaleStageRemoved: a stage left by a process that no longer exists
// (killed with SIGKILL) is removed by the next build; one of a live
// process is not.
func TestStaleStageRemoved(t *testing.T) {
	parent := t.TempDir()
	out := filepath.Join(parent, "out")
	dead := exec.Command("true")
	if err := dead.Run(); err != nil {
		t.Skip("cannot run true:", err)
	}
	stale := filepath.Join(parent, ".out"+StageMark+fmt.Sprint(dead.Process.Pid)+"-1")
	live := filepath.Join(parent, ".out"+StageMark+fmt.Sprint(os.Getpid())+"-2")
	os.MkdirAll(stale, 0o755)
	os.MkdirAll(live, 0o755)
	s, err := newStage(out)
	if err != nil {
		t.Fatal(err)
	}
	defer s.abort()
	if _, err := os.Stat(stale); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("stale stage kept")
	}
	if _, err := os.Stat(live); err != nil {
		t.Errorf("live stage removed: %v", err)
	}
}
