package attribution

import (
	"fmt"

	"github.com/gapwise/gapwise/internal/workers"
)

// ObservedIntervals returns every metric's observed group values and gap
// (as Observe) with the intervals DecomposeWithIntervals would give them
// for the same Options.Seed and Intervals (bopt.Replicate, if set,
// receives every replicate's observed values; Progress is unused): the observed values
// of a replicate depend only on its resampled records, which
// replicateRecords draws alike in both, so no classifier is fitted and
// ReferenceCI, ComparisonCI and GapCI are the same numbers. Studies of the
// gap's coverage use it to afford many draws; the estimated quantities
// (contributions, residual) are left zero and without intervals. A
// replicate in which a metric is undefined is left out, as in
// DecomposeWithIntervals; fewer than two computed replicates is an error.
func ObservedIntervals(s *Sample, metricNames []string, opt Options, bopt BootstrapOptions) ([]MetricDecomposition, error) {
	s.mustAlign()
	iv := bopt.Intervals
	if iv.Form == "" {
		iv.Form = DefaultIntervalForm
	}
	if iv.Replicates == 0 {
		iv.Replicates = DefaultReplicates(iv.Form)
	}
	if iv.Level == 0 {
		iv.Level = 0.95
	}
	opt = withDefaults(opt)
	g := splitGroups(s)
	md, err := observe(metricNames, g, opt)
	if err != nil {
		return nil, err
	}
	reps := make([][]MetricDecomposition, iv.Replicates)
	workers.For(opt.Workers, iv.Replicates, func(_, b int) {
		ri, ci := replicateRecords(g, opt.Seed, b)
		rg := groupSplit{refIdx: ri, cmpIdx: ci,
			refY: pick(s.Labels, ri), refS: pick(s.Scores, ri), cmpY: pick(s.Labels, ci), cmpS: pick(s.Scores, ci)}
		if r, err := observe(metricNames, rg, opt); err == nil {
			reps[b] = r
			if bopt.Replicate != nil {
				bopt.Replicate(b, r)
			}
		}
	})
	var ok [][]MetricDecomposition
	for _, r := range reps {
		if r != nil {
			ok = append(ok, r)
		}
	}
	if len(ok) < 2 {
		return nil, fmt.Errorf("attribution: only %d of %d bootstrap replicates could be computed", len(ok), iv.Replicates)
	}
	for m := range md {
		d := &md[m]
		get := func(est float64, f func(r MetricDecomposition) float64) *Interval {
			x := make([]float64, len(ok))
			for b, r := range ok {
				x[b] = f(r[m])
			}
			out := PercentileInterval(x, iv.Level)
			if iv.Form == FormNormal {
				out = NormalInterval(est, x, iv.Level)
			}
			return &out
		}
		d.ReferenceCI = get(d.Reference, func(r MetricDecomposition) float64 { return r.Reference })
		d.ComparisonCI = get(d.Comparison, func(r MetricDecomposition) float64 { return r.Comparison })
		d.GapCI = get(d.Gap, func(r MetricDecomposition) float64 { return r.Gap })
		if iv.Form == FormNormal {
			scoreIntervals(d, g, opt.Threshold, iv.Level)
		}
	}
	return md, nil
}
