package attribution

import (
	"fmt"
	"math"
)

// Mix says how SideBoth combines the game estimated from the reference
// records, v_ref(S) = M̂_ref(S) − M̂_ref(∅), with the one estimated from the
// comparison records, v_cmp(S) = M̂_cmp(S) − M̂_cmp(∅).
//
//   - MixCoalition: per coalition S, M̂(S) = Σ_j n_eff,j(S)·M̂_j(S) / Σ_j
//     n_eff,j(S), n_eff of each side's weights for S over all its records
//     (Kish 1965). Each coalition leans on the side whose weights are
//     better there, but the game is then a patchwork of two estimators: a
//     mechanism's marginal contributions compare coalitions estimated
//     mostly from different records, so the misfit of one side can land on
//     a mechanism neither side credits. Both ends are pinned to the
//     observed metrics (n_eff = n where the weights are all 1), which keeps
//     the residual near zero by construction.
//   - MixMetricESS: one weight λ per metric, v = λ·v_ref + (1−λ)·v_cmp with
//     λ = n_eff,ref(N) / (n_eff,ref(N) + n_eff,cmp(∅)), each n_eff that of
//     the side's far hybrid over the records the metric counts. The game is
//     a convex combination of two consistent games, so φ = λ·φ_ref +
//     (1−λ)·φ_cmp (Shapley values are linear) and a mechanism both sides
//     credit with 0 gets 0.
//   - MixMetricVariance: one weight per metric, λ = V_cmp / (V_ref + V_cmp):
//     the inverse-variance combination of the two sides' estimated gaps
//     v_j(N). V_j is the larger of the delta-method variance of v_j(N)
//     (deltaVariances) and Kish's design-effect approximation of the far
//     end's variance, V_j(own end)·m_j / n_eff,j(far), m_j the records of
//     side j the metric counts and n_eff,j(far) that of the far hybrid's
//     weights over them (Kish 1965, "Survey Sampling"). The delta method
//     alone understates the variance when the weights collapse onto a few
//     records (one dominant record makes its own influence vanish); the
//     Kish term keeps a collapsed side from being trusted. Falls back to
//     MixMetricESS's λ when a variance is unknown.
//   - MixPick: per metric, the side with the smaller V_j (λ ∈ {0, 1};
//     MixMetricESS's λ rounded when a variance is unknown).
//   - MixMechanism: per mechanism, φ_i = λ_i·φ_ref,i + (1−λ_i)·φ_cmp,i with
//     λ_i = U_cmp,i / (U_ref,i + U_cmp,i), U_j,i the delta-method variance
//     of side j's Shapley value φ̂_j,i: each contribution is the
//     inverse-variance combination of two estimates of the same φ_i. The
//     what-if values (v({i}), v(N∖{i})) come from MixMetricVariance's game
//     and the estimated gap is Σφ_i. Where the Shapley values' variances
//     are not computed (sampled Shapley values, or n·2^k above
//     phiVarianceBudget) it is MixMetricVariance.
//   - MixGuarded: per metric, MixCoalition while the two sides agree
//     (SideAgreement.MaxZ ≤ GuardZ), MixMetricVariance once they disagree
//     beyond sampling noise, when the per-coalition patchwork would move
//     the misfit of one side onto other mechanisms. Above the exact limit
//     (sampled Shapley values) it is MixMetricVariance.
//
// With a metric-level λ the residual is λ·(M_cmp − M̂_ref(N)) +
// (1−λ)·(M̂_cmp(∅) − M_ref): the far-end errors of the two sides, no longer
// pinned to zero.
type Mix int

// Mixes. The zero value means DefaultMix.
const (
	MixDefault Mix = iota
	MixCoalition
	MixMetricESS
	MixMetricVariance
	MixPick
	MixMechanism
	MixGuarded
)

// GuardZ is the disagreement between the sides, in standard errors, above
// which MixGuarded leaves the per-coalition combination; it is the
// threshold of the sides_disagree warning (fairness.WarnSidesZ).
const GuardZ = 4.0

// DefaultMix is the combination used when Options.Mix is MixDefault. The
// accuracy study against simulated ground truth decided it:
//
//	go run ./cmd/gapwise-accuracy -sides -learners expanded,linear -reps 3 -sizes 2000,10000
//
// pooled over the six synthetic screening cases, four metrics and 3
// replicates, max / mean |φ̂ − φ| / null-mechanism error (largest |φ̂| of a
// mechanism whose true contribution is 0) at 2,000 and 10,000 records per
// group, with the expanded learner (ratios about right) and the linear
// one (misspecified where the log ratio has an interaction or a square):
//
//	                 expanded, 2,000        expanded, 10,000       linear, 2,000          linear, 10,000
//	coalition        0.0290/0.0043/0.0270   0.0118/0.0018/0.0102   0.1865/0.0082/0.0877   0.1702/0.0071/0.0845
//	metric-ess       0.0406/0.0047/0.0406   0.0175/0.0020/0.0175   0.1866/0.0071/0.0435   0.1720/0.0055/0.0215
//	metric-variance  0.0407/0.0046/0.0407   0.0171/0.0020/0.0171   0.1874/0.0071/0.0434   0.1723/0.0055/0.0220
//	mechanism        0.0413/0.0044/0.0413   0.0148/0.0019/0.0148   0.1875/0.0071/0.0428   0.1719/0.0055/0.0191
//	guarded          0.0290/0.0043/0.0270   0.0118/0.0018/0.0102   0.1874/0.0076/0.0670   0.1723/0.0056/0.0220
//
// At 50,000 records (-sizes 50000 -reps 2) coalition and metric-variance
// gave 0.0146/0.0008/0.0062 and 0.0153/0.0009/0.0052 with the expanded
// learner, 0.1619/0.0066/0.0772 and 0.1644/0.0050/0.0086 with the linear
// one: the patchwork's misfit does not shrink with n.
//
// Per coalition is the most accurate when the ratios are right, but with
// the misspecified learner it credits the unread covariate with up to
// 0.085 of a gap; the consistent combinations keep that at 0.02–0.04.
// Summed over the four columns, max + mean + null: guarded 0.546,
// mechanism 0.552, metric-ess 0.559, metric-variance 0.560, pick 0.603,
// coalition 0.628 (reference alone 0.658, comparison alone 0.694).
// Guarded is not a consistent game while the sides agree (its null error
// 0.067 at 2,000 is the patchwork's, below the guard), and mechanism,
// like a variance without the Kish floor, trusts a side whose weights
// collapsed onto one record (one extreme value moved a contribution by
// 0.079 in fairness's TestOneExtremeValue); metric-variance is within the
// replicate noise of the best consistent rule and robust to that.
const DefaultMix = MixMetricVariance

