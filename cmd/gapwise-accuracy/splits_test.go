package main

import (
	"bytes"
	"io"
	"strings"
	"testing"
)

func TestRunSplitsWritesTable(t *testing.T) {
	opt, err := parseFlags([]string{"-splits", "-sizes", "150", "-seeds", "2", "-boot", "4", "-fold-splits", "1,3", "-truth-n", "4096", "-cases", "prevalence", "-learners", "linear"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if !opt.splits || len(opt.foldSplits) != 2 {
		t.Fatalf("flags not parsed: %+v", opt)
	}
	var out bytes.Buffer
	if err := runSplits(opt, &out, io.Discard); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	for _, want := range []string{"| case | n | R | range/hw max |", "| prevalence | 150 | 1 |", "| prevalence | 150 | 3 |"} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
	// One split has no median over splits; three have.
	if !strings.Contains(text, "| prevalence | 150 | 1 |") || strings.Count(text, "| – | – |") != 1 {
		t.Errorf("want the median columns empty for R = 1 only:\n%s", text)
	}
}

func TestParseFlagsSplitsDefaults(t *testing.T) {
	opt, err := parseFlags([]string{"-splits"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if len(opt.sizes) != 1 || opt.sizes[0] != splitsSize || strings.Join(opt.cases, ",") != strings.Join(splitsCases, ",") {
		t.Errorf("sizes %v cases %v, want the splits study's defaults", opt.sizes, opt.cases)
	}
	if _, err := parseFlags([]string{"-splits", "-fold-splits", "two"}, io.Discard); err == nil {
		t.Error("-fold-splits two accepted")
	}
}
