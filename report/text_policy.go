package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// policy prints the policy gate: the verdict, one row per check (rule,
// metric, comparison group, limit, what was judged, the value and the
// result, with the reason of a check not judged), the presets' cautions
// and the general caution. Nothing without a policy.
func (t *textWriter) policy(res *fairness.Result) {
	o := res.Policy
	if o == nil {
		return
	}
	title := ""
	if o.Title != "" {
		title = fmt.Sprintf(", %q", o.Title)
	}
	t.line("Policy gate: %s (%s%s)", policyHeadline(o), o.File, title)
	tab := textTable{header: []string{"rule", "metric", "group", "limit", "judged on", "value", "result"}}
	var reasons []string
	for _, r := range policyRows(o, res.Names) {
		tab.add(fmt.Sprintf("%d (line %d)", r.Rule, r.Line), r.Metric, r.Group, r.LimitPlain, r.Judged, r.Value, r.StatusWord)
		if r.Reason != "" {
			reasons = append(reasons, fmt.Sprintf("rule %d, %s for %q: %s", r.Rule, r.Metric, r.Group, r.Reason))
		}
	}
	tab.write(t.w, "  ")
	for _, s := range reasons {
		t.line("  %s", s)
	}
	for _, n := range policyNotes(o) {
		t.line("  %s", n)
	}
	t.line("  %s", policyCaution)
	t.line("")
}

// impactRow adds the impact ratio of a rate to a metric's value table.
func impactRow(vals *textTable, m fairness.MetricResult) {
	if m.ImpactRatio == nil {
		return
	}
	vals.add("impact ratio (comparison / reference)", fixed(*m.ImpactRatio), interval(m.ImpactRatioCI, fixed), "")
}
