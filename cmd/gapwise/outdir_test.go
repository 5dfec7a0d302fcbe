package main

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

func readFile(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func TestWriteOutDirCreatesWhole(t *testing.T) {
	root := t.TempDir()
	for _, dir := range []string{filepath.Join(root, "new"), filepath.Join(root, "a", "b", "deep")} {
		files := []outFile{{"result.json", []byte("{}\n")}, {"report.html", []byte("<p>")}}
		if err := writeOutDir(dir, files, false); err != nil {
			t.Fatal(err)
		}
		if got := readFile(t, filepath.Join(dir, "report.html")); got != "<p>" {
			t.Errorf("report.html = %q", got)
		}
		info, _ := os.Stat(dir)
		if info.Mode().Perm() != 0o755 {
			t.Errorf("folder mode %v, want 0755", info.Mode().Perm())
		}
	}
	leftovers, _ := filepath.Glob(filepath.Join(root, ".*"))
	if len(leftovers) > 0 {
		t.Errorf("temporary folders left: %v", leftovers)
	}
}

func TestWriteOutDirEmptyExisting(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := writeOutDir(dir, []outFile{{"result.json", []byte("x")}}, false); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, filepath.Join(dir, "result.json")); got != "x" {
		t.Errorf("result.json = %q", got)
	}
}

func TestWriteOutDirRefusesNonEmpty(t *testing.T) {
	dir := t.TempDir()
	keep := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(keep, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "result.json"), []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	err := writeOutDir(dir, []outFile{{"result.json", []byte("new")}}, false)
	var oe *outDirError
	if !errors.As(err, &oe) {
		t.Fatalf("got %v, want an outDirError", err)
	}
	if got := readFile(t, filepath.Join(dir, "result.json")); got != "old" {
		t.Errorf("refused write changed result.json to %q", got)
	}
	// With force the named files are replaced and others kept.
	if err := writeOutDir(dir, []outFile{{"result.json", []byte("new")}, {"report.html", []byte("h")}}, true); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, filepath.Join(dir, "result.json")); got != "new" {
		t.Errorf("forced result.json = %q", got)
	}
	if got := readFile(t, keep); got != "mine" {
		t.Errorf("other file changed to %q", got)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 3 {
		t.Errorf("folder holds %d entries, want 3 (no temporary files)", len(entries))
	}
}

func TestWriteOutDirNotAFolder(t *testing.T) {
	path := filepath.Join(t.TempDir(), "file")
	if err := os.WriteFile(path, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	var oe *outDirError
	if err := writeOutDir(path, nil, true); !errors.As(err, &oe) {
		t.Fatalf("got %v, want an outDirError", err)
	}
}

// TestWriteOutDirFailureLeavesNothing: when a file cannot be written the
// folder must not appear, and no temporary folder may remain.
func TestWriteOutDirFailureLeavesNothing(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	files := []outFile{{"result.json", []byte("{}")}, {"missing-sub/report.html", []byte("x")}}
	if err := writeOutDir(dir, files, false); err == nil {
		t.Fatal("no error for an unwritable file")
	}
	entries, _ := os.ReadDir(root)
	if len(entries) != 0 {
		t.Errorf("left behind: %v", entries)
	}
}
