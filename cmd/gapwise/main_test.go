package main

import (
	"bytes"
	"os"
	"path/filepath"
	"sync"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// testRows is the size of the demo cohort the tests audit: big enough for
// the estimates to be meaningful, small enough to keep `go test` quick.
const testRows = 12000

// testIntervals are the bootstrap settings of the shared demo run: a few
// fast replicates, enough for every output to carry intervals.
var testIntervals = intervalOptions{flags: fairness.Intervals{Replicates: 20, Level: 0.95, KeepRatios: true}}.allSet()

var (
	shared       string // folder holding the shared demo, removed by TestMain
	sharedOnce   sync.Once
	sharedErr    error
	sharedOut    string
	sharedErrOut string // what the shared demo wrote to its (non-terminal) stderr
)

func TestMain(m *testing.M) {
	code := m.Run()
	if shared != "" {
		os.RemoveAll(shared)
	}
	os.Exit(code)
}

// demoDir runs `gapwise demo` once per test binary and returns its folder.
func demoDir(t testing.TB) string {
	t.Helper()
	sharedOnce.Do(func() {
		shared, sharedErr = os.MkdirTemp("", "gapwise-cmd-test-")
		if sharedErr != nil {
			return
		}
		var stdout bytes.Buffer
		var stderr *os.File
		if stderr, sharedErr = os.Create(filepath.Join(shared, "stderr.txt")); sharedErr != nil {
			return
		}
		defer stderr.Close()
		dir := filepath.Join(shared, "demo")
		sharedErr = runDemo(demoOptions{out: dir, rows: testRows, seed: 1, intervals: testIntervals}, &stdout, stderr)
		sharedOut = stdout.String()
		b, _ := os.ReadFile(stderr.Name())
		sharedErrOut = string(b)
	})
	if sharedErr != nil {
		t.Fatalf("demo: %v", sharedErr)
	}
	return filepath.Join(shared, "demo")
}
