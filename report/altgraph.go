package report

import (
	"fmt"
	"path/filepath"
	"slices"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// The wording of the section on alternative graphs (fairness.GraphRobustness),
// shared by the text, Markdown and HTML reports.

// altGraphIntro says what the side-by-side tables show and what they
// cannot.
const altGraphIntro = "The decomposition was rerun under other causal graphs over the same columns, with the same data, seed and settings. " +
	"What holds under every graph does not depend on the choice among them; what changes does. " +
	"The data cannot tell which graph is right: agreement across graphs is reassurance, not proof, " +
	"and a graph none of these runs tried could still change the conclusions."

// altGraphs is the section as the reports render it; nil when the result
// holds no alternative graphs.
type altGraphs struct {
	Runs    []string // column header of each run (runHeader)
	Graphs  []string // how each alternative differs from the spec's graph
	Clear   string   // what a clear sign means here
	Metrics []altGraphMetric
}

// altGraphMetric is one metric's side-by-side table and verdicts.
type altGraphMetric struct {
	Name, Title string
	Rows        []altGraphRow
	Leads       []string // the lead mechanism of each run
	Holds       []string // sentences: what holds under every graph
	Changes     []string // sentences: what changes
	Dependent   bool
}

// altGraphRow is one mechanism's contributions under each run.
type altGraphRow struct {
	Node      string // display name
	Values    []string
	Intervals []string // "" without one
}

// newAltGraphs builds the section from res.GraphRobustness, nil when
// absent.
func newAltGraphs(res *fairness.Result) *altGraphs {
	gr := res.GraphRobustness
	if gr == nil {
		return nil
	}
	v := &altGraphs{}
	for i, run := range gr.Runs {
		v.Runs = append(v.Runs, runHeader(run))
		if i > 0 {
			v.Graphs = append(v.Graphs, graphChanges(res, gr.Runs[0], run))
		}
	}
	v.Clear = fmt.Sprintf("A sign counts as clear when the contribution's interval excludes 0 or, without an interval, when the contribution is at least %.0f%% of the gap in size.", 100*gr.ClearShare)
	for mi, gm := range gr.Metrics {
		v.Metrics = append(v.Metrics, altGraphMetricView(res, gr, mi, gm))
	}
	return v
}

// runHeader is the short name of a run for a column header.
func runHeader(run fairness.GraphRun) string {
	switch run.Reading {
	case fairness.ReadingSpec:
		return "spec's graph"
	case fairness.ReadingFile:
		return filepath.Base(run.File)
	case fairness.ReadingIndependent:
		return "independent roots"
	case fairness.ReadingLabelParent:
		return "label only parent"
	}
	return run.Reading
}

// graphChanges says how run's graph differs from spec's, node by node.
func graphChanges(res *fairness.Result, spec, run fairness.GraphRun) string {
	parents := map[string][]string{}
	for _, n := range spec.Graph {
		parents[n.Node] = n.Parents
	}
	var diffs []string
	for _, n := range run.Graph {
		old, ok := parents[n.Node]
		if ok && slices.Equal(old, n.Parents) {
			continue
		}
		diffs = append(diffs, fmt.Sprintf("%s ← %s", nodeName(res, n.Node), parentWords(res, n.Parents)))
	}
	head := runHeader(run) + ": "
	if run.Reading == fairness.ReadingFile {
		head = run.File + ": "
	}
	if len(diffs) == 0 {
		return head + "the same parents as the spec's graph"
	}
	return head + strings.Join(diffs, "; ")
}

// parentWords lists parents by display name, "no parents" for none.
func parentWords(res *fairness.Result, parents []string) string {
	if len(parents) == 0 {
		return "no parents"
	}
	names := make([]string, len(parents))
	for i, p := range parents {
		names[i] = nodeName(res, p)
	}
	return strings.Join(names, ", ")
}

// altGraphMetricView builds metric mi's table and sentences.
func altGraphMetricView(res *fairness.Result, gr *fairness.GraphRobustness, mi int, gm fairness.GraphMetric) altGraphMetric {
	m := altGraphMetric{Name: gm.Metric, Title: MetricTitle(gm.Metric), Dependent: gm.Dependent}
	for _, nv := range gm.Nodes {
		row := altGraphRow{Node: nodeName(res, nv.Node)}
		for _, run := range gr.Runs {
			val, iv := "–", ""
			for _, c := range run.Metrics[mi].Contributions {
				if c.Node != nv.Node {
					continue
				}
				val = formatDelta(gm.Metric, c.Value)
				if c.NotEstimable {
					val = notEstimable
				} else {
					iv = formatDeltaInterval(gm.Metric, c.CILow, c.CIHigh)
				}
			}
			row.Values = append(row.Values, val)
			row.Intervals = append(row.Intervals, iv)
		}
		m.Rows = append(m.Rows, row)
	}
	for _, l := range gm.Leads {
		lead := "none"
		if l != "" {
			lead = nodeName(res, l)
		}
		m.Leads = append(m.Leads, lead)
	}
	m.Holds, m.Changes = altGraphSentences(res, gr.Runs, gm)
	return m
}

// altGraphSentences words what holds and what changes for one metric.
func altGraphSentences(res *fairness.Result, runs []fairness.GraphRun, gm fairness.GraphMetric) (holds, changes []string) {
	if gm.LeadHolds {
		holds = append(holds, fmt.Sprintf("The largest contribution is %s's under every graph.", nodeName(res, gm.Leads[0])))
	} else {
		var parts []string
		for i, l := range gm.Leads {
			name := "no estimable mechanism"
			if l != "" {
				name = nodeName(res, l)
			}
			parts = append(parts, fmt.Sprintf("%s under %s", name, fairness.RunLabel(runs[i])))
		}
		changes = append(changes, "The largest contribution moves: "+strings.Join(parts, ", ")+".")
	}
	var up, down, reverse, varies []string
	for _, nv := range gm.Nodes {
		name := nodeName(res, nv.Node)
		switch nv.Status {
		case fairness.SignHolds:
			if nv.Signs[0] > 0 {
				up = append(up, name)
			} else {
				down = append(down, name)
			}
		case fairness.SignReverses:
			reverse = append(reverse, name)
		case fairness.SignVaries:
			varies = append(varies, fmt.Sprintf("%s (clear under: %s)", name, clearRuns(runs, nv)))
		}
	}
	if len(up) > 0 {
		holds = append(holds, fmt.Sprintf("%s clearly push%s the gap up (a positive contribution) under every graph.", joinWords(up), verbS(up)))
	}
	if len(down) > 0 {
		holds = append(holds, fmt.Sprintf("%s clearly push%s the gap down (a negative contribution) under every graph.", joinWords(down), verbS(down)))
	}
	if len(reverse) > 0 {
		changes = append(changes, fmt.Sprintf("The sign of %s reverses between graphs.", joinWords(reverse)))
	}
	if len(varies) > 0 {
		changes = append(changes, fmt.Sprintf("A clear sign under some graphs only: %s.", strings.Join(varies, "; ")))
	}
	if len(holds) == 0 {
		holds = append(holds, "Nothing: no conclusion above is the same under every graph.")
	}
	if len(changes) == 0 {
		changes = append(changes, "Nothing: the largest contribution and every clear sign are the same under every graph.")
	}
	return holds, changes
}

// clearRuns names the runs in which nv's sign is clear.
func clearRuns(runs []fairness.GraphRun, nv fairness.GraphNodeVerdict) string {
	var names []string
	for i, s := range nv.Signs {
		if s != 0 {
			names = append(names, runHeader(runs[i]))
		}
	}
	return strings.Join(names, ", ")
}

// verbS is the "es" of "push" whose subject is the one name in names.
func verbS(names []string) string {
	if len(names) == 1 {
		return "es"
	}
	return ""
}
