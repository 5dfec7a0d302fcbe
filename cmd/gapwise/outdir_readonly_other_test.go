//go:build !linux

package main

import (
	"os"
	"testing"
)

// readOnly makes dir unwritable for the rest of the test with mode 0555.
// Root ignores permission bits, and read-only mounts are made here on
// Linux only, so as root the test is skipped.
func readOnly(t *testing.T, dir string) {
	t.Helper()
	if os.Geteuid() == 0 {
		t.Skip("running as root, which ignores permission bits; the read-only mount of this test is Linux-only")
	}
	mustDo(t, os.Chmod(dir, 0o555))
	t.Cleanup(func() { os.Chmod(dir, 0o755) })
}
