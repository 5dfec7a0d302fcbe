package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness/compare"
)

// secondModelDir runs the demo with the second model version (same
// records, a haemoglobin cut-off of 12.5 g/dL) once for the compare tests.
func secondModelDir(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "v2")
	var stdout, stderr bytes.Buffer
	if err := runDemo(demoOptions{out: dir, rows: testRows, seed: 1, intervals: testIntervals, model: 2}, &stdout, &stderr); err != nil {
		t.Fatalf("demo --model 2: %v", err)
	}
	return dir
}

// TestCompareDemoReleases reviews the demo's model 1.0 against 2.0 on the
// same records. The second model lowers the haemoglobin cut-off towards
// women's WHO cut-off (12 g/dL, WHO 2011), so it flags fewer healthy
// women: the FPR gap and haemoglobin's contribution to it must shrink
// (the direction follows from the model's definition; the magnitudes are
// checked against simulated truth in fairness/compare), with change
// intervals by the dependent (Bonferroni) method at level 2·0.95 − 1.
func TestCompareDemoReleases(t *testing.T) {
	if testing.Short() {
		t.Skip("runs the demo with the second model")
	}
	v1 := filepath.Join(demoDir(t), resultFile)
	v2 := filepath.Join(secondModelDir(t), resultFile)
	var stdout, stderr bytes.Buffer
	if code := execute([]string{"compare", v1, v2, "--format", "json"}, &stdout, &stderr); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	var rv compare.Review
	if err := json.Unmarshal(stdout.Bytes(), &rv); err != nil {
		t.Fatal(err)
	}
	if rv.Intervals == nil || rv.Intervals.Method != compare.MethodBonferroni || rv.Intervals.Level < 0.8999 || rv.Intervals.Level > 0.9001 {
		t.Fatalf("change intervals %+v, want bonferroni at 0.90", rv.Intervals)
	}
	if rv.Before.Label == rv.After.Label || !strings.Contains(rv.After.Label, "2.0") {
		t.Errorf("labels %q and %q", rv.Before.Label, rv.After.Label)
	}
	for _, m := range rv.Comparisons[0].Metrics {
		if m.Metric != "fpr" {
			continue
		}
		hb := m.Contributions[2]
		if hb.Node != "hb" || !(m.Gap.Change < 0 && m.Gap.ExcludesZero) || !(hb.Change.Change < 0 && hb.ExcludesZero) {
			t.Errorf("fpr gap change %+v, hb %+v: want both to shrink, intervals excluding zero", m.Gap, hb)
		}
	}
	for _, format := range []string{"text", "markdown", "html"} {
		stdout.Reset()
		if code := execute([]string{"compare", v1, v2, "--format", format}, &stdout, &stderr); code != exitOK {
			t.Fatalf("%s: exit %d: %s", format, code, stderr.String())
		}
		out := strings.ReplaceAll(stdout.String(), `\|`, "|") // Markdown escapes the bar
		if !strings.Contains(out, "haemoglobin | anaemia, age") || !strings.Contains(out, "2.0") || !strings.Contains(strings.ToLower(out), "synthetic") {
			t.Errorf("%s output lacks the mechanism, the version or the synthetic note", format)
		}
	}
	// A history of three runs, drawn as charts in HTML.
	page := filepath.Join(t.TempDir(), "history.html")
	if code := execute([]string{"compare", v1, v2, v1, "--format", "html", "--out", page}, &stdout, &stderr); code != exitOK {
		t.Fatalf("history: exit %d: %s", code, stderr.String())
	}
	html := readFile(t, page)
	if !strings.Contains(html, `id="chart-fpr"`) || !strings.Contains(html, "window.gapwiseCompare") || !strings.Contains(html, "(run 3)") {
		t.Errorf("history page lacks the fpr chart, its data or the distinct run labels")
	}
	// A policy on the later run: an FPR gap limit of 5 points breaches
	// (the 2.0 gap is above it), exit 3 after the output is written.
	pol := filepath.Join(t.TempDir(), "gate.yaml")
	if err := os.WriteFile(pol, []byte("rules:\n  - metric: fpr\n    max_gap: 0.001\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	stdout.Reset()
	stderr.Reset()
	if code := execute([]string{"compare", v1, v2, "--policy", pol}, &stdout, &stderr); code != exitPolicy {
		t.Fatalf("policy: exit %d, want %d: %s", code, exitPolicy, stderr.String())
	}
	if !strings.Contains(stdout.String(), "Policy gate on") || !strings.Contains(stdout.String(), "BREACH") || !strings.Contains(stderr.String(), "breached") {
		t.Errorf("policy breach not listed: %s / %s", stdout.String(), stderr.String())
	}
}

// TestCompareInputErrors: unreadable or incomparable result files exit
// with status 2 and a message naming the file and the JSON path.
func TestCompareInputErrors(t *testing.T) {
	if testing.Short() {
		t.Skip("reads the shared demo run")
	}
	good := filepath.Join(demoDir(t), resultFile)
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	var res map[string]any
	if err := json.Unmarshal([]byte(readFile(t, good)), &res); err != nil {
		t.Fatal(err)
	}
	res["groups"].(map[string]any)["comparison"] = "other"
	b, _ := json.Marshal(res)
	otherGroups := write("other.json", string(b))
	res["groups"].(map[string]any)["comparison"] = "female"
	res["metrics"] = res["metrics"].([]any)[:2]
	b, _ = json.Marshal(res)
	fewer := write("fewer.json", string(b))
	broken := write("broken.json", "{\n \"tool\": 3\n}")
	tests := []struct {
		args []string
		code int
		msg  string
	}{
		{[]string{good, broken}, exitInput, broken + ":2:10: key tool: want an object, got a JSON number"},
		{[]string{good, filepath.Join(dir, "none.json")}, exitInput, "none.json: result file not found"},
		{[]string{good, otherGroups}, exitInput, "the groups differ"},
		{[]string{good, fewer}, exitInput, "the metrics differ"},
		{[]string{good, fewer, "--shared"}, exitOK, ""},
		{[]string{good}, exitInput, "requires at least 2 arg"},
		{[]string{good, good, "--format", "pdf"}, exitInput, "--format must be"},
		{[]string{good, good, "--out", good}, exitInput, "refusing to overwrite an input"},
	}
	for _, tc := range tests {
		var stdout, stderr bytes.Buffer
		code := execute(append([]string{"compare"}, tc.args...), &stdout, &stderr)
		if code != tc.code || !strings.Contains(stderr.String(), tc.msg) {
			t.Errorf("compare %v: exit %d, stderr %q; want %d and %q", tc.args, code, stderr.String(), tc.code, tc.msg)
		}
	}
}
