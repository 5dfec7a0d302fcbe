package attribution

import (
	"math"
	"sort"

	"github.com/gapwise/gapwise/metrics"
)

// ratioIntervals returns the percentile intervals, at the quantiles lo and
// hi of the replicates reps (metric m of each), of the impact ratio
// Comparison ÷ Reference and of the ratio lower ÷ higher = min(ref, cmp) ÷
// max(ref, cmp), for a rate (metrics.Fact.Proportion; nil, nil for other
// metrics). The impact ratio's interval is nil when a replicate has a
// reference value of 0, lower ÷ higher's when one has both values 0: a
// percentile interval over the replicates where the ratio happens to be
// defined would not be one of the ratio. Percentile intervals of a ratio
// are those of any monotone transform of it (Efron & Tibshirani 1993,
// "An Introduction to the Bootstrap", §13.3, from memory), so the log
// scale needs no separate treatment.
func ratioIntervals(reps [][]MetricDecomposition, m int, metric string, lo, hi float64) (impact, lowerToHigher *Interval) {
	if f, ok := metrics.FactOf(metric); !ok || !f.Proportion {
		return nil, nil
	}
	r := make([]float64, 0, len(reps))
	q := make([]float64, 0, len(reps))
	for _, rep := range reps {
		ref, cmp := rep[m].Reference, rep[m].Comparison
		if ref > 0 {
			r = append(r, cmp/ref)
		}
		if h := math.Max(ref, cmp); h > 0 {
			q = append(q, math.Min(ref, cmp)/h)
		}
	}
	within := func(x []float64) *Interval {
		if len(x) != len(reps) || len(x) < 2 {
			return nil
		}
		sort.Float64s(x)
		return &Interval{Low: quantile(x, lo), High: quantile(x, hi)}
	}
	return within(r), within(q)
}
