package classify

import (
	"math"
	"testing"
)

// TestLogit checks Logit against log(p/(1−p)) computed by hand (analytic):
// logit(1/4) = −log 3, logit(1/2) = 0, and the clipped ends
// ∓log((1−10⁻⁶)/10⁻⁶).
func TestLogit(t *testing.T) {
	end := math.Log((1 - ProbabilityClip) / ProbabilityClip)
	for _, c := range []struct{ p, want float64 }{
		{0.25, -math.Log(3)},
		{0.5, 0},
		{0.75, math.Log(3)},
		{0, -end},
		{1e-9, -end},
		{1, end},
		{1 - 1e-12, end},
	} {
		if got := Logit(c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("Logit(%g) = %.15g, want %.15g", c.p, got, c.want)
		}
	}
	if !math.IsNaN(Logit(math.NaN())) {
		t.Error("Logit(NaN) is not NaN")
	}
}
