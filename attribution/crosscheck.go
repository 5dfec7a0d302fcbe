package attribution

import "math"

// EstimatorCheck compares, for one metric, the robust estimate with the
// weighting estimate of the same game (EstimatorBoth). Both are
// consistent when the density ratios are right; the robust one also when
// its regressions are, so a difference well beyond sampling error means
// the ratios are wrong (a misfitted classifier) or the regressions fail
// where the weights are poor. Every difference is robust minus weighting,
// with the standard error of that difference from the two estimators'
// joint influence (influenceSEs), the weighting part holding the
// log-ratios fixed.
type EstimatorCheck struct {
	// Weighting[i] is the weighting estimator's φ_i, WeightingEstimated
	// its estimated gap Σφ (with several fold splits, their means).
	Weighting          []float64
	WeightingEstimated float64
	// Contributions[i] is the robust φ_i minus Weighting[i].
	Contributions []Difference
	// Gap is the robust estimated gap (the observed gap) minus
	// WeightingEstimated: the weighting estimator's residual.
	Gap Difference
	// MaxZ is the largest |Value|/SE over Gap and Contributions; NaN when
	// no standard error is known.
	MaxZ float64
}

// newEstimatorCheck compares the robust md with the weighting w of the
// same metric; standard errors come from md.crossSE (NaN when unset:
// later fold splits, replicates).
func newEstimatorCheck(md, w MetricDecomposition) *EstimatorCheck {
	c := &EstimatorCheck{Weighting: append([]float64(nil), w.Contributions...), WeightingEstimated: w.Estimated}
	c.fill(md)
	return c
}

// fill sets the differences and MaxZ from the robust md.
func (c *EstimatorCheck) fill(md MetricDecomposition) {
	se := md.crossSE
	at := func(x []float64, i int) float64 {
		if se == nil || x == nil {
			return math.NaN()
		}
		return x[i]
	}
	gapSE := math.NaN()
	if se != nil {
		gapSE = se.Estimated
	}
	c.Gap = Difference{md.Estimated - c.WeightingEstimated, gapSE}
	c.Contributions = make([]Difference, len(c.Weighting))
	for i := range c.Contributions {
		var x []float64
		if se != nil {
			x = se.Contributions
		}
		c.Contributions[i] = Difference{md.Contributions[i] - c.Weighting[i], at(x, i)}
	}
	c.MaxZ = math.NaN()
	for _, d := range append([]Difference{c.Gap}, c.Contributions...) {
		if z := d.z(); !math.IsNaN(z) && !(z <= c.MaxZ) {
			c.MaxZ = z
		}
	}
}

// meanCrossCheck returns the cross-check of the split-averaged robust
// estimate agg against the split-averaged weighting estimate (nil when the
// splits have none), with split 0's standard errors.
func meanCrossCheck(per []*MetricDecomposition, agg MetricDecomposition) *EstimatorCheck {
	for _, d := range per {
		if d.CrossCheck == nil {
			return nil
		}
	}
	c := &EstimatorCheck{
		Weighting:          meanOver(per, func(d *MetricDecomposition) []float64 { return d.CrossCheck.Weighting }),
		WeightingEstimated: meanOver(per, func(d *MetricDecomposition) []float64 { return []float64{d.CrossCheck.WeightingEstimated} })[0],
	}
	c.fill(agg)
	return c
}
