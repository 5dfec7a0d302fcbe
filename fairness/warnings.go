package fairness

import (
	"fmt"
	"math"
	"strconv"
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
)

// Warnings lists, as plain sentences, the problems a reader of r should
// know about, in a fixed order: dropped rows; then per mechanism in graph
// order its overlap (AUC), effective sample size, largest weight share and
// mean ratio; then per metric a large residual.
func Warnings(r *Result) []string {
	out := droppedWarnings(r.Groups)
	nRef := r.Groups.NReference
	for _, m := range r.Mechanisms {
		if m.AUC >= WarnAUC {
			out = append(out, fmt.Sprintf("the groups are nearly separable on `%s` (out-of-fold AUC %.3f): overlap is poor, so its contribution is unreliable", m.Mechanism, m.AUC))
		}
		if m.ESS < WarnESSShare*float64(nRef) || m.ESS < WarnESSMin {
			out = append(out, fmt.Sprintf("the contribution of `%s` rests on %s effective records out of %s; treat it as unreliable", m.Node, thousands(int(math.Round(m.ESS))), thousands(nRef)))
		}
		if m.MaxShare > WarnMaxShare {
			out = append(out, fmt.Sprintf("a single record carries %.1f%% of the weight for `%s`; its contribution hinges on a few records", 100*m.MaxShare, m.Node))
		}
		if m.MeanRatio < WarnMeanRatioLow || m.MeanRatio > WarnMeanRatioHigh {
			out = append(out, fmt.Sprintf("the density ratios of `%s` average %.3f over the reference records instead of 1; its classifiers may be miscalibrated", m.Mechanism, m.MeanRatio))
		}
	}
	for _, mr := range r.Metrics {
		if math.Abs(mr.Residual) > WarnResidualShare*math.Abs(mr.Gap) && math.Abs(mr.Residual) > WarnResidualMin {
			out = append(out, fmt.Sprintf("for %s the contributions add up to %.4f but the observed gap is %.4f; the residual %.4f is large, so part of the gap is not explained by the estimated mechanisms", mr.Metric, mr.Estimated, mr.Gap, mr.Residual))
		}
	}
	if out == nil {
		out = []string{}
	}
	return out
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
