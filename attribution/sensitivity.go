package attribution

import (
	"fmt"
	"math"
)

// DefaultSensitivityFactors are the factors Λ at which Sensitivity bounds
// every contribution when SensitivityOptions.Factors is nil.
var DefaultSensitivityFactors = []float64{1.1, 1.25, 1.5, 2}

// DefaultMaxSensitivityFactor is the largest Λ the search for a sign or
// lead change tries when SensitivityOptions.MaxFactor is 0.
const DefaultMaxSensitivityFactor = 10

// sensitivityTolerance is the relative width at which the bisection for
// the smallest Λ stops: the factor returned is at most 0.1% above it.
const sensitivityTolerance = 1e-3

// SensitivityOptions controls Decomposition.Sensitivity.
type SensitivityOptions struct {
	// Factors are the Λ ≥ 1 at which contributions are bounded; nil means
	// DefaultSensitivityFactors.
	Factors []float64
	// MaxFactor is the largest Λ searched for a sign or lead change;
	// 0 means DefaultMaxSensitivityFactor.
	MaxFactor float64
}

// SensitivityBound is the interval [Lower, Upper] a value can take when
// every hybrid's weights may be off by a factor in [1/Factor, Factor].
type SensitivityBound struct {
	Factor, Lower, Upper float64
}

// MetricSensitivity is one metric's sensitivity to hidden confounding.
type MetricSensitivity struct {
	Metric string
	// Skipped, when not empty, says why the metric is not bounded; every
	// other field is then empty.
	Skipped string
	// Estimated bounds the estimated gap v(N) at each factor, and
	// Contributions[i] mechanism i's Shapley value.
	Estimated     []SensitivityBound
	Contributions [][]SensitivityBound
	// EstimatedSignFactor and SignFactors[i] are the smallest Λ at which
	// the bounds of the estimated gap and of contribution i reach zero
	// (their sign could change): 1 for a value of 0, +Inf when not within
	// MaxFactor.
	EstimatedSignFactor float64
	SignFactors         []float64
	// Lead is the mechanism of largest |φ|, and LeadFactor the smallest Λ
	// at which another mechanism's largest possible |φ| reaches the lead's
	// smallest, so that it could lead instead: +Inf when not within
	// MaxFactor or with one mechanism.
	Lead       int
	LeadFactor float64
}

// Sensitivity is the sensitivity analysis of a Decomposition.
type Sensitivity struct {
	Factors   []float64
	MaxFactor float64
	Side      Side // the side whose weighting game is bounded
	Metrics   []MetricSensitivity
}

// sensitivityInput keeps what Sensitivity needs from the point estimate:
// the first side's records and clipped log-weights of fold split 0.
type sensitivityInput struct {
	side      *sideEstimate
	threshold float64
	exact     bool // every coalition value was evaluated (k ≤ ExactLimit)
}

// Sensitivity bounds every metric's contributions and estimated gap under
// a marginal sensitivity model (Tan 2006; Zhao, Small & Bhattacharya
// 2019): an unrecorded factor may move the weights that emulate each
// hybrid distribution P_S by up to a factor Λ per record, in either
// direction. For the grand coalition this is exactly the marginal
// sensitivity model of group membership: w_N(x) = P_cmp(x)/P_ref(x) is an
// odds ratio of membership given the recorded x, and a factor u that
// shifts the odds given (x, u) by at most Λ moves it by at most Λ; the
// same Λ is applied to every other hybrid's weights, which is an
// assumption of this analysis, not a consequence.
//
// The bounds of every coalition value come from WeightedMeanBounds; those
// of the Shapley values from shapleyBounds, which is conservative (each
// coalition value at its own extreme). They are computed on the weighting
// game of the first side of fold split 0 (the reference side whenever it
// estimates) and carried to the reported values as a shift: the bound of
// contribution i is φ̂_i + (φ_i^lo(Λ) − φ_i(1)), φ_i(1) the same game's
// point value, so that Λ = 1 returns the reported values exactly whatever
// the estimator, side mix or number of fold splits. The smallest Λ that
// reverses a sign or the lead is found by bisection on log Λ to a relative
// width of 0.1%, and is exact only up to that.
//
// It returns an error for a factor below 1 or a MaxFactor not above 1,
// and a Sensitivity whose metrics are all Skipped for a Decomposition
// without point-estimate data (a bootstrap replicate).
func (d *Decomposition) Sensitivity(opt SensitivityOptions) (*Sensitivity, error) {
	factors := opt.Factors
	if factors == nil {
		factors = DefaultSensitivityFactors
	}
	maxF := opt.MaxFactor
	if maxF == 0 {
		maxF = DefaultMaxSensitivityFactor
	}
	for _, l := range factors {
		if !(l >= 1) || math.IsInf(l, 1) {
			return nil, fmt.Errorf("attribution: sensitivity factor %v must be a finite number >= 1", l)
		}
	}
	if !(maxF > 1) || math.IsInf(maxF, 1) {
		return nil, fmt.Errorf("attribution: largest sensitivity factor %v must be a finite number > 1", maxF)
	}
	out := &Sensitivity{Factors: append([]float64(nil), factors...), MaxFactor: maxF}
	in := d.sens
	if in != nil {
		out.Side = in.side.side
	}
	for m := range d.Metrics {
		out.Metrics = append(out.Metrics, metricSensitivity(&d.Metrics[m], in, factors, maxF))
	}
	return out, nil
}

