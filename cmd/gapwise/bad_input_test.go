package main

import (
	"bufio"
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// badCasesFile lists the bad-input fixtures shared with the fairness
// package: a header row "case<TAB>expected", then one "case<TAB>expected
// message substring" per line, the case being a folder under testdata/bad
// with a spec.yaml.
var badCasesFile = filepath.Join("..", "..", "testdata", "bad", "cases.tsv")

// TestBadInputs: every bad-input case exits with status 2, names the
// problem on stderr, prints nothing on stdout and creates no output folder,
// both for decompose and for check.
func TestBadInputs(t *testing.T) {
	f, err := os.Open(badCasesFile)
	if err != nil {
		t.Fatalf("bad-input fixture list missing: %v", err) // a missing list must not pass silently
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	n := 0
	for sc.Scan() {
		line := sc.Text()
		if strings.TrimSpace(line) == "" || strings.HasPrefix(line, "#") || line == "case\texpected" {
			continue
		}
		name, want, ok := strings.Cut(line, "\t")
		if !ok {
			t.Fatalf("%s: line without a tab: %q", badCasesFile, line)
		}
		n++
		spec := filepath.Join(filepath.Dir(badCasesFile), name, "spec.yaml")
		t.Run(name, func(t *testing.T) {
			for _, cmd := range [][]string{
				{"decompose", "--spec", spec, "--format", "json"},
				{"check", "--spec", spec},
			} {
				out := filepath.Join(t.TempDir(), "out")
				args := cmd
				if cmd[0] == "decompose" {
					args = append(append([]string(nil), cmd...), "--out", out)
				}
				var stdout, stderr bytes.Buffer
				code := execute(args, &stdout, &stderr)
				if code != exitInput {
					t.Errorf("%s: exit %d, want %d; stderr %q", cmd[0], code, exitInput, stderr.String())
				}
				if !strings.Contains(stderr.String(), want) {
					t.Errorf("%s: stderr %q lacks %q", cmd[0], stderr.String(), want)
				}
				if stdout.Len() != 0 {
					t.Errorf("%s: stdout not empty: %q", cmd[0], stdout.String())
				}
				if _, err := os.Stat(out); err == nil {
					t.Errorf("%s: output folder created", cmd[0])
				}
			}
		})
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if n == 0 {
		t.Fatalf("%s lists no cases", badCasesFile)
	}
}
