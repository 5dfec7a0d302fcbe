package report

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/metrics"
)

// How the reports show a count that small-cell suppression withholds
// (fairness.Suppression): "<T" for a count from 1 to T−1, "withheld" for
// one withheld with it so that totals do not give it away.

// withheldWord is the reports' word for a complementary withheld value.
const withheldWord = "withheld"

// withheldText is what the reports print in place of the value at path
// when res withholds it; ok is false when it is shown.
func withheldText(res *fairness.Result, path string) (text string, ok bool) {
	s := res.Suppression
	reason, ok := s.Withheld(path)
	if !ok {
		return "", false
	}
	if reason == fairness.WithheldBelow {
		return fmt.Sprintf("<%d", s.Below), true
	}
	return withheldWord, true
}

// countAt prints the count n at path: withheldText when withheld, else
// shown by format.
func countAt(res *fairness.Result, path string, n int, format func(int) string) string {
	if t, ok := withheldText(res, path); ok {
		return t
	}
	return format(n)
}

// suppressionSentences say, for the reports' opening, that suppression is
// on, what it withholds and shows, what stays shown though small and
// which rates give a small count away; none when it is off. Group names
// are plain text (each output escapes the sentences).
func suppressionSentences(res *fairness.Result) []string {
	s := res.Suppression
	if s == nil {
		return nil
	}
	t := s.Below
	out := []string{fmt.Sprintf("Small-cell suppression is on: counts from 1 to %d are shown as “<%d”, and other counts as “%s” where a total shown elsewhere would give a small one away (confusion counts, score bins of the calibration curves, records per bin or level of each column, missing and outlying values, rows of other group values, rows dropped or without a group value; null in the JSON). Zero is shown. Every metric, gap, contribution and interval is computed from all records and shown as it is.",
		t-1, t, withheldWord)}
	if len(s.SmallMargins) > 0 {
		var parts []string
		for _, p := range s.SmallMargins {
			parts = append(parts, marginWords(res, p))
		}
		out = append(out, fmt.Sprintf("Shown although below %d, because the audit rests on them: %s.", t, strings.Join(parts, "; ")))
	}
	if len(s.RevealingRates) > 0 {
		byMetric := map[string][]string{}
		var order []string
		for _, r := range s.RevealingRates {
			if _, ok := byMetric[r.Metric]; !ok {
				order = append(order, r.Metric)
			}
			byMetric[r.Metric] = append(byMetric[r.Metric], roleGroup(res, r.Group))
		}
		var parts []string
		for _, m := range order {
			parts = append(parts, MetricTitle(m)+" of "+joinWords(byMetric[m]))
		}
		out = append(out, fmt.Sprintf("With the records they rest on, these rates give a count below %d away: %s; withhold them before publishing if your disclosure rules require it.", t, strings.Join(parts, ", ")))
	}
	return out
}

// suppressionSetting is the settings' line for suppression, or "" when
// it is off.
func suppressionSetting(res *fairness.Result) string {
	if res.Suppression == nil {
		return ""
	}
	return fmt.Sprintf("counts from 1 to %d withheld (%d values)", res.Suppression.Below-1, len(res.Suppression.Cells))
}

// roleGroup names the group of a role ("reference" or "comparison") by
// its display name.
func roleGroup(res *fairness.Result, role string) string {
	if role == "comparison" {
		return cmpName(res)
	}
	return refName(res)
}

// marginPath matches the paths of fairness.Suppression.SmallMargins.
var marginPath = regexp.MustCompile(`^(?:groups\.(n|events|non_events)_(reference|comparison)|metrics\[(\d+)\]\.records_(reference|comparison))$`)

// marginWords words one small margin: "the events of female (6)", "the
// positives behind the false-negative rate of male (4)".
func marginWords(res *fairness.Result, path string) string {
	m := marginPath.FindStringSubmatch(path)
	if m == nil {
		return path
	}
	g := res.Groups
	if m[1] != "" {
		n, events := g.NReference, g.EventsReference
		if m[2] == "comparison" {
			n, events = g.NComparison, g.EventsComparison
		}
		what, v := "records", n
		switch m[1] {
		case "events":
			what, v = "events", events
		case "non_events":
			what, v = "records without the outcome", n-events
		}
		return fmt.Sprintf("the %s of %s (%d)", what, roleGroup(res, m[2]), v)
	}
	i, _ := strconv.Atoi(m[3])
	if i >= len(res.Metrics) {
		return path
	}
	mr := res.Metrics[i]
	v := mr.RecordsReference
	if m[4] == "comparison" {
		v = mr.RecordsComparison
	}
	noun := "records"
	if f, ok := metrics.FactOf(mr.Metric); ok {
		noun = f.BasisNoun()
	}
	return fmt.Sprintf("the %s behind the %s of %s (%d)", noun, MetricTitle(mr.Metric), roleGroup(res, m[4]), v)
}
