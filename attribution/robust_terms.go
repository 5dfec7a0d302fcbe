package attribution

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/metrics"
)

// The robust estimator (robust.go) estimates means θ = E_S[f(Y, s)] of
// per-record terms under a hybrid distribution, and a metric is a smooth
// function g(θ) of a few such means: a ratio metric is the ratio of two
// (FPR = E[(1−y)·d] / E[1−y], d = [s ≥ t]), a mean-type metric one mean
// (the Brier score E[(s−y)²]), the ECE Σ_b |E[(s−y)·[bin(s) = b]]|. This
// is the same algebra as metrics.Stats, whose cell sums divided by the
// total weight are such means; robustMetricOf states it per metric with
// the fewest terms, so that fewer regressions are fitted.

// termID names one per-record term.
type termID int

// Terms. Binary ones take values in {0, 1}.
const (
	termY0    termID = iota // 1 − y
	termY1                  // y
	termD0                  // 1 − d
	termD1                  // d
	termY0D0                // (1−y)(1−d)
	termY0D1                // (1−y)·d
	termY1D0                // y·(1−d)
	termY1D1                // y·d
	termRight               // [y = d]
	termSq                  // (s − y)²
	termLoss                // ℓ(y, s), metrics.LogLossTerm
	termDiff                // s − y
	termBin0                // (s − y)·[bin(s) = b] is termBin0 + b
)

// meanTerm is one per-record term of the robust estimator.
type meanTerm struct {
	id         termID
	readsLabel bool // f depends on y
	readsScore bool // f depends on s
	binary     bool // values in {0, 1}
}

// termOf returns the term with id (termBin0 + b for ECE bin b).
func termOf(id termID) meanTerm {
	switch id {
	case termY0, termY1:
		return meanTerm{id: id, readsLabel: true, binary: true}
	case termD0, termD1:
		return meanTerm{id: id, readsScore: true, binary: true}
	case termY0D0, termY0D1, termY1D0, termY1D1, termRight:
		return meanTerm{id: id, readsLabel: true, readsScore: true, binary: true}
	}
	return meanTerm{id: id, readsLabel: true, readsScore: true}
}

// value is f(y, s) with decisions at s ≥ threshold and bins score bins.
func (t meanTerm) value(y, s, threshold float64, bins int) float64 {
	d := 0.0
	if s >= threshold {
		d = 1
	}
	switch t.id {
	case termY0:
		return 1 - y
	case termY1:
		return y
	case termD0:
		return 1 - d
	case termD1:
		return d
	case termY0D0:
		return (1 - y) * (1 - d)
	case termY0D1:
		return (1 - y) * d
	case termY1D0:
		return y * (1 - d)
	case termY1D1:
		return y * d
	case termRight:
		if y == d {
			return 1
		}
		return 0
	case termSq:
		return (s - y) * (s - y)
	case termLoss:
		return metrics.LogLossTerm(y, s)
	case termDiff:
		return s - y
	}
	b := int(t.id - termBin0)
	if metrics.Cell(y, s, threshold, bins)>>2 == b {
		return s - y
	}
	return 0
}

// robustMetric is a metric as g(θ) of the means of its terms.
type robustMetric struct {
	name  string
	terms []termID
	// value is g(θ), θ[j] the mean of terms[j]; an error wrapping
	// metrics.ErrUndefined when a denominator is not positive.
	value func(theta []float64) (float64, error)
	// grad writes ∂g/∂θ_j into dst.
	grad func(theta, dst []float64)
	// denominator names what a ratio metric's denominator counts
	// ("positives"), "" for other metrics.
	denominator string
}

// robustMetricOf returns the metric called name as a function of means,
// with ECE on bins bins. ok is false for AUC, which is a mean over pairs
// of records and not a function of per-record means. The values agree
// with metrics.Compute on unweighted records (robust_terms_test.go);
// estimated means can give a value outside the metric's range (a
// numerator above its denominator), which is clamped to it
// (metrics.Fact.Min, Max).
func robustMetricOf(name string, bins int) (m robustMetric, ok bool) {
	m, ok = robustMetricRaw(name, bins)
	if !ok {
		return m, false
	}
	fact, _ := metrics.FactOf(name)
	raw := m.value
	m.value = func(th []float64) (float64, error) {
		v, err := raw(th)
		return min(max(v, fact.Min), fact.Max), err
	}
	return m, true
}

// robustMetricRaw is robustMetricOf without the clamp.
func robustMetricRaw(name string, bins int) (m robustMetric, ok bool) {
	ratio := func(num, den termID, what string) robustMetric {
		return robustMetric{name: name, terms: []termID{num, den}, denominator: what,
			value: func(th []float64) (float64, error) {
				if !(th[1] > 0) {
					return math.NaN(), fmt.Errorf("%w: %s needs %s (their estimated share is %g)", metrics.ErrUndefined, name, what, th[1])
				}
				return th[0] / th[1], nil
			},
			grad: func(th, dst []float64) { dst[0], dst[1] = 1/th[1], -th[0]/(th[1]*th[1]) }}
	}
	mean := func(t termID) robustMetric {
		return robustMetric{name: name, terms: []termID{t},
			value: func(th []float64) (float64, error) { return th[0], nil },
			grad:  func(_, dst []float64) { dst[0] = 1 }}
	}
	switch name {
	case metrics.NameFPR:
		return ratio(termY0D1, termY0, "negatives"), true
	case metrics.NameTPR:
		return ratio(termY1D1, termY1, "positives"), true
	case metrics.NameFNR:
		return ratio(termY1D0, termY1, "positives"), true
	case metrics.NamePPV:
		return ratio(termY1D1, termD1, "positive decisions"), true
	case metrics.NameNPV:
		return ratio(termY0D0, termD0, "negative decisions"), true
	case metrics.NameSelectionRate:
		return mean(termD1), true
	case metrics.NameAccuracy:
		return mean(termRight), true
	case metrics.NameBrier:
		return mean(termSq), true
	case metrics.NameLogLoss:
		return mean(termLoss), true
	case metrics.NameCalibrationInTheLarge:
		return mean(termDiff), true
	case metrics.NameECE:
		m := robustMetric{name: name}
		for b := 0; b < bins; b++ {
			m.terms = append(m.terms, termBin0+termID(b))
		}
		m.value = func(th []float64) (float64, error) {
			var s float64
			for _, x := range th {
				s += math.Abs(x)
			}
			return s, nil
		}
		m.grad = func(th, dst []float64) {
			for j, x := range th {
				dst[j] = sign(x)
			}
		}
		return m, true
	}
	return robustMetric{}, false
}

func sign(x float64) float64 {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

// String names the term: "y0", "y1", "d0", "d1", "y0d0" … "y1d1",
// "right", "sq", "loss", "diff", "bin0", "bin1", ….
func (t termID) String() string {
	names := []string{"y0", "y1", "d0", "d1", "y0d0", "y0d1", "y1d0", "y1d1", "right", "sq", "loss", "diff"}
	if int(t) < len(names) {
		return names[t]
	}
	return fmt.Sprintf("bin%d", int(t-termBin0))
}
