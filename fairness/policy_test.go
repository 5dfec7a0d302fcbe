package fairness

import (
	"math"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness/policy"
)

// TestImpactRatios: on a run with fast bootstrap intervals every rate has
// its impact ratio comparison ÷ reference (its definition), with an
// interval and an interval of lower ÷ higher inside [0, 1]; the Brier
// score, not a rate, has none. The subjects a policy judges carry the
// same numbers, and ApplyPolicy records the outcome.
func TestImpactRatios(t *testing.T) {
	spec := writeAudit(t, strings.Replace(smallSpec, "metrics: [fpr, fnr, brier]", "metrics: [fpr, fnr, selection_rate, brier]", 1), smallData(400))
	r, err := Run(spec, RunOptions{Workers: 2, Intervals: &Intervals{Replicates: 20, Level: 0.9, KeepRatios: true}})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range r.Metrics {
		if m.Metric == "brier" {
			if m.ImpactRatio != nil || m.ImpactRatioCI != nil || m.LowerToHigherCI != nil {
				t.Errorf("brier has a ratio: %v %v %v", m.ImpactRatio, m.ImpactRatioCI, m.LowerToHigherCI)
			}
			continue
		}
		if m.ImpactRatio == nil || *m.ImpactRatio != m.Comparison/m.Reference {
			t.Errorf("%s: impact ratio %v, want %v / %v", m.Metric, m.ImpactRatio, m.Comparison, m.Reference)
		}
		if ci := m.ImpactRatioCI; ci == nil || !(ci.Low <= ci.High) || ci.Low < 0 {
			t.Errorf("%s: impact ratio interval %+v", m.Metric, ci)
		}
		if ci := m.LowerToHigherCI; ci == nil || !(0 <= ci.Low && ci.Low <= ci.High && ci.High <= 1) {
			t.Errorf("%s: lower/higher interval %+v", m.Metric, ci)
		}
	}
	subjects := PolicySubjects(r)
	if len(subjects) != len(r.Metrics) {
		t.Fatalf("%d subjects for %d metrics", len(subjects), len(r.Metrics))
	}
	for i, s := range subjects {
		m := r.Metrics[i]
		if s.Metric != m.Metric || s.Reference != "a" || s.Comparison != "b" || s.ReferenceValue != m.Reference || s.ComparisonValue != m.Comparison ||
			s.GapCI == nil || s.GapCI.Low != m.GapCI.Low || s.Level != 0.9 {
			t.Errorf("subject %+v for %+v", s, m.Metric)
		}
	}
	p, err := policy.Parse("p.yaml", []byte("rules:\n  - {metric: fnr, max_gap: 1, judge: worst_bound}\n  - {preset: four-fifths, judge: best_bound}\n"))
	if err != nil {
		t.Fatal(err)
	}
	if err := ApplyPolicy(r, p); err != nil {
		t.Fatal(err)
	}
	if o := r.Policy; o == nil || len(o.Checks) != 2 || o.Checks[0].Status != policy.StatusPass || o.Checks[1].Value == nil ||
		math.Abs(*o.Checks[1].Value-r.Metrics[2].LowerToHigherCI.High) > 0 {
		t.Errorf("outcome %+v", r.Policy)
	}
	if !IsInputError(&policy.Error{File: "p.yaml", Err: policy.ErrBadValue}) {
		t.Error("a policy error is not an input error")
	}
}
