package main

import (
	"os"
	"syscall"
	"testing"
)

// readOnly makes dir unwritable for the rest of the test. Without root,
// mode 0555 does it. Root ignores permission bits (capabilities(7),
// CAP_DAC_OVERRIDE), so as root dir is bind-mounted read-only onto itself
// (mount(2), MS_BIND then MS_REMOUNT|MS_RDONLY); where mounting is not
// allowed the test is skipped, saying why.
func readOnly(t *testing.T, dir string) {
	t.Helper()
	if os.Geteuid() != 0 {
		mustDo(t, os.Chmod(dir, 0o555))
		t.Cleanup(func() { os.Chmod(dir, 0o755) })
		return
	}
	if err := syscall.Mount(dir, dir, "", syscall.MS_BIND, ""); err != nil {
		t.Skipf("running as root, which ignores permission bits, and cannot bind-mount %s read-only: %v", dir, err)
	}
	t.Cleanup(func() { syscall.Unmount(dir, 0) })
	if err := syscall.Mount("", dir, "", syscall.MS_REMOUNT|syscall.MS_BIND|syscall.MS_RDONLY, ""); err != nil {
		t.Skipf("running as root, which ignores permission bits, and cannot remount %s read-only: %v", dir, err)
	}
}
