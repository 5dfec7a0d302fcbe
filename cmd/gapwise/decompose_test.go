package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/fairness"
)

// decompose runs `gapwise decompose` through its run function with stderr
// a regular file (not a terminal), and checks that nothing, in particular
// no progress line, was written to it.
func decompose(t *testing.T, o decomposeOptions) string {
	t.Helper()
	var stdout bytes.Buffer
	stderr := nonTerminal(t)
	if err := runDecompose(o, &stdout, stderr); err != nil {
		t.Fatalf("decompose %+v: %v", o, err)
	}
	if got := readFile(t, stderr.Name()); got != "" {
		t.Errorf("decompose wrote to a non-terminal stderr: %q", got)
	}
	return stdout.String()
}

// TestDecomposeFormats runs the default text format through runDecompose
// and renders the demo's result as Markdown; JSON output is checked by
// TestDecomposeDeterministic.
func TestDecomposeFormats(t *testing.T) {
	spec := filepath.Join(demoDir(t), demoSpec)
	text := decompose(t, decomposeOptions{spec: spec, format: formatText})
	for _, w := range []string{"fnr (false-negative rate)", "residual (gap - sum)", "haemoglobin | anaemia, age", "Assumptions and cautions", "SYNTHETIC DATA"} {
		if !strings.Contains(text, w) {
			t.Errorf("text output lacks %q", w)
		}
	}
	var md bytes.Buffer
	if err := render(&md, loadResult(t, filepath.Join(demoDir(t), resultFile)), formatMarkdown, false); err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{"|", "anaemia, age"} {
		if !strings.Contains(md.String(), w) {
			t.Errorf("markdown output lacks %q", w)
		}
	}
}

// TestDecomposeDeterministic: the JSON result depends only on the spec, the
// data and the seed, not on the number of workers or on the run. The JSON
// parses and honours Σ contributions + residual = gap.
func TestDecomposeDeterministic(t *testing.T) {
	spec := filepath.Join(demoDir(t), demoSpec)
	one := decompose(t, decomposeOptions{spec: spec, format: formatJSON, workers: 1, intervals: testIntervals})
	two := decompose(t, decomposeOptions{spec: spec, format: formatJSON, workers: 2, intervals: testIntervals})
	if one != two {
		t.Error("JSON differs between 1 and 2 workers")
	}
	// The demo's result.json came from an earlier run (GOMAXPROCS workers)
	// on the same spec and data, with the same bootstrap, under the same
	// alternative graphs.
	alts := altGraphOptions{files: []string{filepath.Join(demoDir(t), demoAltGraph)}, labelParent: true}
	withAlts := decompose(t, decomposeOptions{spec: spec, format: formatJSON, intervals: testIntervals, alt: alts})
	if file := readFile(t, filepath.Join(demoDir(t), resultFile)); file != withAlts {
		t.Error("demo's result.json differs from decompose --format json")
	}
	var res fairness.Result
	if err := json.Unmarshal([]byte(one), &res); err != nil {
		t.Fatalf("JSON output does not parse: %v", err)
	}
	checkSums(t, &res)
	if strings.Contains(one, `"audit_date"`) {
		t.Error("JSON of a spec without audit_date, run without --audit-date, holds a date")
	}
	if strings.Contains(one, `"coalitions`) {
		t.Error("JSON without --coalitions holds coalitions")
	}
	if iv := res.Settings.Intervals; iv == nil || iv.Replicates != testIntervals.flags.Replicates || iv.Level != 0.95 || !iv.KeepRatios {
		t.Errorf("settings.intervals %+v, want %d fast replicates at 0.95", iv, testIntervals.flags.Replicates)
	}
	for _, m := range res.Metrics {
		if m.GapCI == nil || m.GapCI.Low > m.GapCI.High {
			t.Errorf("%s: gap interval %+v", m.Metric, m.GapCI)
		}
	}
}

func TestDecomposeOut(t *testing.T) {
	spec := filepath.Join(demoDir(t), demoSpec)
	out := filepath.Join(t.TempDir(), "audit")
	stdout := decompose(t, decomposeOptions{spec: spec, format: formatJSON, out: out, coalitions: coalitionOptions{json: true, limit: 12}})
	if got := readFile(t, filepath.Join(out, resultFile)); got != stdout {
		t.Error("result.json differs from the JSON printed on stdout")
	}
	checkCoalitionsJSON(t, stdout)
	if html := readFile(t, filepath.Join(out, reportFile)); !strings.Contains(html, "<html") {
		t.Error("report.html is not HTML")
	}
	// A second run into the now non-empty folder is refused without --force
	// and leaves the files alone.
	before, _ := os.Stat(filepath.Join(out, resultFile))
	var so, se bytes.Buffer
	if code := execute([]string{"decompose", "--spec", spec, "--out", out}, &so, &se); code != exitInput {
		t.Fatalf("exit %d, want %d (stderr %q)", code, exitInput, se.String())
	}
	after, _ := os.Stat(filepath.Join(out, resultFile))
	if !before.ModTime().Equal(after.ModTime()) {
		t.Error("refused run touched result.json")
	}
}

