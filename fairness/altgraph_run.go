package fairness

import (
	"math"
	"slices"
	"strings"

	"github.com/gapwise/gapwise/attribution"
)

// GraphClearShare is the share of a metric's |gap| above which a
// contribution without an interval counts as having a clear sign. With
// intervals the interval decides: a sign is clear when it excludes 0.
const GraphClearShare = 0.10

// runGraphs is Run with opt.AltGraphs: the data are read once, the audit
// runs under the spec's graph and then under each alternative with the
// same seed and settings (no coalitions kept for the alternatives), and
// the result, the spec's graph's, records every run's contributions and
// what holds across them (GraphRobustness). When a metric's conclusion
// depends on the graph (GraphMetric.Dependent) it carries a
// KindGraphDependent warning and renewed headlines.
//
// A mechanism's density ratio p_cmp(x_j | pa_j) / p_ref(x_j | pa_j) comes
// from classifiers of group membership on (x_j, pa_j) and on pa_j; such a
// classifier depends on the column set it reads, not on the graph, so a
// set that several graphs need is fitted once (graphFits).
func runGraphs(spec *Spec, opt RunOptions) (*Result, error) {
	alts := opt.AltGraphs
	opt.AltGraphs = nil
	d, err := LoadData(spec)
	if err != nil {
		return nil, err
	}
	load := func(*Spec) (*Dataset, error) { return d, nil }
	opt.fits = graphFits(spec, d, alts, opt.intervals(spec))
	r, err := run(spec, opt, load)
	if err != nil {
		return nil, err
	}
	gr := &GraphRobustness{ClearShare: GraphClearShare}
	gr.Runs = append(gr.Runs, graphRun(AltGraph{Reading: ReadingSpec, Graph: spec.Graph}, r))
	opt.CoalitionLimit = -1
	for _, a := range alts {
		s := *spec
		s.Graph = a.Graph
		s.HiddenFactor.Off = true // each run keeps only its contributions
		ar, err := run(&s, opt, load)
		if err != nil {
			return nil, err
		}
		gr.Runs = append(gr.Runs, graphRun(a, ar))
	}
	for i, m := range r.Metrics {
		gr.Metrics = append(gr.Metrics, compareRuns(gr.Runs, i, m.Metric, spec.Graph))
	}
	r.GraphRobustness = gr
	for _, gm := range gr.Metrics {
		if w, ok := graphWarning(gm, gr.Runs, r.Names); ok {
			r.Warnings = append(r.Warnings, w)
		}
	}
	setHeadlines(r)
	return r, nil
}

// GraphFitBudget caps the memory, in bytes, that sharing the group
// classifiers of bootstrap replicates between graphs may hold (one
// float64 per record, kept set, fold split and replicate); above it only
// the point estimate's fits are shared.
const GraphFitBudget = 256 << 20

// graphFits returns the cache that shares, between the runs of spec's
// graph and of alts, the column sets two or more of them fit
// (attribution.FitColumnSets over d's feature columns); nil when none is
// shared. Bootstrap replicates share theirs too within GraphFitBudget.
func graphFits(spec *Spec, d *Dataset, alts []AltGraph, iv Intervals) *attribution.FitCache {
	cols, features := featureLayout(d)
	sample := &attribution.Sample{Features: features}
	uses := map[string]int{}
	var order [][]string
	graphs := [][]NodeSpec{spec.Graph}
	for _, a := range alts {
		graphs = append(graphs, a.Graph)
	}
	for _, g := range graphs {
		for _, set := range attribution.FitColumnSets(sample, graphMechanisms(g, cols)) {
			key := strings.Join(set, "\x00")
			if uses[key] == 0 {
				order = append(order, set)
			}
			uses[key]++
		}
	}
	var shared [][]string
	for _, set := range order {
		if uses[strings.Join(set, "\x00")] > 1 {
			shared = append(shared, set)
		}
	}
	if len(shared) == 0 {
		return nil
	}
	nRef, nCmp := d.Counts()
	splits := spec.FoldSplits
	if splits == 0 {
		splits = attribution.DefaultFoldSplits(nRef, nCmp)
	}
	bytes := 8 * (nRef + nCmp) * len(shared) * splits * (1 + iv.Replicates)
	return attribution.NewFitCache(shared, iv.Replicates > 0 && bytes <= GraphFitBudget)
}

