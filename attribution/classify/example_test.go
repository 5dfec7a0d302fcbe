package classify_test

import (
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution/classify"
)

// Two groups that differ only in how two features co-vary: the comparison
// group has x0·x1 > 0 more often. Only the expanded basis sees it.
func Example() {
	rng := rand.New(rand.NewPCG(1, 2))
	n := 4000
	x := mat.NewDense(n, 2, nil)
	group := make([]float64, n) // 1 = comparison
	for i := 0; i < n; i++ {
		a, b := rng.NormFloat64(), rng.NormFloat64()
		if rng.Float64() < 1/(1+math.Exp(-1.5*a*b)) {
			group[i] = 1
		}
		x.SetRow(i, []float64{a, b})
	}
	for _, l := range []classify.Learner{classify.NewLinear(), classify.NewExpanded()} {
		m, err := l.Fit(x, group, nil, 0)
		if err != nil {
			fmt.Println(err)
			return
		}
		z := make([]float64, n)
		m.LogOdds(x, z)
		fmt.Printf("%-8s in-sample log loss %.3f\n", l.Name(), classify.LogLossFromLogOdds(group, z, nil))
	}
	// Output:
	// linear   in-sample log loss 0.693
	// expanded in-sample log loss 0.577
}

// By hand: log(1+e^{−2}) = 0.12693, log(1+e^{−1}) = 0.31326, log 2 = 0.69315;
// their mean is 0.37778, and with weights 1, 1, 2 it is 1.82648/4 = 0.45662.
func ExampleLogLossFromLogOdds() {
	y := []float64{1, 0, 1}
	logOdds := []float64{2, -1, 0}
	fmt.Printf("%.4f\n", classify.LogLossFromLogOdds(y, logOdds, nil))
	fmt.Printf("%.4f\n", classify.LogLossFromLogOdds(y, logOdds, []float64{1, 1, 2}))
	// Output:
	// 0.3778
	// 0.4566
}

func ExampleLogisticModel_Terms() {
	x := mat.NewDense(6, 3, []float64{
		0.5, 0, 3,
		-1, 1, 3,
		2, 1, 3,
		0.1, 0, 3,
		-0.3, 1, 3,
		1.2, 0, 3,
	})
	y := []float64{0, 1, 0, 1, 0, 1}
	m, err := classify.NewExpanded().Fit(x, y, nil, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	// Column 2 is constant; column 1 is binary, so it has no square.
	fmt.Println(m.(*classify.LogisticModel).Terms())
	// Output:
	// [x0 x1 x0^2 x0*x1]
}
