package compare

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

func TestChangeCI(t *testing.T) {
	iv := func(lo, hi float64) *fairness.Interval { return &fairness.Interval{Low: lo, High: hi} }
	tests := []struct {
		name     string
		method   string
		b, a     float64
		bi, ai   *fairness.Interval
		low, hig float64
	}{
		// Bonferroni: [a₋ − b₊, a₊ − b₋], worked by hand.
		{"bonferroni", MethodBonferroni, 0.10, 0.15, iv(0.08, 0.13), iv(0.12, 0.17), 0.12 - 0.13, 0.17 - 0.08},
		// MOVER with symmetric intervals of half-widths 3 and 4 gives
		// d ± 5 (Zou and Donner 2008: it reduces to the Wald interval
		// of a difference of independent estimates).
		{"independent symmetric", MethodIndependent, 1, 2, iv(-2, 4), iv(-2, 6), 1 - 5, 1 + 5},
		// Asymmetric: low uses a − a₋ = 1 and b₊ − b = 2, high uses
		// a₊ − a = 3 and b − b₋ = 4 (3-4-5 triangle).
		{"independent asymmetric", MethodIndependent, 0, 0, iv(-4, 2), iv(-1, 3), -math.Sqrt(5), 5},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := changeCI(tc.method, tc.b, tc.a, tc.bi, tc.ai)
			if math.Abs(got.Low-tc.low) > 1e-12 || math.Abs(got.High-tc.hig) > 1e-12 {
				t.Errorf("got [%v, %v], want [%v, %v]", got.Low, got.High, tc.low, tc.hig)
			}
		})
	}
	if changeCI(MethodBonferroni, 0, 0, nil, iv(0, 1)) != nil {
		t.Error("an interval without the earlier run's one")
	}
}

// TestBonferroniCoverage simulates two strongly dependent estimators (the
// same cohort: correlation −0.9, the worst case for a difference), each
// with an exact 95% normal interval, and checks that the Bonferroni
// change interval covers the true change at least 90% of the time (the
// guarantee 2·0.95 − 1), while the independent (MOVER) one falls short
// of 95%, which is why it is only for disjoint cohorts. Normal quantile
// 1.959964 from memory.
func TestBonferroniCoverage(t *testing.T) {
	const reps, z, rho = 20000, 1.959964, -0.9
	rng := rand.New(rand.NewPCG(1, 2))
	var bonf, mover int
	for range reps {
		u, v := rng.NormFloat64(), rng.NormFloat64()
		eb, ea := u, rho*u+math.Sqrt(1-rho*rho)*v // true values 0, estimates with unit SE
		bi, ai := &fairness.Interval{Low: eb - z, High: eb + z}, &fairness.Interval{Low: ea - z, High: ea + z}
		if c := changeCI(MethodBonferroni, eb, ea, bi, ai); c.Low <= 0 && c.High >= 0 {
			bonf++
		}
		if c := changeCI(MethodIndependent, eb, ea, bi, ai); c.Low <= 0 && c.High >= 0 {
			mover++
		}
	}
	pb, pm := float64(bonf)/reps, float64(mover)/reps
	if pb < 0.90 {
		t.Errorf("Bonferroni coverage %.4f, guaranteed at least 0.90", pb)
	}
	// Var(a − b) = 2 − 2ρ = 3.8 against the 2 MOVER assumes: its coverage
	// is P(|N| ≤ 1.96·√(2/3.8)) ≈ 0.845.
	if math.Abs(pm-0.845) > 0.01 {
		t.Errorf("independent coverage %.4f under correlation −0.9, want about 0.845", pm)
	}
}
