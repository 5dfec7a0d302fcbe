package fairness

import (
	"errors"
	"fmt"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
)

// exampleSpec is the spec format exactly as documented for users.
const exampleSpec = `data: cohort.csv          # relative paths resolve against the spec file's folder
label: dx                 # binary outcome; also a node of the graph
score: score              # the model's probability
threshold: 0.4            # positive decision when score >= threshold
groups:
  column: clinic
  reference: north
  comparison: south
metrics: [fpr, fnr, brier, calibration_in_the_large]
graph:                    # every node once; columns default to [node]
  - node: age
  - node: dx
    parents: [age]
  - node: labs
    columns: [m1, m2]
    parents: [dx, age]
seed: 1
`

func TestParseSpecExample(t *testing.T) {
	s, err := ParseSpec(filepath.Join("audits", "spec.yaml"), []byte(exampleSpec))
	if err != nil {
		t.Fatal(err)
	}
	want := &Spec{
		File: filepath.Join("audits", "spec.yaml"), Data: "cohort.csv", DataPath: filepath.Join("audits", "cohort.csv"),
		Label: "dx", Score: "score", Threshold: 0.4,
		Groups:  GroupSpec{Column: "clinic", Reference: "north", Comparison: "south"},
		Metrics: []string{"fpr", "fnr", "brier", "calibration_in_the_large"},
		Graph: []NodeSpec{
			{Node: "age", Columns: []string{"age"}, Line: 11},
			{Node: "dx", Columns: []string{"dx"}, Parents: []string{"age"}, Line: 12},
			{Node: "labs", Columns: []string{"m1", "m2"}, Parents: []string{"dx", "age"}, Line: 14},
		},
		Seed: 1, Missing: MissingError, Folds: DefaultFolds, Classifier: ClassifierAuto, ECEBins: 10,
		Estimator: attribution.DefaultEstimator.String(), EstimateFrom: attribution.DefaultSide.String(), CombineSides: attribution.DefaultMix.String(), ExactLimit: 16, Intervals: Intervals{Level: DefaultIntervalLevel},
	}
	// Compare exported fields only.
	got := *s
	got.SHA256, got.lines, got.catLines = "", nil, nil
	for i := range got.Graph {
		got.Graph[i].columnLines, got.Graph[i].parentLines = nil, nil
	}
	if !reflect.DeepEqual(&got, want) {
		t.Errorf("got  %+v\nwant %+v", got, *want)
	}
	if s.ScoreIsNode() {
		t.Error("ScoreIsNode() = true")
	}
	if c := strings.Join(s.Columns(), ","); c != "age,dx,m1,m2" {
		t.Errorf("Columns() = %s", c)
	}
	// SHA-256 of the spec's bytes; the expected digest was computed with
	// Python's hashlib.sha256 (/usr/bin/python3).
	if s.SHA256 != "9884a0d14d2b0fba344998fcb6bb30169d1b2f477a827839e5f1ff9fab64e3ee" {
		t.Errorf("SHA256 = %s", s.SHA256)
	}
}

func TestParseSpecOptionalKeys(t *testing.T) {
	src := exampleSpec + `missing: drop
categorical: [m2]
folds: 3
fold_splits: 7
classifier: expanded
ece_bins: 15
synthetic: true
title: Anaemia screening (synthetic)
estimate_from: both
combine_sides: coalition
clip_ratios: 0.98
exact_limit: 12
intervals: {replicates: 50, level: 0.9, keep_ratios: true, form: percentile}
`
	s, err := ParseSpec("/abs/spec.yaml", []byte(strings.Replace(src, "data: cohort.csv", "data: /data/cohort.csv", 1)))
	if err != nil {
		t.Fatal(err)
	}
	if !s.DropMissing() || s.Folds != 3 || s.FoldSplits != 7 || s.Classifier != "expanded" || s.ECEBins != 15 || !s.Synthetic ||
		s.Title != "Anaemia screening (synthetic)" || !reflect.DeepEqual(s.Categorical, []string{"m2"}) || s.DataPath != "/data/cohort.csv" ||
		s.EstimateFrom != "both" || s.CombineSides != "coalition" || s.ClipRatios != 0.98 || s.ExactLimit != 12 ||
		s.Intervals != (Intervals{Replicates: 50, Level: 0.9, KeepRatios: true, Form: FormPercentile}) || !s.IntervalReplicatesGiven {
		t.Errorf("got %+v", s)
	}
}

