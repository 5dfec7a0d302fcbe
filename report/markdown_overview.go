package report

import "github.com/gapwise/gapwise/fairness"

// markdownCellInline writes user text for a GFM table cell: running text
// as mdText, code as mdCodeCell (a pipe inside is escaped).
var markdownCellInline = inlineStyle{text: mdText, code: mdCodeCell}

// mdOverview prints the overview table (overviewRows), overviewCaution
// and, for intervals of the fast bootstrap, approximateNote.
func mdOverview(p mdPrinter, res *fairness.Result) {
	p("### Overview\n\n")
	if len(res.Metrics) == 0 {
		p("The result holds no metrics.\n\n%s\n\n", overviewCaution)
		return
	}
	p("| Metric | %s (reference) | %s (comparison) | Gap | Largest contribution | Reliability |\n", mdText(refName(res)), mdText(cmpName(res)))
	p("| --- | ---: | ---: | ---: | --- | --- |\n")
	for _, r := range overviewRows(res, markdownCellInline) {
		lead := r.Lead
		if r.Share != "" {
			lead += "; " + r.Share
		}
		because := r.Because
		if refs := warningRefs(r.Refs); refs != "" {
			because += " (" + refs + ")"
		}
		p("| %s | %s | %s | %s | %s | **%s**, %s |\n", r.Title, r.Reference, r.Comparison, r.Gap, lead, r.Verdict, because)
	}
	p("\n%s\n\n", overviewCaution)
	if n := approximateNote(res); n != "" {
		p("%s\n\n", mdText(n))
	}
	for _, s := range suppressionSentences(res) {
		p("%s\n\n", mdText(s))
	}
}

// mdWarnings prints the warnings, most serious first, numbered as the
// overview refers to them and with their severities.
func mdWarnings(p mdPrinter, res *fairness.Result) {
	if len(res.Warnings) == 0 {
		p("No warnings.\n\n")
		return
	}
	p("### Warnings\n\n")
	for n, i := range warningOrder(res.Warnings) {
		w := res.Warnings[i]
		p("%d. **%s**: %s\n", n+1, severityWord(w.Severity), mdSentence(w.Message))
	}
	p("\n")
}
