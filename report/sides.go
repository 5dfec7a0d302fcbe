package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// residualNote says what a metric's residual holds, for every report: the
// estimation error and the effect of anything outside the graph, and,
// when both sides are combined per coalition, that it is small by
// construction (both ends of the gap are pinned to the observed values),
// so that the comparison of the two sides is the check to read.
//
// For a metric the robust estimator gives (m.Estimator), both ends are
// the observed metrics and the residual is 0 by construction; the
// comparison with the weighting estimate is the check then.
func residualNote(res *fairness.Result, m fairness.MetricResult) string {
	if m.Estimator == "robust" {
		return "With the robust estimator both ends of the gap are the observed values, so the residual is 0 by construction: read the comparison with the weighting estimate instead."
	}
	s := "The residual holds estimation error and the effect of anything outside the graph that differs between the groups."
	switch {
	case res.Settings.EstimateFrom == "both" && res.Settings.CombineSides == "coalition":
		s += " With both sides combined per coalition it is small by construction, whatever the quality of the estimate: read the comparison of the two sides instead."
	case res.Settings.EstimateFrom == "both":
		s += " A small residual does not prove a sound estimate; the comparison of the two sides is the stronger check."
	}
	return s
}

// sidesLine describes a metric's comparison of the two sides in one
// sentence, or "" when there is none: the difference at each end of the
// gap and their average with one standard error each, and the largest
// difference in standard errors against the warning's threshold.
func sidesLine(m fairness.MetricResult, u units) string {
	a := m.SideAgreement
	if a == nil {
		return ""
	}
	s := fmt.Sprintf("Reweighted reference minus reweighted comparison records: comparison end %s, reference end %s, their average %s",
		u.diff(m.Metric, a.ComparisonEnd), u.diff(m.Metric, a.ReferenceEnd), u.diff(m.Metric, a.EndsAverage))
	if a.MaxZ != nil {
		s += fmt.Sprintf("; the largest difference, contributions included, is %.1f standard errors (a warning above %g)", *a.MaxZ, fairness.WarnSidesZ)
	}
	return s + "."
}

// units prints differences between the sides: reportUnits in the
// metric's delta unit (percentage points for a rate), as the Markdown and
// HTML reports print gaps; textUnits as plain signed decimals, as the text
// report does.
type units struct {
	delta, magnitude func(metric string, v float64) string
	suffix           func(metric string) string
}

var (
	reportUnits = units{delta: formatDelta, magnitude: formatMagnitude, suffix: func(metric string) string {
		if isProportion(metric) {
			return " pts"
		}
		return ""
	}}
	textUnits = units{delta: func(_ string, v float64) string { return signed(v) }, magnitude: func(_ string, v float64) string { return fixed(v) },
		suffix: func(string) string { return "" }}
)

// diff prints a difference between the sides with "± SE" when its
// standard error is known.
func (u units) diff(metric string, d fairness.SideDifference) string {
	if d.StdError == nil {
		return u.delta(metric, d.Difference)
	}
	return u.delta(metric, d.Difference) + " ± " + u.magnitude(metric, *d.StdError) + u.suffix(metric)
}

// sideDiff is reportUnits.diff.
func sideDiff(metric string, d fairness.SideDifference) string {
	if d.StdError == nil {
		return formatDelta(metric, d.Difference)
	}
	return reportUnits.diff(metric, d)
}

// contributionSides prints a contribution's difference between the sides,
// or "" when there is none.
func contributionSides(metric string, c fairness.Contribution, u units) string {
	if c.SideDifference == nil {
		return ""
	}
	return u.diff(metric, *c.SideDifference)
}

// residualDelta prints a metric's residual in its delta unit, with
// "± SE" when its standard error is known.
func residualDelta(m fairness.MetricResult) string {
	return sideDiff(m.Metric, fairness.SideDifference{Difference: m.Residual, StdError: m.ResidualSE})
}
