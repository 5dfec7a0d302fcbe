package classify

import (
	"math"
	"testing"
)

// TestNewtonFromFarStarts: from starts far from the minimiser (log-odds
// of ±20 and more on most rows, where the full Newton step overshoots and
// the line search must bracket), newtonMinimise reaches the minimiser of
// the cold start; the objective is strictly convex, so the minimiser is
// unique (textbook convexity, from memory). It also checks the gradient
// test at the result.
func TestNewtonFromFarStarts(t *testing.T) {
	x, y, _ := interactionData(3000, 3, 9)
	n := len(y)
	z, _, _ := rawDesign(x, nil, float64(n), 1)
	base := make([]float64, z.d)
	base[0] = math.Log(weightedSum(y, nil) / (float64(n) - weightedSum(y, nil)))
	gtol := logisticGradTol * float64(n)
	want, _, err := newtonMinimise(newLogisticObjective(z, y, nil, DefaultLambda, 1), base, gtol)
	if err != nil {
		t.Fatal(err)
	}
	for _, start := range [][]float64{
		{20, 0, 0, 0},
		{-20, 5, -5, 5},
		{0, 30, 30, -30},
	} {
		got, iters, err := newtonMinimise(newLogisticObjective(z, y, nil, DefaultLambda, 1), start, gtol)
		if err != nil {
			t.Fatalf("start %v: %v", start, err)
		}
		for k := range want {
			if d := math.Abs(got[k] - want[k]); d > 1e-6 {
				t.Errorf("start %v: θ_%d = %v, want %v", start, k, got[k], want[k])
			}
		}
		g := make([]float64, z.d)
		newLogisticObjective(z, y, nil, DefaultLambda, 1).Grad(g, got)
		for k, v := range g {
			if math.Abs(v) >= gtol*logisticGradFloor/logisticGradTol {
				t.Errorf("start %v: gradient %d = %.3g at the result", start, k, v)
			}
		}
		t.Logf("start %v: %d Newton steps", start, iters)
	}
}
