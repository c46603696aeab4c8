package main

import (
	"bufio"
	"bytes"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// interruptChildEnv carries the build arguments (tab-separated) to the
// child process of TestInterrupt.
const interruptChildEnv = "SHEAF_TEST_INTERRUPT_CHILD"

// TestInterrupt sends a real SIGINT to a sheaf process in the middle of a
// build: it exits non-zero, removes its stage, and the previous build is
// intact. The process is this test binary running the command (run, which
// is all main does) with a build hook: once the build is drawing PDF pages
// into its stage (page 2 is about to be drawn), the hook says so on a
// pipe and holds the build until the signal has arrived. So the signal always
// lands while the build is writing — never before it started, never
// after it finished — and no timer decides when.
func TestInterrupt(t *testing.T) {
	if args := os.Getenv(interruptChildEnv); args != "" {
		interruptChild(strings.Split(args, "\t"))
		return
	}
	if testing.Short() {
		t.Skip("builds the demo twice; skipped with -short")
	}
	spec := newJob(t, strings.Replace(jobSpec(""), "top: 60", "top: 384", 1))
	out := filepath.Join(filepath.Dir(spec), "out")
	buildInto(t, spec, out, "--quiet", "--no-proofs")
	before := snapshot(t, out)

	ready, tell, err := os.Pipe()
	require.NoError(t, err)
	defer ready.Close()
	cmd := exec.Command(os.Args[0], "-test.run=^TestInterrupt$", "-test.count=1")
	cmd.Env = append(os.Environ(), interruptChildEnv+"="+strings.Join([]string{"build", spec, "--out", out, "--full"}, "\t"))
	cmd.ExtraFiles = []*os.File{tell} // fd 3 in the child
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	require.NoError(t, cmd.Start())
	tell.Close()
	line, err := bufio.NewReader(ready).ReadString('\n')
	if err != nil {
		cmd.Process.Kill()
		cmd.Wait()
		require.NoError(t, err, "the build never reached its second page; stderr:\n%s", stderr.String())
	}
	require.Equal(t, "writing\n", line)
	stages, _ := filepath.Glob(filepath.Join(filepath.Dir(out), ".out*"))
	require.NotEmpty(t, stages, "the build writes into a stage")

	require.NoError(t, cmd.Process.Signal(syscall.SIGINT))
	err = cmd.Wait()
	var exit *exec.ExitError
	if assert.ErrorAs(t, err, &exit, stderr.String()) {
		assert.Equal(t, exitFindings, exit.ExitCode(), stderr.String())
	}
	assert.Contains(t, stderr.String(), "interrupted", "stderr:\n%s", stderr.String())
	sameTree(t, before, snapshot(t, out), nil)
	noStages(t, out)
}

// interruptChild runs the command with the hook TestInterrupt relies on,
// and exits with its status.
func interruptChild(args []string) {
	tell := os.NewFile(3, "ready")
	got := make(chan os.Signal, 1)
	signal.Notify(got, syscall.SIGINT)
	var once sync.Once
	buildHooks.BeforeEncode = func(output string, page int) error {
		if page >= 2 {
			once.Do(func() {
				tell.WriteString("writing\n")
				tell.Close()
				<-got // held until the signal is here; run's context has it too
			})
		}
		return nil
	}
	os.Exit(run(args, os.Stdout, os.Stderr))
}
