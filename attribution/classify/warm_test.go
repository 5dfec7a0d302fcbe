package classify

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestWarmStartSameMinimiser: the penalised logistic objective is strictly
// convex, so its minimiser is unique (textbook convexity, e.g. Boyd &
// Vandenberghe 2004, §9.1, from memory) and a fit on a bootstrap resample
// started from the full-data model must reach the same coefficients as a
// cold start, up to the solver's tolerance, in no more Newton steps. A
// model of another design (other columns) is ignored: the fit is then the
// cold one exactly.
func TestWarmStartSameMinimiser(t *testing.T) {
	x, y, _ := interactionData(6000, 4, 5)
	rng := rand.New(rand.NewPCG(7, 7))
	rs := mat.NewDense(6000, 4, nil)
	ry := make([]float64, 6000)
	for i := range ry {
		j := rng.IntN(6000)
		rs.SetRow(i, x.RawRowView(j))
		ry[i] = y[j]
	}
	narrow := mat.DenseCopyOf(x.Slice(0, 6000, 0, 3))
	for _, l := range []Learner{NewLinear(), NewExpanded()} {
		full, err := l.Fit(x, y, nil, 1)
		if err != nil {
			t.Fatal(err)
		}
		other, err := l.Fit(narrow, y, nil, 1)
		if err != nil {
			t.Fatal(err)
		}
		cold, err := l.Fit(rs, ry, nil, 1)
		if err != nil {
			t.Fatal(err)
		}
		warm, err := l.(WarmStarter).WithWarmStart(full).Fit(rs, ry, nil, 1)
		if err != nil {
			t.Fatal(err)
		}
		c, w := cold.(*LogisticModel), warm.(*LogisticModel)
		for k, v := range c.Coef() {
			if d := math.Abs(v - w.Coef()[k]); d > 1e-6 {
				t.Errorf("%s: coefficient %d differs by %.3g between cold and warm starts", l.Name(), k, d)
			}
		}
		if w.Iterations() > c.Iterations() {
			t.Errorf("%s: warm start took %d Newton steps, cold %d", l.Name(), w.Iterations(), c.Iterations())
		}
		ignored, err := l.(WarmStarter).WithWarmStart(other).Fit(rs, ry, nil, 1)
		if err != nil {
			t.Fatal(err)
		}
		if ig := ignored.(*LogisticModel); ig.Intercept() != c.Intercept() || ig.Iterations() != c.Iterations() {
			t.Errorf("%s: a model of other columns changed the fit", l.Name())
		}
		t.Logf("%s: Newton steps cold %d, warm %d", l.Name(), c.Iterations(), w.Iterations())
	}
}
