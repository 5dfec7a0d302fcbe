package main

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// snapshot lists every entry under root with its kind and content (or
// link target), to show that a refused write changed nothing.
func snapshot(t *testing.T, root string) string {
	t.Helper()
	var b strings.Builder
	filepath.WalkDir(root, func(p string, d os.DirEntry, err error) error {
		if err != nil {
			return nil
		}
		b.WriteString(p + " " + d.Type().String())
		if d.Type()&os.ModeSymlink != 0 {
			target, _ := os.Readlink(p)
			b.WriteString(" -> " + target)
		} else if d.Type().IsRegular() {
			data, _ := os.ReadFile(p)
			b.WriteString(" " + string(data))
		}
		b.WriteString("\n")
		return nil
	})
	return b.String()
}

func mustDo(t *testing.T, errs ...error) {
	t.Helper()
	for _, err := range errs {
		if err != nil {
			t.Fatal(err)
		}
	}
}

// TestOutDirSameFileAsInput: an output that is the same file as an input
// (by identity: device and inode) is refused naming both paths, whatever
// the spelling, and the input is left untouched; a mere copy, or a file of
// the same name elsewhere, is not refused. Identity semantics of hard and
// symbolic links: POSIX link(2), symlink(2) and stat(2).
func TestOutDirSameFileAsInput(t *testing.T) {
	cases := []struct {
		name   string
		setup  func(t *testing.T, root, out string) (input string)
		output string // the output name that is the input; "" none
	}{
		{"data in the folder under an output's name", func(t *testing.T, root, out string) string {
			writeFile(t, filepath.Join(out, resultFile), "g,y\n")
			return filepath.Join(out, resultFile)
		}, resultFile},
		{"hard link", func(t *testing.T, root, out string) string {
			writeFile(t, filepath.Join(root, "data.csv"), "g,y\n")
			mustDo(t, os.Link(filepath.Join(root, "data.csv"), filepath.Join(out, resultFile)))
			return filepath.Join(root, "data.csv")
		}, resultFile},
		{"output is a symbolic link to the spec", func(t *testing.T, root, out string) string {
			writeFile(t, filepath.Join(root, "spec.yaml"), "g,y\n") // the content is never read
			mustDo(t, os.Symlink(filepath.Join("..", "spec.yaml"), filepath.Join(out, reportFile)))
			return filepath.Join(root, "spec.yaml")
		}, reportFile},
		{"input is a symbolic link to an output", func(t *testing.T, root, out string) string {
			writeFile(t, filepath.Join(out, resultFile), "g,y\n")
			mustDo(t, os.Symlink(filepath.Join(out, resultFile), filepath.Join(root, "link.csv")))
			return filepath.Join(root, "link.csv")
		}, resultFile},
		{"relative spellings", func(t *testing.T, root, out string) string {
			writeFile(t, filepath.Join(out, reportFile), "g,y\n")
			t.Chdir(root)
			return "./out/../out/" + reportFile
		}, reportFile},
		{"a copy is another file", func(t *testing.T, root, out string) string {
			writeFile(t, filepath.Join(out, resultFile), "g,y\n")
			writeFile(t, filepath.Join(root, "data.csv"), "g,y\n")
			return filepath.Join(root, "data.csv")
		}, ""},
		{"same name elsewhere", func(t *testing.T, root, out string) string {
			mustDo(t, os.Mkdir(filepath.Join(root, "in"), 0o755))
			writeFile(t, filepath.Join(root, "in", resultFile), "g,y\n")
			return filepath.Join(root, "in", resultFile)
		}, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			out := filepath.Join(root, "out")
			mustDo(t, os.Mkdir(out, 0o755))
			input := c.setup(t, root, out)
			d := outDir{path: out, force: true, inputs: []string{input}}
			if c.name == "relative spellings" {
				d.path = "out"
			}
			err := d.write(pair("new"))
			var oe *outDirError
			if c.output == "" {
				if err != nil {
					t.Fatalf("refused a different file: %v", err)
				}
				if got := readFile(t, input); got != "g,y\n" {
					t.Errorf("input changed to %q", got)
				}
				return
			}
			want := filepath.Join(d.path, c.output) + " is the same file as the input " + input
			if !errors.As(err, &oe) || !strings.Contains(err.Error(), want) {
				t.Fatalf("got %v, want an outDirError with %q", err, want)
			}
			if got := readFile(t, input); got != "g,y\n" {
				t.Errorf("input changed to %q", got)
			}
		})
	}
}

