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
	for _, tc := range []struct{ from, combine, want, not string }{
		{"both", "coalition", "small by construction", ""},
		{"both", "metric-variance", "stronger check", "by construction"},
		{"reference", "", "outside the graph", "sides"},
	} {
		res := &fairness.Result{Settings: fairness.Settings{EstimateFrom: tc.from, CombineSides: tc.combine}}
		got := residualNote(res)
		if !strings.Contains(got, tc.want) || (tc.not != "" && strings.Contains(got, tc.not)) {
			t.Errorf("%s/%s: %q", tc.from, tc.combine, got)
		}
	}
}
