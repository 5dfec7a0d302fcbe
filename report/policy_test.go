package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
)

// policyResult is handResult judged against a policy of four rules, with
// the FNR's impact ratio 0.21 / 0.12 = 1.75 set by hand.
func policyResult(t *testing.T) *fairness.Result {
	t.Helper()
	res := handResult()
	res.Metrics[0].ImpactRatio = ptr(1.75)
	res.Metrics[0].ImpactRatioCI = &fairness.Interval{Low: 1.5, High: 2.0}
	res.Settings.Intervals = &fairness.IntervalSettings{Intervals: fairness.Intervals{Replicates: 200, Level: 0.95}}
	p, err := policy.Parse("gate.yaml", []byte(`title: Release gate
unjudged: breach
rules:
  - {metric: fnr, max_gap: 0.05, judge: worst_bound}
  - {metric: fnr, min_ratio: 0.5}
  - {metric: brier, max_gap: 0.01, groups: [women]}
  - preset: four-fifths
`))
	if err != nil {
		t.Fatal(err)
	}
	if err := fairness.ApplyPolicy(res, p); err != nil {
		t.Fatal(err)
	}
	return res
}

// TestPolicySections: every report lists each check with its limit, what
// was judged, the value (worked by hand from handResult: the FNR gap's
// interval [+6.1, +11.8] pts has its worst bound at 11.80 pts against 5.00
// pts; lower ÷ higher is 0.12 / 0.21 = 0.571; |−0.0067| = 0.007 ≤ 0.010)
// and the result, a check without its metric as not judged, the preset's
// analogy caution, and the impact ratio beside the FNR gap.
func TestPolicySections(t *testing.T) {
	res := policyResult(t)
	var text, md, page bytes.Buffer
	if err := WriteText(&text, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteMarkdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteHTML(&page, res); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name, out string
		want      []string
	}{
		{"text", text.String(), []string{
			`Policy gate: BREACHED: 2 of 4 checks (gate.yaml, "Release gate")`,
			"1 (line 4)  fnr             women  |gap| <= 5.00 pts    worst bound of the 95% interval  11.80 pts (estimate 9.00 pts)  BREACH",
			"2 (line 5)  fnr             women  lower/higher >= 0.5  estimate                         0.571                          pass",
			"3 (line 6)  brier           women  |gap| <= 0.010       estimate                         0.007                          pass",
			"not judged, counted as a breach",
			`rule 4, selection_rate for "women": the run did not audit selection_rate`,
			"Preset four-fifths: after the four-fifths rule of 29 CFR 1607.4(D)",
			"impact ratio (comparison / reference)   1.7500    [1.5000, 2.0000]",
		}},
		{"markdown", md.String(), []string{
			"### Policy gate: BREACHED: 2 of 4 checks",
			"| 1 (line 4) | `fnr` | women | \\|gap\\| ≤ 5.00 pts | worst bound of the 95% interval | 11.80 pts (estimate 9.00 pts) | **BREACH** |",
			"| 4 (line 7) | `selection_rate` | women | lower ÷ higher ≥ 0.8 | estimate |  | not judged, counted as a breach: the run did not audit selection\\_rate |",
			"+9.0 pts [+6.1, +11.8] pts; ratio 1.750 [1.500, 2.000]",
			"analogy",
		}},
		{"html", page.String(), []string{
			`<section id="policy">`,
			`<a href="#policy">Policy</a>`,
			`<span class="gw-verdict gw-verdict-unreliable">BREACHED: 2 of 4 checks</span>`,
			`<td class="num" data-label="Value">11.80 pts (estimate 9.00 pts)</td><td data-label="Result"><span class="gw-verdict gw-verdict-unreliable">BREACH</span></td>`,
			`<span class="gw-verdict gw-verdict-caution">not judged, counted as a breach</span>: the run did not audit selection_rate`,
			`<span class="gw-ci gw-impact">ratio 1.750 [1.500, 2.000]</span>`,
			"29 CFR 1607.4(D)",
		}},
	} {
		for _, w := range tc.want {
			if !strings.Contains(tc.out, w) {
				t.Errorf("%s report lacks %q", tc.name, w)
			}
		}
	}
	if !strings.Contains(PolicyBreachMessage(res.Policy), `policy gate.yaml breached: 2 of 4 checks: rule 1 (line 4) fnr for "women": |gap| <= 5.00 pts breached at 11.80 pts (estimate 9.00 pts); rule 4 (line 7) selection_rate for "women": lower/higher >= 0.8 not judged (the run did not audit selection_rate)`) {
		t.Errorf("breach message %q", PolicyBreachMessage(res.Policy))
	}
}

// TestNoPolicySection: without a policy no report shows the section.
func TestNoPolicySection(t *testing.T) {
	res := handResult()
	var text, md, page bytes.Buffer
	_ = WriteText(&text, res)
	_ = WriteMarkdown(&md, res)
	_ = WriteHTML(&page, res)
	for name, out := range map[string]string{"text": text.String(), "markdown": md.String(), "html": page.String()} {
		if strings.Contains(out, "Policy gate") || strings.Contains(out, `id="policy"`) {
			t.Errorf("%s report shows a policy section without a policy", name)
		}
	}
}

// TestCheckDecimals: a breach by less than the printed precision gets the
// decimals that show it (5.004 pts against 5.00 pts prints as 5.004).
func TestCheckDecimals(t *testing.T) {
	v := 0.05004
	c := policy.Check{Metric: "fnr", Limit: policy.LimitMaxGap, LimitValue: 0.05, Value: &v, Status: policy.StatusBreach}
	if got := checkQuantity(c, v, checkDecimals(c)); got != "5.004 pts" {
		t.Errorf("got %q", got)
	}
}
