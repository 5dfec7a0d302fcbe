package main

import (
	"bytes"
	"io"
	"strings"
	"testing"
)

func TestRunSidesWritesTable(t *testing.T) {
	opt, err := parseFlags([]string{"-sides", "-sizes", "400,800", "-reps", "1", "-truth-n", "8192", "-cases", "spread-wide", "-learners", "expanded"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if !opt.sides {
		t.Fatal("-sides not set")
	}
	var out bytes.Buffer
	if err := runSides(opt, &out, io.Discard); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	for _, want := range []string{"| case | side | n = 400 | n = 800 |", "| spread-wide (hard) | reference |", "| spread-wide (hard) | comparison |", "| spread-wide (hard) | both |", "| **all cases** | both |"} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
	if got := strings.Count(text, "\n| "); got != 1+3+3 {
		t.Errorf("%d table rows, want header + 3 case rows + 3 overall rows:\n%s", got, text)
	}
}
