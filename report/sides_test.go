package report

import (
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestSidesWording checks the residual's description for each way of
// estimating (small by construction only when both sides are combined per
// coalition) and the sentence on the two sides' agreement, in the metric's
// units (percentage points for a rate).
func TestSidesWording(t *testing.T) {
	se, z := 0.004, 2.5
	m := fairness.MetricResult{Metric: "fnr", SideAgreement: &fairness.SideAgreement{
		ComparisonEnd: fairness.SideDifference{Difference: 0.012, StdError: &se},
		ReferenceEnd:  fairness.SideDifference{Difference: -0.003},
		EndsAverage:   fairness.SideDifference{Difference: 0.0046, StdError: &se},
		MaxZ:          &z,
	}}
	if got, want := sidesLine(m, reportUnits), "comparison end +1.2 pts ± 0.4 pts, reference end −0.3 pts, their average +0.5 pts ± 0.4 pts; the largest difference, contributions included, is 2.5 standard errors (a warning above 4)."; !strings.HasSuffix(got, want) {
		t.Errorf("sidesLine = %q, want it to end %q", got, want)
	}
	if sidesLine(fairness.MetricResult{Metric: "fnr"}, reportUnits) != "" {
		t.Error("sidesLine without an agreement is not empty")
	}
	for _, tc := range []struct{ from, combine, estimator, want, not string }{
		{"both", "coalition", "weighting", "small by construction", ""},
		{"both", "metric-variance", "weighting", "stronger check", "by construction"},
		{"reference", "", "weighting", "outside the graph", "sides"},
		{"both", "metric-variance", "robust", "0 by construction: read the comparison with the weighting estimate", "sides"},
	} {
		res := &fairness.Result{Settings: fairness.Settings{EstimateFrom: tc.from, CombineSides: tc.combine}}
		got := residualNote(res, fairness.MetricResult{Metric: "fnr", Estimator: tc.estimator})
		if !strings.Contains(got, tc.want) || (tc.not != "" && strings.Contains(got, tc.not)) {
			t.Errorf("%s/%s: %q", tc.from, tc.combine, got)
		}
	}
}

// TestEstimatorWording checks the sentence on the comparison of the two
// estimators, in the metric's units, and that it follows the sides'
// sentence when both are present.
func TestEstimatorWording(t *testing.T) {
	se, z := 0.003, 1.5
	m := fairness.MetricResult{Metric: "fpr", EstimatorCheck: &fairness.EstimatorCheck{
		GapDifference: fairness.SideDifference{Difference: -0.002, StdError: &se}, MaxZ: &z}}
	want := "Robust minus weighting estimate: estimated gap −0.2 pts ± 0.3 pts; the largest difference, contributions included, is 1.5 standard errors (a warning above 4)."
	if got := estimatorLine(m, reportUnits); got != want {
		t.Errorf("estimatorLine = %q, want %q", got, want)
	}
	if got := checksLines(m, reportUnits); got != want {
		t.Errorf("checksLines without sides = %q", got)
	}
	m.SideAgreement = &fairness.SideAgreement{}
	if got := checksLines(m, reportUnits); !strings.HasPrefix(got, "Reweighted reference") || !strings.HasSuffix(got, want) {
		t.Errorf("checksLines with both = %q", got)
	}
	if estimatorLine(fairness.MetricResult{Metric: "fpr"}, reportUnits) != "" {
		t.Error("estimatorLine without a check is not empty")
	}
}
