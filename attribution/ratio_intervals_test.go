package attribution

import (
	"math"
	"testing"
)

// TestRatioIntervals: on replicates whose values are given, the intervals
// are the percentile intervals of the ratios computed by hand (quantile's
// linear interpolation between order statistics); a replicate with a
// reference value of 0 removes the impact ratio's interval, one with both
// values 0 also lower ÷ higher's; a metric that is not a rate has none.
func TestRatioIntervals(t *testing.T) {
	reps := func(pairs ...[2]float64) [][]MetricDecomposition {
		var out [][]MetricDecomposition
		for _, p := range pairs {
			out = append(out, []MetricDecomposition{{Reference: p[0], Comparison: p[1]}})
		}
		return out
	}
	// Ratios cmp/ref: 0.5, 1, 2; lower/higher: 0.5, 1, 0.5.
	r := reps([2]float64{0.4, 0.2}, [2]float64{0.3, 0.3}, [2]float64{0.1, 0.2})
	imp, lh := ratioIntervals(r, 0, "fnr", 0.25, 0.75)
	// Sorted 0.5, 1, 2: the 0.25 quantile is at h = 0.5, 0.75; the 0.75 at h = 1.5, 1.5.
	if imp == nil || math.Abs(imp.Low-0.75) > 1e-12 || math.Abs(imp.High-1.5) > 1e-12 {
		t.Errorf("impact %+v, want [0.75, 1.5]", imp)
	}
	// Sorted 0.5, 0.5, 1: 0.25 → 0.5, 0.75 → 0.75.
	if lh == nil || math.Abs(lh.Low-0.5) > 1e-12 || math.Abs(lh.High-0.75) > 1e-12 {
		t.Errorf("lower/higher %+v, want [0.5, 0.75]", lh)
	}
	imp, lh = ratioIntervals(reps([2]float64{0, 0.2}, [2]float64{0.3, 0.3}), 0, "fnr", 0.025, 0.975)
	if imp != nil || lh == nil || math.Abs(lh.Low-0.025) > 1e-12 { // lower/higher 0 and 1
		t.Errorf("zero reference: impact %+v, lower/higher %+v", imp, lh)
	}
	imp, lh = ratioIntervals(reps([2]float64{0, 0}, [2]float64{0.3, 0.3}), 0, "fnr", 0.025, 0.975)
	if imp != nil || lh != nil {
		t.Errorf("both zero: %+v %+v", imp, lh)
	}
	if imp, lh = ratioIntervals(r, 0, "brier", 0.025, 0.975); imp != nil || lh != nil {
		t.Errorf("brier: %+v %+v", imp, lh)
	}
}
