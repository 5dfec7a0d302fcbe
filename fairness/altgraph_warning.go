package fairness

import (
	"fmt"
	"slices"
	"strings"
)

// KindGraphDependent (caution): under an alternative graph (RunOptions.AltGraphs)
// a metric's lead mechanism changes, or a contribution's sign is clear
// under some graphs and not the same clear sign under the others
// (GraphMetric.Dependent); Nodes are the leads and the nodes whose sign
// changes, in graph order.
const KindGraphDependent WarningKind = "graph_dependent"

// graphWarning speaks up when gm, one metric compared across runs,
// depends on the graph.
func graphWarning(gm GraphMetric, runs []GraphRun, names *Names) (Warning, bool) {
	if !gm.Dependent {
		return Warning{}, false
	}
	var parts []string
	nodes := []string{}
	if !gm.LeadHolds {
		var leads []string
		for i, l := range gm.Leads {
			lead := "no estimable mechanism"
			if l != "" {
				lead = "`" + names.NodeName(l) + "`"
				if !slices.Contains(nodes, l) {
					nodes = append(nodes, l)
				}
			}
			leads = append(leads, fmt.Sprintf("%s under %s", lead, RunLabel(runs[i])))
		}
		parts = append(parts, "the leading mechanism is "+strings.Join(leads, ", "))
	}
	var rev, varies []string
	for _, v := range gm.Nodes {
		switch v.Status {
		case SignReverses:
			rev = append(rev, v.Node)
		case SignVaries:
			varies = append(varies, v.Node)
		default:
			continue
		}
		if !slices.Contains(nodes, v.Node) {
			nodes = append(nodes, v.Node)
		}
	}
	if len(rev) > 0 {
		parts = append(parts, "the sign of "+nodeList(names, rev)+" reverses between graphs")
	}
	if len(varies) > 0 {
		parts = append(parts, "the sign of "+nodeList(names, varies)+" is clear under some graphs only")
	}
	order := runNodes(runs, nil)
	slices.SortStableFunc(nodes, func(a, b string) int { return slices.Index(order, a) - slices.Index(order, b) })
	msg := fmt.Sprintf("for %s the conclusion depends on the graph: %s; the data cannot tell which graph is right, so state the graph the audit assumes and why", gm.Metric, strings.Join(parts, "; "))
	return Warning{Kind: KindGraphDependent, Severity: SeverityCaution, Metric: gm.Metric, Nodes: nodes, Message: msg}, true
}

// RunLabel names a run's graph in a sentence: "the spec's graph", "the
// graph of FILE", "the independent-roots reading" or "the label-only-parent
// reading".
func RunLabel(run GraphRun) string {
	switch run.Reading {
	case ReadingSpec:
		return "the spec's graph"
	case ReadingFile:
		return "the graph of " + run.File
	case ReadingIndependent:
		return "the independent-roots reading"
	case ReadingLabelParent:
		return "the label-only-parent reading"
	}
	return run.Reading
}
