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
func residualNote(res *fairness.Result) string {
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
func sidesLine(m fairness.MetricResult) string {
	a := m.SideAgreement
	if a == nil {
		return ""
	}
	s := fmt.Sprintf("Reweighted reference minus reweighted comparison records: comparison end %s, reference end %s, their average %s",
		sideDiff(m.Metric, a.ComparisonEnd), sideDiff(m.Metric, a.ReferenceEnd), sideDiff(m.Metric, a.EndsAverage))
	if a.MaxZ != nil {
		s += fmt.Sprintf("; the largest difference, contributions included, is %.1f standard errors (a warning above %g)", *a.MaxZ, fairness.WarnSidesZ)
	}
	return s + "."
}

// sideDiff prints a difference between the sides in the metric's delta
// unit with "± SE" when its standard error is known.
func sideDiff(metric string, d fairness.SideDifference) string {
	if d.StdError == nil {
		return formatDelta(metric, d.Difference)
	}
	se := formatMagnitude(metric, *d.StdError)
	if isProportion(metric) {
		se += " pts"
	}
	return formatDelta(metric, d.Difference) + " ± " + se
}

// contributionSides prints a contribution's difference between the sides,
// or "" when there is none.
func contributionSides(metric string, c fairness.Contribution) string {
	if c.SideDifference == nil {
		return ""
	}
	return sideDiff(metric, *c.SideDifference)
}
