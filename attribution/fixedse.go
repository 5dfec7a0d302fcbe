package attribution

import "math"

// FixedRatioSE are delta-method standard errors (deltaVariances) with the
// fitted log-ratios held fixed: they count the sampling of the records the
// estimate averages over, not the sampling error of the classifiers that
// gave the ratios, nor the between-split spread. They are a lower
// reference for studies of interval coverage (cmd/gapwise-accuracy
// -coverage), not a valid interval on their own.
//
// The observed gap M_cmp − M_ref averages over independent groups, so
// Var = Var(M̂_ref(∅)) + Var(M̂_cmp(N)), each the variance of one side's
// unweighted end. A contribution of the metric-level combination
// φ = λ·φ_ref + (1−λ)·φ_cmp of two sides estimated on disjoint records has
// Var = λ²·U_ref + (1−λ)²·U_cmp, U_j the variance of side j's Shapley value.
type FixedRatioSE struct {
	Gap           float64
	Contributions []float64 // nil when the Shapley values' variances were not computed
}

// fixedRatioSE returns metric m's FixedRatioSE from both sides' variances
// (vars[0] the reference side's) and the metric-level weight λ; nil when
// the sides' variances are missing (one side, or none computed).
func fixedRatioSE(vars [][]sideVariances, m int, lambda *float64) *FixedRatioSE {
	if len(vars) != 2 || vars[0] == nil || vars[1] == nil {
		return nil
	}
	vr, vc := vars[0][m], vars[1][m]
	out := &FixedRatioSE{Gap: math.Sqrt(vr.empty + vc.full)}
	if lambda != nil && vr.phi != nil && vc.phi != nil {
		l := *lambda
		out.Contributions = make([]float64, len(vr.phi))
		for i := range vr.phi {
			out.Contributions[i] = math.Sqrt(l*l*vr.phi[i] + (1-l)*(1-l)*vc.phi[i])
		}
	}
	return out
}
