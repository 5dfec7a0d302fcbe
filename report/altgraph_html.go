package report

import "github.com/gapwise/gapwise/fairness"

// altGraphsView is the HTML report's section on alternative graphs: the
// runs' headers, how each graph differs, and one panel per metric shown
// with the selected metric like the decomposition's panels.
type altGraphsView struct {
	Intro   string
	Runs    []string
	Graphs  []string
	Clear   string
	Metrics []altGraphPanel
}

// altGraphPanel is one metric's panel.
type altGraphPanel struct {
	altGraphMetric
	Selected bool
}

// altGraphPage builds the section's view; nil when the result holds no
// alternative graphs. selected is the metric shown first.
func altGraphPage(res *fairness.Result, selected string) *altGraphsView {
	v := newAltGraphs(res)
	if v == nil {
		return nil
	}
	out := &altGraphsView{Intro: altGraphIntro, Runs: v.Runs, Graphs: v.Graphs, Clear: v.Clear}
	for _, m := range v.Metrics {
		out.Metrics = append(out.Metrics, altGraphPanel{altGraphMetric: m, Selected: m.Name == selected})
	}
	return out
}
