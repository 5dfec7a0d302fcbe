package report

import "github.com/gapwise/gapwise/fairness"

// altGraphs prints the section on alternative graphs, when the result
// holds one: what the runs are, then per metric a table of contributions
// under each graph with the lead mechanism, and what holds and what
// changes.
func (t *textWriter) altGraphs(res *fairness.Result) {
	v := newAltGraphs(res)
	if v == nil {
		return
	}
	t.line("Under other graphs")
	t.line("  %s", altGraphIntro)
	for _, g := range v.Graphs {
		t.line("  - %s", g)
	}
	t.line("  %s", v.Clear)
	t.line("")
	for _, m := range v.Metrics {
		t.line("  %s (%s)", m.Name, m.Title)
		head := append([]string{"mechanism"}, v.Runs...)
		right := make([]bool, len(head))
		for i := 1; i < len(right); i++ {
			right[i] = true
		}
		tab := textTable{header: head, right: right}
		for _, r := range m.Rows {
			row := []string{r.Node}
			for i, val := range r.Values {
				if r.Intervals[i] != "" {
					val += " " + r.Intervals[i]
				}
				row = append(row, val)
			}
			tab.add(row...)
		}
		tab.add(append([]string{"Largest contribution"}, m.Leads...)...)
		tab.write(t.w, "    ")
		for _, s := range m.Holds {
			t.line("    holds: %s", s)
		}
		for _, s := range m.Changes {
			t.line("    changes: %s", s)
		}
		t.line("")
	}
}