func metricSensitivity(md *MetricDecomposition, in *sensitivityInput, factors []float64, maxF float64) MetricSensitivity {
	ms := MetricSensitivity{Metric: md.Metric}
	if in == nil {
		ms.Skipped = "no point-estimate data to bound"
		return ms
	}
	if !in.exact {
		ms.Skipped = SkipSampled
		return ms
	}
	f, keep, binary, reason := sensitivityTerms(md.Metric, in.side.y, in.side.s, in.threshold)
	if reason == "" && !binary && tooLargeToBound(keep, len(in.side.logr)) {
		reason = SkipTooLarge
	}
	if reason != "" {
		ms.Skipped = reason
		return ms
	}
	e := newShiftedBounds(newGameBounder(in.side, f, keep, binary), md)
	for _, l := range factors {
		est, phi := e.at(l)
		ms.Estimated = append(ms.Estimated, est)
		for i := range phi {
			if len(ms.Contributions) <= i {
				ms.Contributions = append(ms.Contributions, nil)
			}
			ms.Contributions[i] = append(ms.Contributions[i], phi[i])
		}
	}
	ms.EstimatedSignFactor = smallestFactor(maxF, func(l float64) bool {
		est, _ := e.at(l)
		return reaches(est, md.Estimated)
	})
	ms.SignFactors = make([]float64, len(md.Contributions))
	for i, v := range md.Contributions {
		ms.SignFactors[i] = smallestFactor(maxF, func(l float64) bool {
			_, phi := e.at(l)
			return reaches(phi[i], v)
		})
	}
	ms.Lead, ms.LeadFactor = leadChange(md.Contributions, e, maxF)
	return ms
}

// reaches reports whether the bound b reaches zero from the side of the
// point value v (always for v = 0).
func reaches(b SensitivityBound, v float64) bool {
	switch {
	case v > 0:
		return b.Lower <= 0
	case v < 0:
		return b.Upper >= 0
	}
	return true
}

// smallestFactor returns the smallest Λ in [1, maxF] at which the
// monotone condition holds, by bisection on log Λ to a relative width of
// sensitivityTolerance (the upper end of the last bracket, so that the
// condition holds there); 1 if it holds at 1 and +Inf if not at maxF.
func smallestFactor(maxF float64, holds func(float64) bool) float64 {
	if holds(1) {
		return 1
	}
	if !holds(maxF) {
		return math.Inf(1)
	}
	lo, hi := 0.0, math.Log(maxF)
	for hi-lo > math.Log1p(sensitivityTolerance) {
		mid := (lo + hi) / 2
		if holds(math.Exp(mid)) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return math.Exp(hi)
}

// leadChange returns the mechanism of largest |φ| (the first on ties) and
// the smallest Λ at which another could lead (see MetricSensitivity).
func leadChange(phi []float64, e *shiftedBounds, maxF float64) (int, float64) {
	lead := 0
	for i, v := range phi {
		if math.Abs(v) > math.Abs(phi[lead]) {
			lead = i
		}
	}
	if len(phi) < 2 {
		return lead, math.Inf(1)
	}
	return lead, smallestFactor(maxF, func(l float64) bool {
		_, b := e.at(l)
		least := 0.0
		if b[lead].Lower > 0 || b[lead].Upper < 0 {
			least = math.Min(math.Abs(b[lead].Lower), math.Abs(b[lead].Upper))
		}
		for j := range b {
			if j != lead && math.Max(math.Abs(b[j].Lower), math.Abs(b[j].Upper)) >= least {
				return true
			}
		}
		return false
	})
}

// tooLargeToBound reports whether a metric that is not a rate has more
// records × coalitions than the running sums may hold
// (sensitivityCacheLimit): without them every evaluation of the bounds
// rebuilds all 2^k coalitions' weights, and the search for the reversing
// factors took minutes at 200,000 records (measured: 600 s of CPU for a
// 6-mechanism decompose with the Brier score), so such a metric is skipped
// with SkipTooLarge rather than slow the whole run.
func tooLargeToBound(keep []bool, k int) bool {
	n := 0
	for _, in := range keep {
		if in {
			n++
		}
	}
	return n<<k > sensitivityCacheLimit
}
