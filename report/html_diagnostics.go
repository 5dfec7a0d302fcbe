package report

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/fairness"
)

// candidateRow is one candidate classifier's out-of-fold fit.
type candidateRow struct {
	Mechanism, Classifier, LogLoss, OddsCheck string
	Chosen                                    bool
}

// hybridView is a hybridRow formatted for the page.
type hybridView struct {
	Side, Records, Which, Nodes, ESS, ESSShare, MaxShare string
}

// diagnosticsView holds the HTML diagnostics beyond the per-mechanism
// table: which optional columns to show, candidate fits, hybrid weights
// and effective records.
type diagnosticsView struct {
	HasComparisonESS bool // some mechanism has comparison_ess
	Clipped          bool // clipping was asked for or happened
	Candidates       []candidateRow
	Hybrids          []hybridView
	HybridPartial    bool // some side's worst hybrid was not searched over all coalitions
	Effective        []keyValue
}

// mechanismDiagnostics formats one mechanism's row of the diagnostics
// table, naming the node, its parents and its columns by their display
// names (the columns followed by their identifiers).
func mechanismDiagnostics(res *fairness.Result, m fairness.MechanismResult, flag string) mechanismView {
	v := mechanismView{Node: nodeName(res, m.Node), Mechanism: mechName(res, m.Node),
		Parents: nodeNames(res, m.Parents), Columns: colsWithID(res, m.Columns),
		Classifier: m.Classifier, ParentClassifier: m.ParentClassifier,
		AUC: formatDiag(m.AUC), ESS: formatCount(math.Round(m.ESS)), ESSShare: fmt.Sprintf("%.1f%%", 100*m.ESSShare),
		MaxShare: fmt.Sprintf("%.2f%%", 100*m.MaxShare), MeanRatio: formatDiag(m.MeanRatio), Unreliable: flag,
		WorstStratum: formatDiag(m.WorstStratumMean), Extreme: fmt.Sprintf("%.1f%%", 100*m.ExtremeShare),
		ComparisonESS: formatCount(math.Round(m.ComparisonESS)),
		Tail:          tailShape(m.TailShape), ComparisonTail: tailShape(m.ComparisonTailShape),
		ComparisonExtreme: optPercent(m.ComparisonExtremeShare),
		ClippedReference:  fmt.Sprint(m.ClippedReference), ClippedComparison: fmt.Sprint(m.ClippedComparison)}
	return v
}

// diagnostics builds the diagnostics view of res.
func diagnostics(res *fairness.Result) diagnosticsView {
	d := diagnosticsView{Clipped: res.Settings.ClipRatios > 0}
	for _, m := range res.Mechanisms {
		d.HasComparisonESS = d.HasComparisonESS || m.ComparisonESS > 0
		d.Clipped = d.Clipped || m.ClippedReference > 0 || m.ClippedComparison > 0
		for _, l := range m.Losses {
			d.Candidates = append(d.Candidates, candidateRow{Mechanism: mechName(res, m.Node), Classifier: l.Classifier,
				LogLoss: fmt.Sprintf("%.4f", l.LogLoss), OddsCheck: formatDiag(l.OddsCheck), Chosen: l.Classifier == m.Classifier})
		}
	}
	rows, partial := hybridRows(res)
	for _, h := range rows {
		d.Hybrids = append(d.Hybrids, hybridView{Side: h.Side, Records: fmt.Sprint(h.Records), Which: h.Which,
			Nodes: nodeList(res, h.Nodes), ESS: formatCount(math.Round(h.ESS)), ESSShare: optPercent(h.ESSShare),
			MaxShare: fmt.Sprintf("%.2f%%", 100*h.MaxShare)})
	}
	d.HybridPartial = partial
	for _, m := range res.Metrics {
		if m.EffectiveRecords > 0 {
			d.Effective = append(d.Effective, keyValue{MetricTitle(m.Metric), formatCount(math.Round(m.EffectiveRecords))})
		}
	}
	return d
}

// tailShape formats a Pareto tail shape, "n/a" when absent.
func tailShape(k *float64) string {
	if k == nil {
		return "n/a"
	}
	return fmt.Sprintf("%.2f", *k)
}

// optPercent formats an optional share as a percentage, "n/a" when absent.
func optPercent(x *float64) string {
	if x == nil {
		return "n/a"
	}
	return fmt.Sprintf("%.1f%%", 100**x)
}
