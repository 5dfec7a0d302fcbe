package report

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/compare"
	"github.com/gapwise/gapwise/fairness/policy"
)

// WriteReviewText writes the release review rv as plain text: the two
// runs, how the change intervals were made, the notes on how the runs
// differ, then per comparison and metric a table of the groups' values,
// the gap and every shared mechanism's contribution before and after,
// their change and its interval (a "*" marks an interval that excludes
// zero), what was left out, the policy gate on the later run, and the
// cautions. It returns the first write error.
func WriteReviewText(w io.Writer, rv *compare.Review) error {
	bw := bufio.NewWriter(w)
	t := &textWriter{bw}
	t.line("Release review: %s -> %s", rv.Before.Label, rv.After.Label)
	t.line("  before: %s", runLine(rv.Before))
	t.line("  after:  %s", runLine(rv.After))
	if anySynthetic(rv.Before, rv.After) {
		t.line("  SYNTHETIC DATA: invented records; the numbers describe no real patients.")
	}
	t.line("")
	t.line("%s", changeIntervalSentence(rv))
	for _, n := range rv.Notes {
		t.line("%s", n)
	}
	t.line("")
	for _, c := range rv.Comparisons {
		t.line("Groups: %s: %s (comparison) vs %s (reference)", rv.Names.ColumnName(c.Groups.Column),
			rv.Names.GroupName(c.Groups.Comparison, true), rv.Names.GroupName(c.Groups.Reference, false))
		t.line("")
		for _, m := range c.Metrics {
			v := reviewRows(rv, c.Groups, m)
			t.line("%s (%s)", v.Title, v.Metric)
			tab := textTable{header: []string{"", "before", "after", "change", "change interval", ""}, right: []bool{false, true, true, true, false, false}}
			for i, r := range v.Rows {
				if i == 3 {
					tab.add("contribution of", "", "", "", "", "")
				}
				name := r.Name
				if r.Contribution {
					name = "  " + name
				}
				mark := ""
				if r.Clear {
					mark = "*"
				}
				tab.add(name, r.Before, r.After, r.Change, r.Interval, mark)
			}
			tab.dropEmpty()
			tab.write(t.w, "  ")
			if v.Lead != "" {
				t.line("  %s", v.Lead)
			}
			t.line("")
		}
	}
	if rv.Intervals != nil {
		t.line("* the change interval excludes zero.")
		t.line("")
	}
	textOmitted(t, rv.Omitted)
	textComparePolicy(t, rv.Policy, rv.Names, rv.After.Label)
	textCautions(t, rv.Assumptions)
	return bw.Flush()
}

// WriteHistoryText writes the history h as plain text: the runs in
// order, then per comparison and metric a table with a column per run of
// the gap and the leading contributions (with intervals where the run
// has them), what was left out, the policy gate on the last run and the
// cautions. It returns the first write error.
func WriteHistoryText(w io.Writer, h *compare.History) error {
	bw := bufio.NewWriter(w)
	t := &textWriter{bw}
	t.line("History over %d runs", len(h.Runs))
	for i, r := range h.Runs {
		t.line("  %d. %s", i+1, runLine(r))
	}
	if anySynthetic(h.Runs...) {
		t.line("  SYNTHETIC DATA: invented records; the numbers describe no real patients.")
	}
	for _, n := range h.Notes {
		t.line("%s", n)
	}
	t.line("")
	for _, c := range h.Comparisons {
		t.line("Groups: %s: %s (comparison) vs %s (reference)", h.Names.ColumnName(c.Groups.Column),
			h.Names.GroupName(c.Groups.Comparison, true), h.Names.GroupName(c.Groups.Reference, false))
		t.line("")
		for _, m := range c.Metrics {
			v := historyRows(h, c.Groups, m)
			t.line("%s (%s): gap and leading contributions", v.Title, v.Metric)
			header := []string{""}
			right := []bool{false}
			for i := range h.Runs {
				header = append(header, fmt.Sprintf("%d", i+1))
				right = append(right, true)
			}
			tab := textTable{header: header, right: right}
			for _, r := range v.Rows {
				tab.add(append([]string{r.Name}, r.Cells...)...)
			}
			tab.write(t.w, "  ")
			t.line("")
		}
	}
	textOmitted(t, h.Omitted)
	textComparePolicy(t, h.Policy, h.Names, h.Runs[len(h.Runs)-1].Label)
	textCautions(t, h.Assumptions)
	return bw.Flush()
}

func textOmitted(t *textWriter, os []compare.Omission) {
	if len(os) == 0 {
		return
	}
	t.line("Compared what the runs share; left out:")
	for _, s := range omittedLines(os) {
		t.line("  %s", s)
	}
	t.line("")
}

// textComparePolicy prints the policy gate judged on the latest run.
func textComparePolicy(t *textWriter, o *policy.Outcome, names *fairness.Names, run string) {
	if o == nil {
		return
	}
	t.line("Policy gate on %s: %s (%s)", run, policyHeadline(o), o.File)
	tab := textTable{header: []string{"rule", "metric", "group", "limit", "judged on", "value", "result"}}
	for _, r := range policyRows(o, names) {
		tab.add(fmt.Sprintf("%d (line %d)", r.Rule, r.Line), r.Metric, r.Group, r.LimitPlain, r.Judged, r.Value, r.StatusWord)
	}
	tab.write(t.w, "  ")
	for _, n := range policyNotes(o) {
		t.line("  %s", n)
	}
	t.line("  %s", policyCaution)
	t.line("")
}

func textCautions(t *textWriter, as []string) {
	t.line("Assumptions and cautions:")
	for _, a := range as {
		t.line("  - %s", strings.Join(strings.Fields(a), " "))
	}
}
