package fairness

import (
	"fmt"
	"github.com/gapwise/gapwise/attribution"
	"math"
	"strconv"
	"strings"
)

// Thresholds above which Warnings speaks up.
const (
	// WarnESSShare and WarnESSMin: a mechanism's effective sample size
	// n_eff = (Σw)²/Σw² below WarnESSShare·n_reference or below WarnESSMin
	// records.
	WarnESSShare = 0.10
	WarnESSMin   = 100
	// WarnMaxShare: one record carries more than this share of Σw.
	WarnMaxShare = 0.05
	// WarnMeanRatioLow/High: the mean of r_i over the reference records,
	// which is 1 when the ratios are right, falls outside this range.
	WarnMeanRatioLow  = 0.9
	WarnMeanRatioHigh = 1.1
	// WarnResidualShare and WarnResidualMin: |residual| exceeds both this
	// share of |gap| and this absolute amount.
	WarnResidualShare = 0.25
	WarnResidualMin   = 0.005
	// WarnAUC: the out-of-fold AUC of a mechanism's group classifier is at
	// least this, so the groups barely overlap on it.
	WarnAUC = 0.95
	// WarnExtremeShare: more than this share of the records of the side(s)
	// that estimate the hybrids carry a weight above 20 for a mechanism.
	WarnExtremeShare = 0.01
	// WarnStratumLow/High: the mean ratio in some fifth of the reference
	// records (grouped by the parents) falls outside this range.
	WarnStratumLow  = 0.8
	WarnStratumHigh = 1.25
)

// Warnings lists, as plain sentences, the problems a reader of r should
// know about, in a fixed order: dropped rows; then per mechanism in graph
// order its overlap (AUC, extreme ratios), effective sample size, largest
// weight share, mean ratio overall and per stratum of the parents, and
// clipping; then per side of estimation its worst hybrid; then per metric
// its effective records and a large residual.
//
// Effective sample sizes are judged on the side(s) that estimate the
// hybrids (Settings.EstimateFrom); with both sides, only when both are low,
// since the combination leans on the better one.
func Warnings(r *Result) []string {
	out := droppedWarnings(r.Groups)
	nRef, nCmp := r.Groups.NReference, r.Groups.NComparison
	side := r.Settings.EstimateFrom
	low := func(ess float64, n int) bool { return ess < WarnESSShare*float64(n) || ess < WarnESSMin }
	for _, m := range r.Mechanisms {
		if m.AUC >= WarnAUC {
			out = append(out, fmt.Sprintf("the groups are nearly separable on `%s` (out-of-fold AUC %.3f): overlap is poor, so its contribution is unreliable", m.Mechanism, m.AUC))
		}
		if w := extremeWarning(m, side); w != "" {
			out = append(out, w)
		}
		refLow, cmpLow := low(m.ESS, nRef), low(m.ComparisonESS, nCmp)
		switch {
		case side == "comparison" && cmpLow:
			out = append(out, fmt.Sprintf("the contribution of `%s` rests on %s effective comparison records out of %s; treat it as unreliable", m.Node, thousands(int(math.Round(m.ComparisonESS))), thousands(nCmp)))
		case side == "both" && refLow && cmpLow:
			out = append(out, fmt.Sprintf("the contribution of `%s` rests on %s effective reference records out of %s and %s comparison records out of %s; treat it as unreliable", m.Node, thousands(int(math.Round(m.ESS))), thousands(nRef), thousands(int(math.Round(m.ComparisonESS))), thousands(nCmp)))
		case side != "comparison" && side != "both" && refLow:
			out = append(out, fmt.Sprintf("the contribution of `%s` rests on %s effective records out of %s; treat it as unreliable", m.Node, thousands(int(math.Round(m.ESS))), thousands(nRef)))
		}
		if w := tailWarning(m, side); w != "" {
			out = append(out, w)
		}
		if m.MaxShare > WarnMaxShare {
			out = append(out, fmt.Sprintf("a single record carries %.1f%% of the weight for `%s`; its contribution hinges on a few records", 100*m.MaxShare, m.Node))
		}
		if m.MeanRatio < WarnMeanRatioLow || m.MeanRatio > WarnMeanRatioHigh {
			out = append(out, fmt.Sprintf("the density ratios of `%s` average %.3f over the reference records instead of 1; its classifiers may be miscalibrated", m.Mechanism, m.MeanRatio))
		}
		if m.WorstStratumMean < WarnStratumLow || m.WorstStratumMean > WarnStratumHigh {
			out = append(out, fmt.Sprintf("the density ratios of `%s` average %.3f in one fifth of the reference records (grouped by its parents) instead of 1; its classifiers may misjudge how the parents differ", m.Mechanism, m.WorstStratumMean))
		}
		if m.ClippedReference+m.ClippedComparison > 0 {
			out = append(out, fmt.Sprintf("the ratios of `%s` were clipped for %s reference and %s comparison records (clip_ratios %g); its contribution is pulled towards zero", m.Node, thousands(m.ClippedReference), thousands(m.ClippedComparison), r.Settings.ClipRatios))
		}
	}
	if side != "both" {
		for _, w := range r.Weights {
			if low(w.Worst.ESS, w.Records) {
				out = append(out, fmt.Sprintf("on the %s records, the hybrid with the comparison group's mechanisms for %s rests on %s effective records out of %s; contributions that use it are unreliable", w.Side, nodeList(w.Worst.ComparisonNodes), thousands(int(math.Round(w.Worst.ESS))), thousands(w.Records)))
			}
		}
	}
	for _, mr := range r.Metrics {
		if mr.EffectiveRecords < WarnESSMin {
			what := "the reweighted comparison group"
			switch side {
			case "comparison":
				what = "the reweighted reference group"
			case "both":
				what = "the combined estimate"
			}
			out = append(out, fmt.Sprintf("for %s, %s rests on %s effective records; the estimated gap is unreliable", mr.Metric, what, thousands(int(math.Round(mr.EffectiveRecords)))))
		}
		if math.Abs(mr.Residual) > WarnResidualShare*math.Abs(mr.Gap) && math.Abs(mr.Residual) > WarnResidualMin {
			out = append(out, fmt.Sprintf("for %s the contributions add up to %.4f but the observed gap is %.4f; the residual %.4f is large, so part of the gap is not explained by the estimated mechanisms", mr.Metric, mr.Estimated, mr.Gap, mr.Residual))
		}
	}
	if out == nil {
		out = []string{}
	}
	return out
}

