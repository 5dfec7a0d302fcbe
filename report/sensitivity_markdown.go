package report

import (
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// mdHiddenFactor prints the sensitivity to an unrecorded factor as the
// text report does (hiddenFactor): introduction, one table per metric
// with the verdicts in words under it.
func mdHiddenFactor(p mdPrinter, res *fairness.Result) {
	ms := hiddenMetrics(res)
	if ms == nil {
		return
	}
	p("### Sensitivity to an unrecorded factor\n\n%s\n\n", mdText(hiddenIntro))
	heads := factorHeads(res)
	for _, m := range ms {
		p("#### %s\n\n", mdText(MetricTitle(m.Metric)))
		if m.Skipped != "" {
			p("Not bounded: %s.\n\n", mdText(m.Skipped))
			continue
		}
		p("| Mechanism | Value |")
		for _, h := range heads {
			p(" %s |", mdText(h))
		}
		p(" Could reverse from |\n| --- | ---: |%s ---: |\n", strings.Repeat(" ---: |", len(heads)))
		for _, r := range m.Rows {
			name := "Estimated gap"
			if r.Name != "" {
				name = mdCodeCell(r.Name)
			}
			p("| %s | %s |", name, formatDelta(m.Metric, r.Value))
			for _, b := range r.Ranges {
				p(" %s |", formatDeltaRange(m.Metric, b))
			}
			p(" %s |\n", mdText(reversalCell(r.Reversal, res.HiddenFactor.MaxFactor)))
		}
		p("\n")
		for _, r := range m.Rows {
			who := "Estimated gap"
			if r.Name != "" {
				who = "`" + r.Name + "`"
			}
			p("- %s\n", mdSentence(who+": "+r.Words+"."))
		}
		if m.Lead != "" {
			p("\n%s\n", mdSentence(m.Lead))
		}
		p("\n")
	}
}

// formatDeltaRange writes a range of differences as formatDelta does
// its ends: "[−1.2, +3.4] pts".
func formatDeltaRange(metric string, b [2]float64) string {
	lo, hi := &b[0], &b[1]
	return formatDeltaInterval(metric, lo, hi)
}
