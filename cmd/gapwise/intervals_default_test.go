package main

import (
	"bytes"
	"encoding/json"
	"html"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestDecomposeIntervalsByDefault: `gapwise decompose` on a spec without
// an intervals key adds intervals (fairness.DefaultIntervals: 50
// replicates refitting the classifiers, normal form) and names how they
// were made in every output: the JSON settings (method and form), the text
// and Markdown reports and the HTML page; --intervals 0 turns them off and
// the reports then say there are none.
func TestDecomposeIntervalsByDefault(t *testing.T) {
	dir := fourFifthsCohort(t)
	spec := filepath.Join(dir, "spec-Hispanic.yaml")
	run := func(args ...string) string {
		t.Helper()
		var stdout, stderr bytes.Buffer
		if code := execute(append([]string{"decompose", "--spec", spec}, args...), &stdout, &stderr); code != 0 {
			t.Fatalf("decompose %v: exit %d, stderr %s", args, code, stderr.String())
		}
		return stdout.String()
	}
	var res fairness.Result
	if err := json.Unmarshal([]byte(run("--format", "json")), &res); err != nil {
		t.Fatal(err)
	}
	want := fairness.IntervalSettings{Intervals: fairness.DefaultIntervals, Method: "bootstrap-refit"}
	if iv := res.Settings.Intervals; iv == nil || *iv != want {
		t.Errorf("settings.intervals %+v, want %+v", iv, want)
	}
	if m := res.Metrics[0]; m.GapCI == nil || len(m.Contributions) == 0 || m.Contributions[0].CILow == nil {
		t.Errorf("no intervals in the result: %+v", m)
	}
	named := "50 bootstrap replicates, classifiers refitted in each, normal form (estimate ± t × bootstrap standard error; a rate's group values and gap by score intervals), level 95%"
	out := filepath.Join(t.TempDir(), "audit")
	for name, text := range map[string]string{
		"text":     run(),
		"markdown": html.UnescapeString(strings.ReplaceAll(run("--format", "markdown"), `\`, "")),
		"html":     html.UnescapeString(readFileAfter(t, func() { run("--out", out) }, filepath.Join(out, reportFile))),
	} {
		if !strings.Contains(text, named) {
			t.Errorf("%s output does not name the intervals' method %q", name, named)
		}
	}
	res = fairness.Result{}
	if err := json.Unmarshal([]byte(run("--format", "json", "--intervals", "0")), &res); err != nil {
		t.Fatal(err)
	}
	if res.Settings.Intervals != nil || res.Metrics[0].GapCI != nil {
		t.Errorf("--intervals 0: settings.intervals %+v, gap interval %+v", res.Settings.Intervals, res.Metrics[0].GapCI)
	}
	if text := run("--intervals", "0"); !strings.Contains(text, "none (decompose adds them unless --intervals 0") {
		t.Errorf("--intervals 0: the text report does not say there are none:\n%s", text)
	}
}

// readFileAfter runs fn and returns the contents of path.
func readFileAfter(t *testing.T, fn func(), path string) string {
	t.Helper()
	fn()
	return readFile(t, path)
}
