package fairness

import (
	"reflect"
	"strings"
	"testing"
)

func TestThousands(t *testing.T) {
	for n, want := range map[int]string{0: "0", 7: "7", 999: "999", 1000: "1,000", 12000: "12,000", 1234567: "1,234,567", -4500: "-4,500"} {
		if got := thousands(n); got != want {
			t.Errorf("thousands(%d) = %q, want %q", n, got, want)
		}
	}
}

// healthy is a mechanism that triggers no warning with 12,000 reference records.
var healthy = MechanismResult{Node: "age", Mechanism: "age", AUC: 0.6, ESS: 9000, MaxShare: 0.001, MeanRatio: 1.01, WorstStratumMean: 1.05, ComparisonESS: 8000}

// warningsBase is a Result that triggers no warning: one healthy
// mechanism, one metric with ample effective records and a small residual,
// estimated from the reference records.
func warningsBase() *Result {
	return &Result{
		Groups:     GroupInfo{Reference: "north", Comparison: "south", NReference: 12000, NComparison: 9000},
		Mechanisms: []MechanismResult{healthy},
		Metrics:    []MetricResult{{Metric: "fnr", Gap: 0.09, Estimated: 0.08, Residual: 0.01, EffectiveRecords: 2500, RecordsReference: 3000, RecordsComparison: 2000}},
		Settings:   Settings{EstimateFrom: "reference", Folds: 5},
		Weights: []WeightSide{
			{Side: "reference", Records: 12000, Worst: HybridWeight{ComparisonNodes: []string{"age"}, ESS: 9000}},
		},
	}
}

// splitContribution gives r's metric one contribution of age with value v
// over R fold splits with standard deviation sd, and the interval [lo, hi]
// unless both are 0.
func splitContribution(r *Result, R int, v, sd, lo, hi float64) {
	r.Settings.FoldSplits = R
	c := Contribution{Node: "age", Mechanism: "age", Value: v, SplitSD: &sd}
	if lo != 0 || hi != 0 {
		c.CILow, c.CIHigh = &lo, &hi
	}
	r.Metrics[0].Contributions = []Contribution{c}
}

