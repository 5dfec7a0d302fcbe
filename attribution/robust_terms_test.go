package attribution

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/gapwise/gapwise/metrics"
)

// TestRobustMetricsMatchCompute: every metric the robust estimator covers,
// as g(θ) of the unweighted means of its terms, equals metrics.Compute on
// the same records (source: package metrics, whose values are checked
// against scikit-learn in testdata/metrics), and ∂g/∂θ matches central
// differences of g.
func TestRobustMetricsMatchCompute(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	const n, threshold, bins = 500, 0.4, 7
	y, s := make([]float64, n), make([]float64, n)
	for i := range y {
		s[i] = rng.Float64()
		if rng.Float64() < s[i] {
			y[i] = 1
		}
	}
	for _, name := range metrics.Names() {
		m, ok := robustMetricOf(name, bins)
		if name == metrics.NameAUC {
			if ok {
				t.Error("AUC must not be estimated as a function of means")
			}
			continue
		}
		if !ok {
			t.Fatalf("%s: no robust form", name)
		}
		theta := make([]float64, len(m.terms))
		for j, id := range m.terms {
			tm := termOf(id)
			for i := range y {
				theta[j] += tm.value(y[i], s[i], threshold, bins) / n
			}
		}
		got, err := m.value(theta)
		if err != nil {
			t.Fatal(err)
		}
		want, err := metrics.Compute(name, y, s, threshold, bins, nil)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-want) > 1e-12 {
			t.Errorf("%s = %.15g from means, metrics.Compute %.15g", name, got, want)
		}
		grad := make([]float64, len(theta))
		m.grad(theta, grad)
		for j := range theta {
			const h = 1e-7
			up := append([]float64(nil), theta...)
			down := append([]float64(nil), theta...)
			up[j] += h
			down[j] -= h
			vu, _ := m.value(up)
			vd, _ := m.value(down)
			if fd := (vu - vd) / (2 * h); math.Abs(fd-grad[j]) > 1e-5*(1+math.Abs(fd)) {
				t.Errorf("%s: ∂g/∂θ_%d = %g, central difference %g", name, j, grad[j], fd)
			}
		}
	}
}

// TestRobustMetricUndefined: a ratio metric with no weight on its
// denominator is undefined (metrics.ErrUndefined), as in metrics.Stats.
func TestRobustMetricUndefined(t *testing.T) {
	m, _ := robustMetricOf(metrics.NameFPR, 1)
	if _, err := m.value([]float64{0, 0}); err == nil || !errors.Is(err, metrics.ErrUndefined) {
		t.Errorf("FPR without negatives: error %v, want metrics.ErrUndefined", err)
	}
}
