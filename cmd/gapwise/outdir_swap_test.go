package main

import (
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// moveKind names a move of the swap: "out:NAME" (old file into the stage),
// "in:NAME" (new file into the folder), "back:NAME" (rollback of an out).
func moveKind(src, dst string) string {
	switch {
	case filepath.Base(filepath.Dir(src)) == "new":
		return "in:" + filepath.Base(src)
	case filepath.Base(filepath.Dir(dst)) == "old":
		return "out:" + filepath.Base(src)
	case filepath.Base(filepath.Dir(src)) == "old":
		return "back:" + filepath.Base(src)
	}
	return "other"
}

// generations returns the generation ("old", "new") of each of the pair's
// files present in dir.
func generations(dir string) []string {
	var gens []string
	for _, f := range []string{resultFile, reportFile} {
		if b, err := os.ReadFile(filepath.Join(dir, f)); err == nil {
			_, gen, _ := strings.Cut(string(b), " ")
			gens = append(gens, gen)
		}
	}
	return gens
}

// TestSwapPairChangesTogether replaces an old result.json + report.html
// pair under --force, failing one chosen move (and possibly a rollback
// move). After every move the folder must hold files of one generation
// only (the guarantee of outDir), and at the end either the whole new
// pair (success) or the whole old pair (rolled back), or, when the
// rollback itself fails, no mixed pair and the old files kept in the
// stage named by the error.
func TestSwapPairChangesTogether(t *testing.T) {
	cases := []struct {
		name     string
		fail     []string // moves that fail
		want     string   // generation of both files at the end; "" none
		stranded bool
	}{
		{"success", nil, "new", false},
		{"first move out fails", []string{"out:" + resultFile}, "old", false},
		{"second move out fails", []string{"out:" + reportFile}, "old", false},
		{"first move in fails", []string{"in:" + resultFile}, "old", false},
		{"second move in fails", []string{"in:" + reportFile}, "old", false},
		{"rollback fails", []string{"in:" + reportFile, "back:" + resultFile}, "", true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			for _, f := range pair("old") {
				writeFile(t, filepath.Join(dir, f.name), string(f.data))
			}
			writeFile(t, filepath.Join(dir, "notes.txt"), "mine")
			t.Cleanup(func() { renameFile = os.Rename })
			renameFile = func(src, dst string) error {
				if slices.Contains(c.fail, moveKind(src, dst)) {
					return errors.New("injected failure")
				}
				err := os.Rename(src, dst)
				if gens := slices.Compact(generations(dir)); len(gens) > 1 {
					t.Errorf("after moving %s: the folder holds generations %v", filepath.Base(src), gens)
				}
				return err
			}
			err := (outDir{path: dir, force: true}).write(pair("new"))
			if (err == nil) != (c.fail == nil) {
				t.Fatalf("error %v", err)
			}
			gens := generations(dir)
			if c.want != "" && (len(gens) != 2 || gens[0] != c.want || gens[1] != c.want) {
				t.Errorf("generations at the end %v, want both %q", gens, c.want)
			}
			if got := readFile(t, filepath.Join(dir, "notes.txt")); got != "mine" {
				t.Errorf("other file changed to %q", got)
			}
			hidden := slices.DeleteFunc(entryNames(t, dir), func(n string) bool { return !strings.HasPrefix(n, ".") })
			var se *strandedError
			if !c.stranded {
				if len(hidden) > 0 {
					t.Errorf("temporary entries left: %v", hidden)
				}
				return
			}
			if !errors.As(err, &se) || len(hidden) != 1 || !strings.Contains(err.Error(), hidden[0]) {
				t.Fatalf("error %v, hidden entries %v: want a strandedError naming the kept stage", err, hidden)
			}
			if got := generations(se.kept); len(got) != 2 || got[0] != "old" || got[1] != "old" {
				t.Errorf("kept stage holds generations %v, want the old pair", got)
			}
		})
	}
}
