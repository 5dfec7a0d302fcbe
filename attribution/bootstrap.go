package attribution

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sync"
	"sync/atomic"

	"github.com/gapwise/gapwise/internal/workers"
)

// Intervals are the settings of bootstrap intervals: the one shape in
// which they travel from the spec's intervals key through fairness.Run to
// DecomposeWithIntervals, and back into the result. Its JSON field names
// are part of the result contract.
type Intervals struct {
	// Replicates is the number of resamples: 0 means no intervals where
	// the settings come from a spec, and DefaultReplicates(Form) in
	// DecomposeWithIntervals.
	Replicates int `json:"replicates"`
	// Level is the interval level, e.g. 0.95 (0 means 0.95).
	Level float64 `json:"level"`
	// KeepRatios resamples records together with their already-fitted
	// log-ratios instead of refitting the classifiers (fast mode). It
	// ignores the classifiers' own estimation error, so intervals are
	// narrower than the full bootstrap's; with several fold splits the
	// replicates still take the ratios of different splits, so the
	// between-split spread is in them (see DecomposeWithIntervals).
	KeepRatios bool `json:"keep_ratios"`
	// Form is how the intervals are read off the replicates (see
	// IntervalForm); "" means DefaultIntervalForm.
	Form IntervalForm `json:"form"`
}

// BootstrapOptions controls bootstrap intervals.
type BootstrapOptions struct {
	Intervals
	// Progress, if non-nil, is called after each finished replicate with
	// the number done and the total; calls may come from several goroutines
	// but never concurrently.
	Progress func(done, total int)
	// Replicate, if non-nil, receives every computed replicate b (0 ≤ b <
	// Replicates) with its metrics, for studies that form other intervals
	// from the same replicates; calls come from several goroutines at
	// once, each b exactly once, and must not keep md's slices beyond
	// reading them.
	Replicate func(b int, md []MetricDecomposition)
}

// BootstrapSummary reports how the intervals were made: the settings used
// (Replicates as requested) and how many replicates failed. Its JSON form
// is the result's record of the bootstrap (fairness.IntervalSettings).
type BootstrapSummary struct {
	Intervals
	// Method names where the intervals' uncertainty comes from:
	// MethodRefit or MethodFast (KeepRatios).
	Method string `json:"method"`
	// Failed counts replicates that could not be computed (e.g. a metric
	// undefined in a resample); the intervals rest on the others.
	Failed int `json:"failed"`
}

// Names of the bootstrap methods (BootstrapSummary.Method).
const (
	// MethodRefit: every replicate refits the classifiers.
	MethodRefit = "bootstrap-refit"
	// MethodFast: every replicate keeps the fitted log-ratios.
	MethodFast = "bootstrap-fast"
)

