package report

import (
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/metrics"
)

// The expected strings are the fixture's numbers rounded by hand (analytic
// ground truth: 0.061 → 6.1 points, −0.012 → 1.2 points, ...).
func TestFormat(t *testing.T) {
	tests := []struct {
		name, got, want string
	}{
		{"proportion", formatValue("fnr", 0.12), "12.0%"},
		{"proportion rounds half-even-free", formatValue("fpr", 0.1234), "12.3%"},
		{"score", formatValue("brier", 0.0812), "0.081"},
		{"nan", formatValue("fnr", math.NaN()), "n/a"},
		{"delta positive", formatDelta("fnr", 0.09), "+9.0 pts"},
		{"delta negative", formatDelta("fnr", -0.012), "−1.2 pts"},
		{"delta zero has no sign", formatDelta("fnr", -0.0002), "0.0 pts"},
		{"delta score", formatDelta("brier", -0.0067), "−0.007"},
		{"interval", formatDeltaInterval("fnr", ptr(-0.02), ptr(-0.004)), "[−2.0, −0.4] pts"},
		{"interval absent", formatDeltaInterval("fnr", nil, ptr(1)), ""},
		{"count", formatCount(12), "12"},
		{"weighted count", formatCount(12.25), "12.2"},
		{"threshold", formatThreshold(0.35), "0.35"},
	}
	for _, tt := range tests {
		if tt.got != tt.want {
			t.Errorf("%s: got %q, want %q", tt.name, tt.got, tt.want)
		}
	}
}

func TestSummary(t *testing.T) {
	res := handResult()
	got := Summary(res, res.Metrics[0])
	// Each fragment is the fixture's numbers rounded by hand.
	for _, want := range []string{
		"The false-negative rate is 21.0% for women and 12.0% for men (reference group).",
		"Of the 9.0-point gap (higher for women; 95% interval [6.1, 11.8] pts), ",
		"6.1 points (95% interval [4.8, 7.3] pts) come from how `hb` presents given `anaemia`; ",
		"3.0 points come from how often `anaemia` occurs given `age`",
		"the mix of `age` narrows it by 1.2 points (95% interval [−2.0, −0.4] pts)",
		"The remaining mechanism contributes 0.0 pts.",
		"add up to +7.9 pts; the remaining +1.1 pts (residual)",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("summary lacks %q:\n%s", want, got)
		}
	}
	// ferritin's contribution rounds to zero, so it is not named; its
	// verdict (unreliable, with low_effective_records) flags it in the
	// Brier summary, where it is named.
	if strings.Contains(got, "ferritin") {
		t.Errorf("summary names a negligible contribution:\n%s", got)
	}
	brier := Summary(res, res.Metrics[1])
	for _, want := range []string{
		"Of the gap of 0.007 (lower for women)",
		"0.004 comes from how often `anaemia` occurs given `age`",
		"0.001 comes from how `ferritin` presents given `anaemia` and `hb` — unreliable: effective sample size 96 is 8% of the reference group",
	} {
		if !strings.Contains(brier, want) {
			t.Errorf("brier summary lacks %q:\n%s", want, brier)
		}
	}
}

func TestUnreliable(t *testing.T) {
	res := handResult()
	got := unreliable(res)
	if len(got) != 1 || !strings.Contains(got["ferritin"], "8%") {
		t.Fatalf("unreliable = %v, want only ferritin with its 8%% ESS share", got)
	}
	res.Mechanisms[3].ESSShare = 0.5
	res.Mechanisms[3].Reliability = fairness.Reliability{Verdict: fairness.VerdictSound, Kinds: []fairness.WarningKind{}}
	res.Mechanisms[2].Reliability = fairness.Reliability{Verdict: fairness.SeverityCaution, Kinds: []fairness.WarningKind{fairness.KindMeanRatioOff}}
	res.Warnings = []fairness.Warning{
		{Kind: fairness.KindMeanRatioOff, Severity: fairness.SeverityCaution, Nodes: []string{"hb"}, Message: "the density ratios of `hb | anaemia` average 1.200"},
		{Kind: fairness.KindRowsDropped, Severity: fairness.SeverityNote, Nodes: []string{}, Message: "`hbx` and hb are not quoted nodes"},
		{Kind: fairness.KindRowsDropped, Severity: fairness.SeverityNote, Nodes: []string{}, Message: "`anaemia | age, sex` is not a label in the graph"},
	}
	got = unreliable(res)
	if _, ok := got["hb"]; !ok || len(got) != 1 {
		t.Fatalf("unreliable = %v, want only hb (its verdict is a caution)", got)
	}
}

