package fairness

import (
	"reflect"
	"testing"
)

// TestSetReliability: a mechanism's verdict is the most serious severity
// among the warnings whose nodes include it (fairness/reliability.go);
// warnings that name it only in their sentence, or concern a metric, do
// not count.
func TestSetReliability(t *testing.T) {
	r := &Result{Mechanisms: []MechanismResult{{Node: "age"}, {Node: "hb"}, {Node: "bmi"}}}
	r.Warnings = []Warning{
		{Kind: KindRowsDropped, Severity: SeverityNote, Nodes: []string{}, Message: "`bmi` is named here but not concerned"},
		{Kind: KindDominantRecord, Severity: SeverityCaution, Nodes: []string{"hb"}},
		{Kind: KindHeavyTail, Severity: SeverityUnreliable, Nodes: []string{"hb"}},
		{Kind: KindDominantRecord, Severity: SeverityCaution, Nodes: []string{"hb"}},
		{Kind: KindWorstHybrid, Severity: SeverityUnreliable, Nodes: []string{"age", "hb"}},
		{Kind: KindLargeResidual, Severity: SeverityCaution, Metric: "fnr", Nodes: []string{}, Message: "`age`"},
		{Kind: KindRatiosClipped, Severity: SeverityCaution, Nodes: []string{"age"}},
		{Kind: KindNotEstimable, Severity: SeverityUnreliable, Nodes: []string{"hb"}, Message: "hb: no overlap"},
	}
	r.Metrics = []MetricResult{{Metric: "fnr", Contributions: []Contribution{{Node: "age"}, {Node: "hb"}, {Node: "bmi"}}}}
	setReliability(r)
	for _, c := range r.Metrics[0].Contributions {
		if c.NotEstimable != (c.Node == "hb") {
			t.Errorf("%s: not estimable %v", c.Node, c.NotEstimable)
		}
	}
	want := []Reliability{
		{Verdict: SeverityUnreliable, Kinds: []WarningKind{KindWorstHybrid, KindRatiosClipped}, Estimable: true},
		{Verdict: SeverityUnreliable, Kinds: []WarningKind{KindDominantRecord, KindHeavyTail, KindWorstHybrid, KindNotEstimable}, NotEstimable: "hb: no overlap"},
		{Verdict: VerdictSound, Kinds: []WarningKind{}, Estimable: true},
	}
	for i, m := range r.Mechanisms {
		if !reflect.DeepEqual(m.Reliability, want[i]) {
			t.Errorf("%s: reliability %+v, want %+v", m.Node, m.Reliability, want[i])
		}
	}
	// A caution alone gives a caution.
	if got := assess("x", []Warning{{Kind: KindMeanRatioOff, Severity: SeverityCaution, Nodes: []string{"x"}}}); got.Verdict != SeverityCaution {
		t.Errorf("verdict %q, want caution", got.Verdict)
	}
}
