package report_test

import (
	"os"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/report"
)

func ExampleWriteMarkdown() {
	res := &fairness.Result{
		Tool:      fairness.ToolInfo{Name: "gapwise", Version: "dev"},
		Groups:    fairness.GroupInfo{Column: "sex", Reference: "men", Comparison: "women", NReference: 500, NComparison: 480, EventsReference: 50, EventsComparison: 48},
		Label:     "anaemia",
		Score:     "risk",
		Threshold: 0.5,
		Metrics: []fairness.MetricResult{{
			Metric: "fnr", Reference: 0.10, Comparison: 0.16, Gap: 0.06, Estimated: 0.055, Residual: 0.005, RecordsReference: 50, RecordsComparison: 48,
			Contributions: []fairness.Contribution{
				{Node: "age", Mechanism: "age", Value: -0.01, Alone: -0.01, IfEqualised: 0.07},
				{Node: "hb", Mechanism: "hb | anaemia", Value: 0.065, Alone: 0.06, IfEqualised: -0.005},
			},
			// hb's +6.5 points are 0.065 / 0.06 ≈ 108% of the gap; the
			// warning below concerns it.
			Headline: fairness.Headline{Lead: "hb", LeadShare: ptr(0.065 / 0.06), Verdict: fairness.SeverityCaution, Warnings: []int{0}},
		}},
		Mechanisms: []fairness.MechanismResult{
			{Node: "age", Mechanism: "age", ESSShare: 0.9},
			{Node: "hb", Mechanism: "hb | anaemia", Parents: []string{"anaemia"}, ESSShare: 0.6,
				Reliability: fairness.Reliability{Verdict: fairness.SeverityCaution, Kinds: []fairness.WarningKind{fairness.KindHeavyTail}, Estimable: true}},
		},
		Warnings: []fairness.Warning{{Kind: fairness.KindHeavyTail, Severity: fairness.SeverityCaution, Nodes: []string{"hb"},
			Message: "the weights of `hb | anaemia` have a heavy tail (shape 0.62)"}},
		Assumptions: []string{"The causal graph is right.", "The contributions are statistical estimates, not clinical or legal findings."},
	}
	if err := report.WriteMarkdown(os.Stdout, res); err != nil {
		panic(err)
	}
	// Output:
	// ## Performance audit of `risk`: women compared with men
	//
	// ### Overview
	//
	// | Metric | men (reference) | women (comparison) | Gap | Largest contribution | Reliability |
	// | --- | ---: | ---: | ---: | --- | --- |
	// | false-negative rate | 10.0% | 16.0% | +6.0 pts | how `hb` presents given `anaemia`: +6.5 pts; 108% of the gap (others offset part) | **Use with caution**, because the weights have a heavy tail for the mechanism of `hb` (warning 1) |
	//
	// These are statistical estimates that hold under the causal assumptions listed in this report (the graph is right, no hidden confounders, overlap between the groups); they are not clinical or legal findings. Local regulation and institutional review govern how a model may be used and changed.
	//
	// ### Warnings
	//
	// 1. **caution**: the weights of `hb | anaemia` have a heavy tail \(shape 0.62\)
	//
	// Groups by `sex`: reference men (500 records, 50 events), comparison women (480 records, 48 events). Label `anaemia`, decision threshold 0.5.
	//
	// The false-negative rate is 16.0% for women and 10.0% for men (reference group). The gap, women minus men, is +6.0 pts: the false-negative rate is higher for women. Widening the gap: how `hb` presents given `anaemia`, +6.5 pts — unreliable: a warning names it. Narrowing it: the mix of `age`, −1.0 pts. The contributions add up to +5.5 pts; the residual, +0.5 pts, is estimation error or the effect of something outside the graph, which the method cannot assign.
	//
	// ### Metrics by group
	//
	// | Metric | men (reference) | women (comparison) | Gap | From |
	// | --- | ---: | ---: | ---: | --- |
	// | false-negative rate | 10.0% | 16.0% | +6.0 pts | 50 / 48 positives |
	//
	// ### Decomposition of the false-negative rate gap
	//
	// | Mechanism | Contribution | 95% interval | Alone | Gap if equalised |
	// | --- | ---: | ---: | ---: | ---: |
	// | `age` | −1.0 pts | – | −1.0 pts | +7.0 pts |
	// | `hb \| anaemia` (unreliable) | +6.5 pts | – | +6.0 pts | −0.5 pts |
	// | Sum of contributions | +5.5 pts | | | |
	// | Residual (not assigned) | +0.5 pts | | | |
	// | Observed gap | +6.0 pts | – | | |
	//
	// The residual holds estimation error and the effect of anything outside the graph that differs between the groups.
	//
	// ### Assumptions and cautions
	//
	// - The causal graph is right.
	// - The contributions are statistical estimates, not clinical or legal findings.
	//
	// _Statistical estimates under the stated causal assumptions, not clinical or legal findings. gapwise dev, seed 0._
}

func ptr(v float64) *float64 { return &v }
