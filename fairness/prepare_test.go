package fairness

import (
	"errors"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/metrics"
)

// TestPlanAndRunAgreeOnUndefinedMetric: check (Plan) and decompose (Run)
// report an undefined metric with the same message, both from
// attribution.Observe. Site a has no positives (TPR undefined) and site b
// no negatives (FPR undefined); the reference group is checked first, so
// both name TPR in site a, the message gapwise gave before Observe existed
// (baseline binary at 07b2ed3, by hand on this data).
func TestPlanAndRunAgreeOnUndefinedMetric(t *testing.T) {
	spec := writeAudit(t, strings.Replace(smallSpec, "metrics: [fpr, fnr, brier]", "metrics: [fpr, tpr]", 1),
		"site,x,dx,z,score\na,1,0,1,0.95\na,2,0,1,0.1\nb,1,1,1,0.3\nb,2,1,2,0.2\n")
	want := `metric tpr is undefined in group "a" (site): it has no positives`
	_, planErr := Plan(spec)
	_, runErr := Run(spec, RunOptions{Workers: 1})
	for name, err := range map[string]error{"Plan": planErr, "Run": runErr} {
		var me *MetricUndefinedError
		if err == nil || err.Error() != want || !errors.As(err, &me) || !IsInputError(err) {
			t.Errorf("%s: got %v, want %s", name, err, want)
		}
	}
}

// TestUndefinedReasonsFromFacts: the one mapping of attribution's
// undefined-metric error gives, for every metric of the facts table and
// both groups, the group's value and the metric's reason.
func TestUndefinedReasonsFromFacts(t *testing.T) {
	spec, err := ParseSpec("spec.yaml", []byte(exampleSpec))
	if err != nil {
		t.Fatal(err)
	}
	groups := map[string]string{attribution.GroupReference: spec.Groups.Reference, attribution.GroupComparison: spec.Groups.Comparison}
	for _, f := range metrics.Facts() {
		for g, value := range groups {
			err := decomposeError(spec, &attribution.MetricError{Metric: f.Name, Group: g, Err: metrics.ErrUndefined})
			var me *MetricUndefinedError
			if !errors.As(err, &me) || me.Metric != f.Name || me.Group != value || me.Reason != f.UndefinedReason() || me.Reason == "" {
				t.Errorf("%s in %s: %+v", f.Name, g, err)
			}
		}
	}
	if err := decomposeError(spec, nil); err != nil {
		t.Errorf("nil maps to %v", err)
	}
}

// TestUndefinedMessagesUnchanged pins the sentence users see for every
// metric undefined in a group: the messages of the baseline binary at
// 07b2ed3, before the reasons moved into the metrics facts table (its
// switch in fairness/plan.go, copied by hand).
func TestUndefinedMessagesUnchanged(t *testing.T) {
	spec, err := ParseSpec("spec.yaml", []byte(exampleSpec))
	if err != nil {
		t.Fatal(err)
	}
	baseline := map[string]string{
		"fpr": "it has no negatives", "tpr": "it has no positives", "fnr": "it has no positives",
		"ppv": "no record is decided positive at this threshold", "npv": "no record is decided negative at this threshold",
		"selection_rate": "it has no records", "accuracy": "it has no records", "brier": "it has no records",
		"log_loss": "it has no records", "calibration_in_the_large": "it has no records", "ece": "it has no records",
		"auc": "it needs both positives and negatives",
	}
	if len(baseline) != len(metrics.Names()) {
		t.Errorf("baseline has %d metrics, the facts table %d", len(baseline), len(metrics.Names()))
	}
	for _, name := range metrics.Names() {
		want := `metric ` + name + ` is undefined in group "north" (clinic): ` + baseline[name]
		if got := undefinedMetric(spec, name, false).Error(); got != want {
			t.Errorf("got %q, want %q", got, want)
		}
	}
}
