package fairness

import (
	"strings"
	"testing"
)

func fp(v float64) *float64 { return &v }

// TestResidualAgainstSpread: a residual above the fixed thresholds is
// reported only when sampling does not explain it: its bootstrap interval
// excludes zero, or it exceeds WarnResidualZ delta-method standard errors
// (SE² = λ²·SE²_cmp + (1 − λ)²·SE²_ref; with λ = 0.5 and both 0.02,
// SE = 0.0141 by hand).
func TestResidualAgainstSpread(t *testing.T) {
	base := MetricResult{Metric: "fpr", Gap: 0.07, Estimated: -0.03, Residual: 0.10}
	agree := func(se float64) *SideAgreement {
		return &SideAgreement{ComparisonEnd: SideDifference{StdError: fp(se)}, ReferenceEnd: SideDifference{StdError: fp(se)}}
	}
	for _, tc := range []struct {
		name string
		edit func(m *MetricResult)
		want string
	}{
		{"fixed thresholds only", func(m *MetricResult) {}, "the residual 0.1000 is large:"},
		{"interval covers zero", func(m *MetricResult) { m.ResidualCI = &Interval{Low: -0.05, High: 0.25} }, ""},
		{"interval excludes zero", func(m *MetricResult) { m.ResidualCI = &Interval{Low: 0.02, High: 0.18} }, "(its bootstrap interval [+0.0200, +0.1800] excludes zero)"},
		{"within sampling error", func(m *MetricResult) { m.SideAgreement, m.ReferenceWeight = agree(0.1), fp(0.5) }, ""},
		{"beyond sampling error", func(m *MetricResult) { m.SideAgreement, m.ReferenceWeight = agree(0.02), fp(0.5) }, "(7.1 standard errors)"},
		{"small against the gap", func(m *MetricResult) { m.Residual, m.Gap = 0.01, 0.2 }, ""},
	} {
		m := base
		tc.edit(&m)
		got := residualWarning(m)
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
}

// TestInheritedSeparation: when a parent separates the groups, its
// children's high AUC is reported once, naming the parent, in place of
// each child's own weight warnings; a child that overlaps is untouched.
func TestInheritedSeparation(t *testing.T) {
	r := warningsBase()
	age := healthy
	age.AUC = 0.97
	hb := healthy
	hb.Node, hb.Mechanism, hb.Parents, hb.AUC, hb.MaxShare, hb.MeanRatio = "hb", "hb | age", []string{"age"}, 0.975, 0.3, 3
	bmi := healthy
	bmi.Node, bmi.Mechanism, bmi.Parents = "bmi", "bmi | age", []string{"age"}
	r.Mechanisms = []MechanismResult{age, hb, bmi}
	ws := Warnings(r)
	var kinds []string
	for _, w := range ws {
		kinds = append(kinds, string(w.Kind)+":"+strings.Join(w.Nodes, ","))
	}
	if strings.Join(kinds, " ") != "poor_overlap:age poor_overlap:hb" {
		t.Fatalf("warnings %v", kinds)
	}
	if !strings.Contains(ws[1].Message, "nearly separated by `age`, and the mechanisms with it among their parents inherit that separation: `hb | age` (out-of-fold AUC 0.975") {
		t.Errorf("message %q", ws[1].Message)
	}
}

// TestBothHybridsLow: with two-sided estimation the worst hybrids are
// reported when both sides' rest on too few records, not when one does.
func TestBothHybridsLow(t *testing.T) {
	r := warningsBase()
	r.Settings.EstimateFrom = "both"
	r.Weights = []WeightSide{
		{Side: "reference", Records: 12000, Worst: HybridWeight{ComparisonNodes: []string{"age"}, ESS: 2.4}},
		{Side: "comparison", Records: 9000, Worst: HybridWeight{ComparisonNodes: []string{"hb"}, ESS: 325}}, // 3.6%: low by share, as on the demo
	}
	if ws := hybridWarnings(r); len(ws) != 0 {
		t.Errorf("one side low: %v", ws)
	}
	r.Weights[1].Worst.ESS = 1.4
	ws := hybridWarnings(r)
	if len(ws) != 1 || ws[0].Kind != KindWorstHybrid || strings.Join(ws[0].Nodes, ",") != "age,hb" || !strings.Contains(ws[0].Message, "2 effective reference records out of 12,000") {
		t.Errorf("both low: %+v", ws)
	}
}

// TestSmallGroupESS: in a group of 39 an effective sample size of 32 is
// not low (it is most of the group); 3 is.
func TestSmallGroupESS(t *testing.T) {
	if lowESS(32, 39) || !lowESS(3, 39) || !lowESS(99, 2000) || lowESS(100, 900) {
		t.Error("lowESS misjudges")
	}
	if got := shapeText(0.5019, 0.5); got != "0.502" {
		t.Errorf("shapeText = %s", got)
	}
	if got := shapeText(0.61, 0.5); got != "0.61" {
		t.Errorf("shapeText = %s", got)
	}
}