// graphRun records the graph of a and the contributions of r, the audit
// under it.
func graphRun(a AltGraph, r *Result) GraphRun {
	run := GraphRun{Reading: a.Reading, File: a.File, FileSHA256: a.SHA256, Graph: []GraphNode{}, Metrics: []GraphRunMetric{}}
	for _, n := range a.Graph {
		run.Graph = append(run.Graph, GraphNode{Node: n.Node, Columns: append([]string{}, n.Columns...), Parents: append([]string{}, n.Parents...)})
	}
	for _, m := range r.Metrics {
		rm := GraphRunMetric{Metric: m.Metric, Estimated: m.Estimated, Residual: m.Residual, Lead: m.Headline.Lead, Contributions: []GraphContribution{}}
		for _, c := range m.Contributions {
			rm.Contributions = append(rm.Contributions, GraphContribution{
				Node: c.Node, Value: c.Value, CILow: c.CILow, CIHigh: c.CIHigh,
				NotEstimable: c.NotEstimable, Sign: clearSign(c, m.Gap),
			})
		}
		run.Metrics = append(run.Metrics, rm)
	}
	return run
}

// clearSign is the sign of contribution c of a metric whose gap is gap
// when it is clear: with an interval, +1 when it lies above 0 and −1 when
// below; without one, the sign of φ when |φ| ≥ GraphClearShare·|gap|. A
// contribution that is not estimable, or not clear, gives 0.
func clearSign(c Contribution, gap float64) int {
	if c.NotEstimable {
		return 0
	}
	if c.CILow != nil && c.CIHigh != nil {
		switch {
		case *c.CILow > 0:
			return 1
		case *c.CIHigh < 0:
			return -1
		}
		return 0
	}
	if gap == 0 || math.Abs(c.Value) < GraphClearShare*math.Abs(gap) {
		return 0
	}
	if c.Value > 0 {
		return 1
	}
	return -1
}

// compareRuns judges metric mi (named metric) across runs: its leads and
// each node's clear signs, nodes in the order of graph and then those
// only an alternative has.
func compareRuns(runs []GraphRun, mi int, metric string, graph []NodeSpec) GraphMetric {
	gm := GraphMetric{Metric: metric, Leads: []string{}, LeadHolds: true, Nodes: []GraphNodeVerdict{}}
	for _, run := range runs {
		lead := run.Metrics[mi].Lead
		gm.Leads = append(gm.Leads, lead)
		if lead == "" || lead != runs[0].Metrics[mi].Lead {
			gm.LeadHolds = false
		}
	}
	gm.Dependent = !gm.LeadHolds
	for _, node := range runNodes(runs, graph) {
		v := GraphNodeVerdict{Node: node, Signs: []int{}}
		for _, run := range runs {
			v.Signs = append(v.Signs, signOf(run.Metrics[mi], node))
		}
		v.Status = signStatus(v.Signs)
		if v.Status == SignReverses || v.Status == SignVaries {
			gm.Dependent = true
		}
		gm.Nodes = append(gm.Nodes, v)
	}
	return gm
}

// runNodes lists the nodes of graph, then those of the runs' graphs that
// graph lacks, in run order.
func runNodes(runs []GraphRun, graph []NodeSpec) []string {
	var out []string
	for _, n := range graph {
		out = append(out, n.Node)
	}
	for _, run := range runs {
		for _, n := range run.Graph {
			if !slices.Contains(out, n.Node) {
				out = append(out, n.Node)
			}
		}
	}
	return out
}

// signOf is node's clear sign in rm, 0 when rm has no such node.
func signOf(rm GraphRunMetric, node string) int {
	for _, c := range rm.Contributions {
		if c.Node == node {
			return c.Sign
		}
	}
	return 0
}

// signStatus classifies a node's clear signs across the runs.
func signStatus(signs []int) string {
	pos, neg, none := 0, 0, 0
	for _, s := range signs {
		switch {
		case s > 0:
			pos++
		case s < 0:
			neg++
		default:
			none++
		}
	}
	switch {
	case pos > 0 && neg > 0:
		return SignReverses
	case pos+neg == 0:
		return SignUnclear
	case none > 0:
		return SignVaries
	}
	return SignHolds
}
