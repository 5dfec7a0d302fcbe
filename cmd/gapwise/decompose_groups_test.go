package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
)

// writeClinics writes n records of the synthetic clinics cohort
// (synth.GenerateClinics) and its spec into a new folder and returns the
// spec's path.
func writeClinics(t *testing.T, n int) string {
	t.Helper()
	dir := t.TempDir()
	recs, clinic := synth.GenerateClinics(n, 3, synth.DefaultScreeningModel())
	var csv bytes.Buffer
	if err := synth.ClinicsTable(recs, clinic).WriteCSV(&csv); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "cohort.csv"), csv.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	spec := filepath.Join(dir, "spec.yaml")
	if err := os.WriteFile(spec, synth.ClinicsSpec("cohort.csv"), 0o644); err != nil {
		t.Fatal(err)
	}
	return spec
}

// TestDecomposeGroupsOut runs decompose on a spec with every-other
// comparisons: the output folder holds one result and report per audited
// clinic and the summary, the summary names the files and the skipped
// outreach unit with its reason, each result file is the JSON of that
// comparison alone, and the text output prints the matrix before each
// comparison's report.
func TestDecomposeGroupsOut(t *testing.T) {
	spec := writeClinics(t, 2000)
	out := filepath.Join(t.TempDir(), "out")
	noIntervals := intervalOptions{flags: fairness.Intervals{Replicates: 0, Level: 0.95}}.allSet()
	text := decompose(t, decomposeOptions{spec: spec, out: out, format: formatText, intervals: noIntervals})
	var sum fairness.GroupsSummary
	if err := json.Unmarshal([]byte(readFile(t, filepath.Join(out, summaryFile))), &sum); err != nil {
		t.Fatal(err)
	}
	if len(sum.Comparisons) != 2 || sum.Comparisons[0].Value != "north" || sum.Comparisons[1].Value != "harbour" {
		t.Fatalf("comparisons = %+v, want north then harbour (most rows first)", sum.Comparisons)
	}
	if len(sum.Skipped) != 1 || sum.Skipped[0].Value != "outreach" || !strings.Contains(sum.Skipped[0].Reason, "need at least 100") {
		t.Errorf("skipped = %+v, want outreach with its reason", sum.Skipped)
	}
	if len(sum.Matrix) != 2*3 {
		t.Errorf("matrix has %d cells, want 2 comparisons × 3 metrics", len(sum.Matrix))
	}
	entries, err := os.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	want := "report-harbour.html report-north.html result-harbour.json result-north.json summary.html summary.json"
	if got := strings.Join(names, " "); got != want {
		t.Errorf("output folder holds %s, want %s", got, want)
	}
	for _, c := range sum.Comparisons {
		var r fairness.Result
		if err := json.Unmarshal([]byte(readFile(t, filepath.Join(out, c.ResultFile))), &r); err != nil {
			t.Fatal(err)
		}
		if r.Groups.Comparison != c.Value || r.Groups.Reference != "central" {
			t.Errorf("%s holds %s vs %s", c.ResultFile, r.Groups.Comparison, r.Groups.Reference)
		}
		if !strings.Contains(readFile(t, filepath.Join(out, "summary.html")), `href="`+c.ReportFile+`"`) {
			t.Errorf("summary.html does not link %s", c.ReportFile)
		}
	}
	iMatrix, iNorth := strings.Index(text, "Lead mechanism"), strings.Index(text, `Comparison "north" vs "central"`)
	if iMatrix < 0 || iNorth < iMatrix || !strings.Contains(text, `"outreach": not audited`) {
		t.Errorf("text output lacks the matrix before the comparisons or the skipped clinic:\n%s", text[:min(len(text), 2000)])
	}
}

// TestDecomposeGroupsPolicy judges every comparison: a limit that one
// clinic breaches exits with status 3 after the outputs are written, and
// the message names that clinic.
func TestDecomposeGroupsPolicy(t *testing.T) {
	spec := writeClinics(t, 2000)
	pol := filepath.Join(t.TempDir(), "policy.yaml")
	if err := os.WriteFile(pol, []byte("rules:\n  - metric: fpr\n    max_gap: 0.0001\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "out")
	noIntervals := intervalOptions{flags: fairness.Intervals{Replicates: 0, Level: 0.95}}.allSet()
	var stdout bytes.Buffer
	err := runDecompose(decomposeOptions{spec: spec, out: out, format: formatJSON, intervals: noIntervals, policy: policyOptions{file: pol}}, &stdout, nonTerminal(t))
	if code := exitCode(wrapRun(err)); code != 3 {
		t.Fatalf("exit status %d (%v), want 3", code, err)
	}
	if !strings.Contains(err.Error(), `"harbour"`) && !strings.Contains(err.Error(), `"north"`) {
		t.Errorf("breach message names no clinic: %v", err)
	}
	var doc struct {
		Summary fairness.GroupsSummary `json:"summary"`
		Results []fairness.Result      `json:"results"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Summary.Policy == nil || doc.Summary.Policy.Passed || len(doc.Results) != 2 || doc.Results[0].Policy == nil {
		t.Errorf("summary policy %+v with %d results, want a breach judged on each", doc.Summary.Policy, len(doc.Results))
	}
	if _, err := os.Stat(filepath.Join(out, summaryFile)); err != nil {
		t.Errorf("outputs not written before the breach: %v", err)
	}
}

// TestGroupFileNames checks the file-name part of comparison values.
func TestGroupFileNames(t *testing.T) {
	cs := []fairness.ComparisonSummary{{Value: "south"}, {Value: "São Paulo"}, {Value: "South"}, {Value: "../x"}, {Value: "__"},
		{Value: "sex F, age 40–65"}, {Value: "sex F, age <40"}, {Value: "sex F, age ≥65"}, {Value: "age ≥65"}}
	got := strings.Join(groupFileNames(cs), " ")
	if want := "south S_o_Paulo South-2 .._x group5 sex_F_age_40-65 sex_F_age_lt40 sex_F_age_ge65 age_ge65"; got != want {
		t.Errorf("names %q, want %q", got, want)
	}
}