// TestDecomposeRefusesInputAsOutput: end to end, a spec whose data file is
// the result.json of the --out folder is refused with exit status 2 before
// any estimation, and the data file is untouched.
func TestDecomposeRefusesInputAsOutput(t *testing.T) {
	dir := t.TempDir()
	data := "g,y,x,score\n" + strings.Repeat("a,1,0.5,0.9\nb,0,0.4,0.8\n", 20)
	writeFile(t, filepath.Join(dir, resultFile), data)
	spec := filepath.Join(dir, "spec.yaml")
	writeFile(t, spec, "data: result.json\nlabel: y\nscore: score\nthreshold: 0.5\ngroups: {column: g, reference: a, comparison: b}\n"+
		"metrics: [fpr]\ngraph:\n  - node: y\n  - node: x\n    parents: [y]\nfolds: 2\n")
	var stdout, stderr bytes.Buffer
	code := execute([]string{"decompose", "--spec", spec, "--out", dir, "--force"}, &stdout, &stderr)
	want := filepath.Join(dir, resultFile) + " is the same file as the input " + filepath.Join(dir, resultFile)
	if code != exitInput || !strings.Contains(stderr.String(), want) {
		t.Errorf("exit %d, stderr %q; want 2 and %q", code, stderr.String(), want)
	}
	if got := readFile(t, filepath.Join(dir, resultFile)); got != data {
		t.Error("the data file was changed")
	}
}

// TestOutDirProblems: output folders that cannot be used are refused by
// check (before any work) and by write, with exit status 2, and nothing
// on disk changes.
func TestOutDirProblems(t *testing.T) {
	cases := []struct {
		name  string
		setup func(t *testing.T, root string) (out string)
		want  string
	}{
		{"under a file", func(t *testing.T, root string) string {
			writeFile(t, filepath.Join(root, "file"), "x")
			return filepath.Join(root, "file", "sub")
		}, "cannot be created: ROOT/file exists and is not a folder"},
		{"deep under a file", func(t *testing.T, root string) string {
			writeFile(t, filepath.Join(root, "file"), "x")
			return filepath.Join(root, "file", "a", "b")
		}, "cannot be created: ROOT/file exists and is not a folder"},
		{"dangling link", func(t *testing.T, root string) string {
			mustDo(t, os.Symlink(filepath.Join(root, "gone"), filepath.Join(root, "out")))
			return filepath.Join(root, "out")
		}, "is a symbolic link to ROOT/gone, which does not exist"},
		{"under a dangling link", func(t *testing.T, root string) string {
			mustDo(t, os.Symlink("gone", filepath.Join(root, "link")))
			return filepath.Join(root, "link", "out")
		}, "cannot be created: ROOT/link is a symbolic link to gone, which does not exist"},
		{"link to a file", func(t *testing.T, root string) string {
			writeFile(t, filepath.Join(root, "file"), "x")
			mustDo(t, os.Symlink("file", filepath.Join(root, "out")))
			return filepath.Join(root, "out")
		}, "exists and is not a folder"},
		{"output name is a folder", func(t *testing.T, root string) string {
			mustDo(t, os.MkdirAll(filepath.Join(root, "out", resultFile), 0o755))
			return filepath.Join(root, "out")
		}, "ROOT/out/result.json exists and is not a regular file"},
		{"output name is a symbolic link", func(t *testing.T, root string) string {
			writeFile(t, filepath.Join(root, "elsewhere.html"), "keep")
			mustDo(t, os.Mkdir(filepath.Join(root, "out"), 0o755))
			mustDo(t, os.Symlink(filepath.Join(root, "elsewhere.html"), filepath.Join(root, "out", reportFile)))
			return filepath.Join(root, "out")
		}, "ROOT/out/report.html is a symbolic link to ROOT/elsewhere.html"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			out := c.setup(t, root)
			before := snapshot(t, root)
			want := strings.ReplaceAll(c.want, "ROOT", root)
			d := outDir{path: out, force: true}
			for _, err := range []error{d.check(resultFile, reportFile), d.write(pair("new"))} {
				var oe *outDirError
				if !errors.As(err, &oe) || !strings.Contains(err.Error(), want) {
					t.Errorf("got %v, want an outDirError with %q", err, want)
				}
				if code := exitCode(wrapRun(err)); code != exitInput {
					t.Errorf("exit status %d, want %d", code, exitInput)
				}
			}
			if after := snapshot(t, root); after != before {
				t.Errorf("refused write changed the disk:\nbefore\n%s\nafter\n%s", before, after)
			}
		})
	}
}

