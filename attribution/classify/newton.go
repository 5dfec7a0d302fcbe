package classify

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// newtonMinimise minimises the penalised logistic objective from theta0
// by Newton's method until ‖∇L‖_∞ < gtol, and returns the minimiser and
// the number of Newton steps taken.
//
// Each step solves (∇²L) Δ = −∇L by Cholesky (adding τI, τ growing
// fivefold, when the Hessian is not numerically positive definite; Nocedal
// & Wright 2006, "Numerical Optimization", Algorithm 3.3) and searches
// along Δ on the directional derivative φ'(t) = ∇L(θ + tΔ)·Δ alone, so
// that L itself, and with it a logarithm per row, is never computed. With
// a = −φ'(0) > 0, a step t is accepted when
//
//   - φ'(t) ∈ [−0.9a, 0]: φ is convex, so φ' ≤ φ'(t) ≤ 0 on [0, t] and L
//     decreased, by at least 0.1·a·t (the curvature condition of the
//     strong Wolfe conditions holds too); or
//   - 0 < φ'(t) ≤ a/2 and t·M ≤ 1, where M = max_i |Δη_i| is how far the
//     full step moves any row's log-odds η_i = z_iᵀθ. Each row's curvature
//     h_i = w_i p_i(1 − p_i) satisfies |dh_i/dη_i| ≤ h_i, so along such a
//     step φ” changes by at most a factor e^{±s}, s ≤ 1, and
//     φ(t) − φ(0) ≤ t(−0.418·a + 0.582·φ'(t)) ≤ −0.127·a·t: a sufficient
//     decrease without evaluating L (the bound is the worst case
//     φ” ∝ e^{−s}: ∫₀¹(1−s)e^{−s}ds / ∫₀¹e^{−s}ds = 0.582).
//
// The full step t = 1 is tried first (in Newton's region it is accepted
// every time); otherwise the root of φ' is bracketed and approached by
// regula falsi with the Illinois modification (Dowell & Jarratt 1971,
// cited from memory) until a t is accepted. Both rules give a decrease
// proportional to the Newton decrement a, so the iteration converges for
// this strictly convex objective (λ > 0, or both classes present with a
// full-rank design) like damped Newton with an Armijo search, at one
// exponential per row per evaluation. Near the optimum rounding noise in
// φ' may keep every trial from being accepted; the point reached is then
// kept when ‖∇L‖_∞ < gtol·logisticGradFloor/logisticGradTol, as for the
// iteration limit.
func newtonMinimise(obj *logisticObjective, theta0 []float64, gtol float64) ([]float64, int, error) {
	d := obj.z.d
	theta := append([]float64(nil), theta0...)
	g := make([]float64, d)
	gt := make([]float64, d)
	step := make([]float64, d)
	trial := make([]float64, d)
	hess := mat.NewSymDense(d, nil)
	floor := gtol * logisticGradFloor / logisticGradTol
	evals := 0
	obj.Grad(g, theta)
	evals++
	iters := 0
	for ; ; iters++ {
		gmax := floats.Norm(g, math.Inf(1))
		if gmax < gtol {
			return theta, iters, nil
		}
		if iters == logisticMaxIter || evals >= logisticMaxEvals || math.IsNaN(gmax) {
			return finishNewton(theta, gmax, floor, iters, "iteration limit")
		}
		obj.Hess(hess, theta)
		if !newtonStep(hess, g, step) {
			return finishNewton(theta, gmax, floor, iters, "Hessian not positive definite")
		}
		a := -floats.Dot(g, step)
		if !(a > 0) {
			return finishNewton(theta, gmax, floor, iters, "no descent direction")
		}
		t, ok := lineSearch(obj, theta, step, trial, gt, a, &evals)
		if !ok {
			return finishNewton(theta, gmax, floor, iters, "line search")
		}
		floats.AddScaled(theta, t, step)
		// The gradient at the accepted point is the last one formed.
		copy(g, gt)
	}
}

