package report

import "github.com/gapwise/gapwise/fairness"

func ptr(v float64) *float64 { return &v }

// handResult is a Result built by hand for the tests: an FNR gap of 9.0
// points between women (comparison) and men (reference), split over four
// mechanisms, with bootstrap intervals on some fields only. Its numbers are
// invented; every expected string in the tests is their rounding done by
// hand.
func handResult() *fairness.Result {
	return &fairness.Result{
		Tool:      fairness.ToolInfo{Name: "gapwise", Version: "0.1.0-test"},
		Groups:    fairness.GroupInfo{Column: "sex", Reference: "men", Comparison: "women", NReference: 1200, NComparison: 1100, EventsReference: 200, EventsComparison: 190, DroppedReference: 3, DroppedComparison: 0},
		Label:     "anaemia",
		Score:     "risk",
		Threshold: 0.35,
		Seed:      7,
		Settings:  fairness.Settings{Folds: 5, Classifier: "auto", ECEBins: 10, Learners: []string{"linear", "quadratic"}},
		Metrics: []fairness.MetricResult{
			{
				Metric: "fnr", Reference: 0.12, Comparison: 0.21, Gap: 0.09, Estimated: 0.079, Residual: 0.011, RecordsReference: 200, RecordsComparison: 190,
				ReferenceCI: &fairness.Interval{Low: 0.101, High: 0.139},
				GapCI:       &fairness.Interval{Low: 0.061, High: 0.118},
				Contributions: []fairness.Contribution{
					{Node: "age", Mechanism: "age", Value: -0.012, CILow: ptr(-0.02), CIHigh: ptr(-0.004), Alone: -0.01, IfEqualised: 0.093},
					{Node: "anaemia", Mechanism: "anaemia | age", Value: 0.03, Alone: 0.028, IfEqualised: 0.05},
					{Node: "hb", Mechanism: "hb | anaemia", Value: 0.061, CILow: ptr(0.048), CIHigh: ptr(0.073), Alone: 0.058, IfEqualised: 0.02},
					{Node: "ferritin", Mechanism: "ferritin | anaemia, hb", Value: 0.0002, Alone: 0.0001, IfEqualised: 0.079},
				},
				// hb's 0.061 is the largest; 0.061 / 0.09 ≈ 0.678; no warning concerns it.
				Headline: fairness.Headline{Lead: "hb", LeadShare: ptr(0.061 / 0.09), Verdict: fairness.VerdictSound, Warnings: []int{}},
			},
			{
				Metric: "brier", Reference: 0.0812, Comparison: 0.0745, Gap: -0.0067, Estimated: -0.006, Residual: -0.0007, RecordsReference: 1200, RecordsComparison: 1100,
				Contributions: []fairness.Contribution{
					{Node: "age", Mechanism: "age", Value: 0.001, Alone: 0.001, IfEqualised: -0.007},
					{Node: "anaemia", Mechanism: "anaemia | age", Value: -0.004, Alone: -0.004, IfEqualised: -0.002},
					{Node: "hb", Mechanism: "hb | anaemia", Value: -0.0025, Alone: -0.002, IfEqualised: -0.0035},
					{Node: "ferritin", Mechanism: "ferritin | anaemia, hb", Value: -0.0005, Alone: -0.0004, IfEqualised: -0.0055},
				},
				Headline: fairness.Headline{Lead: "anaemia", LeadShare: ptr(0.004 / 0.0067), Verdict: fairness.VerdictSound, Warnings: []int{}},
			},
		},
		Mechanisms: []fairness.MechanismResult{
			{Node: "age", Mechanism: "age", Columns: []string{"age"}, Classifier: "linear", ParentClassifier: "prior", AUC: 0.58, ESS: 1100, ESSShare: 0.917, MaxShare: 0.002, MeanRatio: 1.001},
			{Node: "anaemia", Mechanism: "anaemia | age", Parents: []string{"age"}, Columns: []string{"anaemia"}, Classifier: "linear", ParentClassifier: "linear", AUC: 0.55, ESS: 1050, ESSShare: 0.875, MaxShare: 0.003, MeanRatio: 0.998},
			{Node: "hb", Mechanism: "hb | anaemia", Parents: []string{"anaemia"}, Columns: []string{"hb"}, Classifier: "quadratic", ParentClassifier: "linear", AUC: 0.81, ESS: 400, ESSShare: 0.333, MaxShare: 0.02, MeanRatio: 1.012},
			{Node: "ferritin", Mechanism: "ferritin | anaemia, hb", Parents: []string{"anaemia", "hb"}, Columns: []string{"ferritin"}, Classifier: "linear", ParentClassifier: "quadratic", AUC: 0.52, ESS: 96, ESSShare: 0.08, MaxShare: 0.11, MeanRatio: 0.97,
				Losses:      []fairness.LearnerLoss{{Classifier: "linear", LogLoss: 0.689}, {Classifier: "quadratic", LogLoss: 0.691}},
				Reliability: fairness.Reliability{Verdict: fairness.SeverityUnreliable, Kinds: []fairness.WarningKind{fairness.KindLowEffectiveRecords, fairness.KindDominantRecord}}},
		},
		// ferritin's ESS of 96 out of 1200 records and its 11% largest
		// weight share are what fairness.Warnings flags.
		Warnings: []fairness.Warning{
			{Kind: fairness.KindLowEffectiveRecords, Severity: fairness.SeverityUnreliable, Nodes: []string{"ferritin"},
				Message: "the contribution of `ferritin` rests on 96 effective records out of 1,200; treat it as unreliable"},
			{Kind: fairness.KindDominantRecord, Severity: fairness.SeverityCaution, Nodes: []string{"ferritin"},
				Message: "mechanism ferritin: largest weight carries 11% of the total"},
		},
		Assumptions: []string{"The causal graph is right enough.", "There is no hidden confounding."},
		Synthetic:   true,
		Inputs:      fairness.InputInfo{SpecFile: "audit.yaml", SpecSHA256: "ab12", DataFile: "cohort.csv", DataSHA256: "cd34"},
	}
}

// handDetails describes a small invented dataset with fairness.Describe so
// that the report tests exercise the Details sections; the data come from
// a fixed linear congruential sequence.
func handDetails() *fairness.Details {
	state := uint64(12345)
	next := func() float64 { // Knuth's MMIX LCG constants (from memory)
		state = state*6364136223846793005 + 1442695040888963407
		return float64(state>>11) / float64(1<<53)
	}
	ds := &fairness.Dataset{Columns: []fairness.Column{
		{Name: "age"}, {Name: "anaemia", Categorical: true, Levels: []string{"0", "1"}},
		{Name: "hb"}, {Name: "ferritin"},
	}}
	for i := 0; i < 400; i++ {
		cmp := i%2 == 1
		y := 0.0
		if next() < 0.2 {
			y = 1
		}
		hb := 14 - 2.5*y + next()*2
		if cmp {
			hb -= 1.2
		}
		ds.Labels = append(ds.Labels, y)
		ds.Scores = append(ds.Scores, min(0.99, max(0.01, 0.5*y+0.5*next())))
		ds.Comparison = append(ds.Comparison, cmp)
		ds.Columns[0].Values = append(ds.Columns[0].Values, 20+60*next())
		ds.Columns[1].Values = append(ds.Columns[1].Values, y)
		ds.Columns[2].Values = append(ds.Columns[2].Values, hb)
		ds.Columns[3].Values = append(ds.Columns[3].Values, 20+200*next()*next())
	}
	return fairness.Describe(ds, 0.35, 10)
}
