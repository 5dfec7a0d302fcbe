package main

import (
	"bytes"
	"strings"
	"testing"
)

// TestCompletion: a script is printed for each shell, naming the program
// and its commands (cobra's generators; each shell's own syntax marker,
// common practice of those shells' completion systems).
func TestCompletion(t *testing.T) {
	for shell, marker := range map[string]string{"bash": "complete -o default", "zsh": "#compdef gapwise", "fish": "complete -c gapwise", "powershell": "Register-ArgumentCompleter"} {
		var stdout, stderr bytes.Buffer
		if code := execute([]string{"completion", shell}, &stdout, &stderr); code != exitOK {
			t.Errorf("%s: exit %d: %s", shell, code, stderr.String())
		}
		if !strings.Contains(stdout.String(), marker) || !strings.Contains(stdout.String(), "gapwise") {
			t.Errorf("%s: script lacks %q", shell, marker)
		}
	}
}

// TestHelpDescribes: every command's help has a description and uses the
// README's placeholders.
func TestHelpDescribes(t *testing.T) {
	for _, cmd := range []string{"decompose", "check", "demo", "completion"} {
		var stdout, stderr bytes.Buffer
		execute([]string{cmd, "--help"}, &stdout, &stderr)
		out := stdout.String()
		if len(strings.SplitN(out, "\n\n", 2)[0]) < 80 {
			t.Errorf("%s --help has no description:\n%s", cmd, out)
		}
		for _, bad := range []string{"--spec file ", "--out folder ", "--rows int ", "--workers int "} {
			if strings.Contains(out, bad) {
				t.Errorf("%s --help shows %q, not the README's placeholder", cmd, bad)
			}
		}
	}
}