// TestUnreliableFollowsVerdict: the report flags a mechanism by its
// fairness.Reliability verdict alone (caution or worse), never by finding
// its name in a warning's sentence nor by its own reading of the effective
// sample size. The reasons are the fixture's numbers rounded by hand.
func TestUnreliableFollowsVerdict(t *testing.T) {
	rel := func(v fairness.Severity, kinds ...fairness.WarningKind) fairness.Reliability {
		return fairness.Reliability{Verdict: v, Kinds: kinds}
	}
	sound := rel(fairness.VerdictSound)
	tests := []struct {
		name   string
		change func(r *fairness.Result)
		want   map[string]string
	}{
		{"names in a sentence do not flag", func(r *fairness.Result) {
			r.Mechanisms[3].Reliability = sound
			r.Warnings = []fairness.Warning{{Kind: fairness.KindLargeResidual, Severity: fairness.SeverityCaution, Metric: "fnr", Nodes: []string{},
				Message: "for fnr the residual is large; `age`, `anaemia | age` and `hb` are named but not concerned"}}
		}, map[string]string{}},
		{"a verdict flags without a sentence naming it", func(r *fairness.Result) {
			r.Mechanisms[3].Reliability = sound
			r.Mechanisms[1].Reliability = rel(fairness.SeverityUnreliable, fairness.KindWorstHybrid)
			r.Warnings = []fairness.Warning{}
		}, map[string]string{"anaemia": "a warning names it"}},
		{"a note does not flag", func(r *fairness.Result) {
			r.Mechanisms[3].Reliability = rel(fairness.SeverityNote, fairness.KindRowsDropped)
		}, map[string]string{}},
		{"a low ESS share alone does not flag", func(r *fairness.Result) {
			r.Mechanisms[3].Reliability = sound // e.g. estimate_from both, the comparison side is fine
			r.Settings.EstimateFrom = "both"
		}, map[string]string{}},
		{"few effective records, share not low", func(r *fairness.Result) {
			r.Mechanisms[3].ESS, r.Mechanisms[3].ESSShare = 90, 0.3 // below 100 records, 30% of the group
		}, map[string]string{"ferritin": "a warning names it"}},
		{"low share on the comparison side", func(r *fairness.Result) {
			r.Settings.EstimateFrom = "comparison"
			r.Mechanisms[3].Reliability = rel(fairness.SeverityUnreliable, fairness.KindLowEffectiveRecords)
		}, map[string]string{"ferritin": "effective sample size 96 is 8% of the reference group"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := handResult()
			tc.change(r)
			if got := unreliable(r); !reflect.DeepEqual(got, tc.want) {
				t.Errorf("unreliable = %v, want %v", got, tc.want)
			}
		})
	}
}

// TestMetricFacts: the report names and formats every metric from its
// metrics.Fact: the title in running text, and percentages with gaps in
// points exactly for the proportions (0.25 → "25.0%", +0.09 → "+9.0 pts";
// other metrics 0.250 and +0.090, by hand).
func TestMetricFacts(t *testing.T) {
	for _, f := range metrics.Facts() {
		if got := MetricTitle(f.Name); got != f.Title || got == "" {
			t.Errorf("MetricTitle(%s) = %q, want %q", f.Name, got, f.Title)
		}
		value, delta := "0.250", "+0.090"
		if f.Proportion {
			value, delta = "25.0%", "+9.0 pts"
		}
		if got := formatValue(f.Name, 0.25); got != value {
			t.Errorf("formatValue(%s) = %q, want %q", f.Name, got, value)
		}
		if got := formatDelta(f.Name, 0.09); got != delta {
			t.Errorf("formatDelta(%s) = %q, want %q", f.Name, got, delta)
		}
	}
	if got := MetricTitle("f1"); got != "f1" {
		t.Errorf("MetricTitle(f1) = %q", got)
	}
}
