package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// This file words the summary of an audit of several comparison groups
// (fairness.RunGroups): one row per comparison and metric, shared by the
// text, Markdown and HTML forms so that all three print the same cells.

// groupsRow is one cell of the summary matrix as every output prints it.
type groupsRow struct {
	Comparison, ComparisonID string // display name and value
	Metric, MetricTitle      string
	Reference, Value         string // the groups' values
	Gap, GapInterval         string
	Lead                     string // the lead mechanism's display name, "" when none
	LeadContribution         string // with its interval, e.g. "+6.1 pts [+4.0, +8.2] pts"
	LeadShare                string // "74% of the gap", or ""
	Verdict, Level           string // "Reliable", ...; sound, note, caution or unreliable
}

// groupsRows words the summary matrix of g, reading each comparison's
// display names from its Result.
func groupsRows(g *fairness.GroupsResult) []groupsRow {
	byValue := map[string]*fairness.Result{}
	for _, r := range g.Results {
		byValue[r.Groups.Comparison] = r
	}
	var rows []groupsRow
	for _, c := range g.Summary.Matrix {
		res := byValue[c.Comparison]
		row := groupsRow{Comparison: c.Comparison, ComparisonID: c.Comparison, Metric: c.Metric, MetricTitle: MetricTitle(c.Metric),
			Reference: formatValue(c.Metric, c.Reference), Value: formatValue(c.Metric, c.Value),
			Gap: formatDelta(c.Metric, c.Gap), Level: string(c.Verdict), Verdict: groupsVerdict(c.Verdict)}
		if c.GapCI != nil {
			row.GapInterval = formatDeltaInterval(c.Metric, &c.GapCI.Low, &c.GapCI.High)
		}
		if res != nil {
			row.Comparison = res.ComparisonName()
		}
		if c.Lead != "" && res != nil && c.LeadContribution != nil {
			row.Lead = mechName(res, c.Lead)
			row.LeadContribution = formatDelta(c.Metric, *c.LeadContribution)
			if c.LeadCI != nil {
				row.LeadContribution += " " + formatDeltaInterval(c.Metric, &c.LeadCI.Low, &c.LeadCI.High)
			}
		}
		if c.LeadShare != nil {
			row.LeadShare = trimNegZero(fmt.Sprintf("%.0f", 100**c.LeadShare)) + "% of the gap"
		}
		rows = append(rows, row)
	}
	return rows
}

// groupsVerdict words a headline verdict as the overview does.
func groupsVerdict(v fairness.Severity) string {
	switch v {
	case fairness.SeverityUnreliable:
		return "Not reliable"
	case fairness.SeverityCaution:
		return "Use with caution"
	case fairness.SeverityNote, fairness.VerdictSound:
		return "Reliable"
	}
	return "Not assessed"
}

// groupsHeading is the summary's first line, e.g. "3 comparison groups
// against north (column clinic)".
func groupsHeading(g *fairness.GroupsResult) string {
	s := g.Summary
	ref := s.Reference
	if len(g.Results) > 0 {
		ref = g.Results[0].ReferenceName()
	}
	n := len(s.Comparisons)
	word := "groups"
	if n == 1 {
		word = "group"
	}
	return fmt.Sprintf("%d comparison %s against the reference %s (column %s)", n, word, quoted(ref), quoted(s.Column))
}

// groupsSkipped words each skipped comparison: its value and the reason.
func groupsSkipped(s *fairness.GroupsSummary) []string {
	var out []string
	for _, k := range s.Skipped {
		out = append(out, fmt.Sprintf("%s: not audited, %s", quoted(k.Value), k.Reason))
	}
	return out
}

// groupsPolicyLine words the policy's verdict over every comparison, ""
// without a policy.
func groupsPolicyLine(s *fairness.GroupsSummary) string {
	if s.Policy == nil {
		return ""
	}
	if s.Policy.Passed {
		return "Policy: every comparison passed."
	}
	var failed []string
	for _, c := range s.Comparisons {
		if c.PolicyPassed != nil && !*c.PolicyPassed {
			failed = append(failed, quoted(c.Value))
		}
	}
	return fmt.Sprintf("Policy: breached (%d %s) by %s.", s.Policy.Breaches, pluralWord(s.Policy.Breaches, "check", "checks"), joinWords(failed))
}

// groupsNote is the sentence every form prints under the matrix: what the
// rows are and that each comparison has its own report.
const groupsNote = "Each row is one metric of one comparison group decomposed against the same reference, in a separate audit with its own classifiers; the lead mechanism is the one with the largest estimable contribution, and the verdict is that of the comparison's own report, which follows or sits beside this summary. Gaps of different comparisons are not tested against each other."

func quoted(s string) string { return fmt.Sprintf("%q", s) }

func pluralWord(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
