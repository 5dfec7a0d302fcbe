package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestWriteInterrupted: a signal recorded at any checkpoint of a write
// (here injected by the guard's hook) stops it with an interruptedError
// that maps to status 128+n, leaves no temporary entry, and leaves the
// outputs as they were: no folder for a new one, the old pair for a forced
// one.
func TestWriteInterrupted(t *testing.T) {
	cases := []struct {
		existing   bool
		checkpoint string
	}{
		{false, "staged " + resultFile},
		{false, "staged " + reportFile},
		{false, "before rename"},
		{true, "staged " + resultFile},
		{true, "staged " + reportFile},
		{true, "before swap"},
	}
	for _, c := range cases {
		name := c.checkpoint
		if c.existing {
			name = "forced, " + name
		}
		t.Run(name, func(t *testing.T) {
			root := t.TempDir()
			out := filepath.Join(root, "a", "out")
			if c.existing {
				mustDo(t, os.MkdirAll(out, 0o755))
				for _, f := range pair("old") {
					writeFile(t, filepath.Join(out, f.name), string(f.data))
				}
			}
			g := &interruptGuard{}
			reached := false
			g.hook = func(cp string) {
				if cp == c.checkpoint {
					reached = true
					g.receive(syscall.SIGTERM) // a write is in progress: only recorded
				}
			}
			interrupts = g
			t.Cleanup(func() { interrupts = nil })

			err := (outDir{path: out, force: true}).write(pair("new"))
			var ie *interruptedError
			if !reached || !errors.As(err, &ie) {
				t.Fatalf("checkpoint reached %v, error %v; want an interruptedError", reached, err)
			}
			// Shell convention: status 128+n for a process ended by signal n (SIGTERM is 15).
			if code := exitCode(wrapRun(err)); code != 143 {
				t.Errorf("exit status %d, want 143", code)
			}
			assertUntouched(t, root, out, c.existing)
		})
	}
}

// assertUntouched checks that an interrupted write left nothing: no hidden
// entry anywhere under root, and in out either nothing (new folder: not
// even its parent) or exactly the old pair.
func assertUntouched(t *testing.T, root, out string, existing bool) {
	t.Helper()
	filepath.WalkDir(root, func(p string, d os.DirEntry, err error) error {
		if err == nil && strings.HasPrefix(d.Name(), ".") {
			t.Errorf("temporary entry left: %s", p)
		}
		return nil
	})
	if !existing {
		if got := entryNames(t, root); len(got) != 0 {
			t.Errorf("interrupted write left %v", got)
		}
		return
	}
	if got := generations(out); len(got) != 2 || got[0] != "old" || got[1] != "old" {
		t.Errorf("forced folder holds generations %v, want the old pair", got)
	}
	if got := entryNames(t, out); len(got) != 2 {
		t.Errorf("forced folder holds %v", got)
	}
}