// TestParseSpecErrors checks that each mistake gives a *SpecError wrapping
// the right sentinel and naming the line and key.
func TestParseSpecErrors(t *testing.T) {
	edit := func(old, new string) string { return strings.Replace(exampleSpec, old, new, 1) }
	tests := []struct {
		name, src string
		sentinel  error
		line      int
		key, msg  string
	}{
		{"unknown parent", edit("parents: [dx, age]", "parents: [dx, lbs]"), ErrUnknownNode, 16, "graph[2].parents", `unknown node "lbs"`},
		{"duplicate node", edit("- node: labs", "- node: age"), ErrDuplicateNode, 14, "graph[2].node", `node "age" is already defined`},
		{"column in two nodes", edit("columns: [m1, m2]", "columns: [m1, age]"), ErrColumnReuse, 15, "graph[2].columns", `column "age" already belongs to node "age"`},
		{"self parent", edit("parents: [age]", "parents: [dx]"), ErrCycle, 13, "graph[1].parents", `lists itself`},
		{"cycle", edit("  - node: age\n", "  - node: age\n    parents: [labs]\n"), ErrCycle, 11, "graph", "age → dx → labs → age"},
		{"label not node", edit("label: dx", "label: anaemia"), ErrLabelNotNode, 2, "label", `"anaemia"`},
		{"group in graph", edit("column: clinic", "column: m1"), ErrGroupInGraph, 5, "groups.column", `"m1"`},
		{"score with other columns", edit("columns: [m1, m2]", "columns: [m1, score]"), ErrScoreInGraph, 14, "graph[2].columns", "node of its own"},
		{"score equals label", edit("score: score", "score: dx"), ErrBadValue, 3, "score", "same column"},
		{"same groups", edit("comparison: south", "comparison: north"), ErrBadValue, 6, "groups", `both "north"`},
		{"threshold 1", edit("threshold: 0.4", "threshold: 1"), ErrThresholdRange, 4, "threshold", "not strictly between 0 and 1"},
		{"threshold negative", edit("threshold: 0.4", "threshold: -0.2"), ErrThresholdRange, 4, "threshold", "-0.2"},
		{"threshold nan", edit("threshold: 0.4", "threshold: .nan"), ErrThresholdRange, 4, "threshold", ".nan"},
		{"threshold text", edit("threshold: 0.4", "threshold: high"), ErrBadValue, 4, "threshold", `"high"`},
		{"unknown metric", edit("brier,", "bryer,"), ErrUnknownMetric, 9, "metrics[2]", `unknown metric "bryer"`},
		{"duplicate metric", edit("brier,", "fpr,"), ErrBadValue, 9, "metrics[2]", "twice"},
		{"empty metrics", edit("[fpr, fnr, brier, calibration_in_the_large]", "[]"), ErrBadValue, 9, "metrics", "at least one"},
		{"unknown key", exampleSpec + "colour: red\n", ErrUnknownKey, 18, "colour", `unknown key "colour"`},
		{"unknown node key", edit("  - node: age\n", "  - node: age\n    parent: [dx]\n"), ErrUnknownKey, 12, "graph[0].parent", `unknown key "parent"`},
		{"unknown group key", edit("  column: clinic", "  colum: clinic"), ErrUnknownKey, 6, "groups.colum", "unknown key"},
		{"duplicate key", exampleSpec + "label: hb\n", ErrDuplicateKey, 18, "label", "first on line 2"},
		{"missing label", edit("label: dx ", "#"), ErrMissingKey, 0, "label", `missing required key "label"`},
		{"missing group value", edit("  comparison: south\n", ""), ErrMissingKey, 6, "groups.comparison", "missing required key"},
		{"node without name", edit("  - node: age\n", "  - columns: [age]\n"), ErrMissingKey, 11, "graph[0].node", "missing required key"},
		{"empty label", edit("label: dx ", "label: ''"), ErrBadValue, 2, "label", "non-empty"},
		{"folds 1", exampleSpec + "folds: 1\n", ErrBadValue, 18, "folds", "at least 2"},
		{"folds text", exampleSpec + "folds: many\n", ErrBadValue, 18, "folds", `"many"`},
		{"fold_splits 0", exampleSpec + "fold_splits: 0\n", ErrBadValue, 18, "fold_splits", "between 1 and 100, got 0"},
		{"fold_splits over the limit", exampleSpec + "fold_splits: 101\n", ErrBadValue, 18, "fold_splits", "between 1 and 100, got 101"},
		{"fold_splits text", exampleSpec + "fold_splits: auto\n", ErrBadValue, 18, "fold_splits", `"auto"`},
		{"seed negative", edit("seed: 1", "seed: -1"), ErrBadValue, 17, "seed", "non-negative"},
		{"missing mode", exampleSpec + "missing: ignore\n", ErrBadValue, 18, "missing", "error, drop"},
		{"classifier", exampleSpec + "classifier: forest\n", ErrUnknownClassifier, 18, "classifier", `"forest"`},
		{"ece bins", exampleSpec + "ece_bins: 0\n", ErrBadValue, 18, "ece_bins", "at least 1"},
		{"synthetic", exampleSpec + "synthetic: maybe\n", ErrBadValue, 18, "synthetic", "true or false"},
		{"estimate_from", exampleSpec + "estimate_from: left\n", ErrBadValue, 18, "estimate_from", "reference, comparison, both"},
		{"combine_sides", exampleSpec + "combine_sides: average\n", ErrBadValue, 18, "combine_sides", "coalition, metric-ess, metric-variance"},
		{"clip_ratios 1", exampleSpec + "clip_ratios: 1\n", ErrBadValue, 18, "clip_ratios", "strictly between 0 and 1"},
		{"clip_ratios text", exampleSpec + "clip_ratios: most\n", ErrBadValue, 18, "clip_ratios", `"most"`},
		{"exact_limit 0", exampleSpec + "exact_limit: 0\n", ErrBadValue, 18, "exact_limit", "between 1 and 26"},
		{"exact_limit 40", exampleSpec + "exact_limit: 40\n", ErrBadValue, 18, "exact_limit", "got 40"},
		{"intervals not mapping", exampleSpec + "intervals: 200\n", ErrBadValue, 18, "intervals", "must be a mapping"},
		{"intervals 1 replicate", exampleSpec + "intervals:\n  replicates: 1\n", ErrBadValue, 19, "intervals.replicates", "0 (no intervals) or at least 2"},
		{"intervals level 95", exampleSpec + "intervals:\n  replicates: 20\n  level: 95\n", ErrBadValue, 20, "intervals.level", "strictly between 0 and 1"},
		{"intervals keep text", exampleSpec + "intervals: {keep_ratios: sometimes}\n", ErrBadValue, 18, "intervals.keep_ratios", "true or false"},
		{"intervals form", exampleSpec + "intervals: {form: bca}\n", ErrBadValue, 18, "intervals.form", `normal or percentile, got "bca"`},
		{"intervals unknown key", exampleSpec + "intervals:\n  reps: 20\n", ErrUnknownKey, 19, "intervals.reps", `unknown key "reps"`},
		{"intervals duplicate", exampleSpec + "intervals: {level: 0.9, level: 0.8}\n", ErrDuplicateKey, 18, "intervals.level", "twice"},
		{"categorical not in graph", exampleSpec + "categorical: [clinic]\n", ErrBadValue, 18, "categorical[0]", "not a column of any graph node"},
		{"categorical label", exampleSpec + "categorical: [dx]\n", ErrBadValue, 18, "categorical[0]", "label or score"},
		{"graph not list", exampleSpec[:strings.Index(exampleSpec, "graph:")] + "graph: age\n", ErrBadValue, 10, "graph", "non-empty list"},
		{"yaml syntax", edit("  reference: north", "  reference: [north"), ErrSyntax, 7, "", "invalid YAML"},
		// yaml.v3 reports the line of the scalar being scanned (line 6,
		// "clinic") when it meets the tab that starts line 7.
		{"yaml tab", edit("  reference: north", "\treference: north"), ErrSyntax, 6, "", "tab"},
		{"not a mapping", "- a\n- b\n", ErrBadValue, 1, "", "mapping"},
		{"empty", "", ErrMissingKey, 0, "data", "empty"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseSpec("spec.yaml", []byte(tc.src))
			if !errors.Is(err, tc.sentinel) {
				t.Fatalf("error %v does not wrap %v", err, tc.sentinel)
			}
			var se *SpecError
			if !errors.As(err, &se) {
				t.Fatalf("error %T is not a *SpecError", err)
			}
			if se.Line != tc.line || se.Key != tc.key {
				t.Errorf("line %d key %q, want line %d key %q (%v)", se.Line, se.Key, tc.line, tc.key, err)
			}
			prefix := "spec.yaml"
			if tc.line > 0 {
				prefix = fmt.Sprintf("spec.yaml:%d", tc.line)
			}
			if !strings.HasPrefix(err.Error(), prefix) || !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("message %q lacks %q or %q", err, prefix, tc.msg)
			}
			if !IsInputError(err) {
				t.Error("IsInputError = false")
			}
		})
	}
}

