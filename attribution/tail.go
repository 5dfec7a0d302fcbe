package attribution

import (
	"math"
	"slices"
	"sort"

	"github.com/gapwise/gapwise/internal/rank"
)

// Tail-shape thresholds for importance weights (Vehtari, Simpson, Gelman,
// Yao & Gabry 2024, "Pareto smoothed importance sampling", JMLR 25; values
// cited from memory): above TailInfiniteVariance the weights' variance is
// infinite and the central limit theorem no longer governs the estimate;
// above TailUnreliable the estimate converges too slowly to be trusted at
// practical sample sizes.
const (
	TailInfiniteVariance = 0.5
	TailUnreliable       = 0.7
)

// TailShape estimates the shape k of the right tail of the weights
// w = exp(logw): it fits a generalised Pareto distribution to the
// exceedances of the M = min(⌈0.2n⌉, ⌈3√n⌉) largest weights over the next
// largest, as Pareto smoothed importance sampling does (Vehtari et al.
// 2024). The fit is the profile-likelihood-weighted estimator of Zhang &
// Stephens (2009, "A new and efficient estimation method for the
// generalized Pareto distribution", Technometrics 51) with the weakly
// informative shrinkage of k towards 0.5 by a prior worth 10 observations
// used in that paper's reference implementation (from memory).
//
// If the weights are distributed like a Pareto variable with tail index α,
// k = 1/α: the r-th moment of w exists iff r < 1/k, so k > 1/2 means
// infinite variance. It reads the tail by selection (topSorted), in O(n).
// It returns NaN when fewer than 5 tail records exist
// or the tail is flat.
func TailShape(logw []float64) float64 {
	n := len(logw)
	m := int(math.Min(math.Ceil(0.2*float64(n)), math.Ceil(3*math.Sqrt(float64(n)))))
	if m < 5 || n <= m {
		return math.NaN()
	}
	lw := topSorted(logw, m+1)
	// Work relative to the largest weight to avoid overflow.
	top := lw[n-1]
	u := math.Exp(lw[n-m-1] - top)
	x := make([]float64, m)
	for i := range x {
		x[i] = math.Exp(lw[n-m+i]-top) - u
	}
	if !(x[m-1] > 0) {
		return math.NaN()
	}
	return gpdShape(x)
}

// topSorted returns a copy of v whose last t values are the t largest of v
// in ascending order, the same values a full sort puts there: by
// quickselect of the (n−t)-th smallest value (rank.SelectKth) and a sort of
// the t values above it. With a NaN in v, which selection does not handle,
// the whole copy is sorted (NaN first, as sort.Float64s does).
func topSorted(v []float64, t int) []float64 {
	c := append([]float64(nil), v...)
	for _, x := range c {
		if x != x {
			sort.Float64s(c)
			return c
		}
	}
	k := len(c) - t
	rank.SelectKth(c, k)
	slices.Sort(c[k:])
	return c
}

// gpdShape is the Zhang–Stephens estimate of the generalised Pareto shape
// from ascending exceedances x (x > 0 at the end), with the prior
// adjustment described at TailShape.
func gpdShape(x []float64) float64 {
	n := len(x)
	const prior = 3
	mm := 30 + int(math.Sqrt(float64(n)))
	quart := x[int(float64(n)/4+0.5)-1]
	if !(quart > 0) {
		quart = x[n-1] / float64(n)
	}
	bs := make([]float64, mm)
	ks := make([]float64, mm)
	ls := make([]float64, mm)
	for j := range bs {
		bs[j] = 1/x[n-1] + (1-math.Sqrt(float64(mm)/(float64(j+1)-0.5)))/(prior*quart)
		var s float64
		for _, xi := range x {
			s += math.Log1p(-bs[j] * xi)
		}
		ks[j] = s / float64(n)
		ls[j] = float64(n) * (math.Log(-bs[j]/ks[j]) - ks[j] - 1)
	}
	// Posterior-mean b with weights w_j = 1/Σ_l exp(L_l − L_j).
	var b, wsum float64
	for j := range bs {
		var d float64
		for l := range ls {
			d += math.Exp(ls[l] - ls[j])
		}
		w := 1 / d
		if math.IsNaN(w) || w < 10*2.220446049250313e-16 {
			continue
		}
		b += w * bs[j]
		wsum += w
	}
	if wsum == 0 {
		return math.NaN()
	}
	b /= wsum
	var k float64
	for _, xi := range x {
		k += math.Log1p(-b * xi)
	}
	k /= float64(n)
	const a = 10
	return k*float64(n)/float64(n+a) + a*0.5/float64(n+a)
}
