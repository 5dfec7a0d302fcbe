package fairness

import (
	"encoding/json"
	"reflect"
	"strings"
	"testing"
)

// TestWarningFields checks, for every kind, that the check fills in the
// structured fields the contract promises (fairness/warning.go: the kind,
// its documented severity, the node(s) of a mechanism-level warning, the
// metric of a metric-level one) next to the unchanged sentence. Each case
// changes warningsBase (which triggers nothing) so that exactly one check
// speaks up.
func TestWarningFields(t *testing.T) {
	hb := healthy
	hb.Node, hb.Mechanism = "hb", "hb | age"
	tests := []struct {
		name   string
		change func(r *Result)
		want   Warning // Message holds a substring of the sentence
	}{
		{"rows dropped", func(r *Result) { r.Groups.DroppedComparison = 4 },
			Warning{KindRowsDropped, SeverityNote, "", []string{}, `4 rows of group "south" (<0.1%) were dropped`}},
		// 10% against 2% of 1,000 rows each: z = 0.08/√(0.06·0.94·0.002) = 7.5 (by hand).
		{"rows dropped unevenly", func(r *Result) {
			r.Groups.NReference, r.Groups.DroppedReference, r.Groups.NComparison, r.Groups.DroppedComparison = 900, 100, 980, 20
		}, Warning{KindRowsDropped, SeverityCaution, "", []string{}, "(z = -7.5)"}},
		{"poor overlap", func(r *Result) { r.Mechanisms[0].AUC = 0.97 },
			Warning{KindPoorOverlap, SeverityUnreliable, "", []string{"hb"}, "nearly separable on `hb | age`"}},
		{"extreme weights", func(r *Result) { r.Mechanisms[0].ExtremeShare = 0.05 },
			Warning{KindExtremeWeights, SeverityCaution, "", []string{"hb"}, "5.0% of reference records carry a weight above 20 for `hb | age`"}},
		{"low effective records", func(r *Result) { r.Mechanisms[0].ESS = 800 },
			Warning{KindLowEffectiveRecords, SeverityUnreliable, "", []string{"hb"}, "the contribution of `hb` rests on 800 effective records out of 12,000"}},
		// Pareto shape 0.6 is between attribution.TailInfiniteVariance
		// (0.5) and attribution.TailUnreliable (0.7).
		{"heavy tail, infinite variance", func(r *Result) { k := 0.6; r.Mechanisms[0].TailShape = &k },
			Warning{KindHeavyTail, SeverityCaution, "", []string{"hb"}, "(Pareto shape 0.60 > 0.5): their variance is infinite"}},
		{"heavy tail, unreliable", func(r *Result) { k := 0.9; r.Mechanisms[0].TailShape = &k },
			Warning{KindHeavyTail, SeverityUnreliable, "", []string{"hb"}, "(Pareto shape 0.90 > 0.5): the estimate is unreliable at this sample size"}},
		{"heavy tail, advice in use", func(r *Result) {
			k, kc := 0.6, 0.65
			r.Settings.EstimateFrom, r.Mechanisms[0].TailShape, r.Mechanisms[0].ComparisonTailShape = "both", &k, &kc
		}, Warning{KindHeavyTail, SeverityCaution, "", []string{"hb"}, "too narrow; more records would help, or clip_ratios"}},
		{"heavy tail, one side of two", func(r *Result) {
			k, kc := 0.6, 0.2
			r.Settings.EstimateFrom, r.Mechanisms[0].TailShape, r.Mechanisms[0].ComparisonTailShape = "both", &k, &kc
		}, Warning{KindHeavyTail, SeverityNote, "", []string{"hb"}, "on the reference records have a heavy tail (Pareto shape 0.60 > 0.5); the two-sided estimate leans on the comparison records"}},
		{"dominant record", func(r *Result) { r.Mechanisms[0].MaxShare = 0.2 },
			Warning{KindDominantRecord, SeverityCaution, "", []string{"hb"}, "a single record carries 20.0% of the weight for `hb`"}},
		{"mean ratio off", func(r *Result) { r.Mechanisms[0].MeanRatio = 0.5 },
			Warning{KindMeanRatioOff, SeverityCaution, "", []string{"hb"}, "the density ratios of `hb | age` average 0.500 over the reference records"}},
		{"stratum ratio off", func(r *Result) { r.Mechanisms[0].WorstStratumMean = 1.5 },
			Warning{KindStratumRatioOff, SeverityCaution, "", []string{"hb"}, "average 1.500 in one fifth of the reference records"}},
		{"ratios clipped", func(r *Result) { r.Settings.ClipRatios = 0.98; r.Mechanisms[0].ClippedComparison = 7 },
			Warning{KindRatiosClipped, SeverityCaution, "", []string{"hb"}, "the ratios of `hb` were clipped for 0 reference and 7 comparison records (clip_ratios 0.98)"}},
		{"worst hybrid", func(r *Result) { r.Weights[0].Worst = HybridWeight{ComparisonNodes: []string{"age", "hb"}, ESS: 50} },
			Warning{KindWorstHybrid, SeverityUnreliable, "", []string{"age", "hb"}, "mechanisms for `age`, `hb` rests on 50 effective records out of 12,000"}},
		{"metric effective records", func(r *Result) { r.Metrics[0].EffectiveRecords = 60 },
			Warning{KindMetricRecords, SeverityUnreliable, "fnr", []string{}, "for fnr, the reweighted comparison group rests on 60 effective records"}},
		{"large residual", func(r *Result) { r.Metrics[0].Estimated, r.Metrics[0].Residual = 0.05, 0.04 },
			Warning{KindLargeResidual, SeverityCaution, "fnr", []string{}, "the residual 0.0400 is large"}},
		// The sides check fires above WarnSidesZ = 4 (caution) and
		// WarnSidesZUnreliable = 8 (unreliable) and names the mechanisms
		// whose contributions differ by more than 4 standard errors.
		{"sides disagree", func(r *Result) { r.Metrics[0] = sidesMetric(5.2, 0.05) },
			Warning{KindSidesDisagree, SeverityCaution, "fnr", []string{"hb"}, "disagree by up to 5.2 standard errors (comparison end +0.0400 ± 0.0100, reference end -0.0010 ± 0.0100; the contributions of `hb` differ most)"}},
		{"sides disagree, ends only", func(r *Result) { r.Metrics[0] = sidesMetric(9, 0.01) },
			Warning{KindSidesDisagree, SeverityUnreliable, "fnr", []string{}, "disagree by up to 9.0 standard errors (comparison end +0.0400 ± 0.0100, reference end -0.0010 ± 0.0100):"}},
		{"split dependent", func(r *Result) { splitContribution(r, 10, 0.03, 0.04, 0, 0) },
			Warning{KindSplitDependent, SeverityCaution, "", []string{"age"}, "the contributions of `age` (fnr) depend on the fold split"}},
		{"bootstrap failures", func(r *Result) {
			r.Settings.Intervals = &IntervalSettings{Intervals: Intervals{Replicates: 50}, Failed: 3}
		},
			Warning{KindBootstrapFailures, SeverityNote, "", []string{}, "3 of 50 bootstrap replicates could not be computed"}},
		{"outlying values", func(r *Result) {
			far := 1e5
			r.Details = &Details{Columns: []ColumnDetails{{Name: "age"}, {Name: "hb", Outlying: 1, Farthest: &far}}}
		}, Warning{KindOutlyingValues, SeverityNote, "", []string{}, `column "hb" has 1 value far outside the bulk of its values (the farthest is 100000)`}},
	}
	seen := map[WarningKind]bool{}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := warningsBase()
			r.Mechanisms[0] = hb
			tc.change(r)
			got := Warnings(r)
			if len(got) != 1 {
				t.Fatalf("got %d warnings %v, want 1", len(got), got)
			}
			w := got[0]
			if w.Kind != tc.want.Kind || w.Severity != tc.want.Severity || w.Metric != tc.want.Metric || !reflect.DeepEqual(w.Nodes, tc.want.Nodes) {
				t.Errorf("got kind %q severity %q metric %q nodes %#v, want %q %q %q %#v",
					w.Kind, w.Severity, w.Metric, w.Nodes, tc.want.Kind, tc.want.Severity, tc.want.Metric, tc.want.Nodes)
			}
			if !strings.Contains(w.Message, tc.want.Message) || w.String() != w.Message {
				t.Errorf("sentence %q lacks %q", w.Message, tc.want.Message)
			}
			seen[w.Kind] = true
		})
	}
	if len(seen) != 16 {
		t.Errorf("the table covers %d kinds, want all 16", len(seen))
	}
}

