package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
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

func writeFile(t *testing.T, path, data string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
}

// entryNames lists a folder's entries, hidden ones included.
func entryNames(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	return names
}

// pair is a result.json and report.html of one generation.
func pair(gen string) []outFile {
	return []outFile{{resultFile, []byte("result " + gen)}, {reportFile, []byte("report " + gen)}}
}

func TestWriteOutDirCreatesWhole(t *testing.T) {
	root := t.TempDir()
	for _, dir := range []string{filepath.Join(root, "new"), filepath.Join(root, "a", "b", "deep")} {
		files := []outFile{{"result.json", []byte("{}\n")}, {"report.html", []byte("<p>")}}
		if err := (outDir{path: dir}).write(files); err != nil {
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
	if err := os.Mkdir(dir, 0o750); err != nil {
		t.Fatal(err)
	}
	if err := (outDir{path: dir}).write([]outFile{{"result.json", []byte("x")}}); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, filepath.Join(dir, "result.json")); got != "x" {
		t.Errorf("result.json = %q", got)
	}
	// The folder itself is kept, not rebuilt: its mode is unchanged.
	if info, _ := os.Stat(dir); info.Mode().Perm() != 0o750 {
		t.Errorf("folder mode %v, want the original 0750", info.Mode().Perm())
	}
}

func TestWriteOutDirRefusesNonEmpty(t *testing.T) {
	dir := t.TempDir()
	keep := filepath.Join(dir, "notes.txt")
	writeFile(t, keep, "mine")
	writeFile(t, filepath.Join(dir, "result.json"), "old")
	err := (outDir{path: dir}).write([]outFile{{"result.json", []byte("new")}})
	var oe *outDirError
	if !errors.As(err, &oe) {
		t.Fatalf("got %v, want an outDirError", err)
	}
	if got := readFile(t, filepath.Join(dir, "result.json")); got != "old" {
		t.Errorf("refused write changed result.json to %q", got)
	}
	// With force the named files are replaced and others kept.
	if err := (outDir{path: dir, force: true}).write([]outFile{{"result.json", []byte("new")}, {"report.html", []byte("h")}}); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, filepath.Join(dir, "result.json")); got != "new" {
		t.Errorf("forced result.json = %q", got)
	}
	if got := readFile(t, keep); got != "mine" {
		t.Errorf("other file changed to %q", got)
	}
	if names := entryNames(t, dir); len(names) != 3 {
		t.Errorf("folder holds %v, want 3 entries (no temporary files)", names)
	}
}

func TestWriteOutDirNotAFolder(t *testing.T) {
	path := filepath.Join(t.TempDir(), "file")
	writeFile(t, path, "x")
	var oe *outDirError
	if err := (outDir{path: path, force: true}).write(nil); !errors.As(err, &oe) {
		t.Fatalf("got %v, want an outDirError", err)
	}
}

// TestWriteOutDirFailureLeavesNothing: when a file cannot be written the
// folder must not appear, nor the parents made for it, and no temporary
// folder may remain.
func TestWriteOutDirFailureLeavesNothing(t *testing.T) {
	for _, sub := range []string{"out", filepath.Join("a", "b", "out")} {
		root := t.TempDir()
		files := []outFile{{"result.json", []byte("{}")}, {"missing-sub/report.html", []byte("x")}}
		if err := (outDir{path: filepath.Join(root, sub)}).write(files); err == nil {
			t.Fatal("no error for an unwritable file")
		}
		if names := entryNames(t, root); len(names) != 0 {
			t.Errorf("%s: left behind: %v", sub, names)
		}
	}
}

// TestWriteOutDirRetires: the retired names leave with the old generation
// (demo: stale outputs of an earlier cohort), other files stay.
func TestWriteOutDirRetires(t *testing.T) {
	dir := t.TempDir()
	for _, f := range []string{demoData, demoSpec, resultFile, reportFile, "keep.txt"} {
		writeFile(t, filepath.Join(dir, f), "old "+f)
	}
	inputs := []outFile{{demoData, []byte("new cohort")}, {demoSpec, []byte("new spec")}}
	if err := (outDir{path: dir, force: true}).write(inputs, resultFile, reportFile); err != nil {
		t.Fatal(err)
	}
	want := []string{demoData, "keep.txt", demoSpec}
	if got := entryNames(t, dir); strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("folder holds %v, want %v", got, want)
	}
	if got := readFile(t, filepath.Join(dir, demoData)); got != "new cohort" {
		t.Errorf("cohort.csv = %q", got)
	}
}

// TestWriteOutDirHardLinkedTarget: an existing output that is a hard link
// of a file elsewhere is replaced by rename; the file elsewhere keeps its
// content (rename never writes into an existing file; POSIX rename(2)).
func TestWriteOutDirHardLinkedTarget(t *testing.T) {
	root := t.TempDir()
	dir, elsewhere := filepath.Join(root, "out"), filepath.Join(root, "precious.csv")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	writeFile(t, elsewhere, "precious")
	if err := os.Link(elsewhere, filepath.Join(dir, demoData)); err != nil {
		t.Skipf("no hard links here: %v", err)
	}
	if err := (outDir{path: dir, force: true}).write([]outFile{{demoData, []byte("new")}}); err != nil {
		t.Fatal(err)
	}
	if got := readFile(t, elsewhere); got != "precious" {
		t.Errorf("file linked elsewhere changed to %q", got)
	}
	if got := readFile(t, filepath.Join(dir, demoData)); got != "new" {
		t.Errorf("cohort.csv = %q", got)
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
		err := (outDir{path: out, inputs: []string{data}}).checkInputs(resultFile, reportFile)
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
	if err := (outDir{path: ".", inputs: []string{"./" + resultFile}}).checkInputs(resultFile); err == nil {
		t.Error("the input itself as an output was accepted")
	}
}
