package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/metrics"
)

// basis says how many records a metric's group value rests on, "340
// positives", from fairness.MetricResult's RecordsReference or
// RecordsComparison; "" for a result without the count (zero records never
// reach a report: such a metric is undefined).
func basis(metric string, n int) string {
	if n <= 0 {
		return ""
	}
	f, ok := metrics.FactOf(metric)
	noun := "records"
	if ok {
		noun = f.BasisNoun()
	}
	if n == 1 {
		return "1 of the " + noun
	}
	return fmt.Sprintf("%s %s", thousandsText(n), noun)
}

// thousandsText formats n with commas between groups of three digits.
func thousandsText(n int) string {
	s := fmt.Sprint(n)
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return s
}

// basisPair reads "340 / 120 positives" (reference / comparison), or ""
// without counts.
func basisPair(metric string, ref, cmp int) string {
	if ref <= 0 || cmp <= 0 {
		return ""
	}
	f, _ := metrics.FactOf(metric)
	noun := "records"
	if f.Name != "" {
		noun = f.BasisNoun()
	}
	return fmt.Sprintf("%s / %s %s", thousandsText(ref), thousandsText(cmp), noun)
}

// labelWords says how label words were read, ` (positive "died", 0
// "alive")`, or "" when the labels were 0/1.
func labelWords(v *fairness.LabelValues) string {
	if v == nil {
		return ""
	}
	if v.Negative == "" {
		return fmt.Sprintf(" (positive %q, no other value)", v.Positive)
	}
	return fmt.Sprintf(" (positive %q, other %q)", v.Positive, v.Negative)
}

// missingSetting says how missing values were handled.
func missingSetting(s fairness.Settings) string {
	switch s.Missing {
	case "drop":
		return "rows dropped"
	case "indicator":
		return "kept, with a missingness indicator per column"
	case "error":
		return "an error"
	}
	if s.DropMissing { // results written before the missing field
		return "rows dropped"
	}
	return "an error"
}

// allRecordsText reads "before dropping rows: +5.0 pts", the gap on every
// record with label and score when rows were dropped, or "".
func allRecordsText(m fairness.MetricResult) string {
	if m.AllRecords == nil {
		return ""
	}
	return "before dropping rows: " + formatDelta(m.Metric, m.AllRecords.Gap)
}

// allRecordsSuffix is allRecordsText in parentheses after a gap, or "".
func allRecordsSuffix(m fairness.MetricResult) string {
	if s := allRecordsText(m); s != "" {
		return " (" + s + ")"
	}
	return ""
}

// notEstimable is what the reports print in place of a contribution the
// data cannot estimate (fairness.Contribution.NotEstimable).
const notEstimable = "not estimable"

// sumLabel is label for the row of Σ contributions, noting when it holds
// contributions the reports do not show (not estimable), so that the
// visible rows are not expected to add up to it.
func sumLabel(m fairness.MetricResult, label string) string {
	for _, c := range m.Contributions {
		if c.NotEstimable {
			return label + " (including those not estimable)"
		}
	}
	return label
}

// textSides is a contribution's side difference in the text report's
// number style ("+0.0123 ± 0.0045"), or "".
func textSides(c fairness.Contribution) string {
	d := c.SideDifference
	if d == nil {
		return ""
	}
	if d.StdError == nil {
		return fmt.Sprintf("%+.4f", d.Difference)
	}
	return fmt.Sprintf("%+.4f ± %.4f", d.Difference, *d.StdError)
}
