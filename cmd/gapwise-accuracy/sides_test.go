package main

import (
	"bytes"
	"io"
	"strings"
	"testing"
)

func TestRunSidesWritesTable(t *testing.T) {
	if testing.Short() {
		t.Skip("decomposes every estimator × 2 sizes")
	}
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
	for _, want := range []string{"| case | learner, estimator | n = 400 | n = 800 |", "| spread-wide (hard) | expanded reference |", "| spread-wide (hard) | expanded comparison |",
		"| spread-wide (hard) | expanded both/coalition |", "| spread-wide (hard) | expanded both/metric-ess |", "| **all cases** | expanded both/pick |"} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
	if got, e := strings.Count(text, "\n| "), len(studyEstimators()); got != 1+2*e {
		t.Errorf("%d table rows, want header + %d case rows + %d overall rows:\n%s", got, e, e, text)
	}
}
