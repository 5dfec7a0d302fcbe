package attribution_test

import (
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/metrics"
)

// Synthetic records of two groups in which only the case mix differs: a
// finding x is shifted upwards in the comparison group, while the
// mechanism of a second finding z given x is the same in both. The model
// flags x + z above 1. Every mechanism but x's is unchanged, so by the
// Shapley value's null-player property (Shapley 1953) the whole gap in the
// positive rate belongs to x and z's share is zero up to estimation error.
func ExampleDecompose() {
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 3000
	x := mat.NewDense(2*n, 2, nil)
	s := &attribution.Sample{X: x, Comparison: make([]bool, 2*n), Labels: make([]float64, 2*n), Scores: make([]float64, 2*n)}
	for r := range 2 * n {
		shift := 0.0
		if r >= n {
			s.Comparison[r], shift = true, 0.7
		}
		xv := rng.NormFloat64() + shift
		zv := xv + rng.NormFloat64()
		x.Set(r, 0, xv)
		x.Set(r, 1, zv)
		s.Labels[r] = float64(r % 2)
		s.Scores[r] = 1 / (1 + math.Exp(-4*(xv+zv-1)))
	}
	mechs := []attribution.Mechanism{
		{Node: "x", NodeCols: []int{0}},
		{Node: "z", Parents: []string{"x"}, NodeCols: []int{1}, ParentCols: []int{0}},
	}
	d, err := attribution.Decompose(s, mechs, []string{metrics.NameSelectionRate}, attribution.Options{
		Threshold: 0.5, Seed: 7, Learners: []classify.Learner{classify.NewLinear()}, Workers: 2,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	md := d.Metrics[0]
	fmt.Printf("observed gap %.2f\n", md.Gap)
	for i, m := range d.Mechanisms {
		fmt.Printf("%s: %.2f\n", m.Mechanism.Label(), math.Round(md.Contributions[i]*100)/100+0) // +0 turns −0 into 0
	}
	// Output:
	// observed gap 0.24
	// x: 0.24
	// z | x: 0.00
}
