package fairness

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// WarnResidualZ: without a bootstrap, a residual is large when it exceeds
// this many of its delta-method standard errors (two-sided 1% level of
// the normal distribution; common practice).
const WarnResidualZ = 2.58

// residualWarning returns the large-residual sentence for mr, or "". The
// residual must exceed both WarnResidualShare·|gap| and WarnResidualMin,
// as before, and also what sampling explains: with bootstrap intervals,
// its interval (ResidualCI) must exclude zero; without, it must exceed
// WarnResidualZ standard errors, where for λ the reference side's weight
// the residual is −(λ·d_cmp + (1 − λ)·d_ref) for the two end differences
// of SideAgreement, so SE² = λ²·SE²_cmp + (1 − λ)²·SE²_ref (the two sides'
// records are independent). When neither is known, the fixed thresholds
// alone decide.
func residualWarning(mr MetricResult) string {
	r := mr.Residual
	if !(math.Abs(r) > WarnResidualShare*math.Abs(mr.Gap) && math.Abs(r) > WarnResidualMin) {
		return ""
	}
	spread := ""
	switch se, ok := residualSE(mr); {
	case mr.ResidualCI != nil:
		if mr.ResidualCI.Low <= 0 && mr.ResidualCI.High >= 0 {
			return ""
		}
		spread = fmt.Sprintf(" (its bootstrap interval [%+.4f, %+.4f] excludes zero)", mr.ResidualCI.Low, mr.ResidualCI.High)
	case ok:
		if math.Abs(r) <= WarnResidualZ*se {
			return ""
		}
		spread = fmt.Sprintf(" (%.1f standard errors)", math.Abs(r)/se)
	}
	return fmt.Sprintf("for %s the contributions add up to %.4f but the observed gap is %.4f; the residual %.4f is large%s: estimation error beyond sampling, or something outside the graph that differs between the groups", mr.Metric, mr.Estimated, mr.Gap, r, spread)
}

// residualSE is the delta-method standard error of the residual (see
// residualWarning): the engine's (MetricResult.ResidualSE, which also
// counts the covariance of the two ends through their shared records)
// when present, else the approximation above; ok is false when the side
// agreement or a standard error is missing.
func residualSE(mr MetricResult) (float64, bool) {
	if mr.ResidualSE != nil {
		return *mr.ResidualSE, *mr.ResidualSE > 0
	}
	a := mr.SideAgreement
	if a == nil || a.ComparisonEnd.StdError == nil || a.ReferenceEnd.StdError == nil {
		return 0, false
	}
	lambda := 0.5
	if mr.ReferenceWeight != nil {
		lambda = *mr.ReferenceWeight
	}
	sc, sr := *a.ComparisonEnd.StdError, *a.ReferenceEnd.StdError
	se := math.Sqrt(lambda*lambda*sc*sc + (1-lambda)*(1-lambda)*sr*sr)
	return se, se > 0
}

// downstreamOfSeparation marks the mechanisms whose group classifier
// separates the groups (out-of-fold AUC ≥ WarnAUC) because a parent's
// already does: their AUC is that of the node and its parents, so the
// separation they show is inherited. Those not estimable are left out:
// not_estimable speaks for them.
func downstreamOfSeparation(r *Result) map[string]bool {
	auc := map[string]float64{}
	for _, m := range r.Mechanisms {
		auc[m.Node] = m.AUC
	}
	down := map[string]bool{}
	for _, m := range r.Mechanisms {
		if m.AUC < WarnAUC || estimability(r, m) != "" {
			continue
		}
		for _, p := range m.Parents {
			if auc[p] >= WarnAUC {
				down[m.Node] = true
			}
		}
	}
	return down
}

