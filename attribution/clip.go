package attribution

import (
	"fmt"
	"math"
	"sort"
)

// ClipAtQuantiles bounds log-ratios to their central interval of
// probability q: every value below the (1−q)/2 quantile of logr is raised to
// it and every value above the (1+q)/2 quantile lowered to it (quantiles by
// linear interpolation between order statistics, Hyndman & Fan 1996,
// definition 7). It returns the clipped copy and the number of values
// changed.
//
// Both tails are clipped on purpose: the reference side's weights r grow in
// the upper tail of log r, the comparison side's weights 1/r in the lower
// one, so one rule serves both estimates (see Side). Clipping trades
// variance for bias towards "no shift"; the count is reported so that a
// reader can judge how much was changed.
//
// q must be in (0, 1); it returns an error otherwise. NaN values are
// returned unchanged and not counted (the engine rejects them later).
func ClipAtQuantiles(logr []float64, q float64) ([]float64, int, error) {
	if !(q > 0 && q < 1) {
		return nil, 0, fmt.Errorf("attribution: clipping quantile %v is not in (0, 1)", q)
	}
	out := append([]float64(nil), logr...)
	sorted := make([]float64, 0, len(logr))
	for _, x := range logr {
		if !math.IsNaN(x) {
			sorted = append(sorted, x)
		}
	}
	if len(sorted) == 0 {
		return out, 0, nil
	}
	sort.Float64s(sorted)
	lo, hi := quantile(sorted, (1-q)/2), quantile(sorted, (1+q)/2)
	n := 0
	for r, x := range out {
		switch {
		case x < lo:
			out[r], n = lo, n+1
		case x > hi:
			out[r], n = hi, n+1
		}
	}
	return out, n, nil
}
