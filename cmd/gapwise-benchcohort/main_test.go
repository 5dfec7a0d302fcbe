package main

import (
	"path/filepath"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestRunWritesLoadableCohort checks that the written spec and cohort are
// accepted by the CLI's own loaders (fairness.LoadSpec, fairness.LoadData)
// and hold the requested number of rows and mechanisms.
func TestRunWritesLoadableCohort(t *testing.T) {
	const rows, k = 400, 4
	dir := filepath.Join(t.TempDir(), "new") // run creates missing folders
	if err := run(rows, k, 7, dir); err != nil {
		t.Fatal(err)
	}
	spec, err := fairness.LoadSpec(filepath.Join(dir, "spec.yaml"))
	if err != nil {
		t.Fatalf("spec does not load: %v", err)
	}
	data, err := fairness.LoadData(spec)
	if err != nil {
		t.Fatalf("cohort does not load: %v", err)
	}
	if nRef, nCmp := data.Counts(); nRef+nCmp != rows {
		t.Errorf("kept %d+%d rows, want %d", nRef, nCmp, rows)
	}
	if got := len(spec.Graph); got != k {
		t.Errorf("spec has %d mechanisms, want %d", got, k)
	}
}

// TestRunRejectsBadSize checks that a size the generator refuses is an
// error, not a panic (fairness/synth.BenchTable needs k >= 2).
func TestRunRejectsBadSize(t *testing.T) {
	if err := run(10, 1, 1, t.TempDir()); err == nil {
		t.Fatal("k = 1 accepted")
	}
}
