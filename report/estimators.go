package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// estimatorSetting describes the estimator of the coalition values for
// the settings tables, e.g. "robust (regressions corrected by the density
// ratios; auc weighted)"; "" for a result that does not say.
func estimatorSetting(res *fairness.Result) string {
	switch res.Settings.Estimator {
	case "robust":
		return "robust (regressions corrected by the density ratios; auc is weighted), checked against weighting"
	case "both":
		return "weighting, checked against the robust estimator"
	case "weighting":
		return "weighting (reweighted records)"
	}
	return res.Settings.Estimator
}

// estimatorLine describes a metric's comparison of the robust and the
// weighting estimates in one sentence, or "" when there is none: the
// difference of the estimated gaps with one standard error, and the
// largest difference in standard errors against the warning's threshold.
func estimatorLine(m fairness.MetricResult, u units) string {
	ck := m.EstimatorCheck
	if ck == nil {
		return ""
	}
	s := fmt.Sprintf("Robust minus weighting estimate: estimated gap %s", u.diff(m.Metric, ck.GapDifference))
	if ck.MaxZ != nil {
		s += fmt.Sprintf("; the largest difference, contributions included, is %.1f standard errors (a warning above %g)", *ck.MaxZ, fairness.WarnEstimatorsZ)
	}
	return s + "."
}

// checksLines joins a metric's comparison of the two sides and of the two
// estimators ("" when it has neither).
func checksLines(m fairness.MetricResult, u units) string {
	s, e := sidesLine(m, u), estimatorLine(m, u)
	switch {
	case s == "":
		return e
	case e == "":
		return s
	}
	return s + " " + e
}

// influenceIntervals reports whether the result's intervals are the robust
// estimator's influence-function intervals (no bootstrap ran, and some
// metric carries them), and their level.
func influenceIntervals(res *fairness.Result) (level float64, ok bool) {
	if res.Settings.Intervals != nil {
		return 0, false
	}
	for _, m := range res.Metrics {
		if m.Uncertainty != nil {
			return m.Uncertainty.Level, true
		}
	}
	return 0, false
}
