package attribution

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/gapwise/gapwise/internal/workers"
)

// estimateGames completes the weighting games of every metric
// (splitGapsSides) with the robust estimator's and the standard errors:
//
//   - EstimatorRobust: the game of every metric the robust estimator
//     covers (all but AUC) becomes the robust one, M̂(S) = g(θ̂_S) for
//     every coalition S, with its Shapley values, what-if values and
//     residual (fillSummary; the residual is 0 up to rounding, as both
//     ends are the observed metrics).
//   - EstimatorBoth: the weighting games stay.
//   - Either way the two estimates are compared (MetricDecomposition.
//     CrossCheck): the weighting estimate is computed anyway, from the
//     same density ratios.
//   - With diag (the point estimate, not a later fold split or a
//     bootstrap replicate) and the robust estimator computed, every
//     metric gets the influence-function standard errors of the estimator
//     behind it (Influence), and the cross-check the standard errors of
//     the two estimators' differences. The weighting estimator alone gets
//     none: its delta-method errors, which hold the fitted ratios fixed,
//     do not cover (README, Accuracy), and the default run would pay for
//     them.
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
	// A metric the robust estimate leaves undefined under some coalition
	// (a ratio metric whose estimated denominator is not positive, as on
	// very few records) keeps the weighting estimate, and says why.
	games := make([][]float64, len(mds))
	for m := range mds {
		if rob == nil || !rob.ok[m] {
			continue
		}
		vals, err := rob.values(m, k)
		var ce *CoalitionError
		switch {
		case errors.As(err, &ce):
			rob.ok[m] = false
			mds[m].RobustUnavailable = fallbackReason(rob.metrics[m], ce.Coalition, mechs)
			continue
		case err != nil:
			return 0, err
		}
		games[m] = shifted(vals)
	}
	if diag && rob != nil {
		setInfluence(mds, rob, est == EstimatorRobust, sides, g, names, opt, k, len(s.Comparison))
	}
	full := uint64(1)<<k - 1
	for m, v := range games {
		if v == nil {
			continue
		}
		r := mds[m]
		r.Estimator = EstimatorRobust
		fillSummary(&r, ExactShapley(v, k), func(S uint64) float64 { return v[S] }, k, full)
		r.Game = v
		r.ReferenceWeight, r.Agreement, r.ResidualSE = nil, nil, nil
		check := newEstimatorCheck(r, mds[m], mds[m].crossSE)
		if est == EstimatorRobust {
			w := mds[m]
			w.Influence = w.weightingSE
			mds[m] = r
			mds[m].weighting = &w
		}
		mds[m].CrossCheck = check
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
// where it is the metric's estimator, robustPrimary and covering the
// metric, else the weighting estimator's) and, where both are computed,
// the standard errors of their differences (crossSE, for
// newEstimatorCheck). Above the exact limit (sampled Shapley values) only
// the ends, gap and what-if values get one.
func setInfluence(mds []MetricDecomposition, rob *robustEstimate, robustPrimary bool, sides []*sideEstimate, g groupSplit, names []string, opt Options, k, n int) {
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
		mds[m].weightingSE = se[1][m]
		if robustPrimary && rob.ok[m] {
			mds[m].Influence = se[0][m]
		} else {
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

// unifyFallback makes every fold split of a metric use the weighting
// estimate when the robust one was unavailable in any split, so that the
// mean over the splits never mixes the two estimators; split 0's metric
// then carries the reason.
func unifyFallback(fits []splitFit) {
	for m := range fits[0].d.Metrics {
		reason := ""
		for _, f := range fits {
			if r := f.d.Metrics[m].RobustUnavailable; r != "" && reason == "" {
				reason = r
			}
		}
		if reason == "" {
			continue
		}
		for _, f := range fits {
			md := &f.d.Metrics[m]
			if w := md.weighting; w != nil {
				*md = *w
			}
			md.RobustUnavailable, md.CrossCheck = reason, nil
		}
	}
}

// fallbackReason says why the robust estimate of metric m is undefined
// under coalition S: its estimated denominator share is not positive when
// the mechanisms of S take the comparison group's form.
func fallbackReason(m robustMetric, S uint64, mechs []Mechanism) string {
	var nodes []string
	for i, mc := range mechs {
		if S&(1<<uint(i)) != 0 {
			nodes = append(nodes, mc.Node)
		}
	}
	what := m.denominator
	if what == "" {
		what = "its terms"
	}
	where := "with every mechanism in the reference group's form"
	if len(nodes) > 0 {
		where = "with the mechanisms of " + strings.Join(nodes, ", ") + " in the comparison group's form"
	}
	return fmt.Sprintf("its estimated share of %s is not positive %s", what, where)
}