// nodeList renders nodes as "`a`, `b`", or "no node" for none.
func nodeList(nodes []string) string {
	if len(nodes) == 0 {
		return "no node"
	}
	q := make([]string, len(nodes))
	for i, n := range nodes {
		q[i] = "`" + n + "`"
	}
	return strings.Join(q, ", ")
}

// droppedWarnings reports rows dropped for missing values.
func droppedWarnings(g GroupInfo) []string {
	if g.DroppedReference == 0 && g.DroppedComparison == 0 {
		return []string{}
	}
	return []string{fmt.Sprintf("%s rows of group %q and %s rows of group %q were dropped for missing values; the audit describes the remaining records only",
		thousands(g.DroppedReference), g.Reference, thousands(g.DroppedComparison), g.Comparison)}
}

// thousands formats n with a comma between groups of three digits.
func thousands(n int) string {
	s := strconv.Itoa(n)
	neg := n < 0
	if neg {
		s = s[1:]
	}
	var b []byte
	for i := range len(s) {
		if i > 0 && (len(s)-i)%3 == 0 {
			b = append(b, ',')
		}
		b = append(b, s[i])
	}
	if neg {
		return "-" + string(b)
	}
	return string(b)
}

// tailWarning speaks up when the weights of a mechanism have a heavy right
// tail (Pareto k̂ above attribution.TailInfiniteVariance) on the side(s)
// that estimate the hybrids; with both sides, only when both are heavy.
func tailWarning(m MechanismResult, side string) string {
	heavy := func(k *float64) bool { return k != nil && *k > attribution.TailInfiniteVariance }
	ref, cmp := heavy(m.TailShape), heavy(m.ComparisonTailShape)
	var k float64
	var where string
	switch {
	case side == "comparison" && cmp:
		k, where = *m.ComparisonTailShape, "comparison"
	case side == "both" && ref && cmp:
		k, where = math.Min(*m.TailShape, *m.ComparisonTailShape), "reference and comparison"
	case side != "comparison" && side != "both" && ref:
		k, where = *m.TailShape, "reference"
	default:
		return ""
	}
	verdict := "their variance is infinite, so the estimate converges slowly and its interval may be too narrow"
	if k > attribution.TailUnreliable {
		verdict = "the estimate is unreliable at this sample size"
	}
	return fmt.Sprintf("the weights for `%s` on the %s records have a heavy tail (Pareto shape %.2f > %.1f): %s; consider estimate_from: both", m.Mechanism, where, k, attribution.TailInfiniteVariance, verdict)
}

// extremeWarning speaks up when more than WarnExtremeShare of the records
// that estimate the hybrids carry a weight above 20 for a mechanism; with
// both sides, only when both do (the combination leans on the better one).
func extremeWarning(m MechanismResult, side string) string {
	ref := m.ExtremeShare > WarnExtremeShare
	cmp := m.ComparisonExtremeShare != nil && *m.ComparisonExtremeShare > WarnExtremeShare
	switch {
	case side == "comparison" && cmp:
		return fmt.Sprintf("%.1f%% of comparison records carry a weight above 20 for `%s`: the groups barely overlap there, and a few records dominate", 100**m.ComparisonExtremeShare, m.Mechanism)
	case side == "both" && ref && cmp:
		return fmt.Sprintf("%.1f%% of reference and %.1f%% of comparison records carry a weight above 20 for `%s`: the groups barely overlap there, and a few records dominate", 100*m.ExtremeShare, 100**m.ComparisonExtremeShare, m.Mechanism)
	case side != "comparison" && side != "both" && ref:
		return fmt.Sprintf("%.1f%% of reference records carry a weight above 20 for `%s`: the groups barely overlap there, and a few records dominate", 100*m.ExtremeShare, m.Mechanism)
	}
	return ""
}