// TestOutDirThroughSymlink: an --out that is a symbolic link to a folder
// is written through: the link stays a link to the same folder, which
// receives the files.
func TestOutDirThroughSymlink(t *testing.T) {
	cases := []struct {
		name   string
		target string // link target, relative to root
		old    bool   // the folder holds an old pair (needs force)
	}{
		{"empty folder", "real", false},
		{"old pair, forced", "real", true},
		{"relative link into a subfolder", "a/real", true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			root := t.TempDir()
			real := filepath.Join(root, c.target)
			mustDo(t, os.MkdirAll(real, 0o755))
			if c.old {
				for _, f := range pair("old") {
					writeFile(t, filepath.Join(real, f.name), string(f.data))
				}
			}
			link := filepath.Join(root, "out")
			mustDo(t, os.Symlink(c.target, link))
			mustDo(t, (outDir{path: link, force: c.old}).write(pair("new")))
			info, err := os.Lstat(link)
			target, _ := os.Readlink(link)
			if err != nil || info.Mode()&os.ModeSymlink == 0 || target != c.target {
				t.Fatalf("--out no longer a link to %s (mode %v, target %q, %v)", c.target, info.Mode(), target, err)
			}
			if got := generations(real); len(got) != 2 || got[0] != "new" || got[1] != "new" {
				t.Errorf("linked folder holds generations %v, want the new pair", got)
			}
			if got := entryNames(t, real); len(got) != 2 {
				t.Errorf("linked folder holds %v, want the pair only", got)
			}
			if got := slices.DeleteFunc(entryNames(t, root), func(n string) bool { return !strings.HasPrefix(n, ".") }); len(got) > 0 {
				t.Errorf("temporary entries beside the link: %v", got)
			}
		})
	}
}

// TestOutDirUnwritable: a folder gapwise may not write in is found by a
// real probe write, for an existing folder and for one to be created in
// it. Root ignores permission bits, so as root the folder is made
// read-only by a read-only bind mount (see readOnly).
func TestOutDirUnwritable(t *testing.T) {
	cases := []struct{ name, sub string }{
		{"existing folder", ""},
		{"folder to create", "new"},
		{"folder to create, deeper", "new/deeper"},
	}
	root := t.TempDir()
	locked := filepath.Join(root, "locked")
	mustDo(t, os.Mkdir(locked, 0o755))
	readOnly(t, locked)
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			out := filepath.Join(locked, c.sub)
			d := outDir{path: out}
			for _, err := range []error{d.check(resultFile, reportFile), d.write(pair("new"))} {
				var oe *outDirError
				if !errors.As(err, &oe) || !strings.Contains(err.Error(), "cannot write in "+locked+": ") {
					t.Errorf("got %v, want an outDirError saying it cannot write in %s", err, locked)
				}
			}
			if got := entryNames(t, locked); len(got) != 0 {
				t.Errorf("read-only folder holds %v", got)
			}
		})
	}
}
