package main

import (
	"bytes"
	"os"
	"path/filepath"
	"sync"
	"testing"
)

// testRows is the size of the demo cohort the tests audit: big enough for
// the estimates to be meaningful, small enough to keep `go test` quick.
const testRows = 12000

var (
	shared     string // folder holding the shared demo, removed by TestMain
	sharedOnce sync.Once
	sharedErr  error
	sharedOut  string
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
		var stdout, stderr bytes.Buffer
		dir := filepath.Join(shared, "demo")
		sharedErr = runDemo(demoOptions{out: dir, rows: testRows, seed: 1}, &stdout, &stderr)
		sharedOut = stdout.String()
	})
	if sharedErr != nil {
		t.Fatalf("demo: %v", sharedErr)
	}
	return filepath.Join(shared, "demo")
}
