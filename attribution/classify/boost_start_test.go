package classify

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// boostStepData draws n rows of x ~ Uniform(−2, 2) and a noise column,
// with log-odds η(x) = −0.5 + 2·[x > 0.5]: a step that no smooth start
// fits, so the trees must.
func boostStepData(n int, seed uint64) (*mat.Dense, []float64, []float64) {
	rng := rand.New(rand.NewPCG(seed, 7))
	x := mat.NewDense(n, 2, nil)
	y := make([]float64, n)
	eta := make([]float64, n)
	for i := range n {
		v := 4*rng.Float64() - 2
		x.Set(i, 0, v)
		x.Set(i, 1, rng.NormFloat64())
		eta[i] = -0.5
		if v > 0.5 {
			eta[i] += 2
		}
		if rng.Float64() < 1/(1+math.Exp(-eta[i])) {
			y[i] = 1
		}
	}
	return x, y, eta
}

// TestBoostedStartKeepsSteps: where the log-odds is a step, the trees
// grown from the Expanded start still fit it: the test log loss is within
// 0.01 of the Bayes loss (computed from the generating log-odds;
// analytic) and within 0.005 of the trees started from a constant.
func TestBoostedStartKeepsSteps(t *testing.T) {
	xtr, ytr, _ := boostStepData(20000, 1)
	xte, yte, eta := boostStepData(10000, 2)
	bayes := boostLogLoss(eta, yte, ones(len(yte)))
	trees := NewBoosted()
	trees.Start = nil
	var loss [2]float64
	for k, l := range []Boosted{NewBoosted(), trees} {
		m, err := l.Fit(xtr, ytr, nil, 3)
		if err != nil {
			t.Fatal(err)
		}
		loss[k] = boostTestLogLoss(m, xte, yte)
		t.Logf("start %v: test log loss %.4f (%d trees, started %v), Bayes %.4f", l.Start != nil, loss[k], m.(*BoostedModel).Trees(), m.(*BoostedModel).Started(), bayes)
	}
	if loss[0] > bayes+0.01 {
		t.Errorf("from the start: test log loss %.4f > Bayes %.4f + 0.01", loss[0], bayes)
	}
	if loss[0] > loss[1]+0.005 {
		t.Errorf("from the start: test log loss %.4f > %.4f from a constant + 0.005", loss[0], loss[1])
	}
}

func ones(n int) []float64 {
	w := make([]float64, n)
	for i := range w {
		w[i] = 1
	}
	return w
}

// TestBoostedStartClamp: one extreme input among 2 000 rows, where the
// Expanded start's square term extrapolates, gets log-odds no further out
// than the start's (MinLeafRows+1)-th most extreme training value (the
// clamp in fitStart's doc comment), plus what the trees add (none here:
// one round at a tiny learning rate).
func TestBoostedStartClamp(t *testing.T) {
	x, y := boostGaussianData(2000, 0.5, 1.6, 31)
	x.Set(0, 0, 40) // 40 standard deviations out: typical range keeps it
	l := NewBoosted()
	l.ValidationFraction, l.Rounds, l.LearningRate = 0, 1, 1e-9
	m, err := l.Fit(x, y, nil, 1)
	if err != nil {
		t.Fatal(err)
	}
	bm := m.(*BoostedModel)
	if !bm.Started() {
		t.Fatal("the start was not kept")
	}
	got := make([]float64, 1)
	bm.LogOdds(mat.NewDense(1, 2, []float64{40, 0}), got)
	raw := make([]float64, 1)
	bm.start.model.LogOdds(mat.NewDense(1, 2, []float64{40, 0}), raw)
	t.Logf("start log-odds at x = 40: %.2f unclamped, %.2f clamped to [%.2f, %.2f]", raw[0], got[0], bm.start.lo, bm.start.hi)
	if !(raw[0] > bm.start.hi) {
		t.Fatalf("the extreme value is inside the bounds (%.2f ≤ %.2f): the test does not reach the clamp", raw[0], bm.start.hi)
	}
	if math.Abs(got[0]-bm.start.hi) > 1e-6 {
		t.Errorf("log-odds at x = 40: %.4f, want the bound %.4f", got[0], bm.start.hi)
	}
	// The bound leaves MinLeafRows training values above it.
	z := make([]float64, x.RawMatrix().Rows)
	bm.start.model.LogOdds(x, z)
	var above int
	for _, v := range z {
		if v > bm.start.hi {
			above++
		}
	}
	if above != l.MinLeafRows {
		t.Errorf("%d training values above the bound, want MinLeafRows = %d", above, l.MinLeafRows)
	}
}

// TestBoostedStartDropped: on pure noise (targets independent of 12
// columns, 300 rows) the Expanded start, with its squares and products,
// fits noise and does worse on the validation split than the constant
// log prior odds, so the trees start from the constant.
func TestBoostedStartDropped(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	const n, p = 300, 12
	x := mat.NewDense(n, p, nil)
	y := make([]float64, n)
	for i := range n {
		for j := range p {
			x.Set(i, j, rng.NormFloat64())
		}
		if rng.Float64() < 0.5 {
			y[i] = 1
		}
	}
	l := NewBoosted()
	l.ValidationFraction = 0.3
	m, err := l.Fit(x, y, nil, 1)
	if err != nil {
		t.Fatal(err)
	}
	if m.(*BoostedModel).Started() {
		t.Error("the start was kept on pure noise")
	}
}