// Mixes lists the combinations, for studies.
func Mixes() []Mix {
	return []Mix{MixCoalition, MixMetricESS, MixMetricVariance, MixPick, MixMechanism, MixGuarded}
}

// String returns "coalition", "metric-ess", "metric-variance", "pick",
// "mechanism" or "default".
func (x Mix) String() string {
	switch x {
	case MixDefault:
		return "default"
	case MixCoalition:
		return "coalition"
	case MixMetricESS:
		return "metric-ess"
	case MixMetricVariance:
		return "metric-variance"
	case MixPick:
		return "pick"
	case MixMechanism:
		return "mechanism"
	case MixGuarded:
		return "guarded"
	}
	return fmt.Sprintf("Mix(%d)", int(x))
}

// ParseMix turns a name of String into a Mix.
func ParseMix(name string) (Mix, error) {
	for _, x := range Mixes() {
		if x.String() == name {
			return x, nil
		}
	}
	return MixDefault, fmt.Errorf("attribution: unknown mix %q (want coalition, metric-ess, metric-variance, pick, mechanism or guarded)", name)
}

func (x Mix) resolve() Mix {
	if x == MixDefault {
		return DefaultMix
	}
	return x
}

// needsVariance reports whether the rule reads the delta-method variances.
func (x Mix) needsVariance() bool {
	return x == MixMetricVariance || x == MixPick || x == MixMechanism || x == MixGuarded
}

// mixWeights returns λ_m, the weight of the reference side's game of each
// metric under a metric-level rule (see Mix); vars[j][m] are side j's
// variances (nil unless the rule needs them).
func mixWeights(rule Mix, sides []*sideEstimate, names []string, vars [][]sideVariances, opt Options) []float64 {
	lambda := make([]float64, len(names))
	for m, name := range names {
		essRef, countRef := farMetricESS(sides[0], name, opt)
		essCmp, countCmp := farMetricESS(sides[1], name, opt)
		byESS := essRef / (essRef + essCmp)
		if math.IsNaN(byESS) {
			byESS = 0.5
		}
		lambda[m] = byESS
		if !rule.needsVariance() {
			continue
		}
		// The reference side's own (unweighted) end is ∅, the comparison
		// side's is N.
		vr := math.Max(vars[0][m].gap, vars[0][m].empty*countRef/essRef)
		vc := math.Max(vars[1][m].gap, vars[1][m].full*countCmp/essCmp)
		known := !math.IsNaN(vr) && !math.IsNaN(vc) && vr+vc > 0
		switch {
		case (rule == MixMetricVariance || rule == MixMechanism || rule == MixGuarded) && known:
			lambda[m] = vc / (vr + vc)
		case rule == MixPick && known:
			lambda[m] = pick01(vr <= vc)
		case rule == MixPick:
			lambda[m] = pick01(byESS >= 0.5)
		}
	}
	return lambda
}

func pick01(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// combineByLambda returns λ_m·vals[0][m][c] + (1−λ_m)·vals[1][m][c].
func combineByLambda(vals [][][]float64, lambda []float64) [][]float64 {
	out := make([][]float64, len(vals[0]))
	for m := range out {
		l := lambda[m]
		out[m] = make([]float64, len(vals[0][m]))
		for c := range out[m] {
			switch l {
			case 1:
				out[m][c] = vals[0][m][c]
			case 0:
				out[m][c] = vals[1][m][c]
			default:
				out[m][c] = l*vals[0][m][c] + (1-l)*vals[1][m][c]
			}
		}
	}
	return out
}

// mechanismShapley returns, for MixMechanism, per mechanism the
// inverse-variance combination of the two sides' Shapley values of one
// metric (games vRef, vCmp over all 2^k coalitions, variances vr, vc);
// ok is false when a Shapley value's variance is unknown.
func mechanismShapley(vRef, vCmp []float64, vr, vc sideVariances, k int) (phi []float64, ok bool) {
	if vr.phi == nil || vc.phi == nil {
		return nil, false
	}
	pr, pc := ExactShapley(shifted(vRef), k), ExactShapley(shifted(vCmp), k)
	phi = make([]float64, k)
	for i := range phi {
		a, b := vr.phi[i], vc.phi[i]
		if math.IsNaN(a) || math.IsNaN(b) {
			return nil, false
		}
		l := 0.5
		if a+b > 0 {
			l = b / (a + b)
		}
		phi[i] = l*pr[i] + (1-l)*pc[i]
	}
	return phi, true
}
