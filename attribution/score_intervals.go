package attribution

import (
	"math"

	"github.com/gapwise/gapwise/metrics"
	"gonum.org/v1/gonum/stat/distuv"
)

// WilsonInterval returns the Wilson score interval of level L for a
// binomial proportion with x events out of n records (Wilson 1927,
// "Probable inference, the law of succession, and statistical inference",
// JASA 22:209–212), z the normal (1+L)/2 quantile:
//
//	(x + z²/2)/(n + z²) ± z/(n + z²) · √(x(n − x)/n + z²/4).
//
// It stays within [0, 1] and keeps its level with few events, where the
// Wald interval x/n ± z·√(p(1−p)/n), which a normal bootstrap interval
// approximates, is too narrow. It panics if n ≤ 0.
func WilsonInterval(x, n, level float64) Interval {
	if !(n > 0) {
		panic("attribution: WilsonInterval needs n > 0")
	}
	z := distuv.UnitNormal.Quantile((1 + level) / 2)
	c := (x + z*z/2) / (n + z*z)
	h := z / (n + z*z) * math.Sqrt(x*(n-x)/n+z*z/4)
	return Interval{Low: c - h, High: c + h}
}

// NewcombeInterval returns Newcombe's hybrid score interval of level L
// for the difference p1 − p2 of two independent proportions x1/n1 and
// x2/n2 (Newcombe 1998, "Interval estimation for the difference between
// independent proportions: comparison of eleven methods", Statistics in
// Medicine 17:873–890, method 10), from the Wilson intervals (l_i, u_i):
//
//	p1 − p2 − √((p1 − l1)² + (u2 − p2)²),   p1 − p2 + √((u1 − p1)² + (p2 − l2)²).
//
// It panics if n1 or n2 ≤ 0.
func NewcombeInterval(x1, n1, x2, n2, level float64) Interval {
	a, b := WilsonInterval(x1, n1, level), WilsonInterval(x2, n2, level)
	p1, p2 := x1/n1, x2/n2
	d := p1 - p2
	return Interval{Low: d - math.Hypot(p1-a.Low, b.High-p2), High: d + math.Hypot(a.High-p1, p2-b.Low)}
}

// scoreIntervals sets, for a rate (metrics.Fact.Proportion), the
// intervals of its observed values from their counts in the sample's
// groups g at threshold: Wilson intervals for the two groups' values and
// Newcombe's for their gap, comparison minus reference. It reports
// whether it did (false for other metrics). The normal form uses them
// for the observed values of rates: in the coverage study (README,
// Accuracy) the normal bootstrap interval of a false-negative-rate gap
// resting on a few false negatives held the truth in 0.907 of 4,000
// draws at 200 records per group of a rare disease and 0.934 at 400,
// the score interval in 0.961 and 0.951.
func scoreIntervals(md *MetricDecomposition, g groupSplit, threshold, level float64) bool {
	ref, cmp, gap, ok := rateScoreIntervals(md.Metric, g, threshold, level)
	if ok {
		md.ReferenceCI, md.ComparisonCI, md.GapCI = &ref, &cmp, &gap
	}
	return ok
}

// RateScoreIntervals returns the score intervals the normal form gives a
// rate's observed values on the Sample's two groups (see scoreIntervals):
// Wilson intervals of the reference and comparison values and Newcombe's
// interval of their gap; ok is false for a metric that is not a rate or
// a group without the records it counts.
func RateScoreIntervals(s *Sample, metric string, threshold, level float64) (ref, cmp, gap Interval, ok bool) {
	if f, known := metrics.FactOf(metric); !known || !f.Proportion {
		return ref, cmp, gap, false
	}
	s.mustAlign()
	return rateScoreIntervals(metric, splitGroups(s), threshold, level)
}

func rateScoreIntervals(metric string, g groupSplit, threshold, level float64) (ref, cmp, gap Interval, ok bool) {
	if f, known := metrics.FactOf(metric); !known || !f.Proportion {
		return ref, cmp, gap, false
	}
	xr, nr, ok1 := metrics.ConfusionAt(g.refY, g.refS, threshold, nil).RateCounts(metric)
	xc, nc, ok2 := metrics.ConfusionAt(g.cmpY, g.cmpS, threshold, nil).RateCounts(metric)
	if !ok1 || !ok2 || !(nr > 0 && nc > 0) {
		return ref, cmp, gap, false
	}
	return WilsonInterval(xr, nr, level), WilsonInterval(xc, nc, level), NewcombeInterval(xc, nc, xr, nr, level), true
}
