package attribution

import (
	"math"

	"github.com/gapwise/gapwise/internal/workers"
)

// Repeated cross-fitting. One fold split makes the density ratios, and on
// small data even the learner chosen per column set, depend on which
// records share a fold, so the contributions move with the seed by more
// than their sampling error. Following the repeated sample splitting of
// double machine learning (Chernozhukov et al. 2018, "Double/debiased
// machine learning for treatment and structural parameters", The
// Econometrics Journal 21(1), C1–C68, §3.4; cited from memory), Decompose
// estimates the whole decomposition on R independent fold splits and
// averages them.

// Defaults of Options.FoldSplits: below SplitsManyBelow records in the
// smaller group, SplitsMany splits; below SplitsSomeBelow, SplitsSome; from
// there on one. See DefaultFoldSplits for the measurements behind them.
const (
	SplitsManyBelow = 2_000
	SplitsMany      = 10
	SplitsSomeBelow = 10_000
	SplitsSome      = 5
)

// DefaultFoldSplits returns the number of fold splits Decompose uses when
// Options.FoldSplits is 0, from the size of the smaller group
// n = min(nRef, nCmp): SplitsMany when n < SplitsManyBelow, SplitsSome
// when n < SplitsSomeBelow, and 1 otherwise, where a split costs seconds.
//
// Measured on the synthetic screening cases with the auto learners (go run
// ./cmd/gapwise-accuracy -splits -learners auto -fold-splits 1,5,10; 10
// seeds, 95% bootstrap intervals with replicates spread over the splits),
// the largest range of a contribution over the seeds divided by its
// interval's half-width was, for R = 1 / 5 / 10:
//
//	n = 200    interaction 1.28/0.51/0.29  prevalence 3.38/0.94/0.54
//	           case-mix    1.15/1.32/0.59  combined   2.29/0.57/0.37
//	n = 1,000  interaction 2.85/1.12/0.43  prevalence 1.46/0.60/0.61
//	n = 4,000  interaction 2.26/0.40/–     prevalence 0.92/1.06/0.93
//
// so 10 splits are needed below 2,000 records and 5 suffice at 4,000. Above
// 10,000 one split is kept for speed (the cost is R full estimates); set
// FoldSplits there to see the split-to-split spread.
func DefaultFoldSplits(nRef, nCmp int) int {
	switch n := min(nRef, nCmp); {
	case n < SplitsManyBelow:
		return SplitsMany
	case n < SplitsSomeBelow:
		return SplitsSome
	}
	return 1
}

// foldSplits is opt.FoldSplits with its default for the Sample s.
func foldSplits(s *Sample, opt Options) int {
	if opt.FoldSplits > 0 {
		return opt.FoldSplits
	}
	return DefaultFoldSplits(s.Counts())
}