func TestParseSpecClassifiers(t *testing.T) {
	for _, c := range []string{ClassifierAuto, ClassifierLinear, ClassifierExpanded, ClassifierBoosted} {
		s, err := ParseSpec("spec.yaml", []byte(exampleSpec+"classifier: "+c+"\n"))
		if err != nil || s.Classifier != c {
			t.Errorf("classifier %s: %v", c, err)
		}
	}
}

func TestLoadSpecNotFound(t *testing.T) {
	_, err := LoadSpec(filepath.Join(t.TempDir(), "nope.yaml"))
	if !errors.Is(err, ErrSpecNotFound) || !strings.Contains(err.Error(), "nope.yaml") {
		t.Errorf("got %v", err)
	}
}

func ExampleParseSpec() {
	s, err := ParseSpec("audits/spec.yaml", []byte(exampleSpec))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(s.DataPath, s.Groups.Reference, "vs", s.Groups.Comparison, s.Metrics)
	for _, n := range s.Graph {
		fmt.Println(n.Node, n.Columns, n.Parents)
	}
	_, err = ParseSpec("audits/spec.yaml", []byte(strings.Replace(exampleSpec, "[dx, age]", "[dx, lbs]", 1)))
	fmt.Println(err)
	// Output:
	// audits/cohort.csv north vs south [fpr fnr brier calibration_in_the_large]
	// age [age] []
	// dx [dx] [age]
	// labs [m1 m2] [dx age]
	// audits/spec.yaml:16: key graph[2].parents: unknown node "lbs"
}

