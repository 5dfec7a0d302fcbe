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

// testAltGraph reads haemoglobin as depending on age alone and the
// red-cell indices on anaemia and haemoglobin: an alternative to the
// demo spec's graph over the same columns.
const testAltGraph = `graph:
  - node: age
  - node: anaemia
    parents: [age]
  - node: hb
    parents: [age]
  - node: panel
    columns: [mcv, rdw]
    parents: [anaemia, hb]
  - node: bmi
    parents: [age]
`

// oneSplitDemo copies the shared demo's spec into a temporary folder,
// reading the demo's cohort, with one fold split to keep the reruns
// cheap, and returns its path.
func oneSplitDemo(t *testing.T) string {
	t.Helper()
	dir := demoDir(t)
	src, err := os.ReadFile(filepath.Join(dir, demoSpec))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(src), "data: cohort.csv", "data: "+filepath.Join(dir, "cohort.csv"), 1) + "fold_splits: 1\n"
	spec := filepath.Join(t.TempDir(), demoSpec)
	if err := os.WriteFile(spec, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return spec
}

// noAltIntervals turns the bootstrap off, to keep the reruns cheap.
var noAltIntervals = intervalOptions{flags: fairness.Intervals{Level: 0.95}}.allSet()

func writeAltGraph(t *testing.T, src string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "alt.yaml")
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestDecomposeAltGraph: --alt-graph adds the file's graph and the
// independent-roots reading to result.json, the same bytes with 1 and 2
// workers, and every report names the runs.
func TestDecomposeAltGraph(t *testing.T) {
	spec := oneSplitDemo(t)
	alt := writeAltGraph(t, testAltGraph)
	o := decomposeOptions{spec: spec, format: formatJSON, workers: 1, intervals: noAltIntervals, alt: altGraphOptions{files: []string{alt}, labelParent: true}}
	one := decompose(t, o)
	o.workers = 2
	if two := decompose(t, o); one != two {
		t.Error("JSON with alternative graphs differs between 1 and 2 workers")
	}
	var res fairness.Result
	if err := json.Unmarshal([]byte(one), &res); err != nil {
		t.Fatal(err)
	}
	gr := res.GraphRobustness
	if gr == nil || len(gr.Runs) != 4 {
		t.Fatalf("graph_robustness %+v, want 4 runs", gr)
	}
	readings := []string{fairness.ReadingSpec, fairness.ReadingFile, fairness.ReadingIndependent, fairness.ReadingLabelParent}
	for i, run := range gr.Runs {
		if run.Reading != readings[i] || len(run.Metrics) != len(res.Metrics) {
			t.Errorf("run %d: reading %s, %d metrics", i, run.Reading, len(run.Metrics))
		}
	}
	if gr.Runs[1].File != alt || len(gr.Runs[1].FileSHA256) != 64 {
		t.Errorf("file run names %q %q", gr.Runs[1].File, gr.Runs[1].FileSHA256)
	}
	// The spec's run is the audit's own numbers.
	for i, m := range res.Metrics {
		for j, c := range m.Contributions {
			if got := gr.Runs[0].Metrics[i].Contributions[j].Value; got != c.Value {
				t.Errorf("%s %s: spec run %g, audit %g", m.Metric, c.Node, got, c.Value)
			}
		}
	}
	for _, format := range []string{formatText, formatMarkdown, formatHTML} {
		var out bytes.Buffer
		if err := render(&out, &res, format, false); err != nil {
			t.Fatal(err)
		}
		for _, w := range []string{"independent roots", filepath.Base(alt), "label only parent", "Largest contribution"} {
			if !strings.Contains(out.String(), w) {
				t.Errorf("%s output lacks %q", format, w)
			}
		}
	}
}

// TestDecomposeAltGraphBadFile: a bad graph file exits with status 2,
// naming file, line and key, before any estimation, and writes nothing.
func TestDecomposeAltGraphBadFile(t *testing.T) {
	spec := filepath.Join(demoDir(t), demoSpec) // no estimation runs: the files fail first
	tests := []struct{ name, src, want string }{
		{"missing column", strings.Replace(testAltGraph, "[mcv, rdw]", "[mcv]", 1), `alt.yaml:1: key graph: an alternative graph must hold the same columns as the spec's graph: the spec's graph columns "rdw" are in no node`},
		{"unknown parent", strings.Replace(testAltGraph, "[anaemia, hb]", "[anemia, hb]", 1), `alt.yaml:9: key graph[3].parents: unknown node "anemia"`},
		{"other key", testAltGraph + "seed: 2\n", `alt.yaml:12: key seed: unknown key "seed"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			alt := writeAltGraph(t, tc.src)
			out := filepath.Join(t.TempDir(), "out")
			var stdout, stderr bytes.Buffer
			code := execute([]string{"decompose", spec, "--intervals", "0", "--alt-graph", alt, "--out", out}, &stdout, &stderr)
			if code != exitInput || !strings.Contains(stderr.String(), tc.want) {
				t.Errorf("exit %d, stderr %q; want %d and %q", code, stderr.String(), exitInput, tc.want)
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("output folder created")
			}
		})
	}
	var stdout, stderr bytes.Buffer
	missing := filepath.Join(t.TempDir(), "none.yaml")
	if code := execute([]string{"decompose", spec, "--alt-graph", missing}, &stdout, &stderr); code != exitInput || !strings.Contains(stderr.String(), "graph file not found") {
		t.Errorf("missing file: exit %d, stderr %q", code, stderr.String())
	}
}

// TestDecomposeAltGraphSeveralGroups: alternative graphs with several
// comparison groups are refused with exit status 2 before any estimation.
func TestDecomposeAltGraphSeveralGroups(t *testing.T) {
	dir := t.TempDir()
	src, err := os.ReadFile(filepath.Join(demoDir(t), demoSpec))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(src), "data: cohort.csv", "data: "+filepath.Join(demoDir(t), "cohort.csv"), 1)
	text = strings.Replace(text, "comparison: female}", "comparison: every-other}", 1)
	text = strings.Replace(text, "groups: {reference: men, comparison: women}", "groups: {reference: men}", 1)
	spec := filepath.Join(dir, demoSpec)
	if err := os.WriteFile(spec, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	var stdout, stderr bytes.Buffer
	code := execute([]string{"decompose", spec, "--intervals", "0", "--alt-graph-independent"}, &stdout, &stderr)
	if code != exitInput || !strings.Contains(stderr.String(), "not available with several comparison groups") {
		t.Errorf("exit %d, stderr %q; want %d and the refusal", code, stderr.String(), exitInput)
	}
}
