package attribution

import (
	"math"
	"sort"
)

// WeightedMeanBounds returns the smallest and largest values of the
// self-normalised weighted mean
//
//	μ(w') = Σ_r w'_r f_r / Σ_r w'_r
//
// over every weight vector with w'_r ∈ [w_r/Λ, w_r·Λ] for each record r
// independently: the marginal sensitivity model of Tan (2006, JASA 101,
// 1619–1637, from memory) as used for weighting estimators by Zhao, Small &
// Bhattacharya (2019, "Sensitivity analysis for inverse probability
// weighting estimators via the percentile bootstrap", JRSS B 81(4),
// 735–761), where each weight is a density ratio that an unrecorded factor
// may move by up to the factor Λ.
//
// The maximisation is a linear-fractional programme over a box. Its optimum
// is attained at a vertex, and at the optimum value μ* a record gains from
// its upper weight exactly when f_r > μ* (∂μ/∂w'_r has the sign of
// f_r − μ), so the maximiser puts w_r·Λ on the records of largest f and
// w_r/Λ on the rest (the thresholding solution Zhao et al. 2019 use for
// their bounds, from memory of the paper). Sorting the records
// by f once and scanning the n+1 split points with running sums finds it in
// O(n log n); the minimum is the same scan with the order reversed.
//
// Λ = 1 returns lo = hi = Σ w f / Σ w exactly (the point estimate). It
// returns NaN bounds when Σ w = 0 and panics if f and w differ in length
// or Λ < 1. Weights must be non-negative.
func WeightedMeanBounds(f, w []float64, lambda float64) (lo, hi float64) {
	if len(f) != len(w) {
		panic("attribution: WeightedMeanBounds needs f and w of one length")
	}
	order := sortedByValue(f)
	return boundsSorted(order, f, w, lambda)
}

// sortedByValue returns the indices of f in ascending order of f (ties by
// index, so that the order is deterministic).
func sortedByValue(f []float64) []int {
	order := make([]int, len(f))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return f[order[a]] < f[order[b]] })
	return order
}

// pointMean is Σ w f / Σ w over the records of order, summed in order.
func pointMean(order []int, f, w []float64) float64 {
	var num, den float64
	for _, r := range order {
		num += w[r] * f[r]
		den += w[r]
	}
	return num / den
}

// boundsSorted is WeightedMeanBounds over the records of order, which lists
// them in ascending order of f.
func boundsSorted(order []int, f, w []float64, lambda float64) (lo, hi float64) {
	if lambda < 1 || math.IsNaN(lambda) {
		panic("attribution: sensitivity factor Λ must be >= 1")
	}
	if lambda == 1 {
		m := pointMean(order, f, w)
		return m, m
	}
	return extremeMean(order, f, w, 1/lambda, lambda, false), extremeMean(order, f, w, 1/lambda, lambda, true)
}

// extremeMean scans the split points of order (ascending f): for the
// maximum (upper true) the records after the split get factor up and those
// before it factor down; for the minimum the other way round. It returns
// the best mean over all n+1 splits.
func extremeMean(order []int, f, w []float64, down, up float64, upper bool) float64 {
	// Start with every record at the factor it takes when it lies on the
	// "before" side of the split, then move records one by one across.
	before, after := down, up
	if !upper {
		before, after = up, down
	}
	var num, den float64
	for _, r := range order {
		num += after * w[r] * f[r]
		den += after * w[r]
	}
	best := math.NaN()
	take := func(m float64) {
		if math.IsNaN(best) || (upper && m > best) || (!upper && m < best) {
			best = m
		}
	}
	if den > 0 {
		take(num / den)
	}
	for _, r := range order {
		d := (before - after) * w[r]
		num += d * f[r]
		den += d
		if den > 0 {
			take(num / den)
		}
	}
	return best
}

// prefixSums holds, over records in ascending order of f, the running
// sums PW[j] = Σ_{a<j} w and PF[j] = Σ_{a<j} w·f (j = 0..n), from which
// the mean at any split point and any Λ is O(1).
type prefixSums struct {
	f      []float64 // f in the same order
	PW, PF []float64
}

func newPrefixSums(order []int, f, w []float64) prefixSums {
	p := prefixSums{f: make([]float64, len(order)), PW: make([]float64, len(order)+1), PF: make([]float64, len(order)+1)}
	for a, r := range order {
		p.f[a] = f[r]
		p.PW[a+1] = p.PW[a] + w[r]
		p.PF[a+1] = p.PF[a] + w[r]*f[r]
	}
	return p
}

// bounds is boundsSorted from the running sums, in O(log n): with the
// first j records at factor b and the rest at a, the mean is
//
//	g(j) = (b·PF_j + a·(PF_n − PF_j)) / (b·PW_j + a·(PW_n − PW_j)),
//
// and moving record j across improves the extreme exactly when f_j < g(j)
// (for the maximum b = 1/Λ, a = Λ; for the minimum b = Λ, a = 1/Λ). As f
// rises along the order and g stops improving once f_j ≥ g(j), that
// condition is false and then true, so the best split is the first j
// where it holds, found by bisection (sort.Search).
func (p prefixSums) bounds(lambda float64) (lo, hi float64) {
	n := len(p.f)
	if lambda == 1 {
		m := p.PF[n] / p.PW[n]
		return m, m
	}
	best := func(b, a float64) float64 {
		g := func(j int) float64 {
			return (b*p.PF[j] + a*(p.PF[n]-p.PF[j])) / (b*p.PW[j] + a*(p.PW[n]-p.PW[j]))
		}
		j := sort.Search(n, func(j int) bool { return p.f[j] >= g(j) })
		return g(j)
	}
	return best(lambda, 1/lambda), best(1/lambda, lambda)
}
