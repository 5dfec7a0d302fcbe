package report

import (
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// overviewCaution is the caution printed under every report's overview,
// so that a reader who stops there has read it.
const overviewCaution = "These are statistical estimates that hold under the causal assumptions listed in this report (the graph is right, no hidden confounders, overlap between the groups); they are not clinical or legal findings. Local regulation and institutional review govern how a model may be used and changed."

// overview prints the overview of every metric: values, gap, largest
// contribution and verdict, then overviewCaution and, for intervals of
// the fast bootstrap, approximateNote.
func (t *textWriter) overview(res *fairness.Result) {
	ref, cmp := refName(res), cmpName(res)
	head := "Overview: gap = " + cmp + " − " + ref
	if intervalSetting(res) != "" {
		head += "; " + intervalName(res) + "s in brackets"
	}
	t.line("%s", head)
	for _, r := range overviewRows(res, plainInline) {
		t.line("  %s: %s %s, %s %s; gap %s", r.Title, cmp, r.Comparison, ref, r.Reference, r.Gap)
		lead := "    largest contribution: " + r.Lead
		if r.Share != "" {
			lead += "; " + r.Share
		}
		t.line("%s", lead)
		because := r.Because
		if refs := warningRefs(r.Refs); refs != "" {
			because += " (" + refs + ")"
		}
		t.line("    %s: %s", strings.ToLower(r.Verdict), because)
	}
	if len(res.Metrics) == 0 {
		t.line("  The result holds no metrics.")
	}
	t.line("  %s", overviewCaution)
	if n := approximateNote(res); n != "" {
		t.line("  %s", n)
	}
	for _, s := range suppressionSentences(res) {
		t.line("  %s", s)
	}
	t.line("")
}

// warnings prints the warnings, most serious first, numbered as the
// overview refers to them and with their severities.
func (t *textWriter) warnings(res *fairness.Result) {
	t.line("Warnings (most serious first)")
	if len(res.Warnings) == 0 {
		t.line("  none")
	}
	for n, i := range warningOrder(res.Warnings) {
		w := res.Warnings[i]
		t.line("  %d. %s: %s", n+1, severityWord(w.Severity), w.Message)
	}
	t.line("")
}
