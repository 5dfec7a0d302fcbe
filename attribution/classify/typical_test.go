package classify

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestTypicalRange checks the bounds against hand computation from the
// formula in TypicalRange's doc comment.
func TestTypicalRange(t *testing.T) {
	seq := make([]float64, 101) // 0, 1, ..., 100: q01 = 1, q99 = 99, span 98
	for i := range seq {
		seq[i] = float64(i)
	}
	inf := math.Inf(1)
	cases := []struct {
		name   string
		x, w   []float64
		lo, hi float64
	}{
		{"0..100", seq, nil, 1 - 3*98, 99 + 3*98},
		{"empty", nil, nil, -inf, inf},
		{"constant", []float64{2, 2, 2}, nil, -inf, inf},
		{"rare indicator", append(make([]float64, 300), 1), nil, -inf, inf},
		{"zero weights ignored", []float64{0, 1, 2, 1e300}, []float64{1, 1, 1, 0}, 0 - 3*2, 2 + 3*2},
		{"span overflows", []float64{-1.5e308, 0, 1.5e308}, nil, -inf, inf},
	}
	for _, c := range cases {
		lo, hi := TypicalRange(c.x, c.w)
		if lo != c.lo || hi != c.hi {
			t.Errorf("%s: [%v, %v], want [%v, %v]", c.name, lo, hi, c.lo, c.hi)
		}
	}
}

// TestTypicalRangeLeavesGaussianAlone: for 100,000 standard normal draws
// the bounds lie beyond ±14 (about ±16.3 by the normal quantiles
// ±2.326, a textbook value), so no draw is moved.
func TestTypicalRangeLeavesGaussianAlone(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	x := make([]float64, 100000)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	lo, hi := TypicalRange(x, nil)
	if lo > -14 || hi < 14 || lo < -19 || hi > 19 {
		t.Errorf("bounds [%.2f, %.2f], want about ±16.3", lo, hi)
	}
}

// TestExtremeFeatureStaysFinite: one huge but finite feature value (up to
// the largest float64) leaves every fitted log-odds finite, in fitting and
// for prediction on new rows beyond the training range.
func TestExtremeFeatureStaysFinite(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	n := 400
	for _, huge := range []float64{1e5, 1e308, -math.MaxFloat64} {
		x := mat.NewDense(n, 2, nil)
		y := make([]float64, n)
		for i := range n {
			y[i] = float64(i % 2)
			x.Set(i, 0, rng.NormFloat64()+y[i])
			x.Set(i, 1, rng.NormFloat64())
		}
		x.Set(7, 0, huge)
		for _, l := range []Learner{NewLinear(), NewExpanded()} {
			m, err := l.Fit(x, y, nil, 1)
			if err != nil {
				t.Fatalf("%s, %g: %v", l.Name(), huge, err)
			}
			probe := mat.NewDense(2, 2, []float64{math.MaxFloat64, -math.MaxFloat64, -math.MaxFloat64, math.MaxFloat64})
			for _, data := range []*mat.Dense{x, probe} {
				r, _ := data.Dims()
				z := make([]float64, r)
				m.LogOdds(data, z)
				for i, v := range z {
					if math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 100 {
						t.Fatalf("%s with a value %g: log-odds %v on row %d", l.Name(), huge, v, i)
					}
				}
			}
		}
	}
}
