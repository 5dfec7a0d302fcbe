package report

import (
	"bytes"
	"html"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// handHidden adds to handResult a sensitivity section built by hand for
// the FNR metric: hb's contribution (+6.1 pts) stays positive beyond
// Λ = 3, age's (−1.2 pts) reaches zero at Λ = 1.18, the estimated gap at
// Λ = 2.4; the lead could change at Λ = 1.7. The numbers are invented;
// the expected strings are their rounding done by hand.
func handHidden() *fairness.Result {
	res := handResult()
	b := func(lo1, hi1, lo2, hi2 float64) []fairness.FactorBound {
		return []fairness.FactorBound{{Factor: 1.25, Low: lo1, High: hi1}, {Factor: 2, Low: lo2, High: hi2}}
	}
	res.HiddenFactor = &fairness.HiddenFactor{Factors: []float64{1.25, 2}, MaxFactor: 3, Side: "reference", Metrics: []fairness.HiddenFactorMetric{
		{Metric: "fnr", LeadNode: "hb", LeadChangeFactor: ptr(1.7),
			EstimatedGap: &fairness.HiddenFactorValue{Value: 0.079, Bounds: b(0.05, 0.11, 0.01, 0.15), ReversalFactor: ptr(2.4)},
			Contributions: []fairness.HiddenFactorValue{
				{Node: "age", Value: -0.012, Bounds: b(-0.03, 0.004, -0.06, 0.03), ReversalFactor: ptr(1.18)},
				{Node: "hb", Value: 0.061, Bounds: b(0.04, 0.08, 0.02, 0.1)},
			}},
		{Metric: "brier", Skipped: "no contributions to bound"},
	}}
	return res
}

func TestHiddenFactorRendered(t *testing.T) {
	res := handHidden()
	want := []string{
		"up to 25% could reverse this contribution (from a shift of 18%, Λ = 1.18)",
		"up to 25% could not reverse this contribution; not even one of Λ = 3 could",
		"up to 25% could not reverse the sign of the estimated gap; it would take one of Λ = 2.40 (a shift of 140%)",
		"could be overtaken by another mechanism's under an unrecorded factor of Λ = 1.70",
		"no contributions to bound",
	}
	writers := map[string]func(*bytes.Buffer) error{
		"text":     func(b *bytes.Buffer) error { return WriteText(b, res) },
		"markdown": func(b *bytes.Buffer) error { return WriteMarkdown(b, res) },
		"html":     func(b *bytes.Buffer) error { return WriteHTML(b, res) },
	}
	for name, w := range writers {
		var buf bytes.Buffer
		if err := w(&buf); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		// Markdown escapes parentheses and both escape apostrophes.
		out := strings.ReplaceAll(html.UnescapeString(buf.String()), `\`, "")
		out = strings.Join(strings.Fields(out), " ")
		for _, s := range want {
			if !strings.Contains(out, s) {
				t.Errorf("%s report lacks %q", name, s)
			}
		}
	}
}

// Without the section the text and Markdown reports say nothing of it and
// the HTML report says the analysis was off.
func TestHiddenFactorAbsent(t *testing.T) {
	res := handResult()
	var tb, hb bytes.Buffer
	if err := WriteText(&tb, res); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(tb.String(), "Sensitivity to an unrecorded factor") {
		t.Error("text report shows a sensitivity section without one in the result")
	}
	if err := WriteHTML(&hb, res); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(hb.String(), "hidden_factor: off") {
		t.Error("HTML report does not say the analysis was off")
	}
}

// The HTML table marks the row whose sign could reverse at Λ ≤ 1.25.
func TestHiddenFactorHTMLMarksFragile(t *testing.T) {
	v := hiddenPage(handHidden(), "fnr")
	rows := v.Metrics[0].Rows
	if !rows[0].Fragile || rows[1].Fragile || rows[2].Fragile {
		t.Errorf("fragile flags %v %v %v, want true false false", rows[0].Fragile, rows[1].Fragile, rows[2].Fragile)
	}
}