// TestWarningJSON pins the JSON shape of a warning: the field names of the
// contract (README, "JSON contract"), nodes as an array even when empty,
// metric left out when the warning concerns no metric.
func TestWarningJSON(t *testing.T) {
	for _, tc := range []struct {
		w    Warning
		want string
	}{
		{Warning{Kind: KindDominantRecord, Severity: SeverityCaution, Nodes: []string{"hb"}, Message: "m"},
			`{"kind":"dominant_record","severity":"caution","nodes":["hb"],"message":"m"}`},
		{Warning{Kind: KindLargeResidual, Severity: SeverityCaution, Metric: "fnr", Nodes: []string{}, Message: "m"},
			`{"kind":"large_residual","severity":"caution","metric":"fnr","nodes":[],"message":"m"}`},
	} {
		b, err := json.Marshal(tc.w)
		if err != nil || string(b) != tc.want {
			t.Errorf("json = %s (%v), want %s", b, err, tc.want)
		}
	}
}

func TestSeverityAtLeast(t *testing.T) {
	scale := []Severity{VerdictSound, SeverityNote, SeverityCaution, SeverityUnreliable}
	for i, s := range scale {
		for j, u := range scale {
			if got := s.AtLeast(u); got != (i >= j) {
				t.Errorf("%q.AtLeast(%q) = %v, want %v", s, u, got, i >= j)
			}
		}
	}
}

// sidesMetric is warningsBase's metric with a comparison of the sides
// whose largest z is maxZ and whose one contribution (node hb) differs by
// diff with standard error 0.01.
func sidesMetric(maxZ, diff float64) MetricResult {
	se := 0.01
	m := warningsBase().Metrics[0]
	m.SideAgreement = &SideAgreement{
		ComparisonEnd: SideDifference{Difference: 0.04, StdError: &se},
		ReferenceEnd:  SideDifference{Difference: -0.001, StdError: &se},
		MaxZ:          &maxZ,
	}
	m.Contributions = []Contribution{{Node: "hb", Mechanism: "hb | age", Value: 0.08, SideDifference: &SideDifference{Difference: diff, StdError: &se}}}
	return m
}