func BenchmarkParseSpec(b *testing.B) {
	src := []byte(exampleSpec)
	for b.Loop() {
		if _, err := ParseSpec("spec.yaml", src); err != nil {
			b.Fatal(err)
		}
	}
}

// TestIntervalsByDefault: what `gapwise decompose` runs without its
// interval flags: a spec silent on intervals gets DefaultIntervals; one
// with a form but no replicates the default replicates of that form; one
// with replicates its own, 0 meaning none; with estimator robust none
// unless asked.
func TestIntervalsByDefault(t *testing.T) {
	for _, c := range []struct {
		add  string
		want Intervals
	}{
		{"", DefaultIntervals},
		{"intervals: {level: 0.9}\n", Intervals{Replicates: 50, Level: 0.9, Form: FormNormal}},
		{"intervals: {form: percentile}\n", Intervals{Replicates: 200, Level: 0.95, Form: FormPercentile}},
		{"intervals: {replicates: 0}\n", Intervals{Replicates: 0, Level: 0.95, Form: FormNormal}},
		{"intervals: {replicates: 30, keep_ratios: true}\n", Intervals{Replicates: 30, Level: 0.95, KeepRatios: true, Form: FormNormal}},
		// The robust estimator's influence-function intervals need no
		// bootstrap; asked for, it runs.
		{"estimator: robust\n", Intervals{Replicates: 0, Level: 0.95, Form: FormNormal}},
		{"estimator: robust\nintervals: {replicates: 20}\n", Intervals{Replicates: 20, Level: 0.95, Form: FormNormal}},
	} {
		s, err := ParseSpec("spec.yaml", []byte(exampleSpec+c.add))
		if err != nil {
			t.Fatal(err)
		}
		if got := s.IntervalsByDefault(); got != c.want {
			t.Errorf("%q: %+v, want %+v", c.add, got, c.want)
		}
	}
	if DefaultIntervals != (Intervals{Replicates: 50, Level: 0.95, Form: FormNormal}) {
		t.Errorf("DefaultIntervals %+v", DefaultIntervals)
	}
}
