package report

import "github.com/gapwise/gapwise/fairness"

// mdPolicy prints the policy gate as a section with a table of the checks
// (as the text report's policy), the presets' cautions and the general
// caution. Nothing without a policy.
func mdPolicy(p mdPrinter, res *fairness.Result) {
	o := res.Policy
	if o == nil {
		return
	}
	p("### Policy gate: %s\n\n", mdText(policyHeadline(o)))
	if o.Title != "" {
		p("Policy %s (%s).\n\n", mdText(o.Title), mdCode(o.File))
	} else {
		p("Policy %s.\n\n", mdCode(o.File))
	}
	p("| Rule | Metric | Group | Limit | Judged on | Value | Result |\n")
	p("| ---: | --- | --- | --- | --- | ---: | --- |\n")
	for _, r := range policyRows(o, res.Names) { // Judged and Value are the report's own words and numbers
		result := mdText(r.StatusWord)
		if r.Status == "breach" {
			result = "**" + result + "**"
		}
		if r.Reason != "" {
			result += ": " + mdText(r.Reason)
		}
		p("| %d (line %d) | %s | %s | %s | %s | %s | %s |\n", r.Rule, r.Line, mdCodeCell(r.Metric), mdText(r.Group), mdText(r.Limit), r.Judged, r.Value, result)
	}
	p("\n")
	for _, n := range policyNotes(o) {
		p("%s\n\n", mdText(n))
	}
	p("%s\n\n", mdText(policyCaution))
}

// mdImpact is the impact ratio beside a gap in a Markdown cell ("; ratio
// 1.214 [1.102, 1.330]"), or "".
func mdImpact(m fairness.MetricResult) string {
	if s := impactText(m); s != "" {
		return "; " + s // digits, brackets and the word ratio: no user text
	}
	return ""
}
