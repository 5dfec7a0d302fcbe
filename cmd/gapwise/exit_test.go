package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestExitCodes runs command lines that fail before any estimation and
// checks the status and the single error line on stderr.
func TestExitCodes(t *testing.T) {
	dir := t.TempDir()
	notDir := filepath.Join(dir, "plain-file")
	if err := os.WriteFile(notDir, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	dangling := filepath.Join(dir, "dangling")
	if err := os.Symlink(filepath.Join(dir, "gone"), dangling); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name   string
		args   []string
		code   int
		stderr string
	}{
		{"unknown flag", []string{"decompose", "--spec", "x.yaml", "--bogus"}, exitInput, "unknown flag: --bogus"},
		{"unknown command", []string{"explain"}, exitInput, `unknown command "explain"`},
		{"missing spec", []string{"decompose"}, exitInput, "no spec given: run gapwise decompose --spec FILE (or gapwise decompose FILE)"},
		{"spec twice", []string{"decompose", "--spec", "a.yaml", "b.yaml"}, exitInput, "the spec is given twice (--spec a.yaml and b.yaml)"},
		{"positional spec", []string{"check", filepath.Join(dir, "nope.yaml")}, exitInput, "nope.yaml: spec file not found"},
		{"two arguments", []string{"check", "a.yaml", "b.yaml"}, exitInput, "accepts at most 1 arg(s)"},
		{"completion shell", []string{"completion", "tcsh"}, exitInput, "unknown shell tcsh"},
		{"stray argument", []string{"check", "--spec", "x.yaml", "extra"}, exitInput, "extra"},
		{"bad format", []string{"decompose", "--spec", "x.yaml", "--format", "xml"}, exitInput, `--format must be text, json or markdown, got "xml"`},
		{"negative workers", []string{"decompose", "--spec", "x.yaml", "--workers", "-1"}, exitInput, "--workers must be 0 or more"},
		{"spec not found", []string{"decompose", "--spec", filepath.Join(dir, "nope.yaml")}, exitInput, "nope.yaml: spec file not found"},
		{"check spec not found", []string{"check", "--spec", filepath.Join(dir, "nope.yaml")}, exitInput, "spec file not found"},
		{"out is a file", []string{"decompose", "--spec", "x.yaml", "--out", notDir}, exitInput, "exists and is not a folder"},
		{"out under a file", []string{"decompose", "--spec", "x.yaml", "--out", filepath.Join(notDir, "sub")}, exitInput, "cannot be created: " + notDir + " exists and is not a folder"},
		{"out a dangling link", []string{"decompose", "--spec", "x.yaml", "--out", dangling}, exitInput, "which does not exist"},
		{"demo out under a file", []string{"demo", "--out", filepath.Join(notDir, "sub")}, exitInput, "exists and is not a folder"},
		{"one replicate", []string{"decompose", "--spec", "x.yaml", "--intervals", "1"}, exitInput, "--intervals must be 0 (no intervals) or at least 2, got 1"},
		{"negative replicates", []string{"decompose", "--spec", "x.yaml", "--intervals", "-5"}, exitInput, "--intervals must be 0"},
		{"level above 1", []string{"decompose", "--spec", "x.yaml", "--intervals", "50", "--level", "95"}, exitInput, "--level must be strictly between 0 and 1"},
		{"level not a number", []string{"decompose", "--spec", "x.yaml", "--level", "high"}, exitInput, `invalid argument "high"`},
		{"unknown interval form", []string{"decompose", "--spec", "x.yaml", "--interval-form", "bca"}, exitInput, `--interval-form must be normal or percentile, got "bca"`},
		{"demo level 0", []string{"demo", "--level", "0", "--out", filepath.Join(dir, "d")}, exitInput, "--level must be strictly between 0 and 1"},
		{"demo too few rows", []string{"demo", "--rows", "5", "--out", filepath.Join(dir, "d")}, exitInput, "--rows must be at least 100"},
		{"demo too many rows", []string{"demo", "--rows", "2000001", "--out", filepath.Join(dir, "d")}, exitInput, "--rows must be at most 2000000"},
		{"too many workers", []string{"decompose", "--spec", "x.yaml", "--workers", "1025"}, exitInput, "--workers must be at most 1024"},
		{"demo too many workers", []string{"demo", "--workers", "100000", "--out", filepath.Join(dir, "d")}, exitInput, "--workers must be at most 1024"},
		{"too many replicates", []string{"decompose", "--spec", "x.yaml", "--intervals", "10001"}, exitInput, "--intervals must be at most 10000"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			code := execute(c.args, &stdout, &stderr)
			if code != c.code {
				t.Errorf("exit %d, want %d (stderr %q)", code, c.code, stderr.String())
			}
			if !strings.Contains(stderr.String(), c.stderr) {
				t.Errorf("stderr %q lacks %q", stderr.String(), c.stderr)
			}
			if n := strings.Count(stderr.String(), "gapwise: "); n != 1 {
				t.Errorf("error printed %d times: %q", n, stderr.String())
			}
			if strings.Contains(stderr.String(), "Usage:") {
				t.Errorf("usage dump on stderr: %q", stderr.String())
			}
			if stdout.Len() != 0 {
				t.Errorf("stdout not empty: %q", stdout.String())
			}
		})
	}
	if _, err := os.Stat(filepath.Join(dir, "d")); err == nil {
		t.Error("demo with bad flags created its folder")
	}
}

func TestVersionFlag(t *testing.T) {
	var stdout, stderr bytes.Buffer
	if code := execute([]string{"--version"}, &stdout, &stderr); code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, stderr.String())
	}
	if got, want := stdout.String(), "gapwise "+version+"\n"; got != want {
		t.Errorf("--version printed %q, want %q", got, want)
	}
}

// TestExecuteReportsPanics: a panic inside a command (here from a writer
// that panics) is an internal error: one message, exit status 1, no stack
// trace.
func TestExecuteReportsPanics(t *testing.T) {
	var stderr strings.Builder
	code := execute([]string{"--version"}, panicWriter{}, &stderr)
	if code != exitFailure {
		t.Errorf("exit status %d, want %d", code, exitFailure)
	}
	msg := stderr.String()
	if !strings.Contains(msg, "gapwise: internal error: writer exploded") || strings.Contains(msg, "goroutine ") || strings.Count(msg, "internal error") != 1 {
		t.Errorf("stderr %q", msg)
	}
}

// panicWriter panics on every write.
type panicWriter struct{}

func (panicWriter) Write([]byte) (int, error) { panic("writer exploded") }