// checkCoalitionsJSON parses a result written with --coalitions and checks
// that every metric lists all 2^k coalitions, whose Shapley values
// (Shapley 1953, attribution.ExactShapley) are the contributions.
func checkCoalitionsJSON(t *testing.T, js string) {
	t.Helper()
	var res fairness.Result
	if err := json.Unmarshal([]byte(js), &res); err != nil {
		t.Fatal(err)
	}
	k := len(res.Mechanisms)
	for _, m := range res.Metrics {
		if len(m.Coalitions) != 1<<k {
			t.Fatalf("%s: %d coalitions for %d mechanisms (omitted %q)", m.Metric, len(m.Coalitions), k, m.CoalitionsOmitted)
		}
		v := make([]float64, len(m.Coalitions))
		for S, c := range m.Coalitions {
			v[S] = c.ChangeFromReference
		}
		for i, phi := range attribution.ExactShapley(v, k) {
			if math.Abs(phi-m.Contributions[i].Value) > 1e-12 {
				t.Errorf("%s/%s: Shapley value of the coalitions %v, contribution %v", m.Metric, m.Contributions[i].Node, phi, m.Contributions[i].Value)
			}
		}
	}
}

// --coalition-limit outside [0, 16] is a usage error (exit 2).
func TestDecomposeCoalitionLimitFlag(t *testing.T) {
	for _, bad := range []string{"-1", "17"} {
		var so, se bytes.Buffer
		if code := execute([]string{"decompose", "--spec", "none.yaml", "--coalition-limit", bad}, &so, &se); code != exitInput || !strings.Contains(se.String(), "--coalition-limit must be between 0 and 16") {
			t.Errorf("--coalition-limit %s: exit %d, want %d (stderr %q)", bad, code, exitInput, se.String())
		}
	}
}

// TestDecomposeFailedRunCreatesNoFolder: an audit that fails after the
// spec was read (here: a metric without a value in one group) leaves no
// output folder behind.
func TestDecomposeFailedRunCreatesNoFolder(t *testing.T) {
	dir := t.TempDir()
	spec := filepath.Join(dir, "spec.yaml")
	data := "g,y,x,score\n" + strings.Repeat("a,1,0.5,0.9\nb,1,0.4,0.8\n", 20)
	if err := os.WriteFile(filepath.Join(dir, "d.csv"), []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
	src := "data: d.csv\nlabel: y\nscore: score\nthreshold: 0.5\ngroups: {column: g, reference: a, comparison: b}\n" +
		"metrics: [fpr]\ngraph:\n  - node: y\n  - node: x\n    parents: [y]\nfolds: 2\n"
	if err := os.WriteFile(spec, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	var stdout, stderr bytes.Buffer
	code := execute([]string{"decompose", "--spec", spec, "--out", out}, &stdout, &stderr)
	if code == exitOK {
		t.Fatal("FPR without negatives did not fail")
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("failed run created the output folder")
	}
	if stdout.Len() != 0 {
		t.Errorf("failed run printed %q", stdout.String())
	}
}

func TestCheckDemo(t *testing.T) {
	var stdout, stderr bytes.Buffer
	if err := runCheck(checkOptions{spec: filepath.Join(demoDir(t), demoSpec)}, &stdout, &stderr); err != nil {
		t.Fatal(err)
	}
	// The demo spec names its nodes and columns (spec key names), with units.
	for _, want := range []string{"spec and data are valid", "SYNTHETIC", "red-cell indices | anaemia", "mean cell volume, fL (mcv); red-cell distribution width, % (rdw)",
		"model       Demo anaemia screening model (version 1.0)", "reference men (male)", "5 mechanisms", "fnr, fpr, ppv", "intervals   50 bootstrap replicates refitting the classifiers, normal form", "(decompose's default; --intervals 0 for none)"} {
		if !strings.Contains(stdout.String(), want) {
			t.Errorf("check output lacks %q:\n%s", want, stdout.String())
		}
	}
}
