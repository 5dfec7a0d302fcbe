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

// TestRefuseOverwritingInputs: an output file that is an input under
// another name (the same path, a hard link, a symbolic link, a relative
// spelling) is refused; a different file of the same content is not.
func TestRefuseOverwritingInputs(t *testing.T) {
	dir := t.TempDir()
	data := filepath.Join(dir, "cohort.csv")
	if err := os.WriteFile(data, []byte("a,b\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name   string
		make   func(out string) error
		refuse bool
	}{
		{"hard link", func(out string) error { return os.Link(data, filepath.Join(out, resultFile)) }, true},
		{"symbolic link", func(out string) error { return os.Symlink(data, filepath.Join(out, reportFile)) }, true},
		{"copy", func(out string) error { return os.WriteFile(filepath.Join(out, resultFile), []byte("a,b\n"), 0o644) }, false},
		{"none", func(string) error { return nil }, false},
	}
	for _, c := range cases {
		out := filepath.Join(t.TempDir(), "out")
		if err := os.Mkdir(out, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := c.make(out); err != nil {
			t.Fatal(err)
		}
		err := refuseOverwritingInputs(out, []string{resultFile, reportFile}, data)
		var oe *outDirError
		if got := errors.As(err, &oe); got != c.refuse {
			t.Errorf("%s: error %v, want refused %v", c.name, err, c.refuse)
		}
	}
	// The data file's own folder as --out, the data named result.json and
	// reached by a relative path.
	if err := os.Rename(data, filepath.Join(dir, resultFile)); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	if err := refuseOverwritingInputs(".", []string{resultFile}, "./"+resultFile); err == nil {
		t.Error("the input itself as an output was accepted")
	}
}
