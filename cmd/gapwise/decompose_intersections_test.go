package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// clinicsByAge rewrites the clinics spec at path so that groups are
// combinations of clinic and an age band (age taken out of the graph,
// as a banded group column must be) with the given groups key.
func clinicsByAge(t *testing.T, path, groups string, keepAgeNode bool) {
	t.Helper()
	s := readFile(t, path)
	r := []string{"groups: {column: clinic, reference: central, comparison: every-other}", "groups: " + groups}
	if !keepAgeNode {
		r = append(r, "  - node: age\n    parents: [sex]\n", "", "[anaemia, age, sex]", "[anaemia, sex]",
			"[age, sex]", "[sex]", "    age: {name: age, unit: years}\n", "")
	}
	s = strings.NewReplacer(r...).Replace(s)
	if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestDecomposeIntersections runs decompose on combinations of clinic and
// age band: the result files are named by the combinations' slugs and
// hold the combinations; a banded column left in the graph is an input
// error (exit status 2) naming groups.bands.age.
func TestDecomposeIntersections(t *testing.T) {
	spec := writeClinics(t, 2000)
	clinicsByAge(t, spec, `{columns: [clinic, age], bands: {age: [50]}, reference: {clinic: central, age: "<50"}, comparison: [{clinic: north, age: "<50"}, {clinic: central, age: ">=50"}]}`, false)
	out := filepath.Join(t.TempDir(), "out")
	noIntervals := intervalOptions{flags: fairness.Intervals{Replicates: 0, Level: 0.95}}.allSet()
	decompose(t, decomposeOptions{spec: spec, out: out, format: formatText, intervals: noIntervals})
	var sum fairness.GroupsSummary
	if err := json.Unmarshal([]byte(readFile(t, filepath.Join(out, summaryFile))), &sum); err != nil {
		t.Fatal(err)
	}
	want := map[string]string{"clinic north, age <50": "result-clinic_north_age_lt50.json", "clinic central, age ≥50": "result-clinic_central_age_ge50.json"}
	if sum.Column != "clinic × age" || sum.Reference != "clinic central, age <50" || len(sum.Comparisons) != 2 {
		t.Fatalf("summary of %q against %q with %d comparisons", sum.Column, sum.Reference, len(sum.Comparisons))
	}
	for _, c := range sum.Comparisons {
		if want[c.Value] != c.ResultFile {
			t.Errorf("%s written to %s, want %s", c.Value, c.ResultFile, want[c.Value])
		}
		var r fairness.Result
		if err := json.Unmarshal([]byte(readFile(t, filepath.Join(out, c.ResultFile))), &r); err != nil {
			t.Fatal(err)
		}
		if r.Groups.Comparison != c.Value || strings.Join(r.Groups.Columns, ",") != "clinic,age" || len(r.Groups.Bands) != 1 {
			t.Errorf("%s holds groups %+v", c.ResultFile, r.Groups)
		}
	}

	bad := writeClinics(t, 300)
	clinicsByAge(t, bad, `{columns: [clinic, age], bands: {age: [50]}, reference: {clinic: central, age: "<50"}, comparison: every-other}`, true)
	var stdout bytes.Buffer
	err := runDecompose(decomposeOptions{spec: bad, format: formatText, intervals: noIntervals}, &stdout, nonTerminal(t))
	if code := exitCode(wrapRun(err)); code != exitInput || !strings.Contains(err.Error(), "groups.bands.age") {
		t.Errorf("banded column in the graph: exit %d, %v; want 2 naming groups.bands.age", code, err)
	}
}
