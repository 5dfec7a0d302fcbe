package scm

import (
	"fmt"
	"math/bits"
)

// Shapley returns the Shapley values of the k-player game whose value of
// coalition S is v[S] (S a bit set, len(v) = 2^k):
//
//	φ_i = Σ_{S ⊆ N∖{i}} |S|!·(k−|S|−1)!/k! · (v[S ∪ {i}] − v[S])
//
// (L. S. Shapley 1953, "A value for n-person games", Contributions to the
// Theory of Games II). The sum is evaluated directly over all 2^(k−1)
// coalitions per player; it is meant as an independent reference, not for
// speed. It panics if len(v) is not a power of two.
func Shapley(v []float64) []float64 {
	k := 0
	for 1<<uint(k) < len(v) {
		k++
	}
	if len(v) == 0 || 1<<uint(k) != len(v) {
		panic(fmt.Sprintf("scm: Shapley needs 2^k values, got %d", len(v)))
	}
	// weight[s] = s!(k−s−1)!/k!, built as a ratio of products to stay exact
	// for small k.
	weight := make([]float64, k)
	for s := 0; s < k; s++ {
		w := 1.0 / float64(k)
		// 1/k · 1/C(k−1, s)
		for j := 1; j <= s; j++ {
			w *= float64(j) / float64(k-s-1+j)
		}
		weight[s] = w
	}
	phi := make([]float64, k)
	for i := 0; i < k; i++ {
		bit := 1 << uint(i)
		for S := 0; S < len(v); S++ {
			if S&bit != 0 {
				continue
			}
			phi[i] += weight[bits.OnesCount(uint(S))] * (v[S|bit] - v[S])
		}
	}
	return phi
}
