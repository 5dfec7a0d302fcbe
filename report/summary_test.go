package report

import (
	"math"
	"reflect"
	"regexp"
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
		{"interval of positive ends", formatDeltaInterval("fnr", ptr(0.048), ptr(0.073)), "[+4.8, +7.3] pts"},
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
		"The gap, women minus men, is +9.0 pts (95% interval [+6.1, +11.8] pts): the false-negative rate is higher for women.",
		"Widening the gap: how `hb` presents given `anaemia`, +6.1 pts (95% interval [+4.8, +7.3] pts); how often `anaemia` occurs given `age`, +3.0 pts.",
		"Narrowing it: the mix of `age`, −1.2 pts (95% interval [−2.0, −0.4] pts).",
		// ferritin rounds to zero and is named all the same, with its verdict.
		"Too small to widen or narrow it at the precision shown: how `ferritin` presents given `anaemia` and `hb`, 0.0 pts — unreliable: effective sample size 96 is 8% of the reference group.",
		"add up to +7.9 pts; the residual, +1.1 pts, is",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("summary lacks %q:\n%s", want, got)
		}
	}
	brier := Summary(res, res.Metrics[1])
	for _, want := range []string{
		"The gap, women minus men, is −0.007: the Brier score is lower for women.",
		"Widening the gap: how often `anaemia` occurs given `age`, −0.004;",
		"how `ferritin` presents given `anaemia` and `hb`, −0.001 — unreliable: effective sample size 96 is 8% of the reference group",
		"Narrowing it: the mix of `age`, +0.001.",
	} {
		if !strings.Contains(brier, want) {
			t.Errorf("brier summary lacks %q:\n%s", want, brier)
		}
	}
}

// TestSummaryWording: in every summary a number and its interval carry
// the same signs and decimals, no interval prints as one number twice,
// every mechanism is named, and the residual has its own word. The
// expected strings are the cases' numbers rounded by hand.
func TestSummaryWording(t *testing.T) {
	contribution := func(node string, v, lo, hi float64) fairness.Contribution {
		return fairness.Contribution{Node: node, Mechanism: node, Value: v, CILow: ptr(lo), CIHigh: ptr(hi)}
	}
	tests := []struct {
		name     string
		metric   string
		gap      float64
		ci       *fairness.Interval
		contribs []fairness.Contribution
		want     []string
	}{
		{"negative gap, widening contribution negative", "fnr", -0.0322, &fairness.Interval{Low: -0.0562, High: -0.0128},
			[]fairness.Contribution{contribution("hb", -0.0506, -0.0803, -0.0311), contribution("age", 0.0064, -0.0005, 0.0144)},
			[]string{"is −3.2 pts (95% interval [−5.6, −1.3] pts): the false-negative rate is lower",
				"Widening the gap: the mix of `hb`, −5.1 pts (95% interval [−8.0, −3.1] pts).",
				"Narrowing it: the mix of `age`, +0.6 pts (95% interval [−0.1, +1.4] pts)."}},
		{"ends that round alike get more decimals, the value too", "fnr", 0.0013, &fairness.Interval{Low: 0.0011, High: 0.0014},
			[]fairness.Contribution{contribution("hb", 0.0012, 0.00101, 0.00104)},
			[]string{"is +0.13 pts (95% interval [+0.11, +0.14] pts)", "the mix of `hb`, +0.120 pts (95% interval [+0.101, +0.104] pts)"}},
		{"an interval around zero has one sign per end", "fpr", 0.05, nil,
			[]fairness.Contribution{contribution("hb", 0.05, 0.03, 0.07), contribution("age", 0.0001, -0.0004, 0.0004)},
			[]string{"the mix of `age`, +0.01 pts (95% interval [−0.04, +0.04] pts)"}},
		{"a score metric keeps three decimals", "brier", -0.0067, &fairness.Interval{Low: -0.0121, High: -0.0012},
			[]fairness.Contribution{contribution("hb", -0.0061, -0.0102, -0.0020)},
			[]string{"is −0.007 (95% interval [−0.012, −0.001])", "the mix of `hb`, −0.006 (95% interval [−0.010, −0.002])"}},
		{"six mechanisms are all named", "fnr", 0.1, nil,
			[]fairness.Contribution{contribution("a", 0.05, 0.04, 0.06), contribution("b", 0.03, 0.02, 0.04), contribution("c", 0.01, 0, 0.02),
				contribution("d", -0.004, -0.01, 0.002), contribution("e", 0.002, -0.01, 0.01), contribution("f", 0.0001, -0.01, 0.01)},
			[]string{"the mix of `e`, +0.2 pts. Narrowing it", "the mix of `f`, 0.0 pts.", "Narrowing it: the mix of `d`, −0.4 pts (95% interval [−1.0, +0.2] pts)."}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			res := handResult()
			res.Mechanisms = nil
			var sum float64
			for _, c := range tc.contribs {
				sum += c.Value
				res.Mechanisms = append(res.Mechanisms, fairness.MechanismResult{Node: c.Node, Mechanism: c.Node})
			}
			m := fairness.MetricResult{Metric: tc.metric, Reference: 0.2, Comparison: 0.2 + tc.gap, Gap: tc.gap, GapCI: tc.ci,
				Estimated: sum, Residual: tc.gap - sum, Contributions: tc.contribs}
			got := Summary(res, m)
			for _, w := range tc.want {
				if !strings.Contains(got, w) {
					t.Errorf("lacks %q:\n%s", w, got)
				}
			}
			for _, c := range tc.contribs {
				if !strings.Contains(got, "`"+c.Node+"`") {
					t.Errorf("%s is not named:\n%s", c.Node, got)
				}
			}
			if strings.Contains(got, "remaining") || strings.Contains(got, "other ") {
				t.Errorf("a mechanism or the residual is left unnamed:\n%s", got)
			}
			for _, iv := range regexp.MustCompile(`\[([^,\]]+), ([^\]]+)\]`).FindAllStringSubmatch(got, -1) {
				if iv[1] == iv[2] {
					t.Errorf("interval %s prints one number twice", iv[0])
				}
			}
		})
	}
}

// TestIntervalDecimals: the ends of an interval print apart, with at most
// maxExtraDecimals more decimals (by hand: 0.11 and 0.14 points agree at
// one decimal, not at two).
func TestIntervalDecimals(t *testing.T) {
	tests := []struct {
		metric  string
		lo, hi  float64
		want    string
		decimal int
	}{
		{"fnr", -0.02, -0.004, "[−2.0, −0.4] pts", 1},
		{"fnr", 0.0011, 0.0014, "[+0.11, +0.14] pts", 2},
		{"fnr", -0.0004, 0.0004, "[−0.04, +0.04] pts", 2},
		{"fnr", 0.001, 0.001, "[+0.1, +0.1] pts", 1}, // equal ends are one number
		{"brier", 0.123451, 0.123452, "[+0.123451, +0.123452]", 6},
		{"brier", 0.1234501, 0.1234502, "[+0.123450, +0.123450]", 6}, // at most three more decimals
	}
	for _, tc := range tests {
		if got := formatDeltaInterval(tc.metric, &tc.lo, &tc.hi); got != tc.want {
			t.Errorf("%s [%v, %v] = %q, want %q", tc.metric, tc.lo, tc.hi, got, tc.want)
		}
		if got := intervalDecimals(tc.metric, tc.lo, tc.hi); got != tc.decimal {
			t.Errorf("%s [%v, %v]: %d decimals, want %d", tc.metric, tc.lo, tc.hi, got, tc.decimal)
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
