package attribution

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/internal/workers"
)

// estimateGames completes the weighting games of every metric
// (splitGapsSides) with the other estimator's and the standard errors:
//
//   - EstimatorRobust, EstimatorBoth: the game of every metric the
//     robust estimator covers (all but AUC) becomes the robust one,
//     M̂(S) = g(θ̂_S) for every coalition S, with its Shapley values,
//     what-if values and residual (fillSummary; the residual is 0 up to
//     rounding, as both ends are the observed metrics); with
//     EstimatorBoth the weighting estimate stays beside it
//     (MetricDecomposition.CrossCheck).
//   - With diag (the point estimate, not a later fold split or a
//     bootstrap replicate), every metric gets the influence-function
//     standard errors of the estimator behind it (Influence), and
//     CrossCheck the standard errors of the two estimators' differences.
//
// The robust estimator reads the weighting estimator's log-ratios,
// clipped alike. It returns the number of regressions fitted.
func estimateGames(mds []MetricDecomposition, s *Sample, mechs []Mechanism, ratios []MechanismRatio, sides []*sideEstimate, g groupSplit, opt Options, est Estimator, diag bool) (int, error) {
	k := len(mechs)
	names := make([]string, len(mds))
	for m := range mds {
		names[m] = mds[m].Metric
	}
	var rob *robustEstimate
	if est.robust() {
		var err error
		if rob, err = robustEstimateOf(s, mechs, ratios, g, names, opt); err != nil {
			return 0, err
		}
	}
	weighting := make([]MetricDecomposition, len(mds))
	copy(weighting, mds)
	if diag {
		setInfluence(mds, rob, sides, g, names, opt, k, len(s.Comparison))
	}
	full := uint64(1)<<k - 1
	for m := range mds {
		if rob == nil || !rob.ok[m] {
			continue
		}
		vals, err := rob.values(m, k)
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
		if est == EstimatorBoth {
			md.CrossCheck = newEstimatorCheck(*md, weighting[m])
		}
	}
	if rob == nil {
		return 0, nil
	}
	return rob.regressions(), nil
}

// robustEstimateOf fits the robust estimator of the metrics names.
func robustEstimateOf(s *Sample, mechs []Mechanism, ratios []MechanismRatio, g groupSplit, names []string, opt Options) (*robustEstimate, error) {
	k := len(mechs)
	if k > exactLimit(opt) || k > MaxExactMechanisms {
		return nil, fmt.Errorf("attribution: the robust estimator needs exact Shapley values (at most %d mechanisms), got %d", min(exactLimit(opt), MaxExactMechanisms), k)
	}
	logr, err := robustLogRatios(ratios, g, opt)
	if err != nil {
		return nil, err
	}
	if opt.robustHooks != nil && opt.robustHooks.LogRatios != nil {
		logr = opt.robustHooks.LogRatios
	}
	folds := assignFolds(s.Comparison, opt.Folds, opt.Seed)
	in, err := newRobustInput(s, mechs, logr, folds, opt.Folds, opt)
	if err != nil {
		return nil, err
	}
	return estimateRobust(in, names)
}

// setInfluence runs the influence pass (influenceSEs) of the estimators
// computed and sets every metric's Influence (the robust estimator's
// where it covers the metric, else the weighting estimator's) and, where
// both are, the standard errors of their differences (kept for
// newEstimatorCheck in MetricDecomposition.crossSE). Above the exact
// limit (sampled Shapley values) only the ends, gap and what-if values
// get one.
func setInfluence(mds []MetricDecomposition, rob *robustEstimate, sides []*sideEstimate, g groupSplit, names []string, opt Options, k, n int) {
	p := newInfluencePlan(n, k, k <= exactLimit(opt))
	var prep [2]func(lo, hi int) recordInfluence
	var defined [2][]bool
	if rob != nil {
		prep[0], defined[0] = rob.prepareInfluence(p)
	} else {
		defined[0] = make([]bool, len(names))
	}
	prep[1], defined[1] = prepareWeightingInfluence(mds, sides, g, names, p, opt)
	se, diff := influenceSEs(n, len(names), p, workers.Count(opt.Workers), prep, defined)
	for m := range mds {
		switch {
		case rob != nil && rob.ok[m]:
			mds[m].Influence = se[0][m]
		default:
			mds[m].Influence = se[1][m]
		}
		if diff != nil {
			mds[m].crossSE = diff[m]
		}
	}
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
