package scm

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"
)

// screeningRates returns FNR and FPR of the Screening model under the
// hybrid coalition s of shift sh, by numerical integration independent of
// the simulator: given disease D and age a, the score's logit is Gaussian,
//
//	L | D, a ~ N(−2 + 1.2·(1.5D + 0.3a + κD) + 0.9·1.2D + 0.3a, 1.44 + 0.81τ²),
//
// so P(flag | D, a) = P(L ≥ 0) = Φ(mean/sd); the disease probability
// σ(−1.5 + 0.5a + site effect + δ) is summed over sites and integrated over
// age ~ N(μ, 1) with gonum's Gauss–Legendre quadrature.
func screeningRates(sh Shift, s Coalition) (fnr, fpr float64) {
	pick := func(node int, ref, cmp float64) float64 {
		if s.Has(node) {
			return cmp
		}
		return ref
	}
	spread := sh.Spread
	if spread == 0 {
		spread = 1
	}
	mu := pick(NodeAge, 0, sh.Age)
	delta := pick(NodeDisease, 0, sh.Prevalence)
	kappa := pick(NodeMarkerA, 0, sh.DiseasedMarker)
	tau := pick(NodeMarkerB, 1, spread)
	pi := []float64{0.5, 0.3, 0.2}
	if s.Has(NodeSite) && sh.Site {
		pi = []float64{0.3, 0.3, 0.4}
	}
	siteEffect := []float64{0, 0.4, 0.8}
	sd := math.Sqrt(1.44 + 0.81*tau*tau)
	norm := distuv.UnitNormal
	// joint returns the density-weighted P(D=d, flag=f) integrand at age a.
	joint := func(d, flag int) func(float64) float64 {
		return func(a float64) float64 {
			m := -2 + 1.2*(1.5*float64(d)+0.3*a+kappa*float64(d)) + 0.9*1.2*float64(d) + 0.3*a
			pf := norm.CDF(m / sd)
			if flag == 0 {
				pf = 1 - pf
			}
			var sum float64
			for k, p := range pi {
				pd := 1 / (1 + math.Exp(-(-1.5 + 0.5*a + siteEffect[k] + delta)))
				if d == 0 {
					pd = 1 - pd
				}
				sum += p * pd
			}
			return norm.Prob(a-mu) * sum * pf
		}
	}
	integral := func(f func(float64) float64) float64 { return quad.Fixed(f, mu-12, mu+12, 400, nil, 0) }
	tp, fn := integral(joint(1, 1)), integral(joint(1, 0))
	fp, tn := integral(joint(0, 1)), integral(joint(0, 0))
	return fn / (tp + fn), fp / (fp + tn)
}
