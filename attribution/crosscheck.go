package attribution

import "math"

// EstimatorCheck compares, for one metric, the robust estimate of the
// game with the weighting estimate (EstimatorRobust and EstimatorBoth;
// the weighting estimate is computed either way). Both are consistent
// when the density ratios are right, the robust one also when its
// regressions are, so a difference well beyond sampling error means the
// ratios are wrong (a misfitted classifier), or the regressions fail
// where the weights are poor. Every difference is robust minus weighting,
// with the standard error of that difference from the two estimators'
// joint influence (influenceSEs), whose weighting part holds the
// log-ratios fixed.
type EstimatorCheck struct {
	// Robust[i] and Weighting[i] are the two estimators' φ_i,
	// RobustEstimated and WeightingEstimated their estimated gaps Σφ
	// (with several fold splits, the means over the splits).
	Robust, Weighting                   []float64
	RobustEstimated, WeightingEstimated float64
	// Contributions[i] is Robust[i] − Weighting[i].
	Contributions []Difference
	// Gap is RobustEstimated − WeightingEstimated: as the robust
	// estimated gap is the observed one, minus the weighting estimator's
	// residual.
	Gap Difference
	// MaxZ is the largest |Value|/SE over Gap and Contributions; NaN when
	// no standard error is known (later fold splits, bootstrap
	// replicates).
	MaxZ float64
	se   *InfluenceSE // standard errors of the differences, nil when unknown
}

// newEstimatorCheck compares the robust estimate r of a metric with its
// weighting estimate w; se holds the standard errors of the differences
// (nil when unknown).
func newEstimatorCheck(r, w MetricDecomposition, se *InfluenceSE) *EstimatorCheck {
	c := &EstimatorCheck{Robust: append([]float64(nil), r.Contributions...), Weighting: append([]float64(nil), w.Contributions...),
		RobustEstimated: r.Estimated, WeightingEstimated: w.Estimated, se: se}
	c.fill()
	return c
}

// fill sets the differences and MaxZ.
func (c *EstimatorCheck) fill() {
	gapSE := math.NaN()
	if c.se != nil {
		gapSE = c.se.Estimated
	}
	c.Gap = Difference{c.RobustEstimated - c.WeightingEstimated, gapSE}
	c.Contributions = make([]Difference, len(c.Weighting))
	for i := range c.Contributions {
		se := math.NaN()
		if c.se != nil {
			se = c.se.Contributions[i]
		}
		c.Contributions[i] = Difference{c.Robust[i] - c.Weighting[i], se}
	}
	c.MaxZ = math.NaN()
	for _, d := range append([]Difference{c.Gap}, c.Contributions...) {
		if z := d.z(); !math.IsNaN(z) && !(z <= c.MaxZ) {
			c.MaxZ = z
		}
	}
}

// meanCrossCheck returns the cross-check of the means over the fold
// splits per (nil when a split has none), with split 0's standard errors.
func meanCrossCheck(per []*MetricDecomposition) *EstimatorCheck {
	for _, d := range per {
		if d.CrossCheck == nil {
			return nil
		}
	}
	get := func(f func(*EstimatorCheck) []float64) []float64 {
		return meanOver(per, func(d *MetricDecomposition) []float64 { return f(d.CrossCheck) })
	}
	c := &EstimatorCheck{
		Robust:             get(func(c *EstimatorCheck) []float64 { return c.Robust }),
		Weighting:          get(func(c *EstimatorCheck) []float64 { return c.Weighting }),
		RobustEstimated:    get(func(c *EstimatorCheck) []float64 { return []float64{c.RobustEstimated} })[0],
		WeightingEstimated: get(func(c *EstimatorCheck) []float64 { return []float64{c.WeightingEstimated} })[0],
		se:                 per[0].CrossCheck.se,
	}
	c.fill()
	return c
}
