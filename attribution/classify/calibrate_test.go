package classify

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestPlattFitRecoversParameters draws y ~ Bernoulli(σ(a·s + b)) and checks
// that maximum likelihood recovers (a, b) within 4 standard errors, the
// standard errors coming from the inverse Fisher information at the truth
// (analytic: I = Σ p(1−p)·[s², s; s, 1]).
func TestPlattFitRecoversParameters(t *testing.T) {
	cases := []struct{ a, b float64 }{{1, 0}, {0.6, 0.4}, {2, -1}}
	for _, c := range cases {
		rng := rand.New(rand.NewPCG(7, uint64(c.a*10)))
		const n = 50000
		s, y, w := make([]float64, n), make([]float64, n), make([]float64, n)
		var iaa, iab, ibb float64
		for i := range n {
			s[i] = 2 * rng.NormFloat64()
			p := 1 / (1 + math.Exp(-(c.a*s[i] + c.b)))
			if rng.Float64() < p {
				y[i] = 1
			}
			w[i] = 1
			q := p * (1 - p)
			iaa += q * s[i] * s[i]
			iab += q * s[i]
			ibb += q
		}
		det := iaa*ibb - iab*iab
		seA, seB := math.Sqrt(ibb/det), math.Sqrt(iaa/det)
		a, b, err := plattFit(s, y, w)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(a-c.a) > 4*seA || math.Abs(b-c.b) > 4*seB {
			t.Errorf("truth (%g, %g): got (%.4f, %.4f), se (%.4f, %.4f)", c.a, c.b, a, b, seA, seB)
		}
	}
}

// TestPlattFitWeightsEqualCopies: weight 2 on a row must give the same fit
// as two copies of it (definition of the weighted likelihood).
func TestPlattFitWeightsEqualCopies(t *testing.T) {
	s := []float64{-2, -1, -0.5, 0, 0.3, 1, 1.5, 2}
	y := []float64{0, 0, 1, 0, 1, 0, 1, 1}
	w := []float64{1, 2, 1, 3, 1, 1, 2, 1}
	var sd, yd, wd []float64
	for i := range s {
		for range int(w[i]) {
			sd, yd, wd = append(sd, s[i]), append(yd, y[i]), append(wd, 1)
		}
	}
	a1, b1, err := plattFit(s, y, w)
	if err != nil {
		t.Fatal(err)
	}
	a2, b2, err := plattFit(sd, yd, wd)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(a1-a2) > 1e-8 || math.Abs(b1-b2) > 1e-8 {
		t.Errorf("weighted (%v, %v) vs copies (%v, %v)", a1, b1, a2, b2)
	}
}

func TestPlattFitErrors(t *testing.T) {
	_, _, err := plattFit([]float64{1, 1, 1}, []float64{0, 1, 0}, []float64{1, 1, 1})
	if err == nil {
		t.Error("constant scores: no error")
	}
	defer func() {
		if recover() == nil {
			t.Error("mismatched lengths did not panic")
		}
	}()
	plattFit([]float64{1}, []float64{0, 1}, []float64{1})
}
