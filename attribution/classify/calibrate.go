package classify

import (
	"errors"
	"fmt"
	"math"
)

// plattFit fits the two-parameter logistic recalibration
//
//	P(y = 1 | s) = σ(a·s + b)
//
// of scores s (here: log-odds) to 0/1 targets y with weights w by maximum
// likelihood (Platt 1999, "Probabilistic outputs for support vector machines
// and comparisons to regularized likelihood methods"). The weighted log loss
// is convex in (a, b); it is minimised by Newton's method with step halving,
// starting from the identity map (a, b) = (1, 0). It returns an error when
// the 2×2 Hessian is singular (e.g. all scores equal) or the iteration does
// not converge.
func plattFit(s, y, w []float64) (a, b float64, err error) {
	if len(s) != len(y) || len(s) != len(w) {
		panic("classify: plattFit: mismatched lengths")
	}
	loss := func(a, b float64) float64 {
		var sum float64
		for i, si := range s {
			z := a*si + b
			sum += w[i] * (math.Max(z, 0) + math.Log1p(math.Exp(-math.Abs(z))) - y[i]*z)
		}
		return sum
	}
	a, b = 1, 0
	cur := loss(a, b)
	for iter := 0; iter < 100; iter++ {
		// Gradient and Hessian of Σ w·ℓ(y, a·s + b) with respect to (a, b).
		var ga, gb, haa, hab, hbb float64
		for i, si := range s {
			p := 1 / (1 + math.Exp(-(a*si + b)))
			r := w[i] * (p - y[i])
			q := w[i] * p * (1 - p)
			ga += r * si
			gb += r
			haa += q * si * si
			hab += q * si
			hbb += q
		}
		det := haa*hbb - hab*hab
		if !(det > 1e-12*haa*hbb) {
			return 0, 0, errors.New("platt scaling: scores carry no spread (singular Hessian)")
		}
		da := (hbb*ga - hab*gb) / det
		db := (haa*gb - hab*ga) / det
		step := 1.0
		for {
			na, nb := a-step*da, b-step*db
			if l := loss(na, nb); l <= cur {
				converged := cur-l <= 1e-12*math.Max(1, math.Abs(cur))
				a, b, cur = na, nb, l
				if converged {
					return a, b, nil
				}
				break
			}
			step /= 2
			if step < 1e-10 {
				return a, b, nil // no further decrease in floating point
			}
		}
	}
	return 0, 0, fmt.Errorf("platt scaling: no convergence after 100 Newton steps (a=%g, b=%g)", a, b)
}
