package attribution

import (
	"math"

	"github.com/gapwise/gapwise/metrics"
)

// normalRatioIntervals returns the normal-form intervals of a rate's
// impact ratio ρ = Comparison ÷ Reference and of lower ÷ higher
// = min(ρ, 1/ρ), at level L, from the replicates ok (metric m of each)
// around the point estimate md. A ratio's sampling distribution is skewed
// and its logarithm's much less so, so the interval is formed on the log
// scale and mapped back (as for a risk ratio; e.g. Agresti 2013,
// "Categorical Data Analysis", §3.1.4, from memory):
//
//	exp(log ρ̂ ± t_{B−1,(1+L)/2} · SD_b(log ρ*_b)).
//
// lower ÷ higher is the image of that interval [a, b] under
// g(x) = min(x, 1/x), which rises to 1 at x = 1 and falls after: [a, b]
// below 1, [1/b, 1/a] above, [min(a, 1/b), 1] around 1. Both are nil for
// a metric that is not a rate, and when the estimate or a replicate has a
// value of 0 in either group (the logarithm is then undefined).
func normalRatioIntervals(ok [][]MetricDecomposition, m int, md *MetricDecomposition, level float64) (impact, lowerToHigher *Interval) {
	if f, known := metrics.FactOf(md.Metric); !known || !f.Proportion {
		return nil, nil
	}
	if !(md.Reference > 0 && md.Comparison > 0) {
		return nil, nil
	}
	x := make([]float64, len(ok))
	for b, rep := range ok {
		ref, cmp := rep[m].Reference, rep[m].Comparison
		if !(ref > 0 && cmp > 0) {
			return nil, nil
		}
		x[b] = math.Log(cmp / ref)
	}
	lg := NormalInterval(math.Log(md.Comparison/md.Reference), x, level)
	a, b := math.Exp(lg.Low), math.Exp(lg.High)
	impact = &Interval{Low: a, High: b}
	switch {
	case b <= 1:
		lowerToHigher = &Interval{Low: a, High: b}
	case a >= 1:
		lowerToHigher = &Interval{Low: 1 / b, High: 1 / a}
	default:
		lowerToHigher = &Interval{Low: math.Min(a, 1/b), High: 1}
	}
	return impact, lowerToHigher
}
