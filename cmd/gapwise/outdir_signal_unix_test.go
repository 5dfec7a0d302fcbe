//go:build unix

package main

import (
	"bufio"
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// signalHelperEnv, when set in the environment of this test binary, makes
// it the child process of TestSignalEndsCleanly instead of running tests.
const signalHelperEnv = "GAPWISE_TEST_SIGNAL_HELPER"

func init() {
	if h := os.Getenv(signalHelperEnv); h != "" {
		runSignalHelper(h)
	}
}

// runSignalHelper installs the signal guard as main does and, for spec
// "write|OUT|CHECKPOINT", writes a pair into OUT (forced), printing
// "ready" at CHECKPOINT and waiting there for the signal; for "idle|" it
// prints "ready" and waits outside any write. It never returns.
func runSignalHelper(spec string) {
	mode, rest, _ := strings.Cut(spec, "|")
	out, checkpoint, _ := strings.Cut(rest, "|")
	interrupts = watchSignals()
	if mode == "idle" {
		fmt.Println("ready")
		time.Sleep(30 * time.Second)
		os.Exit(0) // not reached when the signal ends the process
	}
	interrupts.hook = func(cp string) {
		if cp != checkpoint {
			return
		}
		fmt.Println("ready")
		for i := 0; i < 3000 && !signalled(interrupts); i++ {
			time.Sleep(10 * time.Millisecond)
		}
	}
	err := (outDir{path: out, force: true}).write(pair("new"))
	if err != nil {
		fmt.Fprintf(os.Stderr, "gapwise: %v\n", err)
	}
	interrupts.exit(exitCode(wrapRun(err)))
}

func signalled(g *interruptGuard) bool {
	g.mu.Lock()
	defer g.mu.Unlock()
	return g.caught != nil
}

// TestSignalEndsCleanly sends real signals to a child process (this test
// binary, see runSignalHelper) in the middle of writing outputs, and
// outside a write. The child must remove its temporary entries, leave the
// outputs as they were, and end by the same signal, the convention for a
// program that cleans up on a signal (a shell then shows 128+n).
func TestSignalEndsCleanly(t *testing.T) {
	cases := []struct {
		sig        syscall.Signal
		existing   bool
		checkpoint string // "" outside a write
	}{
		{syscall.SIGINT, false, "staged " + resultFile},
		{syscall.SIGTERM, false, "before rename"},
		{syscall.SIGINT, true, "staged " + reportFile},
		{syscall.SIGTERM, true, "before swap"},
		{syscall.SIGHUP, true, "staged " + resultFile},
		{syscall.SIGINT, false, ""},
		{syscall.SIGTERM, false, ""},
	}
	for _, c := range cases {
		t.Run(fmt.Sprintf("%v existing=%v at %q", c.sig, c.existing, c.checkpoint), func(t *testing.T) {
			if signal.Ignored(c.sig) {
				// Ignored signals are inherited (nohup ignores SIGHUP), and
				// the guard leaves an ignored signal ignored, as a program
				// started under nohup should.
				t.Skipf("%v is ignored in this test's environment; the child would inherit that", c.sig)
			}
			root := t.TempDir()
			out := filepath.Join(root, "a", "out")
			if c.existing {
				mustDo(t, os.MkdirAll(out, 0o755))
				for _, f := range pair("old") {
					writeFile(t, filepath.Join(out, f.name), string(f.data))
				}
			}
			spec := "write|" + out + "|" + c.checkpoint
			if c.checkpoint == "" {
				spec = "idle|"
			}
			stderr := runToSignal(t, spec, c.sig)
			if c.checkpoint != "" && !strings.Contains(stderr, "interrupted by") {
				t.Errorf("stderr %q, want a line saying it was interrupted", stderr)
			}
			assertUntouched(t, root, out, c.existing)
		})
	}
}

// runToSignal starts the helper child with spec, waits for its "ready",
// sends sig and checks that the child ended by sig. It returns the
// child's stderr.
func runToSignal(t *testing.T, spec string, sig syscall.Signal) string {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), signalHelperEnv+"="+spec)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	stdout, err := cmd.StdoutPipe()
	mustDo(t, err, cmd.Start())
	watchdog := time.AfterFunc(60*time.Second, func() { cmd.Process.Kill() })
	defer watchdog.Stop()
	if line, _ := bufio.NewReader(stdout).ReadString('\n'); line != "ready\n" {
		cmd.Wait()
		t.Fatalf("child printed %q, not ready; stderr %q", line, stderr.String())
	}
	mustDo(t, cmd.Process.Signal(sig))
	cmd.Wait()
	ws, ok := cmd.ProcessState.Sys().(syscall.WaitStatus)
	if !ok || !ws.Signaled() || ws.Signal() != sig {
		t.Errorf("child ended with %v, want ended by %v; stderr %q", cmd.ProcessState, sig, stderr.String())
	}
	return stderr.String()
}
