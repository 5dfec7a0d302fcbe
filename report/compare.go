package report

import (
	"fmt"
	"strings"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/compare"
)

// This file holds the wording of a release review and a history
// (fairness/compare) that the text, Markdown and HTML forms share:
// rows of already formatted strings. It computes nothing.

// changeRow is one quantity of a review: its name and the formatted
// values before and after, the change and the change's interval.
type changeRow struct {
	Name, Before, After, Change, Interval string
	// Clear is set when the change's interval excludes zero.
	Clear bool
	// Contribution marks a mechanism's row (not a group value or gap).
	Contribution bool
}

// reviewMetric is one metric of a review as the reports show it.
type reviewMetric struct {
	Metric, Title string
	Rows          []changeRow
	Lead          string // how the largest contribution moved
}

// reviewRows formats the metric m of rv.
func reviewRows(rv *compare.Review, g compare.Groups, m compare.MetricChange) reviewMetric {
	ref, cmp := rv.Names.GroupName(g.Reference, false), rv.Names.GroupName(g.Comparison, true)
	out := reviewMetric{Metric: m.Metric, Title: MetricTitle(m.Metric)}
	value := func(name string, c compare.Change) changeRow {
		return changeRow{Name: name, Before: formatValue(m.Metric, c.Before), After: formatValue(m.Metric, c.After),
			Change: formatDelta(m.Metric, c.Change), Interval: changeInterval(m.Metric, c.ChangeCI), Clear: c.ExcludesZero}
	}
	delta := func(name string, c compare.Change) changeRow {
		return changeRow{Name: name, Before: formatDelta(m.Metric, c.Before), After: formatDelta(m.Metric, c.After),
			Change: formatDelta(m.Metric, c.Change), Interval: changeInterval(m.Metric, c.ChangeCI), Clear: c.ExcludesZero}
	}
	out.Rows = append(out.Rows, value(ref+" (reference)", m.Reference), value(cmp+" (comparison)", m.Comparison),
		delta("Gap ("+cmp+" − "+ref+")", m.Gap))
	for _, c := range m.Contributions {
		r := delta(reviewMechanism(rv.Names, rv.Mechanisms, c.Node), c.Change)
		r.Contribution = true
		if c.NotEstimable {
			r.Before, r.After, r.Change, r.Interval, r.Clear = "not estimable", "not estimable", "", "", false
		}
		out.Rows = append(out.Rows, r)
	}
	switch {
	case m.LeadBefore == "" || m.LeadAfter == "":
	case m.LeadBefore == m.LeadAfter:
		out.Lead = "The largest contribution comes from " + rv.Names.NodeName(m.LeadAfter) + " in both runs."
	default:
		out.Lead = "The largest contribution came from " + rv.Names.NodeName(m.LeadBefore) + " before and comes from " + rv.Names.NodeName(m.LeadAfter) + " after."
	}
	return out
}

// reviewMechanism names node's mechanism with display names.
func reviewMechanism(names *fairness.Names, mechs []compare.Mechanism, node string) string {
	for _, m := range mechs {
		if m.Node == node {
			return names.Mechanism(node, m.Parents)
		}
	}
	return names.NodeName(node)
}

// changeInterval prints the interval of a change, or "".
func changeInterval(metric string, ci *fairness.Interval) string {
	if ci == nil {
		return ""
	}
	return formatDeltaInterval(metric, &ci.Low, &ci.High)
}

// changeIntervalSentence says how the change intervals were made and
// what they guarantee.
func changeIntervalSentence(rv *compare.Review) string {
	iv := rv.Intervals
	if iv == nil {
		return "No change has an interval: " + rv.NoIntervals + "."
	}
	run := trimPercent(iv.RunLevel)
	if iv.Method == compare.MethodIndependent {
		return fmt.Sprintf("Change intervals combine the runs' %s intervals as for independent estimates (MOVER, Zou and Donner 2008), as declared for disjoint cohorts: about %s coverage if the runs share no record, too narrow otherwise.", run, trimPercent(iv.Level))
	}
	return fmt.Sprintf("Change intervals run from the later run's lower bound minus the earlier run's upper bound to the later upper minus the earlier lower bound (the runs' %s half-widths added). The runs may share records, so their estimates are dependent; by Bonferroni's inequality these intervals cover the true change with probability at least %s whatever the dependence, usually more.", run, trimPercent(iv.Level))
}

// runLine describes a run: its label and file.
func runLine(r compare.Run) string {
	s := r.Label + " (" + r.File
	if r.AuditDate != "" && !strings.Contains(r.Label, r.AuditDate) {
		s += ", audit date " + r.AuditDate
	}
	return s + ")"
}

// omittedLines are the omissions as sentences.
func omittedLines(os []compare.Omission) []string {
	var out []string
	for _, o := range os {
		out = append(out, fmt.Sprintf("%s %s left out: %s.", o.Kind, o.Name, o.Reason))
	}
	return out
}

// historyMetric is one metric of a history as the reports show it: one
// row for the gap and one per leading contribution, a cell per run.
type historyMetric struct {
	Metric, Title string
	Rows          []historyRow
}

type historyRow struct {
	Name  string
	Cells []string // per run: the value and, when present, its interval
}

func historyRows(h *compare.History, g compare.Groups, m compare.MetricHistory) historyMetric {
	ref, cmp := h.Names.GroupName(g.Reference, false), h.Names.GroupName(g.Comparison, true)
	out := historyMetric{Metric: m.Metric, Title: MetricTitle(m.Metric)}
	row := func(name string, pts []compare.Point) historyRow {
		r := historyRow{Name: name}
		for _, p := range pts {
			cell := formatDelta(m.Metric, p.Value)
			if p.NotEstimable {
				cell = "not estimable"
			} else if p.CI != nil {
				cell += " " + formatDeltaInterval(m.Metric, &p.CI.Low, &p.CI.High)
			}
			r.Cells = append(r.Cells, cell)
		}
		return r
	}
	out.Rows = append(out.Rows, row("Gap ("+cmp+" − "+ref+")", m.Gap))
	for _, s := range m.Leading {
		out.Rows = append(out.Rows, row(reviewMechanism(h.Names, h.Mechanisms, s.Node), s.Points))
	}
	return out
}

func anySynthetic(runs ...compare.Run) bool {
	for _, r := range runs {
		if r.Synthetic {
			return true
		}
	}
	return false
}