func TestWarnings(t *testing.T) {
	base := warningsBase
	tests := []struct {
		name   string
		change func(r *Result)
		want   []string // substrings, one per expected warning, in order
	}{
		{"none", func(r *Result) {}, nil},
		{"dropped", func(r *Result) { r.Groups.DroppedReference, r.Groups.DroppedComparison = 1200, 3 }, []string{`1,200 rows of group "north" (9.1%) and 3 rows of group "south" (<0.1%) were dropped for missing values; the audit describes the remaining records only. The shares differ by more than chance explains (z = -29.3)`}},
		{"dropped evenly", func(r *Result) { r.Groups.DroppedReference, r.Groups.DroppedComparison = 600, 450 }, []string{`600 rows of group "north" (4.8%) and 450 rows of group "south" (4.8%) were dropped`}},
		{"ess share", func(r *Result) { r.Mechanisms[0].ESS = 1199 }, []string{"the contribution of `age` rests on 1,199 effective records out of 12,000; treat it as unreliable"}},
		{"ess floor", func(r *Result) { r.Groups.NReference = 500; r.Mechanisms[0].ESS = 99.6 }, []string{`group "north" has 500 records, fewer than the 800 per group`, "rests on 100 effective records out of 500"}},
		{"ess fine", func(r *Result) { r.Groups.NReference = 500; r.Mechanisms[0].ESS = 100 }, []string{`group "north" has 500 records`}},
		// An FNR from 7 positives with value 3/7: p̃ = 5/11, SE √(p̃(1−p̃)/11) = 0.150 (computed by hand).
		{"few records", func(r *Result) { r.Metrics[0].RecordsComparison, r.Metrics[0].Comparison = 7, 3.0/7 }, []string{`in group "south", fnr rests on 7 positives (standard error about 0.15)`}},
		{"few records caution", func(r *Result) { r.Metrics[0].RecordsReference = 29 }, []string{`in group "north", fnr rests on 29 positives`}},
		{"records enough", func(r *Result) { r.Metrics[0].RecordsReference = 30 }, nil},
		{"few records once per basis", func(r *Result) {
			r.Metrics[0].RecordsComparison = 7
			r.Metrics = append(r.Metrics, MetricResult{Metric: "tpr", RecordsReference: 3000, RecordsComparison: 7, EffectiveRecords: 2500})
		}, []string{`in group "south", fnr and tpr rest on 7 positives`}},
		{"few records not a share", func(r *Result) { r.Metrics[0].Metric, r.Metrics[0].RecordsReference = "brier", 12 }, []string{`in group "north", brier rests on 12 records: a value from so few records is imprecise`}},
		{"folds too many", func(r *Result) { r.Groups.NComparison, r.Settings.Folds = 190, 10 }, []string{`group "south" has 190 records: with 10 folds each held-out fold holds about 19 of them`}},
		{"max share", func(r *Result) { r.Mechanisms[0].MaxShare = 0.073 }, []string{"a single record carries 7.3% of the weight for `age`"}},
		{"mean low", func(r *Result) { r.Mechanisms[0].MeanRatio = 0.85 }, []string{"average 0.850 over the reference records instead of 1"}},
		{"mean high", func(r *Result) { r.Mechanisms[0].MeanRatio = 1.2 }, []string{"average 1.200"}},
		{"mean edge", func(r *Result) { r.Mechanisms[0].MeanRatio = 1.1 }, nil},
		{"auc", func(r *Result) { r.Mechanisms[0].AUC = 0.95 }, []string{"nearly separable on `age` (out-of-fold AUC 0.950)"}},
		{"residual", func(r *Result) { r.Metrics[0].Estimated, r.Metrics[0].Residual = 0.06, 0.03 }, []string{"for fnr the contributions add up to 0.0600 but the observed gap is 0.0900"}},
		// The residual's own standard error (both sides) decides against
		// WarnResidualZ = 2.58: 0.03 is 2.5 standard errors of 0.012 and
		// 4.3 of 0.007.
		{"residual within noise", func(r *Result) {
			se := 0.012
			r.Metrics[0].Estimated, r.Metrics[0].Residual, r.Metrics[0].ResidualSE = 0.06, 0.03, &se
		}, nil},
		{"residual beyond noise", func(r *Result) {
			se := 0.007
			r.Metrics[0].Estimated, r.Metrics[0].Residual, r.Metrics[0].ResidualSE = 0.06, 0.03, &se
		}, []string{"the residual 0.0300 is large"}},
		{"residual tiny", func(r *Result) { r.Metrics[0].Gap, r.Metrics[0].Estimated, r.Metrics[0].Residual = 0.004, 0, 0.004 }, nil},
		{"extreme", func(r *Result) { r.Mechanisms[0].ExtremeShare = 0.034 }, []string{"3.4% of reference records carry a weight above 20 for `age`: the groups barely overlap there"}},
		{"extreme both one side", func(r *Result) { r.Settings.EstimateFrom = "both"; r.Mechanisms[0].ExtremeShare = 0.034 }, nil},
		{"extreme both sides", func(r *Result) {
			r.Settings.EstimateFrom = "both"
			c := 0.02
			r.Mechanisms[0].ExtremeShare, r.Mechanisms[0].ComparisonExtremeShare = 0.034, &c
		}, []string{"3.4% of reference and 2.0% of comparison records carry a weight above 20 for `age`"}},
		{"extreme fine", func(r *Result) { r.Mechanisms[0].ExtremeShare = 0.01 }, nil},
		// A tail shape is absent with too few records; the note on the
		// heavy side must not read the absent one.
		{"tail one side, other absent", func(r *Result) {
			r.Settings.EstimateFrom = "both"
			k := 0.8
			r.Mechanisms[0].TailShape, r.Mechanisms[0].ComparisonTailShape = nil, &k
		}, []string{"on the comparison records have a heavy tail (Pareto shape 0.80 > 0.5); the two-sided estimate leans on the reference records"}},
		{"stratum", func(r *Result) { r.Mechanisms[0].WorstStratumMean = 1.4 }, []string{"average 1.400 in one fifth of the reference records"}},
		{"stratum low", func(r *Result) { r.Mechanisms[0].WorstStratumMean = 0.7 }, []string{"average 0.700 in one fifth"}},
		{"clipped", func(r *Result) { r.Settings.ClipRatios = 0.99; r.Mechanisms[0].ClippedReference = 120 }, []string{"the ratios of `age` were clipped for 120 reference and 0 comparison records (clip_ratios 0.99)"}},
		{"worst hybrid", func(r *Result) { r.Weights[0].Worst = HybridWeight{ComparisonNodes: []string{"age", "hb"}, ESS: 23} }, []string{"on the reference records, the hybrid with the comparison group's mechanisms for `age`, `hb` rests on 23 effective records out of 12,000"}},
		{"worst hybrid both", func(r *Result) {
			r.Settings.EstimateFrom = "both"
			r.Weights[0].Worst.ESS = 23
		}, nil},
		{"metric records", func(r *Result) { r.Metrics[0].EffectiveRecords = 12.2 }, []string{"for fnr, the reweighted comparison group rests on 12 effective records"}},
		{"metric records comparison", func(r *Result) { r.Settings.EstimateFrom = "comparison"; r.Metrics[0].EffectiveRecords = 40 }, []string{"for fnr, the reweighted reference group rests on 40"}},
		{"ess comparison side", func(r *Result) { r.Settings.EstimateFrom = "comparison"; r.Mechanisms[0].ComparisonESS = 50 }, []string{"rests on 50 effective comparison records out of 9,000"}},
		{"ess comparison side ignores reference", func(r *Result) { r.Settings.EstimateFrom = "comparison"; r.Mechanisms[0].ESS = 5 }, nil},
		{"ess both one side low", func(r *Result) { r.Settings.EstimateFrom = "both"; r.Mechanisms[0].ESS = 25 }, []string{"the reference records give `age` only 25 effective records out of 12,000; the two-sided estimate leans on the comparison records (8,000 effective out of 9,000)"}},
		{"ess both low", func(r *Result) {
			r.Settings.EstimateFrom = "both"
			r.Mechanisms[0].ESS, r.Mechanisms[0].ComparisonESS = 5, 60
		}, []string{"rests on 5 effective reference records out of 12,000 and 60 comparison records out of 9,000"}},
		{"not estimable auc", func(r *Result) { r.Mechanisms[0].AUC = 0.995 }, []string{"the contribution of `age` is not estimable here: the groups' records barely overlap on `age` (out-of-fold AUC 0.995"}},
		{"not estimable ess", func(r *Result) { r.Mechanisms[0].ESS = 12 }, []string{"the contribution of `age` is not estimable here: its weights rest on 12 effective records"}},
		{"not estimable both", func(r *Result) {
			r.Settings.EstimateFrom = "both"
			r.Mechanisms[0].ESS, r.Mechanisms[0].ComparisonESS = 5, 15
		}, []string{"its weights rest on 5 effective reference and 15 comparison records"}},
		{"estimable on one side", func(r *Result) {
			r.Settings.EstimateFrom = "both"
			r.Mechanisms[0].ESS, r.Mechanisms[0].ComparisonESS = 5, 3000
		}, []string{"the two-sided estimate leans on the comparison records (3,000 effective"}},
		{"one cause once: not estimable", func(r *Result) {
			m := &r.Mechanisms[0]
			m.AUC, m.MaxShare, m.MeanRatio, m.WorstStratumMean, m.ExtremeShare = 0.995, 0.3, 0.2, 0.1, 0.5
		}, []string{"the contribution of `age` is not estimable here"}},
		{"one cause once: mean ratio", func(r *Result) { r.Mechanisms[0].MeanRatio, r.Mechanisms[0].WorstStratumMean = 0.5, 0.5 }, []string{"average 0.500 over the reference records"}},
		{"one cause once: learner", func(r *Result) {
			m := &r.Mechanisms[0]
			m.Classifier, m.MeanRatio = "linear", 40
			m.Losses = []LearnerLoss{{Classifier: "linear", OddsCheck: 40, MaxShare: 0.1}}
			r.Settings.Classifier = "linear"
		}, []string{"the learner linear set by the spec's classifier key fails the self-checks"}},
		{"learner fails auto", func(r *Result) {
			r.Settings.Classifier = "auto"
			r.Mechanisms[0].Classifier = "linear"
			r.Mechanisms[0].Losses = []LearnerLoss{{Classifier: "linear", LogLoss: 0.6, OddsCheck: 1400, MaxShare: 0.97}, {Classifier: "boosted", LogLoss: 0.5, OddsCheck: 2, MaxShare: 0.9}}
		}, []string{"no candidate learner passed the self-checks for `age`; the least bad, linear, was used: mean odds check 1400.00"}},
		{"learner fails fixed", func(r *Result) {
			r.Settings.Classifier = "expanded"
			r.Mechanisms[0].Classifier = "expanded"
			r.Mechanisms[0].Losses = []LearnerLoss{{Classifier: "expanded", LogLoss: 0.6, OddsCheck: 1.0, MaxShare: 0.6}}
		}, []string{"the learner expanded set by the spec's classifier key fails the self-checks for `age`: mean odds check 1.00 (sound within a factor 1.25 of 1), largest single-record share 60.0%"}},
		{"learner passes", func(r *Result) {
			r.Settings.Classifier = "expanded"
			r.Mechanisms[0].Classifier = "expanded"
			r.Mechanisms[0].Losses = []LearnerLoss{{Classifier: "expanded", LogLoss: 0.6, OddsCheck: 1.2, MaxShare: 0.5}}
		}, nil},
		// Split checks (WarnSplitShare 0.3, WarnSplitMin 0.005): with 4
		// splits the seed noise is SplitSD/2.
		{"split vs interval", func(r *Result) { splitContribution(r, 4, 0.05, 0.031, 0.00, 0.10) }, []string{"the contributions of `age` (fnr) depend on the fold split: averaged over 4 splits they still move with the seed by more than 30% of their interval's half-width (without intervals, of their value); the largest, `age` for fnr, has standard deviation 0.0310 between the splits and moves by about 0.0155 with the seed, against its interval's half-width 0.0500"}},
		{"split vs interval fine", func(r *Result) { splitContribution(r, 4, 0.05, 0.029, 0.00, 0.10) }, nil},
		{"split vs value", func(r *Result) { splitContribution(r, 4, 0.02, 0.013, 0, 0) }, []string{"moves by about 0.0065 with the seed, against its value +0.0200"}},
		{"split vs value small", func(r *Result) { splitContribution(r, 4, 0.002, 0.009, 0, 0) }, nil},
		{"split vs value fine", func(r *Result) { splitContribution(r, 4, 0.05, 0.02, 0, 0) }, nil},
		{"one split", func(r *Result) { splitContribution(r, 1, 0.02, 0.5, 0, 0) }, nil},
		{"split over metrics and nodes", func(r *Result) {
			splitContribution(r, 4, 0.02, 0.013, 0, 0)
			hb := healthy
			hb.Node, hb.Mechanism = "hb", "hb | age"
			r.Mechanisms = append(r.Mechanisms, hb)
			sd1, sd2 := 0.02, 0.05
			r.Metrics[0].Contributions = append(r.Metrics[0].Contributions, Contribution{Node: "hb", Mechanism: "hb | age", Value: 0.01, SplitSD: &sd1})
			fpr := r.Metrics[0]
			fpr.Metric = "fpr"
			fpr.Contributions = []Contribution{{Node: "age", Mechanism: "age", Value: 0.001, SplitSD: &sd1}, {Node: "hb", Mechanism: "hb | age", Value: 0.03, SplitSD: &sd2}}
			r.Metrics = append(r.Metrics, fpr)
		}, []string{"the contributions of `age` (fnr, fpr), `hb` (fnr, fpr) depend on the fold split: averaged over 4 splits they still move with the seed by more than 30% of their interval's half-width (without intervals, of their value); the largest, `age` for fpr, has standard deviation 0.0200"}},
		{"split of an unreliable mechanism", func(r *Result) {
			splitContribution(r, 4, 0.02, 0.013, 0, 0)
			r.Mechanisms[0].AUC = 0.96
		}, []string{"nearly separable"}},
		{"split of a mechanism not estimable", func(r *Result) {
			splitContribution(r, 4, 0.02, 0.013, 0, 0)
			r.Mechanisms[0].AUC = 0.995
		}, []string{"the contribution of `age` is not estimable here"}},
		{"order", func(r *Result) {
			r.Groups.DroppedReference = 1
			bad := healthy
			bad.Node, bad.Mechanism, bad.AUC, bad.ESS, bad.ExtremeShare = "hb", "hb | dx", 0.97, 37, 0.2
			r.Mechanisms = append(r.Mechanisms, bad)
			r.Weights[0].Worst.ESS = 30
			r.Metrics[0].Residual, r.Metrics[0].EffectiveRecords = 0.05, 30
			splitContribution(r, 4, 0.02, 0.013, 0, 0) // age: also in the unreliable worst hybrid
			sd := 0.013
			r.Metrics[0].Contributions = append(r.Metrics[0].Contributions, Contribution{Node: "bmi", Mechanism: "bmi", Value: 0.02, SplitSD: &sd})
		}, []string{"dropped", "separable on `hb | dx`", "weight above 20", "`hb` rests on 37 effective records", "the hybrid with", "for fnr, the reweighted", "for fnr the contributions", "the contributions of `bmi` (fnr) depend on the fold split"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := base()
			tc.change(r)
			got := Warnings(r)
			if len(got) != len(tc.want) || got == nil {
				t.Fatalf("got %d warnings %q, want %d", len(got), got, len(tc.want))
			}
			for i, w := range tc.want {
				if !strings.Contains(got[i].Message, w) {
					t.Errorf("warning %d %q lacks %q", i, got[i], w)
				}
			}
			if again := Warnings(r); !reflect.DeepEqual(got, again) {
				t.Error("not deterministic")
			}
		})
	}
}
