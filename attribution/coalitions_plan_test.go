package attribution

import (
	"errors"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// TestMetricPlanCoversFacts: the engine plans every metric of the facts
// table, alone and all together, and rejects names outside it; the
// records a planned metric reads (metricRecords, behind its effective
// record count) are exactly those its Fact.Counts names, by the
// definitions of the record classes (negatives: y = 0, positive decision:
// s ≥ t, ...). The values the engine then computes are checked against
// brute force for every name in TestEvaluateCoalitionsBruteForce.
func TestMetricPlanCoversFacts(t *testing.T) {
	y := []float64{0, 0, 1, 1}
	s := []float64{0.2, 0.7, 0.3, 0.8}
	const threshold = 0.5
	counted := map[metrics.Records][]bool{
		metrics.AllRecords:      {true, true, true, true},
		metrics.Negatives:       {true, true, false, false},
		metrics.Positives:       {false, false, true, true},
		metrics.DecidedPositive: {false, true, false, true},
		metrics.DecidedNegative: {true, false, true, false},
		metrics.BothClasses:     {true, true, true, true},
	}
	for _, f := range metrics.Facts() {
		p, err := newMetricPlan([]string{f.Name}, 7)
		if err != nil {
			t.Errorf("%s: %v", f.Name, err)
			continue
		}
		if ranked := f.Name == metrics.NameAUC; (p.auc == 0) != ranked || (p.statMetrics() == 1) == ranked {
			t.Errorf("%s: auc index %d, %d Stats metrics", f.Name, p.auc, p.statMetrics())
		}
		want, ok := counted[f.Counts]
		if !ok {
			t.Errorf("%s: no record class %v in the test", f.Name, f.Counts)
			continue
		}
		got := metricRecords(f.Name, y, s, threshold, 7)
		for r := range want {
			if got[r] != want[r] {
				t.Errorf("%s: record %d (y=%v, s=%v) counted %v, want %v", f.Name, r, y[r], s[r], got[r], want[r])
			}
		}
	}
	if _, err := newMetricPlan(metrics.Names(), 10); err != nil {
		t.Errorf("all names: %v", err)
	}
	if _, err := newMetricPlan([]string{metrics.NameFPR, "f1"}, 10); !errors.Is(err, ErrUnsupportedMetric) {
		t.Errorf("f1: err = %v, want ErrUnsupportedMetric", err)
	}
}
