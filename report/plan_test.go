package report

import (
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestPlan: the check table shows the inputs, the interval setting in
// words, one aligned row per mechanism and the warnings.
func TestPlan(t *testing.T) {
	spec := &fairness.Spec{File: "audit.yaml", DataPath: "cohort.csv", Seed: 3,
		Intervals: fairness.Intervals{Replicates: 50, Level: 0.9, KeepRatios: true, Form: fairness.FormPercentile}, IntervalReplicatesGiven: true}
	p := &fairness.PlanInfo{
		Label: "dx", Score: "score", Threshold: 0.5, Metrics: []string{"fnr", "fpr"},
		Groups:     fairness.GroupInfo{Column: "sex", Reference: "m", Comparison: "f", NReference: 10, NComparison: 12, EventsReference: 4, EventsComparison: 5, DroppedComparison: 1},
		Classifier: "auto", Learners: []string{"linear", "boosted"}, Folds: 5, FoldSplits: 10, Features: 3,
		ModelInputs: &fairness.ModelInputs{Declared: []string{"age", "mcv", "bmi"}, OutsideGraph: []string{"bmi"}},
		Nodes: []fairness.PlanNode{
			{Node: "age", Mechanism: "age", Columns: []string{"age"}, Features: 1},
			{Node: "panel", Mechanism: "panel | age", Columns: []string{"mcv", "rdw"}, Features: 2},
		},
		Warnings: []fairness.Warning{{Kind: fairness.KindRowsDropped, Message: "1 row was dropped"}},
	}
	var b strings.Builder
	if err := Plan(&b, spec, p); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"audit.yaml: spec and data are valid\n",
		"  groups      column sex: reference m (10 records, 4 events, 0 dropped), comparison f (12 records, 5 events, 1 dropped)\n",
		"  classifier  auto (candidates: linear, boosted), 5 folds, 10 fold splits averaged, seed 3\n",
		"  inputs      age, mcv, bmi (outside the graph: bmi)\n",
		"  intervals   50 bootstrap replicates keeping the fitted ratios, percentile form (the replicates' quantiles), level 0.9 (spec key intervals)\n",
		"  mechanism    columns   features\n",
		"  panel | age  mcv, rdw         2\n",
		"Warnings:\n  - 1 row was dropped\n",
	} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("plan lacks %q:\n%s", want, b.String())
		}
	}
	if strings.Contains(b.String(), "SYNTHETIC") {
		t.Error("a plan of real data is not marked synthetic")
	}
	// Without intervals.replicates the plan shows decompose's default;
	// with replicates 0, none.
	for _, c := range []struct {
		spec fairness.Spec
		want string
	}{
		{fairness.Spec{Intervals: fairness.Intervals{Level: 0.95}},
			"  intervals   50 bootstrap replicates refitting the classifiers, normal form (estimate ± t × bootstrap standard error; a rate's group values and gap by score intervals), level 0.95 (decompose's default; --intervals 0 for none)\n"},
		{fairness.Spec{Intervals: fairness.Intervals{Level: 0.95}, IntervalReplicatesGiven: true},
			"  intervals   none (intervals.replicates: 0; decompose --intervals N adds them)\n"},
		{fairness.Spec{Intervals: fairness.Intervals{Level: 0.95}, Estimator: "robust"},
			"  intervals   influence-function Wald intervals of the robust estimator, no refits (decompose's default with estimator robust; --intervals N for the bootstrap)\n"},
	} {
		var b strings.Builder
		if err := Plan(&b, &c.spec, p); err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(b.String(), c.want) {
			t.Errorf("plan lacks %q:\n%s", c.want, b.String())
		}
	}
}

// TestDemoSummary: one line per metric with the gap, its interval when
// there is one and the largest contribution by magnitude (the first on a
// tie), then where the files are.
func TestDemoSummary(t *testing.T) {
	lo, hi := -0.2, 0.1
	res := &fairness.Result{
		Groups: fairness.GroupInfo{Reference: "male", Comparison: "female", NReference: 5, NComparison: 6},
		Metrics: []fairness.MetricResult{
			{Metric: "fnr", Reference: 0.1, Comparison: 0.05, Gap: -0.05, GapCI: &fairness.Interval{Low: lo, High: hi},
				Contributions: []fairness.Contribution{{Mechanism: "age", Value: 0.02}, {Mechanism: "hb | age", Value: -0.07}, {Mechanism: "bmi", Value: 0.07}}},
			{Metric: "brier", Gap: 0.01},
		},
	}
	var b strings.Builder
	if err := DemoSummary(&b, res, DemoOutputs{Dir: "out", Data: "c.csv", Spec: "s.yaml", Result: "r.json", Report: "r.html"}); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"male 5 records, female 6 records\n",
		"  fnr    male 0.1000  female 0.0500  gap -0.0500 [-0.2000, +0.1000]  largest: hb | age -0.0700\n",
		"  brier  male 0.0000  female 0.0000  gap +0.0100\n",
		"Wrote c.csv, s.yaml, r.json and r.html in out\n",
		"gapwise decompose --spec out/s.yaml\n",
	} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("summary lacks %q:\n%s", want, b.String())
		}
	}
}
