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
// (Newton's method on the logistic loss; analytic). The trees start from
// the constant (Start nil).
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
			l.Start = nil // the closed form is a step from the constant z₀
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

// TestBoostGradients compares the gradients and hessians formed from the
// odds with the textbook g = w·(σ(z) − y), h = w·σ(z)(1 − σ(z)), σ from
// math.Exp, for log-odds across ±60 (beyond that they are 0 or ±w in
// single precision): the relative error must stay within single-precision
// rounding (3e-7 allows a few roundings).
func TestBoostGradients(t *testing.T) {
	const n = 24001
	z := make([]float64, n)
	sw := make([]float64, n)
	for i := range z {
		z[i] = -60 + 120*float64(i)/(n-1)
		sw[i] = 0.5 + float64(i%3) // weights 0.5, 1.5, 2.5
		if i%2 == 1 {
			sw[i] = -sw[i] // y = 0
		}
	}
	gr := newBoostGrower(make([]uint64, n), &boostBinning{edges: [][]float64{{0}}, offsets: []int{0, 2}}, z, sw, boostTreeConfig{threads: 1})
	gr.gradients()
	for i, r := range gr.gh {
		s := 1 / (1 + math.Exp(-z[i]))
		w, y := math.Abs(sw[i]), 0.0
		if sw[i] > 0 {
			y = 1
		}
		// 1 − σ(z) = σ(−z), evaluated without cancellation.
		wantG := w * s
		if y == 1 {
			wantG = -w / (1 + math.Exp(z[i]))
		}
		wantH := w * s / (1 + math.Exp(z[i]))
		for _, c := range []struct {
			name      string
			got, want float64
		}{{"g", float64(r.g), wantG}, {"h", float64(r.h), wantH}} {
			if math.Abs(c.got-c.want) > 3e-7*math.Abs(c.want) {
				t.Fatalf("z = %g, y = %g: %s = %.9g, want %.9g", z[i], y, c.name, c.got, c.want)
			}
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
