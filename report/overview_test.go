package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestOverviewRows: the overview words the fairness.Headline of a metric:
// its verdict with the reasons and numbers of its warnings (most serious
// first), the lead's share of the gap, and whether the gap's interval
// holds 0. Shares are the fixture's by hand: 0.061/0.09 ≈ 68%,
// 0.061/0.05 = 122%, −0.012/0.09 ≈ −13%.
func TestOverviewRows(t *testing.T) {
	tests := []struct {
		name   string
		change func(r *fairness.Result)
		want   []string
	}{
		{"sound", func(r *fairness.Result) {}, []string{"+9.0 pts [+6.1, +11.8] pts", "how `hb` presents given `anaemia`: +6.1 pts (95% interval [+4.8, +7.3] pts)", "68% of the gap", "Reliable|no warning concerns it"}},
		{"caution with its warnings' numbers", func(r *fairness.Result) {
			r.Warnings = append(r.Warnings, fairness.Warning{Kind: fairness.KindHeavyTail, Severity: fairness.SeverityCaution, Nodes: []string{"hb"}, Message: "heavy"},
				fairness.Warning{Kind: fairness.KindFewRecords, Severity: fairness.SeverityCaution, Metric: "fnr", Nodes: []string{}, Message: "few"})
			r.Metrics[0].Headline.Verdict, r.Metrics[0].Headline.Warnings = fairness.SeverityCaution, []int{2, 3}
		}, []string{"Use with caution|because the weights have a heavy tail for the mechanism of `hb` and the metric rests on few records|[3 4]"}},
		{"unreliable, notes left out of the reasons", func(r *fairness.Result) {
			r.Warnings = append(r.Warnings, fairness.Warning{Kind: fairness.KindBootstrapFailures, Severity: fairness.SeverityNote, Nodes: []string{}, Message: "n"},
				fairness.Warning{Kind: fairness.KindPoorOverlap, Severity: fairness.SeverityUnreliable, Nodes: []string{"hb"}, Message: "u"})
			r.Metrics[0].Headline.Verdict, r.Metrics[0].Headline.Warnings = fairness.SeverityUnreliable, []int{2, 3}
		}, []string{"Not reliable|because the groups barely overlap for the mechanism of `hb`|[2]"}}, // after ferritin's unreliable warning
		{"notes only", func(r *fairness.Result) {
			r.Warnings = []fairness.Warning{{Kind: fairness.KindRowsDropped, Severity: fairness.SeverityNote, Nodes: []string{}, Message: "n"}}
			r.Metrics[0].Headline.Verdict, r.Metrics[0].Headline.Warnings = fairness.SeverityNote, []int{0}
		}, []string{"Reliable|only notes concern it|[1]"}},
		{"more than the whole gap, interval holding 0", func(r *fairness.Result) {
			r.Metrics[0].Gap, r.Metrics[0].GapCI = 0.05, &fairness.Interval{Low: -0.01, High: 0.11}
			r.Metrics[0].Headline.LeadShare = ptr(0.061 / 0.05)
		}, []string{"+5.0 pts [−1.0, +11.0] pts, interval includes 0", "122% of the gap (others offset part)"}},
		{"a lead that narrows the gap", func(r *fairness.Result) {
			r.Metrics[0].Headline.Lead, r.Metrics[0].Headline.LeadShare = "age", ptr(-0.012/0.09)
		}, []string{"the mix of `age`: −1.2 pts (95% interval [−2.0, −0.4] pts)", "it narrows the gap, by 13% of the gap's size"}},
		{"no gap at the precision shown: no share", func(r *fairness.Result) {
			r.Metrics[0].Gap, r.Metrics[0].GapCI = 0.0002, nil
		}, []string{"0.0 pts: no difference at the precision shown", "share="}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := handResult()
			tc.change(r)
			row := overviewRows(r, plainInline)[0]
			got := strings.Join([]string{row.Gap, row.Lead, "share=" + row.Share, row.Verdict + "|" + row.Because + "|" + fmtInts(row.Refs)}, "\n")
			for _, w := range tc.want {
				if !strings.Contains(got, w) {
					t.Errorf("overview lacks %q:\n%s", w, got)
				}
			}
		})
	}
}

func fmtInts(v []int) string {
	var b bytes.Buffer
	b.WriteString("[")
	for i, n := range v {
		if i > 0 {
			b.WriteString(" ")
		}
		b.WriteString(itoa(n))
	}
	return b.String() + "]"
}

// TestOverviewInEveryReport: the text, Markdown and HTML reports open
// with the overview and its caution, then the warnings with their
// severities, before the groups.
func TestOverviewInEveryReport(t *testing.T) {
	r := handResult()
	var text, md, page bytes.Buffer
	if err := WriteText(&text, r); err != nil {
		t.Fatal(err)
	}
	if err := WriteMarkdown(&md, r); err != nil {
		t.Fatal(err)
	}
	if err := WriteHTML(&page, r); err != nil {
		t.Fatal(err)
	}
	for name, tc := range map[string]struct {
		out     string
		inOrder []string
	}{
		"text": {text.String(), []string{"Overview: gap = women − men", "false-negative rate: women 21.0%, men 12.0%; gap +9.0 pts",
			"not clinical or legal findings", "Warnings (most serious first)", "1. unreliable: the contribution of `ferritin`", "2. caution: mechanism ferritin", "Groups (column"}},
		"markdown": {md.String(), []string{"### Overview", "| false-negative rate | 12.0% | 21.0% |", "not clinical or legal findings",
			"### Warnings", "1. **unreliable**:", "2. **caution**:", "Groups by `sex`", "### Assumptions and cautions", "- The causal graph is right enough."}},
		"html": {page.String(), []string{`<section id="overview">`, `id="overview-caution"`, "not clinical or legal findings",
			`<section id="warnings-section">`, `<li id="warning-1"><span class="gw-sev gw-sev-unreliable">unreliable</span>`, `<section id="summary">`}},
	} {
		at := 0
		for _, w := range tc.inOrder {
			i := strings.Index(tc.out[at:], w)
			if i < 0 {
				t.Errorf("%s: %q missing or out of order", name, w)
				continue
			}
			at += i
		}
	}
}
