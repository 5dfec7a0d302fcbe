package report

import (
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// mdAltGraphs prints the section on alternative graphs as the text report
// does (altGraphs): what the runs are, then per metric the contributions
// under each graph side by side with the lead, and what holds and what
// changes.
func mdAltGraphs(p mdPrinter, res *fairness.Result) {
	v := newAltGraphs(res)
	if v == nil {
		return
	}
	p("### Under other graphs\n\n%s\n\n", mdText(altGraphIntro))
	for _, g := range v.Graphs {
		p("- %s\n", mdText(g))
	}
	p("\n%s\n\n", mdText(v.Clear))
	for _, m := range v.Metrics {
		p("#### %s\n\n| Mechanism |", mdText(m.Title))
		for _, r := range v.Runs {
			p(" %s |", mdText(r))
		}
		p("\n| --- |%s\n", strings.Repeat(" ---: |", len(v.Runs)))
		for _, r := range m.Rows {
			p("| %s |", mdText(r.Node))
			for i, val := range r.Values {
				if r.Intervals[i] != "" {
					val += " " + r.Intervals[i]
				}
				p(" %s |", mdText(val))
			}
			p("\n")
		}
		p("| Largest contribution |")
		for _, l := range m.Leads {
			p(" %s |", mdText(l))
		}
		p("\n\n")
		for _, s := range m.Holds {
			p("- Holds: %s\n", mdSentence(s))
		}
		for _, s := range m.Changes {
			p("- Changes: %s\n", mdSentence(s))
		}
		p("\n")
	}
}
