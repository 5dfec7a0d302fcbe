package attribution_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// gaussianShift draws n records per group: x ~ N(0, 1) in the reference
// group and N(μ, 1) in the comparison group; z = x + N(0, 1) in both.
func gaussianShift(n int, mu float64, seed uint64) *attribution.Sample {
	rng := rand.New(rand.NewPCG(seed, 1))
	x := mat.NewDense(2*n, 2, nil)
	s := &attribution.Sample{X: x, Comparison: make([]bool, 2*n), Labels: make([]float64, 2*n), Scores: make([]float64, 2*n)}
	for r := range 2 * n {
		shift := 0.0
		if r >= n {
			s.Comparison[r], shift = true, mu
		}
		xv := rng.NormFloat64() + shift
		x.Set(r, 0, xv)
		x.Set(r, 1, xv+rng.NormFloat64())
		s.Labels[r] = float64(r % 2)
		s.Scores[r] = 0.5
	}
	return s
}

// TestEstimateRatiosGaussianShift checks EstimateRatios against the
// closed-form log density ratios of a Gaussian mean shift (analytic ground
// truth): for the root x, log N(x; μ, 1)/N(x; 0, 1) = μx − μ²/2; for z | x,
// whose mechanism is the same in both groups, log r = 0.
func TestEstimateRatiosGaussianShift(t *testing.T) {
	const n, mu = 4000, 0.5
	s := gaussianShift(n, mu, 11)
	mechs := []attribution.Mechanism{
		{Node: "x", NodeCols: []int{0}},
		{Node: "z", Parents: []string{"x"}, NodeCols: []int{1}, ParentCols: []int{0}},
	}
	got, err := attribution.EstimateRatios(s, mechs, attribution.RatioOptions{Folds: 5, Seed: 3, Learners: []classify.Learner{classify.NewLinear()}, Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	var errX, errZ float64
	var m int
	for r := range 2 * n {
		xv := s.X.At(r, 0)
		if math.Abs(xv) > 2 { // compare where both groups have records
			continue
		}
		m++
		errX += math.Abs(got[0].LogRatio[r] - (mu*xv - mu*mu/2))
		errZ += math.Abs(got[1].LogRatio[r])
	}
	errX, errZ = errX/float64(m), errZ/float64(m)
	// Sampling error of a fitted logistic slope at this size is about
	// 0.03 per unit of x (common practice: se ≈ 1/sqrt(n·var)), so a mean
	// absolute error of 0.05 is a loose but failing bound.
	if errX > 0.05 || errZ > 0.05 {
		t.Errorf("mean |error| of log r: x %.4f, z %.4f; want both below 0.05", errX, errZ)
	}
	if got[0].ParentLearner != "prior" || got[1].Learner != classify.NameLinear {
		t.Errorf("learners %q/%q, %q/%q", got[0].Learner, got[0].ParentLearner, got[1].Learner, got[1].ParentLearner)
	}
}
