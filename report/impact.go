package report

import (
	"strconv"

	"github.com/gapwise/gapwise/fairness"
)

// formatRatio prints an impact ratio with three decimals.
func formatRatio(v float64) string { return strconv.FormatFloat(v, 'f', 3, 64) }

// impactText is the impact ratio comparison ÷ reference of a rate as the
// Markdown and HTML reports print it beside the gap, "ratio 1.214" with
// its interval when the bootstrap ran ("ratio 1.214 [1.102, 1.330]"); ""
// when the result has none (not a rate, or a reference value of 0).
func impactText(m fairness.MetricResult) string {
	if m.ImpactRatio == nil {
		return ""
	}
	s := "ratio " + formatRatio(*m.ImpactRatio)
	if ci := m.ImpactRatioCI; ci != nil {
		s += " [" + formatRatio(ci.Low) + ", " + formatRatio(ci.High) + "]"
	}
	return s
}

// impactNote explains the ratio where a report shows one; "" when no
// metric has one.
func impactNote(res *fairness.Result) string {
	for _, m := range res.Metrics {
		if m.ImpactRatio != nil {
			return "For rates, ratio = comparison ÷ reference (the impact ratio), beside the gap."
		}
	}
	return ""
}