// SplitSeed returns the seed of fold split r (0-based) of a decomposition
// seeded by seed: seed itself for r = 0, so that one split is the
// single-split estimate, and for r > 0 the SplitMix64 finaliser (Steele,
// Lea & Flood 2014) of seed + r·0x9e3779b97f4a7c15 offset by a constant of
// its own, so that no split seed coincides with a bootstrap replicate's.
func SplitSeed(seed uint64, r int) uint64 {
	if r == 0 {
		return seed
	}
	z := (seed ^ 0x5f0d5111e5eed0ff) + uint64(r)*0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// splitFit is one fold split's estimate and the density ratios behind it.
type splitFit struct {
	d      *Decomposition
	ratios []MechanismRatio
}

// decomposeSplits runs decompose on R = foldSplits(s, opt) fold splits,
// split r seeded by SplitSeed(opt.Seed, r), in parallel on opt.Workers
// goroutines (each split gets an equal share of them for its fits), and
// returns their aggregate (aggregateSplits) with every split's estimate,
// split 0 first. Only split 0 computes the diagnostics and reports sampling
// progress. The first error in split order is returned.
func decomposeSplits(s *Sample, mechs []Mechanism, metricNames []string, opt Options) (*Decomposition, []splitFit, error) {
	opt = withDefaults(opt)
	R := foldSplits(s, opt)
	fits := make([]splitFit, R)
	errs := make([]error, R)
	nw := workers.Count(opt.Workers)
	inner := opt
	inner.Workers = max(1, nw/min(nw, R))
	workers.For(nw, R, func(_, r int) {
		o := inner
		o.Seed = SplitSeed(opt.Seed, r)
		if r > 0 {
			o.Sampling.Progress = nil
			o.splitOnly = true
		}
		fits[r].d, fits[r].ratios, errs[r] = decompose(s, mechs, metricNames, o, nil)
	})
	for _, err := range errs {
		if err != nil {
			return nil, nil, err
		}
	}
	unifyFallback(fits)
	return aggregateSplits(fits), fits, nil
}

// aggregateSplits returns the mean over the splits: for each metric and
// mechanism i, φ̄_i = (1/R) Σ_r φ_{r,i}, and likewise v({i}) (Alone),
// v(N∖{i}) (IfEqualised) and Estimated = v(N); Residual = Gap − Estimated.
// The mean of the games is one game, and Shapley values are linear in the
// game, so φ̄ is the Shapley split of the mean game and
// Σ_i φ̄_i + Residual = Gap holds as for one split. Monte Carlo standard
// errors of sampled values become √(Σ_r se_{r,i}²)/R (independent
// permutation streams). SplitSD_i is the standard deviation of φ_{r,i}
// over the splits (divisor R − 1) and SplitContributions[r] the splits'
// values. Game becomes the mean game v̄(S) = (1/R) Σ_r v_r(S) (nil
// when a split has none), whose Shapley values are φ̄. The observed values, the diagnostics (mechanism reports,
// weights, effective records) and every other field are split 0's. With
// one split, that split is returned unchanged.
//
// The mean rather than the median of Chernozhukov et al.: measured on the
// synthetic screening cases at 200 records per group (auto learners, 10
// seeds, 10 splits; go run ./cmd/gapwise-accuracy -splits), the two had
// about the same error against ground truth and the mean the smaller
// largest seed-to-seed range; and only the mean keeps Alone, IfEqualised
// and the contributions one coherent game.
func aggregateSplits(fits []splitFit) *Decomposition {
	out := fits[0].d
	R := len(fits)
	out.FoldSplits = R
	if R == 1 {
		return out
	}
	for m := range out.Metrics {
		md := &out.Metrics[m]
		per := make([]*MetricDecomposition, R)
		for r := range fits {
			per[r] = &fits[r].d.Metrics[m]
		}
		agg := *md
		agg.Contributions = meanOver(per, func(d *MetricDecomposition) []float64 { return d.Contributions })
		agg.Alone = meanOver(per, func(d *MetricDecomposition) []float64 { return d.Alone })
		agg.IfEqualised = meanOver(per, func(d *MetricDecomposition) []float64 { return d.IfEqualised })
		agg.Estimated = meanOver(per, func(d *MetricDecomposition) []float64 { return []float64{d.Estimated} })[0]
		agg.Game = meanGame(per)
		agg.Residual = agg.Gap - agg.Estimated
		agg.StdErrors = pooledStdErrors(per)
		agg.SplitContributions = make([][]float64, R)
		for r, d := range per {
			agg.SplitContributions[r] = d.Contributions
		}
		agg.SplitSD = splitSD(agg.SplitContributions, agg.Contributions)
		agg.CrossCheck = meanCrossCheck(per)
		*md = agg
	}
	return out
}

// meanOver returns the element-wise mean of get(d) over ds, summed in
// order.
func meanOver(ds []*MetricDecomposition, get func(*MetricDecomposition) []float64) []float64 {
	out := make([]float64, len(get(ds[0])))
	for _, d := range ds {
		for i, x := range get(d) {
			out[i] += x
		}
	}
	for i := range out {
		out[i] /= float64(len(ds))
	}
	return out
}

// meanGame returns the mean of the splits' games over every coalition,
// or nil when a split has no game (see MetricDecomposition.Game).
func meanGame(ds []*MetricDecomposition) []float64 {
	for _, d := range ds {
		if d.Game == nil {
			return nil
		}
	}
	return meanOver(ds, func(d *MetricDecomposition) []float64 { return d.Game })
}

// pooledStdErrors returns √(Σ_r se_{r,i}²)/R, the standard error of the
// mean of R independent estimates; nil when the values were exact.
func pooledStdErrors(ds []*MetricDecomposition) []float64 {
	if ds[0].StdErrors == nil {
		return nil
	}
	out := make([]float64, len(ds[0].StdErrors))
	for _, d := range ds {
		for i, se := range d.StdErrors {
			out[i] += se * se
		}
	}
	for i := range out {
		out[i] = math.Sqrt(out[i]) / float64(len(ds))
	}
	return out
}

// splitSD returns, per mechanism i, √(Σ_r (x_{r,i} − mean_i)² / (R − 1)).
func splitSD(x [][]float64, mean []float64) []float64 {
	out := make([]float64, len(mean))
	for _, row := range x {
		for i, v := range row {
			out[i] += (v - mean[i]) * (v - mean[i])
		}
	}
	for i := range out {
		out[i] = math.Sqrt(out[i] / float64(len(x)-1))
	}
	return out
}
