package synth

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestNormalQuantileMatchesGonum(t *testing.T) {
	for _, u := range []float64{1e-9, 0.001, 0.025, 0.3, 0.5, 0.77, 0.975, 0.999999} {
		want := distuv.UnitNormal.Quantile(u) // reference: gonum distuv
		if got := normalQuantile(u); math.Abs(got-want) > 1e-8 {
			t.Errorf("normalQuantile(%g) = %.12g, gonum says %.12g", u, got, want)
		}
		if got, want := normalCDF(want), distuv.UnitNormal.CDF(want); math.Abs(got-want) > 1e-12 {
			t.Errorf("normalCDF(%g) = %.15g, gonum says %.15g", want, got, want)
		}
	}
}

func TestTruncNormalMean(t *testing.T) {
	// Mean of N(μ, σ²) truncated to [a, b]:
	// μ + σ·(φ(α) − φ(β)) / (Φ(β) − Φ(α)), α = (a−μ)/σ, β = (b−μ)/σ
	// (Johnson, Kotz & Balakrishnan 1994, "Continuous Univariate
	// Distributions", vol. 1, ch. 13; from memory). φ, Φ from gonum.
	cases := []struct{ mu, sd, lo, hi float64 }{
		{46, 16, 18, 90},
		{0, 1, -0.5, 3},
		{10, 2, 11, 12},
	}
	for _, c := range cases {
		al, be := (c.lo-c.mu)/c.sd, (c.hi-c.mu)/c.sd
		n := distuv.UnitNormal
		want := c.mu + c.sd*(n.Prob(al)-n.Prob(be))/(n.CDF(be)-n.CDF(al))
		// Midpoint rule over u ∈ (0, 1): exact up to O(1/m²) for a smooth quantile.
		const m = 200000
		var sum float64
		for i := range m {
			x := truncNormal((float64(i)+0.5)/m, c.mu, c.sd, c.lo, c.hi)
			if x < c.lo || x > c.hi {
				t.Fatalf("truncNormal out of [%g, %g]: %g", c.lo, c.hi, x)
			}
			sum += x
		}
		if got := sum / m; math.Abs(got-want) > 1e-4*c.sd {
			t.Errorf("%+v: mean %.6f, analytic %.6f", c, got, want)
		}
	}
}

func TestStreamIsDeterministicAndOpen(t *testing.T) {
	a, b := newStream(42), newStream(42)
	c := newStream(43)
	same := 0
	for range 1000 {
		x, y, z := a.uniform(), b.uniform(), c.uniform()
		if x != y {
			t.Fatal("same seed gave different draws")
		}
		if x <= 0 || x >= 1 {
			t.Fatalf("draw %g outside (0, 1)", x)
		}
		if x == z {
			same++
		}
	}
	if same > 0 {
		t.Errorf("seeds 42 and 43 agree on %d of 1000 draws", same)
	}
}