// finishNewton keeps theta when its gradient passes the floor and
// otherwise reports that the iteration did not converge.
func finishNewton(theta []float64, gmax, floor float64, iters int, why string) ([]float64, int, error) {
	if gmax < floor {
		return theta, iters, nil
	}
	return nil, iters, fmt.Errorf("%d Newton iterations (%s, ‖gradient‖∞ = %.3g): %w", iters, why, gmax, ErrNoConvergence)
}

// newtonStep solves (H + τI) step = −g by Cholesky with the smallest τ of
// 0, then τ₀ = 10⁻³ + max(0, −min diag H) growing fivefold, at which the
// factorisation succeeds (at most 20 tries); false when none does.
func newtonStep(h *mat.SymDense, g, step []float64) bool {
	d := len(g)
	var chol mat.Cholesky
	rhs := mat.NewVecDense(d, nil)
	for k := range g {
		rhs.SetVec(k, -g[k])
	}
	minDiag := math.Inf(1)
	for k := 0; k < d; k++ {
		minDiag = math.Min(minDiag, h.At(k, k))
	}
	tau := 0.0
	if !(minDiag > 0) {
		tau = 1e-3 - math.Min(0, minDiag)
	}
	shifted := mat.NewSymDense(d, nil)
	for try := 0; try < 20; try++ {
		shifted.CopySym(h)
		for k := 0; k < d && tau > 0; k++ {
			shifted.SetSym(k, k, h.At(k, k)+tau)
		}
		if chol.Factorize(shifted) {
			out := mat.NewVecDense(d, step)
			if err := chol.SolveVecTo(out, rhs); err == nil && finite(step) {
				return true
			}
		}
		if tau == 0 {
			tau = 1e-3
		} else {
			tau *= 5
		}
	}
	return false
}

// lineSearch returns the step t along step from theta accepted by the
// rules of newtonMinimise, leaving the gradient at theta + t·step in gt;
// a = −φ'(0). The objective's cache must hold theta, so that the first
// trial (t = 1) measures M = max_i |Δη_i|, the largest change of a row's
// log-odds along the full step (η is linear in t, so t·M at t). It counts
// the gradient evaluations in evals.
func lineSearch(obj *logisticObjective, theta, step, trial, gt []float64, a float64, evals *int) (float64, bool) {
	deriv := func(t float64) float64 {
		copy(trial, theta)
		floats.AddScaled(trial, t, step)
		obj.Grad(gt, trial)
		*evals++
		return floats.Dot(gt, step)
	}
	// Bracket [lo, hi] with φ'(lo) < 0 < φ'(hi); φ'(0) = −a.
	lo, dlo := 0.0, -a
	t := 1.0
	dt := deriv(t)
	m := obj.moved
	accept := func(t, dt float64) bool {
		return (dt <= 0 && dt >= -0.9*a) || (dt > 0 && dt <= a/2 && t*m <= 1)
	}
	if accept(t, dt) {
		return t, true
	}
	// φ'(1) < −0.9a: the function is still falling steeply at the full
	// step; take it (L decreased, φ' ≤ φ'(1) < 0 on [0, 1]) and let the
	// next Newton step go on from there.
	if dt < 0 {
		return t, true
	}
	hi, dhi := t, dt
	side := 0
	for try := 0; try < logisticMaxLineSearch; try++ {
		if math.IsNaN(dhi) || math.IsInf(dhi, 0) {
			t = (lo + hi) / 2 // no usable slope: bisect
		} else {
			t = lo + (hi-lo)*(-dlo)/(dhi-dlo)
			if !(t > lo && t < hi) {
				t = (lo + hi) / 2
			}
		}
		dt = deriv(t)
		if accept(t, dt) {
			return t, true
		}
		if dt < 0 {
			lo, dlo = t, dt
			if side == -1 {
				dhi /= 2 // Illinois: halve the stale end's value
			}
			side = -1
		} else {
			hi, dhi = t, dt
			if side == 1 {
				dlo /= 2
			}
			side = 1
		}
	}
	return 0, false
}

// logisticMaxLineSearch bounds the trials of one line search after the
// full step.
const logisticMaxLineSearch = 40

// finite reports whether every value of v is finite.
func finite(v []float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}
