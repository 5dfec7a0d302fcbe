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

// WriteReviewMarkdown writes the release review rv as Markdown, for a pull
// request or a release note: the runs, how the change intervals were
// made, the notes, one table per metric (before, after, change and its
// interval, bold where the interval excludes zero), what was left out,
// the policy gate and the cautions. User text passes through mdText. It
// returns the first write error.
func WriteReviewMarkdown(w io.Writer, rv *compare.Review) error {
	bw := bufio.NewWriter(w)
	p := mdPrinter(func(format string, args ...any) { fmt.Fprintf(bw, format, args...) })
	p("## Release review: %s → %s\n\n", mdText(rv.Before.Label), mdText(rv.After.Label))
	p("- Before: %s\n- After: %s\n\n", mdText(runLine(rv.Before)), mdText(runLine(rv.After)))
	if anySynthetic(rv.Before, rv.After) {
		p("**Synthetic data.** Invented records; the numbers describe no real patients.\n\n")
	}
	p("%s\n\n", mdText(changeIntervalSentence(rv)))
	for _, n := range rv.Notes {
		p("- %s\n", mdText(n))
	}
	p("\n")
	for _, c := range rv.Comparisons {
		p("Groups: %s: %s (comparison) vs %s (reference).\n\n", mdText(rv.Names.ColumnName(c.Groups.Column)),
			mdText(rv.Names.GroupName(c.Groups.Comparison, true)), mdText(rv.Names.GroupName(c.Groups.Reference, false)))
		for _, m := range c.Metrics {
			v := reviewRows(rv, c.Groups, m)
			p("### %s (`%s`)\n\n", mdText(v.Title), v.Metric)
			p("| | Before | After | Change | Change interval |\n| --- | ---: | ---: | ---: | --- |\n")
			for _, r := range v.Rows {
				name := mdText(r.Name)
				if r.Contribution {
					name = "Contribution of " + name
				}
				ch := mdText(r.Change)
				if r.Clear {
					ch = "**" + ch + "**"
				}
				p("| %s | %s | %s | %s | %s |\n", name, mdText(r.Before), mdText(r.After), ch, mdText(r.Interval))
			}
			p("\n")
			if v.Lead != "" {
				p("%s\n\n", mdText(v.Lead))
			}
		}
	}
	if rv.Intervals != nil {
		p("_Bold: the change interval excludes zero._\n\n")
	}
	mdCompareTail(p, rv.Omitted, rv.Policy, rv.Names, rv.After.Label, rv.Assumptions)
	return bw.Flush()
}

// WriteHistoryMarkdown writes the history h as Markdown: the runs in
// order and, per metric, a table of the gap and the leading
// contributions with a column per run. It returns the first write error.
func WriteHistoryMarkdown(w io.Writer, h *compare.History) error {
	bw := bufio.NewWriter(w)
	p := mdPrinter(func(format string, args ...any) { fmt.Fprintf(bw, format, args...) })
	p("## History over %d runs\n\n", len(h.Runs))
	for i, r := range h.Runs {
		p("%d. %s\n", i+1, mdText(runLine(r)))
	}
	p("\n")
	if anySynthetic(h.Runs...) {
		p("**Synthetic data.** Invented records; the numbers describe no real patients.\n\n")
	}
	for _, n := range h.Notes {
		p("- %s\n\n", mdText(n))
	}
	for _, c := range h.Comparisons {
		for _, m := range c.Metrics {
			v := historyRows(h, c.Groups, m)
			p("### %s (`%s`)\n\n|", mdText(v.Title), v.Metric)
			for _, r := range h.Runs {
				p(" | %s", mdText(r.Label))
			}
			p(" |\n| ---" + strings.Repeat(" | ---:", len(h.Runs)) + " |\n")
			for _, r := range v.Rows {
				p("| %s", mdText(r.Name))
				for _, c := range r.Cells {
					p(" | %s", mdText(c))
				}
				p(" |\n")
			}
			p("\n")
		}
	}
	mdCompareTail(p, h.Omitted, h.Policy, h.Names, h.Runs[len(h.Runs)-1].Label, h.Assumptions)
	return bw.Flush()
}

func mdCompareTail(p mdPrinter, om []compare.Omission, o *policy.Outcome, names *fairness.Names, run string, as []string) {
	if len(om) > 0 {
		p("### Left out\n\n")
		for _, s := range omittedLines(om) {
			p("- %s\n", mdText(s))
		}
		p("\n")
	}
	if o != nil {
		p("### Policy gate on %s\n\n**%s** (`%s`)\n\n", mdText(run), mdText(policyHeadline(o)), mdText(o.File))
		p("| Rule | Metric | Group | Limit | Judged on | Value | Result |\n| ---: | --- | --- | --- | --- | ---: | --- |\n")
		for _, r := range policyRows(o, names) {
			p("| %d (line %d) | %s | %s | %s | %s | %s | %s |\n", r.Rule, r.Line, mdText(r.Metric), mdText(r.Group), mdText(r.Limit), mdText(r.Judged), mdText(r.Value), mdText(r.StatusWord))
		}
		p("\n%s\n\n", mdText(policyCaution))
	}
	p("### Assumptions and cautions\n\n")
	for _, a := range as {
		p("- %s\n", mdText(a))
	}
	p("\n")
}
