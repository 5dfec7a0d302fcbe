package classify_test

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/gapwise/gapwise/attribution/classify"
	"gonum.org/v1/gonum/mat"
)

// A group-membership classifier turned into a density ratio: the comparison
// group's values are spread wider than the reference group's, so the ratio
// p_cmp(x)/p_ref(x) is below 1 near the centre and above 1 in the tails.
func ExampleBoosted() {
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 20000
	x := mat.NewDense(n, 1, nil)
	group := make([]float64, n) // 1 = comparison, 0 = reference
	for i := range n {
		v := rng.NormFloat64()
		if i%2 == 1 {
			group[i] = 1
			v *= 1.5
		}
		x.Set(i, 0, v)
	}
	model, err := classify.NewBoosted().Fit(x, group, nil, 42)
	if err != nil {
		fmt.Println(err)
		return
	}
	at := mat.NewDense(2, 1, []float64{0, 2.5})
	logOdds := make([]float64, 2)
	model.LogOdds(at, logOdds)
	// Equal group sizes, so the prior odds are 1 and the ratio is exp(log-odds).
	fmt.Printf("ratio at x=0 below 1: %v\n", math.Exp(logOdds[0]) < 1)
	fmt.Printf("ratio at x=2.5 above 2: %v\n", math.Exp(logOdds[1]) > 2)
	// Output:
	// ratio at x=0 below 1: true
	// ratio at x=2.5 above 2: true
}
