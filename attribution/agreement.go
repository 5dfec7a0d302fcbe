package attribution

import "math"

// SideAgreement compares, for one metric, the two one-sided estimates of
// the same game: from the reference records reweighted by Π_{i∈S} r_i and
// from the comparison records reweighted by Π_{i∉S} 1/r_i. When the
// density ratios are right both estimate the same coalition values, so
// every difference below is zero up to sampling noise; a difference many
// standard errors wide means the ratios are wrong (a misfitted or
// degenerate classifier, weights that collapsed) or the graph leaves out
// something that differs between the groups and matters to the metric
// (e.g. a model input missing from the graph). Under SideBoth the
// combined game pins both ends to the observed metrics, so the residual
// stays small whatever the ratios; this comparison is what shows a broken
// estimate.
//
// Every difference is reference side minus comparison side, with the
// standard error of the two sides' independent delta-method variances
// (deltaVariances), which hold the log-ratios fixed: the fitting noise of
// the classifiers is not in it, which is why the warning threshold was
// calibrated on simulated clean draws. Contributions sum to
// AtFull.Value − AtEmpty.Value.
type SideAgreement struct {
	// AtFull is M̂_ref(N) − M_cmp: the reweighted reference records'
	// estimate of the comparison group's metric against its observed value.
	AtFull Difference
	// AtEmpty is M_ref − M̂_cmp(∅): the observed reference metric against
	// the reweighted comparison records' estimate of it.
	AtEmpty Difference
	// Ends is (AtFull + AtEmpty)/2, with the standard error of that
	// average (the two share records, so it is not their SEs combined as
	// if independent). When something that differs between the groups
	// and matters to the metric is missing from the graph, both sides miss
	// its effect e at their far end and AtFull ≈ AtEmpty ≈ −e while the
	// contributions' differences sum to AtFull − AtEmpty ≈ 0; averaging
	// the two ends detects that with less noise than either.
	Ends Difference
	// Contributions[i] is φ̂_ref,i − φ̂_cmp,i, the Shapley values of the two
	// one-sided games; nil when the Shapley values were sampled.
	Contributions []Difference
	// MaxZ is the largest |Value|/SE over AtFull, AtEmpty, Ends and
	// Contributions; NaN when no standard error is known (AUC).
	MaxZ float64
}

// Difference is one difference between the two sides' estimates with its
// standard error (NaN when unknown: AUC, or the Shapley values of a game
// too large for the per-record coalition work, see phiVarianceBudget).
type Difference struct {
	Value, SE float64
}

// z returns |Value|/SE, NaN when SE is unknown, 0 for 0/0.
func (d Difference) z() float64 {
	if d.Value == 0 {
		return 0
	}
	return math.Abs(d.Value) / d.SE
}

// agreement builds metric m's SideAgreement from the per-side coalition
// values vals[j][m][S] (all 2^k coalitions when phi, else only ∅ and N at
// indices 0 and 1) and their variances vars[j][m].
func agreement(vals [][][]float64, vars [][]sideVariances, m, k int, phi bool) *SideAgreement {
	ref, cmp := vals[0][m], vals[1][m]
	vr, vc := vars[0][m], vars[1][m]
	fullAt := 1
	if phi {
		fullAt = 1<<k - 1
	}
	a := &SideAgreement{
		AtFull:  Difference{ref[fullAt] - cmp[fullAt], math.Sqrt(vr.full + vc.full)},
		AtEmpty: Difference{ref[0] - cmp[0], math.Sqrt(vr.empty + vc.empty)},
		Ends:    Difference{(ref[fullAt] + ref[0] - cmp[fullAt] - cmp[0]) / 2, math.Sqrt(vr.mid + vc.mid)},
	}
	if phi {
		pr := ExactShapley(shifted(ref), k)
		pc := ExactShapley(shifted(cmp), k)
		a.Contributions = make([]Difference, k)
		for i := range a.Contributions {
			se := math.NaN()
			if vr.phi != nil && vc.phi != nil {
				se = math.Sqrt(vr.phi[i] + vc.phi[i])
			}
			a.Contributions[i] = Difference{pr[i] - pc[i], se}
		}
	}
	a.MaxZ = math.NaN()
	for _, d := range append([]Difference{a.AtFull, a.AtEmpty, a.Ends}, a.Contributions...) {
		if z := d.z(); !math.IsNaN(z) && !(z <= a.MaxZ) {
			a.MaxZ = z
		}
	}
	return a
}

// shifted returns v(S) = vals[S] − vals[∅].
func shifted(vals []float64) []float64 {
	v := make([]float64, len(vals))
	for S := range vals {
		v[S] = vals[S] - vals[0]
	}
	return v
}

// residualSE returns the delta-method standard error of metric m's
// residual under SideBoth. The observed gap is M_cmp(N) − M_ref(∅), so for
// a combination whose ends are M̂(N) = a·M̂_ref(N) + (1−a)·M_cmp and
// M̂(∅) = (1−b)·M_ref + b·M̂_cmp(∅),
//
//	Residual = −a·D_N − b·D_∅,  D_N = M̂_ref(N) − M_cmp,  D_∅ = M_ref − M̂_cmp(∅),
//
// with a = λ, b = 1 − λ for a metric-level weight λ and, per coalition,
// a = n_eff,ref(N)/(n_eff,ref(N) + n_eff,cmp(N)) and b = n_eff,cmp(∅)/
// (n_eff,ref(∅) + n_eff,cmp(∅)). Each side contributes the variance of
// a·M̂_j(N) + b·M̂_j(∅) (the sides are independent): a²V(N) + b²V(∅) +
// 2ab·C, the covariance C = 2·V((M̂(N) + M̂(∅))/2) − (V(N) + V(∅))/2 from
// sideVariances. nil for MixMechanism, whose contributions are not one
// game's, and when a variance is unknown (AUC).
func residualSE(md MetricDecomposition, sides []*sideEstimate, vars [][]sideVariances, m int, mix Mix) *float64 {
	var a, b float64
	switch {
	case mix == MixMechanism:
		return nil
	case md.ReferenceWeight != nil:
		a, b = *md.ReferenceWeight, 1-*md.ReferenceWeight
	default:
		full := uint64(1)<<len(sides[0].logr) - 1
		wr, wc := sides[0].someWeights([]uint64{0, full}), sides[1].someWeights([]uint64{0, full})
		a = wr[1].ESS / (wr[1].ESS + wc[1].ESS)
		b = wc[0].ESS / (wr[0].ESS + wc[0].ESS)
	}
	var v float64
	for j := range sides {
		x := vars[j][m]
		c := 2*x.mid - (x.full+x.empty)/2
		v += a*a*x.full + b*b*x.empty + 2*a*b*c
	}
	if math.IsNaN(v) {
		return nil
	}
	se := math.Sqrt(math.Max(v, 0))
	return &se
}