// DecomposeWithIntervals runs Decompose and then a bootstrap (Efron &
// Tibshirani 1993, "An Introduction to the Bootstrap", ch. 6 and 13):
// each replicate resamples the records of each group with replacement
// (group sizes fixed), refits the classifiers (with the learner chosen on
// the full data for each column set, or keeps the fitted ratios in fast
// mode; a boosted learner grows the number of rounds early stopping kept on
// the full data, without an inner validation split, see refitLearner), and
// recomputes each group's metric, the gap and every
// contribution. The interval for a quantity is, in the normal form, the
// point estimate ± t_{B−1,(1+L)/2} times the standard deviation of its
// replicates (NormalInterval), except that a rate's observed group values
// and gap get score intervals from their counts (scoreIntervals: Wilson
// and Newcombe), which keep their level with few events; in the
// percentile form it is the ((1−L)/2, (1+L)/2) quantiles of its
// replicates (PercentileInterval). The interval
// level is L = Level, the replicates B = Replicates (0:
// DefaultReplicates(Form)). Replicate b uses a PCG stream seeded by (Seed, b), and
// replicates run in parallel with one result slot each, so the intervals do
// not depend on the number of goroutines. Each replicate runs its fits one
// at a time on a single goroutine (the replicates already occupy the
// workers).
//
// With R = Options.FoldSplits > 1 fold splits, replicate b takes what it
// reuses from split r = b mod R of the point estimate: its learner choice
// (refit mode, where the replicate also draws a fold split of its own) or
// its fitted log-ratios (fast mode). The replicates then form a mixture
// over the splits, whose variance is E_r[Var(θ* | r)] + Var_r(E[θ* | r]):
// the resampling variance within a split plus the between-split variance,
// the bootstrap counterpart of the variance σ² = (1/R) Σ_r (σ_r² + (θ_r −
// θ̄)²) with which Chernozhukov et al. (2018, §3.4) fold the uncertainty of
// the sample splitting into the interval of the split-averaged estimate θ̄.
// It is conservative: θ̄ itself varies between seeds by about
// SplitSD/√R, while the mixture carries the whole between-split spread.
func DecomposeWithIntervals(s *Sample, mechs []Mechanism, metricNames []string, opt Options, bopt BootstrapOptions) (*Decomposition, *BootstrapSummary, error) {
	if bopt.Form == "" {
		bopt.Form = DefaultIntervalForm
	}
	if !bopt.Form.Known() {
		return nil, nil, fmt.Errorf("attribution: interval form %q is neither %s nor %s", bopt.Form, FormNormal, FormPercentile)
	}
	if bopt.Replicates == 0 {
		bopt.Replicates = DefaultReplicates(bopt.Form)
	}
	if bopt.Level == 0 {
		bopt.Level = 0.95
	}
	if !(bopt.Level > 0 && bopt.Level < 1) {
		return nil, nil, fmt.Errorf("attribution: bootstrap level %v is not in (0, 1)", bopt.Level)
	}
	if bopt.Replicates < 2 {
		return nil, nil, fmt.Errorf("attribution: bootstrap needs at least 2 replicates, got %d", bopt.Replicates)
	}
	opt = withDefaults(opt)
	d, fits, err := decomposeSplits(s, mechs, metricNames, opt)
	if err != nil {
		return nil, nil, err
	}
	chosen, logRatio := reuseBySplit(fits, bopt.KeepRatios)
	g := splitGroups(s)

	B := bopt.Replicates
	reps := make([][]MetricDecomposition, B)
	inner := opt
	inner.Workers = 1
	inner.Sampling.Progress = nil // replicates run concurrently
	var done atomic.Int64
	var progressMu sync.Mutex
	workers.For(opt.Workers, B, func(_, b int) {
		ri, ci := replicateRecords(g, opt.Seed, b)
		var md []MetricDecomposition
		var err error
		r := b % len(fits)
		if bopt.KeepRatios {
			md, err = replicateKeep(s, ri, ci, logRatio[r], metricNames, inner)
		} else {
			md, err = replicateRefit(s, mechs, ri, ci, metricNames, inner, chosen[r], uint64(b))
		}
		if err == nil {
			dropGames(md)
			reps[b] = md
			if bopt.Replicate != nil {
				bopt.Replicate(b, md)
			}
		}
		if bopt.Progress != nil {
			progressMu.Lock()
			bopt.Progress(int(done.Add(1)), B)
			progressMu.Unlock()
		}
	})

	sum := &BootstrapSummary{Intervals: Intervals{Replicates: B, Level: bopt.Level, KeepRatios: bopt.KeepRatios, Form: bopt.Form}, Method: MethodRefit}
	if bopt.KeepRatios {
		sum.Method = MethodFast
	}
	var ok [][]MetricDecomposition
	for _, r := range reps {
		if r == nil {
			sum.Failed++
			continue
		}
		ok = append(ok, r)
	}
	if len(ok) < 2 {
		return nil, nil, fmt.Errorf("attribution: only %d of %d bootstrap replicates could be computed", len(ok), B)
	}
	for m := range d.Metrics {
		setIntervals(&d.Metrics[m], m, ok, bopt.Intervals)
		if bopt.Form == FormNormal {
			scoreIntervals(&d.Metrics[m], g, opt.Threshold, bopt.Level)
		}
	}
	return d, sum, nil
}

// setIntervals sets the intervals of metric m of the point estimate md
// from the computed replicates ok, in the form iv.Form at level iv.Level:
// percentile intervals (PercentileInterval), or normal ones around md's
// own values (NormalInterval), the ratios' on the log scale
// (ratioIntervals, normalRatioIntervals).
func setIntervals(md *MetricDecomposition, m int, ok [][]MetricDecomposition, iv Intervals) {
	interval := func(est float64, get func(md []MetricDecomposition) float64) *Interval {
		x := make([]float64, len(ok))
		for b, r := range ok {
			x[b] = get(r)
		}
		out := PercentileInterval(x, iv.Level)
		if iv.Form == FormNormal {
			out = NormalInterval(est, x, iv.Level)
		}
		return &out
	}
	md.ReferenceCI = interval(md.Reference, func(r []MetricDecomposition) float64 { return r[m].Reference })
	md.ComparisonCI = interval(md.Comparison, func(r []MetricDecomposition) float64 { return r[m].Comparison })
	md.GapCI = interval(md.Gap, func(r []MetricDecomposition) float64 { return r[m].Gap })
	md.ResidualCI = interval(md.Residual, func(r []MetricDecomposition) float64 { return r[m].Residual })
	md.ContributionCIs = make([]Interval, len(md.Contributions))
	for i := range md.Contributions {
		md.ContributionCIs[i] = *interval(md.Contributions[i], func(r []MetricDecomposition) float64 { return r[m].Contributions[i] })
	}
	if iv.Form == FormNormal {
		md.ImpactRatioCI, md.LowerToHigherCI = normalRatioIntervals(ok, m, md, iv.Level)
	} else {
		md.ImpactRatioCI, md.LowerToHigherCI = ratioIntervals(ok, m, md.Metric, (1-iv.Level)/2, (1+iv.Level)/2)
	}
}

// dropGames clears the games of a replicate's metrics: the intervals
// read only the contributions and the ends, and B games of 2^k values
// each would be held until the end.
func dropGames(md []MetricDecomposition) {
	for m := range md {
		md[m].Game = nil
	}
}

