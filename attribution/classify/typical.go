package classify

import (
	"math"
	"slices"

	"github.com/gapwise/gapwise/internal/rank"
)

// Bounds of a column's typical range (TypicalRange).
const (
	// TypicalLowQuantile and TypicalHighQuantile are the quantiles whose
	// span measures the bulk of a column.
	TypicalLowQuantile  = 0.01
	TypicalHighQuantile = 0.99
	// TypicalFence is how many spans beyond those quantiles a value may
	// lie and still count as typical.
	TypicalFence = 3
	// magnitudeLimit: columns whose largest magnitude exceeds it are
	// rescaled by an exact power of two before standardising, so that
	// squares and sums of squares stay finite.
	magnitudeLimit = 0x1p500
	magnitudeScale = 0x1p-600
)

// TypicalRange returns the bounds [lo, hi] of the typical values of x over
// the rows with positive weight (w nil means all 1):
//
//	span = q₉₉ − q₀₁,   lo = q₀₁ − 3·span,   hi = q₉₉ + 3·span,
//
// with q_p the empirical quantile (the ⌊p·(m−1)⌉-th of the m sorted
// values; no interpolation, found by selection in O(m) rather than by
// sorting). For a Gaussian column the bounds lie about
// 16 standard deviations from the mean, so clean data is never touched;
// a value such as an age of 100000 among adult ages is. The fence follows
// the spirit of Tukey's "far out" values (3 interquartile ranges beyond
// the quartiles; J. W. Tukey (1977), Exploratory Data Analysis, from
// memory), measured on the wider 1–99% span so that rare genuine values
// survive. When the span is 0 (a column that is almost constant, such as a
// rare indicator) or not finite, there are no bounds (−Inf, +Inf).
//
// The logistic learners move values outside [lo, hi] to the nearer bound
// before standardising, in fitting and prediction alike, so that one
// extreme but finite value cannot dominate a fit or make a log-odds
// overflow. An empty x gives (−Inf, +Inf).
func TypicalRange(x, w []float64) (lo, hi float64) {
	v := make([]float64, 0, len(x))
	hasNaN := false
	for i, xi := range x {
		if w == nil || w[i] > 0 {
			v = append(v, xi)
			hasNaN = hasNaN || xi != xi
		}
	}
	if len(v) == 0 {
		return math.Inf(-1), math.Inf(1)
	}
	at := func(p float64) int { return int(math.Round(p * float64(len(v)-1))) }
	klo, khi := at(TypicalLowQuantile), at(TypicalHighQuantile)
	var qlo, qhi float64
	if hasNaN {
		// NaN sorts first (slices.Sort), which rank.SelectKth does not handle.
		slices.Sort(v)
		qlo, qhi = v[klo], v[khi]
	} else {
		// Two selections instead of a sort: the second works on the
		// values at or above q₀₁, which rank.SelectKth left from klo on.
		qlo = rank.SelectKth(v, klo)
		qhi = rank.SelectKth(v[klo:], khi-klo)
	}
	span := qhi - qlo
	if span == 0 || math.IsInf(span, 0) {
		return math.Inf(-1), math.Inf(1)
	}
	// A bound beyond ±MaxFloat64 becomes ±Inf: no bound on that side.
	return qlo - TypicalFence*span, qhi + TypicalFence*span
}

// clampInPlace moves every value of v outside [lo, hi] to the nearer bound.
func clampInPlace(v []float64, lo, hi float64) {
	for i, x := range v {
		v[i] = min(max(x, lo), hi)
	}
}

// magnitudeFactor returns the exact power-of-two factor by which column v
// is multiplied before standardising: 1 unless its largest magnitude
// exceeds magnitudeLimit.
func magnitudeFactor(v []float64) float64 {
	for _, x := range v {
		if math.Abs(x) > magnitudeLimit {
			return magnitudeScale
		}
	}
	return 1
}
