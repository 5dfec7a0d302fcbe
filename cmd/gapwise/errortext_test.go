package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode"
)

// TestErrorsPrintable: an error message that quotes a file name, a spec
// key or a flag holding terminal control sequences (ECMA-48 colour, an OSC
// window title ended by BEL, CR, a bidi override; from memory) shows them
// as Go escapes, once, on one line; cobra's own multi-line suggestion keeps
// its layout.
func TestErrorsPrintable(t *testing.T) {
	dir := t.TempDir()
	evil := "x\x1b[31m\x1b]0;owned\x07\r\u202e"
	shown := `x\x1b[31m\x1b]0;owned\a\r\u202e`
	spec := filepath.Join(dir, "spec.yaml")
	data := "data" + evil + ".csv"
	yaml := "data: \"" + strings.NewReplacer("\x1b", `\e`, "\x07", `\a`, "\r", `\r`).Replace(data) + "\"\n" +
		"label: dx\nscore: score\nthreshold: 0.4\ngroups: {column: clinic, reference: north, comparison: south}\n" +
		"metrics: [fnr]\ngraph:\n  - node: age\n  - node: dx\n    parents: [age]\nfolds: 2\n"
	if err := os.WriteFile(spec, []byte(yaml), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		args []string
		want string
	}{
		{"spec file name", []string{"check", "--spec", filepath.Join(dir, "spec"+evil+".yaml")}, "spec" + shown + ".yaml: spec file not found"},
		{"data file name from the spec", []string{"check", "--spec", spec}, "data" + shown + ".csv: data file not found"},
		{"flag name", []string{"check", "--spec", spec, "--" + evil}, "unknown flag: --" + shown},
		{"command name", []string{evil}, `unknown command "x\x1b[31m\x1b]0;owned\a\r\u202e"`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			if code := execute(c.args, &stdout, &stderr); code != exitInput {
				t.Errorf("exit %d, want %d", code, exitInput)
			}
			msg := stderr.String()
			if !strings.Contains(msg, c.want) {
				t.Errorf("stderr %q lacks %q", msg, c.want)
			}
			for _, r := range msg {
				if r != '\n' && r != '\t' && (unicode.Is(unicode.Cc, r) || unicode.Is(unicode.Bidi_Control, r)) {
					t.Errorf("stderr holds %U raw: %q", r, msg)
				}
			}
		})
	}
	var stderr bytes.Buffer
	execute([]string{"decomp"}, &bytes.Buffer{}, &stderr)
	if want := "Did you mean this?\n\tdecompose\n"; !strings.Contains(stderr.String(), want) {
		t.Errorf("cobra's suggestion lost its layout: %q", stderr.String())
	}
}