// reuseBySplit returns, per fold split, what a bootstrap replicate reuses
// from it: the learner fitted on each column set (chosen[r]) and, in fast
// mode (keep), the log-ratios logRatio[r][i] of mechanism i at every
// record of the Sample.
func reuseBySplit(fits []splitFit, keep bool) (chosen []fixedLearners, logRatio [][][]float64) {
	chosen = make([]fixedLearners, len(fits))
	logRatio = make([][][]float64, len(fits))
	for r, f := range fits {
		chosen[r] = fixedLearners{}
		for _, mr := range f.ratios {
			chosen[r][mr.jointKey] = mr.jointRefit
			if mr.parentKey != "" {
				chosen[r][mr.parentKey] = mr.parentRefit
			}
		}
		if keep {
			logRatio[r] = make([][]float64, len(f.ratios))
			for i, mr := range f.ratios {
				logRatio[r][i] = mr.LogRatio
			}
		}
	}
	return chosen, logRatio
}

// replicateRecords draws replicate b's records of a decomposition seeded
// by seed: each group's records resampled with replacement from a PCG
// stream seeded by (seed, b), the reference group first.
func replicateRecords(g groupSplit, seed uint64, b int) (ri, ci []int) {
	rng := rand.New(rand.NewPCG(seed, 0xb0075742^uint64(b)))
	ri = resample(g.refIdx, rng)
	ci = resample(g.cmpIdx, rng)
	return ri, ci
}

// resample draws len(idx) elements of idx with replacement.
func resample(idx []int, rng *rand.Rand) []int {
	out := make([]int, len(idx))
	for a := range out {
		out[a] = idx[rng.IntN(len(idx))]
	}
	return out
}

// replicateKeep recomputes a replicate from resampled records (ri, ci:
// Sample indices) and their already-fitted log-ratios (logRatio[i][r] for
// every record r of the Sample), estimating from the side(s) opt.Side
// selects with the same clipping as the point estimate.
func replicateKeep(s *Sample, ri, ci []int, logRatio [][]float64, metricNames []string, opt Options) ([]MetricDecomposition, error) {
	g := groupSplit{refIdx: ri, cmpIdx: ci}
	g.refY, g.refS = pick(s.Labels, ri), pick(s.Scores, ri)
	g.cmpY, g.cmpS = pick(s.Labels, ci), pick(s.Scores, ci)
	md, err := observe(metricNames, g, opt)
	if err != nil {
		return nil, err
	}
	side := opt.Side.resolve()
	var sides []*sideEstimate
	for _, sd := range []struct {
		use  bool
		side Side
		idx  []int
		y, s []float64
	}{
		{side != SideComparison, SideReference, ri, g.refY, g.refS},
		{side != SideReference, SideComparison, ci, g.cmpY, g.cmpS},
	} {
		if !sd.use {
			continue
		}
		logr := make([][]float64, len(logRatio))
		for i := range logr {
			logr[i] = pick(logRatio[i], sd.idx)
			if opt.ClipQuantile != 0 {
				if logr[i], _, err = ClipAtQuantiles(logr[i], opt.ClipQuantile); err != nil {
					return nil, err
				}
			}
		}
		sides = append(sides, newSideEstimate(sd.side, sd.y, sd.s, logr))
	}
	mix := MixDefault
	if side == SideBoth {
		mix = opt.Mix.resolve()
	}
	if err := splitGapsSides(md, sides, opt, mix, false); err != nil {
		return nil, err
	}
	return md, nil
}

// replicateRefit builds the resampled Sample and reruns the decomposition.
func replicateRefit(s *Sample, mechs []Mechanism, ri, ci []int, metricNames []string, opt Options, chosen fixedLearners, b uint64) ([]MetricDecomposition, error) {
	rows := append(append([]int{}, ri...), ci...)
	rs := &Sample{
		X:          subMatrix(s.X, rows, allCols(s.X.RawMatrix().Cols)),
		Comparison: make([]bool, len(rows)),
		Labels:     pick(s.Labels, rows),
		Scores:     pick(s.Scores, rows),
		// The same columns hold probabilities in the replicate.
		ProbabilityCols: s.ProbabilityCols,
		Features:        s.Features,
	}
	for a := len(ri); a < len(rows); a++ {
		rs.Comparison[a] = true
	}
	opt.Seed = opt.Seed ^ (b+1)*0x9e3779b97f4a7c15
	d, _, err := decompose(rs, mechs, metricNames, opt, chosen)
	if err != nil {
		return nil, err
	}
	return d.Metrics, nil
}

func allCols(p int) []int {
	c := make([]int, p)
	for i := range c {
		c[i] = i
	}
	return c
}

// quantile returns the q-quantile of sorted x by linear interpolation
// between order statistics (Hyndman & Fan 1996, definition 7).
func quantile(x []float64, q float64) float64 {
	if len(x) == 1 {
		return x[0]
	}
	h := q * float64(len(x)-1)
	lo := math.Floor(h)
	i := int(lo)
	if i >= len(x)-1 {
		return x[len(x)-1]
	}
	return x[i] + (h-lo)*(x[i+1]-x[i])
}
