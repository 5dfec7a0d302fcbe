package main

import (
	"bytes"
	"io"
	"strings"
	"testing"
)

func TestRunWritesTable(t *testing.T) {
	opt, err := parseFlags([]string{"-sizes", "400,800", "-reps", "1", "-truth-n", "8192", "-cases", "prevalence", "-learners", "linear,linear+expanded", "-detail", "-truth"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	var out, errOut bytes.Buffer
	if err := run(opt, &out, &errOut); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	for _, want := range []string{"| case | learner | n = 400 | n = 800 |", "| prevalence | linear |", "| prevalence | linear+expanded |", "| prevalence | linear | 400 | fnr | disease |", "| case | metric | gap | age | site | disease |"} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
	// 2 summary rows + 4 truth rows + 2 learners × 2 sizes × 4 metrics ×
	// (6 mechanisms + residual) detail rows.
	if got, want := strings.Count(text, "\n| prevalence |"), 2+4+2*2*4*7; got != want {
		t.Errorf("%d table rows, want %d", got, want)
	}
}

func TestParseFlagsRejectsBadInput(t *testing.T) {
	for _, args := range [][]string{
		{"-sizes", "10"},
		{"-sizes", "abc"},
		{"-metrics", "auc"},
		{"-metrics", "nope"},
		{"-reps", "0"},
	} {
		if _, err := parseFlags(args, io.Discard); err == nil {
			t.Errorf("parseFlags(%q) accepted bad input", args)
		}
	}
	opt, err := parseFlags(nil, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	// The message as the study printed it before classify owned the
	// learner names (learners.go at 07b2ed3).
	want := `-learners: unknown learner "nope" in "linear+nope" (want linear, expanded, boosted, a "+"-joined set, or auto)`
	if _, err := learnerSet("linear+nope"); err == nil || err.Error() != want {
		t.Errorf("learnerSet(linear+nope): error %v, want %s", err, want)
	}
	if _, err := selectCases([]string{"nope"}); err == nil {
		t.Error("selectCases accepted an unknown case")
	}
	if len(opt.sizes) != 3 || opt.sizes[2] != 50000 {
		t.Errorf("default sizes %v", opt.sizes)
	}
}
