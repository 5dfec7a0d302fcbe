package attribution

import (
	"math"
	"math/bits"

	"github.com/gapwise/gapwise/internal/workers"
)

// ExactShapley returns the Shapley values of the k-player game v (Shapley
// 1953, "A value for n-person games"):
//
//	φ_i = Σ_{S ⊆ N∖{i}} |S|!·(k−|S|−1)!/k! · (v(S∪{i}) − v(S)).
//
// v is indexed by coalition bitmask: bit i of S is set when player i (here a
// mechanism, taking the comparison group's form) is in S, so len(v) must be
// 1<<k. The values satisfy Σφ_i = v(N) − v(∅). The cost is O(k·2^k): the k
// sums run concurrently, each over the 2^(k−1) coalitions without i in
// ascending order, so the result does not depend on GOMAXPROCS. The weights
// are computed by the recurrence w(s+1) = w(s)·(s+1)/(k−s−1) from
// w(0) = 1/k, and each sum is compensated, which keeps about 1e-15
// relative precision at k = 20 (see the tests).
//
// For k = 0 it returns an empty slice. It panics if len(v) != 1<<k or k is
// negative or larger than 30.
func ExactShapley(v []float64, k int) []float64 {
	if k < 0 || k > 30 {
		panic("attribution: ExactShapley needs 0 <= k <= 30")
	}
	if len(v) != 1<<k {
		panic("attribution: ExactShapley needs len(v) == 1<<k")
	}
	phi := make([]float64, k)
	if k == 0 {
		return phi
	}
	w := shapleyWeights(k)
	workers.For(0, k, func(_, i int) {
		phi[i] = shapleyOne(v, w, k, i)
	})
	return phi
}

// shapleyWeights returns w[s] = s!·(k−s−1)!/k! for s = 0..k−1.
func shapleyWeights(k int) []float64 {
	w := make([]float64, k)
	w[0] = 1 / float64(k)
	for s := 0; s+1 < k; s++ {
		w[s+1] = w[s] * float64(s+1) / float64(k-s-1)
	}
	return w
}

// shapleyOne sums the weighted marginal contributions of player i over the
// coalitions without i, enumerated by inserting a zero bit at position i
// into every (k−1)-bit number in ascending order. The 2^(k−1) terms are
// added with Neumaier's compensated summation (Neumaier 1974, "Rundungs-
// fehleranalyse einiger Verfahren zur Summation endlicher Summen", from
// memory): plain summation loses about 1e-11 relative at k = 20.
func shapleyOne(v, w []float64, k, i int) float64 {
	bit := uint64(1) << i
	low := bit - 1
	var sum, comp float64
	for t := uint64(0); t < uint64(1)<<(k-1); t++ {
		s := (t&^low)<<1 | t&low
		x := w[bits.OnesCount64(s)] * (v[s|bit] - v[s])
		u := sum + x
		if math.Abs(sum) >= math.Abs(x) {
			comp += (sum - u) + x
		} else {
			comp += (x - u) + sum
		}
		sum = u
	}
	return sum + comp
}
