package attribution

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestTailShapePareto: w = U^(−k) with U uniform is Pareto with tail index
// 1/k, so its generalised-Pareto shape is exactly k (analytic). With the
// 3√n tail records of n = 40,000 draws (600), the estimator's standard
// error is about (1+k)/√600 ≈ 0.05 (asymptotic ML variance (1+k)²/M, Smith
// 1987, from memory); we allow 0.15.
func TestTailShapePareto(t *testing.T) {
	for _, k := range []float64{0.2, 0.5, 0.8} {
		rng := rand.New(rand.NewPCG(1, uint64(k*100)))
		logw := make([]float64, 40000)
		for i := range logw {
			logw[i] = -k * math.Log(1-rng.Float64())
		}
		if got := TailShape(logw); math.Abs(got-k) > 0.15 {
			t.Errorf("Pareto shape %v: estimated %v", k, got)
		}
	}
}

// TestTailShapeGaussianSpread: reweighting N(0,1) towards N(0, σ²) gives
// w ∝ exp(x²(1−1/σ²)/2), whose tail is P(w > t) ≈ t^(−σ²/(σ²−1)) up to a
// slowly varying factor, so k = 1 − 1/σ² (analytic): 0.75 for σ = 2 —
// infinite variance, since k > 1/2 exactly when σ² > 2 — and k ≤ 0 (light
// tail, bounded weights) for σ < 1. The slowly varying factor biases
// finite-sample estimates, so we check the side of the thresholds only.
func TestTailShapeGaussianSpread(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 2))
	wide, narrow := make([]float64, 20000), make([]float64, 20000)
	for i := range wide {
		x := rng.NormFloat64()
		wide[i] = -math.Log(2) + x*x*(1-1/4.0)/2
		narrow[i] = -math.Log(0.7) + x*x*(1-1/0.49)/2
	}
	if k := TailShape(wide); !(k > TailUnreliable-0.1) {
		t.Errorf("σ=2: k̂ = %v, want near 0.75", k)
	}
	if k := TailShape(narrow); !(k < 0.3) {
		t.Errorf("σ=0.7: k̂ = %v, want ≤ 0 (bounded weights)", k)
	}
}

func TestTailShapeTooFew(t *testing.T) {
	if k := TailShape([]float64{0, 1, 2}); !math.IsNaN(k) {
		t.Errorf("3 records: %v, want NaN", k)
	}
}