// inheritedSeparationWarnings reports, once, the mechanisms of down: the
// separation comes from their parents, and with it their hybrids need the
// comparison group's mechanisms where the reference records lie, which the
// data hardly shows, so their contributions are unreliable. Their weight
// diagnostics (extreme weights, effective records, tails, learner checks,
// mean ratios) restate this cause and are not repeated; clipping, a
// setting, still is.
func inheritedSeparationWarnings(r *Result, down map[string]bool) []Warning {
	var nodes, mechs, sources []string
	lo, hi := math.Inf(1), math.Inf(-1)
	seen := map[string]bool{}
	var out []Warning
	for _, m := range r.Mechanisms {
		if !down[m.Node] {
			continue
		}
		nodes = append(nodes, m.Node)
		mechs = append(mechs, "`"+r.MechanismName(m.Node)+"`")
		lo, hi = math.Min(lo, m.AUC), math.Max(hi, m.AUC)
		for _, p := range m.Parents {
			if !down[p] && !seen[p] && isSeparating(r, p) {
				seen[p] = true
				sources = append(sources, "`"+r.NodeName(p)+"`")
			}
		}
		if m.ClippedReference+m.ClippedComparison > 0 {
			out = append(out, Warning{Kind: KindRatiosClipped, Severity: SeverityCaution, Nodes: []string{m.Node},
				Message: fmt.Sprintf("the ratios of `%s` were clipped for %s reference and %s comparison records (clip_ratios %g); its contribution is pulled towards zero", r.NodeName(m.Node), thousands(m.ClippedReference), thousands(m.ClippedComparison), r.Settings.ClipRatios)})
		}
	}
	if len(nodes) == 0 {
		return out
	}
	aucs := fmt.Sprintf("%.3f", lo)
	if hi-lo >= 0.0005 {
		aucs = fmt.Sprintf("%.3f–%.3f", lo, hi)
	}
	w := Warning{Kind: KindPoorOverlap, Severity: SeverityUnreliable, Nodes: nodes,
		Message: fmt.Sprintf("the groups are nearly separated by %s, and the mechanisms with it among their parents inherit that separation: %s (out-of-fold AUC %s on node and parents); their hybrids need the comparison group's mechanisms where the reference records lie, which the data hardly shows, so their contributions are unreliable (their weight diagnostics say the same and are not repeated)",
			strings.Join(sources, ", "), strings.Join(mechs, ", "), aucs)}
	return append([]Warning{w}, out...)
}

// isSeparating reports whether the mechanism of node p separates the
// groups (out-of-fold AUC ≥ WarnAUC).
func isSeparating(r *Result, p string) bool {
	for _, m := range r.Mechanisms {
		if m.Node == p {
			return m.AUC >= WarnAUC
		}
	}
	return false
}

// bothHybridsWarning speaks up, with two-sided estimation, when the worst
// hybrid of each side rests on fewer than WarnESSMin effective records:
// the combination then has no sound side to lean on for those coalitions.
// The share rule of lowESS is not used here: on the demo cohort the worst
// hybrids rest on 515 and 325 effective records (10% and 5% of their
// groups) while every contribution is within 0.01 of the truth, whereas on
// the Rotterdam cohort, whose groups age nearly separates, they rest on 2
// and 1. Nodes are those in comparison form in either worst hybrid.
func bothHybridsWarning(r *Result) []Warning {
	if len(r.Weights) < 2 {
		return nil
	}
	var parts []string
	nodes := []string{}
	for _, w := range r.Weights {
		if w.Worst.ESS >= WarnESSMin {
			return nil
		}
		parts = append(parts, fmt.Sprintf("%s effective %s records out of %s (the hybrid with the comparison group's mechanisms for %s)", thousands(int(math.Round(w.Worst.ESS))), w.Side, thousands(w.Records), nodeList(r.Names, w.Worst.ComparisonNodes)))
		for _, n := range w.Worst.ComparisonNodes {
			if !slices.Contains(nodes, n) {
				nodes = append(nodes, n)
			}
		}
	}
	return []Warning{{Kind: KindWorstHybrid, Severity: SeverityUnreliable, Nodes: nodes,
		Message: "on both sides some hybrid rests on very few records: " + strings.Join(parts, " and ") + "; contributions that use them are unreliable"}}
}

// shapeText prints a Pareto shape above threshold with two decimals, or
// three when two would round it down to the threshold (0.5019 reads
// 0.502, not 0.50 > 0.5).
func shapeText(k, threshold float64) string {
	if s := fmt.Sprintf("%.2f", k); k > threshold && s == fmt.Sprintf("%.2f", threshold) {
		return fmt.Sprintf("%.3f", k)
	}
	return fmt.Sprintf("%.2f", k)
}
