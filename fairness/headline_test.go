package fairness

import (
	"math"
	"reflect"
	"testing"
)

// TestHeadline: the lead is the estimable contribution of largest size,
// its share is φ/gap (by hand: −0.05/−0.04 = 1.25, 0.01/−0.04 = −0.25),
// and the verdict is the most serious warning about the metric, the
// lead's mechanism or the whole audit.
func TestHeadline(t *testing.T) {
	ws := []Warning{
		{Kind: KindRowsDropped, Severity: SeverityNote, Nodes: []string{}},                     // 0: the audit
		{Kind: KindHeavyTail, Severity: SeverityCaution, Nodes: []string{"hb"}},                // 1: hb
		{Kind: KindDominantRecord, Severity: SeverityCaution, Nodes: []string{"age"}},          // 2: age
		{Kind: KindFewRecords, Severity: SeverityUnreliable, Metric: "fpr", Nodes: []string{}}, // 3: another metric
		{Kind: KindLargeResidual, Severity: SeverityCaution, Metric: "fnr", Nodes: []string{}}, // 4: this metric
		{Kind: KindWorstHybrid, Severity: SeverityUnreliable, Nodes: []string{"age", "bmi"}},   // 5: age and bmi
	}
	contribs := func(notEstimable string, vs ...float64) []Contribution {
		var out []Contribution
		for i, n := range []string{"age", "hb", "bmi"} {
			out = append(out, Contribution{Node: n, Value: vs[i], NotEstimable: n == notEstimable})
		}
		return out
	}
	share := func(v float64) *float64 { return &v }
	tests := []struct {
		name string
		m    MetricResult
		ws   []Warning
		want Headline
	}{
		{"lead widens more than the gap", MetricResult{Metric: "fnr", Gap: -0.04, Contributions: contribs("", 0.01, -0.05, 0.001)}, ws,
			Headline{Lead: "hb", LeadShare: share(1.25), Verdict: SeverityCaution, Warnings: []int{0, 1, 4}}},
		{"lead narrows the gap", MetricResult{Metric: "fnr", Gap: -0.04, Contributions: contribs("hb", 0.01, -0.05, 0.001)}, ws[:3],
			Headline{Lead: "age", LeadShare: share(-0.25), Verdict: SeverityCaution, Warnings: []int{0, 2}}},
		{"ties go to the first in graph order", MetricResult{Metric: "auc", Gap: 0.02, Contributions: contribs("", 0.01, -0.01, 0.01)}, ws,
			Headline{Lead: "age", LeadShare: share(0.5), Verdict: SeverityUnreliable, Warnings: []int{0, 2, 5}}},
		{"no gap, no share", MetricResult{Metric: "fnr", Gap: 0, Contributions: contribs("", 0.01, -0.01, 0)}, nil,
			Headline{Lead: "age", Verdict: VerdictSound, Warnings: []int{}}},
		{"nothing estimable: every mechanism's warnings", MetricResult{Metric: "ppv", Gap: 0.1, Contributions: []Contribution{{Node: "hb", NotEstimable: true}}},
			[]Warning{{Kind: KindNotEstimable, Severity: SeverityUnreliable, Nodes: []string{"hb"}}},
			Headline{Verdict: SeverityUnreliable, Warnings: []int{0}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := headline(tc.m, tc.ws)
			if (got.LeadShare == nil) != (tc.want.LeadShare == nil) ||
				(got.LeadShare != nil && math.Abs(*got.LeadShare-*tc.want.LeadShare) > 1e-12) {
				t.Errorf("share %v, want %v", got.LeadShare, tc.want.LeadShare)
			}
			got.LeadShare, tc.want.LeadShare = nil, nil
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("headline %+v, want %+v", got, tc.want)
			}
		})
	}
}
