package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// diagnostics prints the estimation diagnostics: per mechanism the chosen
// classifiers and the weights of its ratio, each candidate classifier's
// out-of-fold fit, the weights of the hybrids farthest from each side and
// of the worst hybrid, and the effective records behind each metric's
// estimated gap, each table followed by one sentence per column that
// needs explaining.
func (t *textWriter) diagnostics(res *fairness.Result) {
	if len(res.Mechanisms) > 0 {
		t.mechanismWeights(res)
		t.candidates(res)
	}
	t.hybridWeights(res)
	t.effectiveRecords(res)
}

func (t *textWriter) mechanismWeights(res *fairness.Result) {
	hasCmp, clipped := false, res.Settings.ClipRatios > 0
	for _, m := range res.Mechanisms {
		hasCmp = hasCmp || m.ComparisonESS > 0
		clipped = clipped || m.ClippedReference > 0 || m.ClippedComparison > 0
	}
	t.line("Mechanism diagnostics (reference records reweighted by one mechanism's ratio)")
	head := []string{"mechanism", "classifier", "parents by", "oof AUC", "ESS", "ESS share", "max weight share", "mean ratio", "worst-fifth mean ratio", "weights > 20", "tail shape"}
	right := []bool{false, false, false, true, true, true, true, true, true, true, true}
	if hasCmp {
		head, right = append(head, "comparison ESS", "comparison > 20", "comparison tail"), append(right, true, true, true)
	}
	if clipped {
		head, right = append(head, "clipped ref", "clipped cmp"), append(right, true, true)
	}
	tab := textTable{header: head, right: right}
	for _, m := range res.Mechanisms {
		row := []string{mechName(res, m.Node), m.Classifier, m.ParentClassifier, fixed(m.AUC), fmt.Sprintf("%.1f", m.ESS), fixed(m.ESSShare),
			fixed(m.MaxShare), fixed(m.MeanRatio), fixed(m.WorstStratumMean), fixed(m.ExtremeShare), tailShape(m.TailShape)}
		if hasCmp {
			row = append(row, fmt.Sprintf("%.1f", m.ComparisonESS), optFixed(m.ComparisonExtremeShare), tailShape(m.ComparisonTailShape))
		}
		if clipped {
			row = append(row, fmt.Sprint(m.ClippedReference), fmt.Sprint(m.ClippedComparison))
		}
		tab.add(row...)
	}
	tab.write(t.w, "  ")
	t.line("  oof AUC: out-of-fold AUC of the group classifier on (node, parents); near 0.5 the groups barely differ on this mechanism.")
	t.line("  ESS: effective sample size (sum w)^2 / sum w^2 of the reweighted reference records; ESS share divides it by their number.")
	t.line("  max weight share: the largest single record's share of the total weight.")
	t.line("  mean ratio: average ratio over the reference records, near 1 when the ratios are right.")
	t.line("  worst-fifth mean ratio: the same average in the fifth of the records (ranked by the parents' classifier) farthest from 1; near 1 when right.")
	t.line("  weights > 20: share of reference records whose weight (ratio) is above 20; a few such records can dominate the estimate, a sign of poor overlap.")
	t.line("  tail shape: Pareto shape of the largest ratios; above 0.5 the weights have infinite variance, above 0.7 the estimate is unreliable.")
	if hasCmp {
		t.line("  comparison ESS, > 20, tail: the same checks for the inverse ratios over the comparison records, which estimate the hybrids too.")
	}
	if clipped {
		t.line("  clipped ref / cmp: records whose log-ratio was clipped (clip_ratios) in the reference / comparison group.")
	}
	t.line("")
}

func (t *textWriter) candidates(res *fairness.Result) {
	tab := textTable{header: []string{"mechanism", "candidate", "oof log loss", "odds check"}, right: []bool{false, false, true, true}}
	for _, m := range res.Mechanisms {
		for _, l := range m.Losses {
			tab.add(mechName(res, m.Node), l.Classifier, fixed(l.LogLoss), fixed(l.OddsCheck))
		}
	}
	if len(tab.rows) == 0 {
		return
	}
	t.line("Classifier candidates (out of fold; the lowest log loss is chosen)")
	tab.write(t.w, "  ")
	t.line("  odds check: n_ref/n_cmp times the mean out-of-fold odds of the comparison group over the reference records; near 1 when the classifier is calibrated.")
	t.line("")
}

func (t *textWriter) hybridWeights(res *fairness.Result) {
	if len(res.Weights) == 0 {
		return
	}
	t.line("Hybrid weights (the weights that emulate a mix of the two groups' mechanisms)")
	tab := textTable{header: []string{"side", "records", "hybrid", "comparison mechanisms", "ESS", "ESS share", "max weight share"},
		right: []bool{false, true, false, false, true, true, true}}
	rows, partial := hybridRows(res)
	for _, h := range rows {
		tab.add(h.Side, fmt.Sprint(h.Records), h.Which, nodeList(res, h.Nodes), fmt.Sprintf("%.1f", h.ESS), optFixed(h.ESSShare), fixed(h.MaxShare))
	}
	tab.write(t.w, "  ")
	t.line("  farthest: the hybrid farthest from the side's own group (all mechanisms in comparison form for the reference side, none for the comparison side).")
	t.line("  worst: the hybrid whose weights have the smallest effective sample size; comparison mechanisms lists the nodes in comparison form.")
	if partial {
		t.line("  With many mechanisms the worst hybrid was searched among the empty, full, single and all-but-one coalitions only.")
	}
	t.line("")
}

func (t *textWriter) effectiveRecords(res *fairness.Result) {
	tab := textTable{header: []string{"metric", "effective records"}, right: []bool{false, true}}
	for _, m := range res.Metrics {
		if m.EffectiveRecords > 0 {
			tab.add(m.Metric, fmt.Sprintf("%.1f", m.EffectiveRecords))
		}
	}
	if len(tab.rows) == 0 {
		return
	}
	t.line("Effective records behind each estimated gap")
	tab.write(t.w, "  ")
	t.line("  effective records: effective sample size of the weights behind the far end of the gap, over the records the metric counts.")
	t.line("")
}

// nodeList prints nodes by their display names separated by commas, or
// "none".
func nodeList(res *fairness.Result, nodes []string) string {
	if len(nodes) == 0 {
		return "none"
	}
	return nodeNames(res, nodes)
}

// optFixed formats an optional diagnostic with fixed, "n/a" when absent.
func optFixed(x *float64) string {
	if x == nil {
		return "n/a"
	}
	return fixed(*x)
}
