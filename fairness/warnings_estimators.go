package fairness

import (
	"fmt"
	"math"
)

// WarnEstimatorsZ and WarnEstimatorsZUnreliable: the robust and weighting
// estimates of a metric (EstimatorCheck) that differ by more than this
// many standard errors of their difference, in the estimated gap or a
// contribution, get a KindEstimatorsDisagree caution, or above the second
// bound an unreliable warning. Both estimators are consistent when the
// density ratios are right, so a difference beyond sampling error means
// the ratios are wrong or the robust estimator's regressions fail where
// the weights are poor. The standard error holds the fitted ratios fixed
// in the weighting part, so the bound was checked on simulated clean
// draws (cmd/gapwise-accuracy -checks -estimators robust -draws 20 -sizes
// 2000,8000): the largest z per draw exceeded 3 in 2–3% of 280 clean
// draws and 4 in none, and exceeded 4 in 96–98% of the draws with a
// degenerate learner, 80% and 100% (2,000 and 8,000 records per group)
// with a misspecified one and 33% and 67% with a model input left out of
// the graph (README, Accuracy).
const (
	WarnEstimatorsZ           = 4.0
	WarnEstimatorsZUnreliable = 8.0
)

// estimatorsWarning speaks up when a metric's robust and weighting
// estimates disagree beyond WarnEstimatorsZ standard errors; Nodes are
// the mechanisms whose contributions differ by more than that, named in
// the sentence by their display names.
func estimatorsWarning(mr MetricResult, names *Names) (Warning, bool) {
	ck := mr.EstimatorCheck
	if ck == nil || ck.MaxZ == nil || *ck.MaxZ <= WarnEstimatorsZ {
		return Warning{}, false
	}
	sev := SeverityCaution
	if *ck.MaxZ > WarnEstimatorsZUnreliable {
		sev = SeverityUnreliable
	}
	nodes := []string{}
	for _, c := range mr.Contributions {
		if d := c.EstimatorDifference; d != nil && d.StdError != nil && math.Abs(d.Difference) > WarnEstimatorsZ**d.StdError {
			nodes = append(nodes, c.Node)
		}
	}
	where := ""
	if len(nodes) > 0 {
		where = fmt.Sprintf("; the contributions of %s differ most", nodeList(names, nodes))
	}
	msg := fmt.Sprintf("for %s the robust and the weighting estimates disagree by up to %.1f standard errors (estimated gap %s%s): the density ratios are likely wrong where the robust estimate leans on its regressions, or its regressions fail where the weights are poor; read the contributions with care",
		mr.Metric, *ck.MaxZ, plusMinus(ck.GapDifference), where)
	return Warning{Kind: KindEstimatorsDisagree, Severity: sev, Metric: mr.Metric, Nodes: nodes, Message: msg}, true
}
