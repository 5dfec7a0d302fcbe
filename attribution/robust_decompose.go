package attribution

import (
	"fmt"
	"math"
)

// splitGapsRobust replaces the game of every metric the robust estimator
// covers (all but AUC) by the robust one, M̂(S) = g(θ̂_S) for every
// coalition S, and its Shapley values, what-if values and residual
// (fillSummary; the residual is 0 up to rounding, as both ends are the
// observed metrics). The log-ratios are those of the weighting estimator,
// clipped alike. It returns the number of regressions fitted.
func splitGapsRobust(mds []MetricDecomposition, s *Sample, mechs []Mechanism, ratios []MechanismRatio, g groupSplit, opt Options) (int, error) {
	k := len(mechs)
	if k > exactLimit(opt) || k > MaxExactMechanisms {
		return 0, fmt.Errorf("attribution: the robust estimator needs exact Shapley values (at most %d mechanisms), got %d", min(exactLimit(opt), MaxExactMechanisms), k)
	}
	logr, err := robustLogRatios(ratios, g, opt)
	if err != nil {
		return 0, err
	}
	if opt.robustHooks != nil && opt.robustHooks.LogRatios != nil {
		logr = opt.robustHooks.LogRatios
	}
	folds := assignFolds(s.Comparison, opt.Folds, opt.Seed)
	in, err := newRobustInput(s, mechs, logr, folds, opt.Folds, opt)
	if err != nil {
		return 0, err
	}
	names := make([]string, len(mds))
	for m := range mds {
		names[m] = mds[m].Metric
	}
	est, err := estimateRobust(in, names)
	if err != nil {
		return 0, err
	}
	full := uint64(1)<<k - 1
	se := est.influence(k)
	for m := range mds {
		if !est.ok[m] {
			continue
		}
		vals, err := est.values(m, k)
		if err != nil {
			return 0, err
		}
		v := shifted(vals)
		md := &mds[m]
		md.Estimator = EstimatorRobust
		fillSummary(md, ExactShapley(v, k), func(S uint64) float64 { return v[S] }, k, full)
		md.Game = v
		md.ReferenceWeight = nil
		md.Agreement = nil
		md.ResidualSE = nil
		md.Influence = se[m]
	}
	return est.regressions(), nil
}

// robustLogRatios returns every mechanism's log-ratio at every record of
// the Sample, clipped to ±ClipLogRatio and, when Options.ClipQuantile is
// set, to each group's central interval (sideLogRatios).
func robustLogRatios(ratios []MechanismRatio, g groupSplit, opt Options) ([][]float64, error) {
	out := make([][]float64, len(ratios))
	for i, mr := range ratios {
		ref, cmp, _, err := sideLogRatios(mr, g, opt, true, true)
		if err != nil {
			return nil, err
		}
		l := make([]float64, len(mr.LogRatio))
		for a, r := range g.refIdx {
			l[r] = ref[a]
		}
		for a, r := range g.cmpIdx {
			l[r] = cmp[a]
		}
		for r, x := range l {
			if math.IsNaN(x) {
				return nil, fmt.Errorf("attribution: mechanism %d, record %d: log-ratio is NaN", i, r)
			}
			l[r] = math.Max(-ClipLogRatio, math.Min(ClipLogRatio, x))
		}
		out[i] = l
	}
	return out, nil
}
