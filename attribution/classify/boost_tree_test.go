package classify

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestBoostedOneRoundNewtonStep checks one boosting round on a 0/1 feature
// against the closed form: from z₀ = logit(p̄) a leaf holding the rows of
// group g (event rate p_g) moves by the Newton step
// −G/H = (p_g − σ(z₀)) / (σ(z₀)(1 − σ(z₀))) when L2 = 0 and the rate is 1
// (Newton's method on the logistic loss; analytic).
func TestBoostedOneRoundNewtonStep(t *testing.T) {
	cases := []struct {
		name           string
		n0, k0, n1, k1 int // rows and events per group
	}{
		{"balanced", 400, 100, 400, 300},
		{"skewed", 900, 90, 100, 60},
		{"rare", 1000, 10, 1000, 50},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			n := c.n0 + c.n1
			x := mat.NewDense(n, 1, nil)
			y := make([]float64, n)
			for i := range c.n1 {
				x.Set(c.n0+i, 0, 1)
				if i < c.k1 {
					y[c.n0+i] = 1
				}
			}
			for i := range c.k0 {
				y[i] = 1
			}
			l := NewBoosted()
			l.Rounds, l.LearningRate, l.L2, l.ValidationFraction = 1, 1, 0, 0
			m, err := l.Fit(x, y, nil, 1)
			if err != nil {
				t.Fatal(err)
			}
			got := make([]float64, 2)
			m.LogOdds(mat.NewDense(2, 1, []float64{0, 1}), got)
			pbar := float64(c.k0+c.k1) / float64(n)
			z0 := math.Log(pbar / (1 - pbar))
			for g, pg := range []float64{float64(c.k0) / float64(c.n0), float64(c.k1) / float64(c.n1)} {
				want := z0 + (pg-pbar)/(pbar*(1-pbar))
				// Gradients are single precision: relative error ~1e-7.
				if math.Abs(got[g]-want) > 1e-5 {
					t.Errorf("group %d: log-odds %.7f, want %.7f", g, got[g], want)
				}
			}
		})
	}
}

// TestBoostExpNeg compares boostExpNeg with math.Exp(−x) over [0, 700):
// the relative error must stay below 1e-9 (the bound in its doc comment,
// well below the single-precision rounding of the gradients).
func TestBoostExpNeg(t *testing.T) {
	worst := 0.0
	for i := 0; i <= 2_000_000; i++ {
		x := 700 * float64(i) / 2_000_001
		want := math.Exp(-x)
		got := boostExpNeg(x)
		if rel := math.Abs(got-want) / want; rel > worst {
			worst = rel
		}
	}
	if worst > 1e-9 {
		t.Errorf("boostExpNeg: worst relative error %.3g over [0, 700), want < 1e-9", worst)
	}
	for _, x := range []float64{700, 1e4, math.Inf(1)} {
		if got := boostExpNeg(x); got != 0 {
			t.Errorf("boostExpNeg(%g) = %g, want 0", x, got)
		}
	}
}

// BenchmarkBoostGradients times one gradient pass over 16 000 rows (the
// size of a bootstrap replicate's fit), single-threaded.
func BenchmarkBoostGradients(b *testing.B) {
	x, y := boostBenchData(16_000, 6, 7)
	rows := make([]int32, len(y))
	for i := range rows {
		rows[i] = int32(i)
	}
	bn := newBoostBinning(x, rows, 255, 1, 1)
	z := make([]float64, len(y))
	sw := make([]float64, len(y))
	for i := range y {
		z[i] = 0.01 * float64(i%400-200)
		sw[i] = 2*y[i] - 1
	}
	gr := newBoostGrower(bn.binRows(x, rows, 1), bn, z, sw, boostTreeConfig{threads: 1})
	for b.Loop() {
		gr.gradients()
	}
}
