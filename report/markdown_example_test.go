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
	// Intervals: none \(decompose adds them unless --intervals 0 or intervals.replicates: 0 turns them off\); no value here shows its sampling error.
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
	// ### Appendix: reporting items
	//
	// Which items of three published reporting frameworks this report gives evidence for, and which it does not. The list describes what gapwise&#39;s reports contain; it is the same for every audit.
	//
	// | Framework | Item | This report | What it gives | Where |
	// | --- | --- | --- | --- | --- |
	// | TRIPOD+AI | Performance measures with confidence intervals, including for key subgroups | **partly** | each audited metric for the two compared groups and their gap, with percentile bootstrap intervals when the audit asks for them \(spec key intervals or --intervals\); one grouping column and two of its values per audit | Overview; Metrics by group |
	// | TRIPOD+AI | Calibration as well as discrimination | **partly** | calibration-in-the-large, expected calibration error, Brier score and the area under the ROC curve per group when the spec lists them, each split into mechanism contributions; the HTML page adds each group&#39;s reliability curve and table; no calibration slope or smoothed calibration curve | Metrics by group; Decomposition of the … gap |
	// | TRIPOD+AI | Approaches to model fairness | **partly** | measures the gap between two groups in each metric and estimates how much each mechanism of the causal graph contributes to it; does not describe how fairness was addressed when the model was developed | Overview; Decomposition of the … gap |
	// | TRIPOD+AI | The other items: data sources, participants, outcome and predictors, sample size, model development and specification, the full validation | **not supplied** | these belong to the model&#39;s own development and validation report; the audit gives the audited records&#39; group sizes, events and rows dropped for missing values, and the inputs&#39; SHA-256 digests | the paragraph on the groups |
	// | Model cards | Disaggregated evaluation: quantitative analyses reported per group | **partly** | every audited metric for each of the two groups, with the gap and its interval; one factor and two of its groups per audit \(run one audit per pair of groups for more\) | Overview; Metrics by group |
	// | Model cards | Intersectional evaluation: analyses for combinations of factors | **not supplied** | one grouping column per audit; an intersection \(say, women over 65\) can be audited as a group through a column that combines the factors | – |
	// | Model cards | The other sections: model details, intended use, factors, training data, ethical considerations, caveats and recommendations | **partly** | only the caveats of this audit \(its assumptions and cautions\); the rest is the model owner&#39;s to state | Assumptions and cautions |
	// | EU AI Act | Article 10\(2\)\(f\): examination in view of possible biases likely to affect health and safety or lead to prohibited discrimination | **partly** | examines the model&#39;s performance in two groups of the audited records and how the groups&#39; data differ, mechanism by mechanism \(contributions, diagnostics\) and, on the HTML page, column by column; it does not examine the training, validation and testing data sets or the data governance that Article 10 covers | Overview; Decomposition of the … gap |
	// | EU AI Act | Article 10\(2\)\(g\): appropriate measures to detect, prevent and mitigate those biases | **partly** | detection only: the gaps, the mechanisms behind them and, on the HTML page, what-if estimates of the gap if chosen mechanisms were the same in both groups; no measure to prevent or mitigate is taken or assessed | Overview; Decomposition of the … gap |
	// | EU AI Act | Article 10\(2\)\(h\): identification of relevant data gaps or shortcomings | **partly** | the warnings flag small groups and few events, poor overlap between the groups, heavy-tailed weights, rows dropped for missing values and model inputs outside the graph; unrecorded variables and errors in the label itself stay invisible to the tool | Warnings |
	//
	// Sources:
	//
	// - TRIPOD+AI: G. S. Collins, K. G. M. Moons, P. Dhiman, et al. \(2024\). TRIPOD+AI statement: updated guidance for reporting clinical prediction models that use regression or machine learning methods. BMJ 385:e078378. doi:10.1136/bmj-2023-078378.
	// - Model cards: M. Mitchell, S. Wu, A. Zaldivar, P. Barnes, L. Vasserman, B. Hutchinson, E. Spitzer, I. D. Raji, T. Gebru \(2019\). Model cards for model reporting. Proceedings of the Conference on Fairness, Accountability, and Transparency \(FAT\* 2019\), 220–229 \(pages from memory\).
	// - EU AI Act: Regulation \(EU\) 2024/1689 \(Artificial Intelligence Act\), Article 10 &quot;Data and data governance&quot;.
	//
	// This is not a statement of compliance. Meeting TRIPOD+AI, writing a model card or fulfilling Article 10 of the EU AI Act rests on the whole documentation of a model and its data, judged by its developer, its deployer and the competent authorities; an audit is not a validation of the model or a conformity assessment.
	//
	// _Statistical estimates under the stated causal assumptions, not clinical or legal findings. gapwise dev, seed 0._
}

func ptr(v float64) *float64 { return &v }
