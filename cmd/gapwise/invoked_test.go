package main

import (
	"os"
	"path/filepath"
	"slices"
	"testing"
)

// TestGoRunTarget: what the demo's hint go-runs after `go run`, for a
// module at a released version and from folders in and outside a local
// module (paths relative to the working directory, as go run takes them).
func TestGoRunTarget(t *testing.T) {
	root := t.TempDir()
	for _, d := range []string{"cmd/gapwise", "docs", "other"} {
		if err := os.MkdirAll(filepath.Join(root, "m", d), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, "m", "go.mod"), []byte("// a comment\nmodule example.com/m // trailing\n\ngo 1.22\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	// A nested module of another name does not count as the root.
	if err := os.WriteFile(filepath.Join(root, "m", "other", "go.mod"), []byte("module example.com/other\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const pkg, mod = "example.com/m/cmd/gapwise", "example.com/m"
	cases := []struct {
		name, ver, wd, want string
	}{
		{"released version", "v1.2.3", root, "example.com/m/cmd/gapwise@v1.2.3"},
		{"module root", "(devel)", filepath.Join(root, "m"), "./cmd/gapwise"},
		{"command folder", "(devel)", filepath.Join(root, "m", "cmd", "gapwise"), "."},
		{"sibling folder", "(devel)", filepath.Join(root, "m", "docs"), "../cmd/gapwise"},
		{"inside a nested module", "", filepath.Join(root, "m", "other"), "../cmd/gapwise"},
		{"outside the module", "(devel)", root, "./cmd/gapwise"},
	}
	for _, c := range cases {
		if got := goRunTarget(pkg, mod, c.ver, c.wd); got != c.want {
			t.Errorf("%s: goRunTarget = %q, want %q", c.name, got, c.want)
		}
	}
	if got := goRunTarget("", "", "", root); got != "./cmd/gapwise" {
		t.Errorf("without build info: %q", got)
	}
}

// TestInvokedAsBinary: a binary started by name or by path is named as
// the user typed it; one in go run's temporary go-build folder is not.
func TestInvokedAsBinary(t *testing.T) {
	for _, arg0 := range []string{"gapwise", "./gapwise", "/usr/local/bin/gapwise", "bin/my gapwise"} {
		if got := invokedAs(arg0); !slices.Equal(got, []string{arg0}) {
			t.Errorf("invokedAs(%q) = %q", arg0, got)
		}
	}
	got := invokedAs(filepath.Join(os.TempDir(), "go-build123", "b001", "exe", "gapwise"))
	if len(got) != 3 || got[0] != "go" || got[1] != "run" {
		t.Errorf("go run binary: invokedAs = %q, want a go run command", got)
	}
}
