package attribution

import (
	"math"
	"math/rand/v2"
	"sort"
	"strconv"
	"testing"
)

// orderCases are inputs for the checks of the O(n) diagnostics against
// full sorts: continuous values, coarse values with many ties, signed
// zeros, and lengths on both sides of the radix sort's threshold.
func orderCases() map[string][]float64 {
	rng := rand.New(rand.NewPCG(11, 12))
	out := map[string][]float64{}
	for _, n := range []int{7, 60, 2047, 2048, 9000, 50001} {
		normal, ties, zeros := make([]float64, n), make([]float64, n), make([]float64, n)
		for i := range normal {
			normal[i] = rng.NormFloat64()
			ties[i] = math.Round(4*rng.NormFloat64()) / 4
			zeros[i] = []float64{0, math.Copysign(0, -1), 0.5, -0.5}[rng.IntN(4)]
		}
		out["normal/"+strconv.Itoa(n)], out["ties/"+strconv.Itoa(n)], out["zeros/"+strconv.Itoa(n)] = normal, ties, zeros
	}
	return out
}

// worstStratumMeanSorted is WorstStratumMean as first written: a stable
// comparison sort of the records by key (sort.SliceStable), the reference
// the radix order must reproduce bit for bit.
func worstStratumMeanSorted(logr, key []float64) float64 {
	n := len(logr)
	order := make([]int, n)
	for r := range order {
		order[r] = r
	}
	sort.SliceStable(order, func(a, b int) bool { return key[order[a]] < key[order[b]] })
	strata := min(RatioStrata, n)
	worst := 1.0
	for q := 0; q < strata; q++ {
		lo, hi := splitRange(n, strata, q)
		var s float64
		for _, r := range order[lo:hi] {
			s += math.Exp(logr[r])
		}
		if m := s / float64(hi-lo); math.Abs(math.Log(m)) > math.Abs(math.Log(worst)) {
			worst = m
		}
	}
	return worst
}

// tailShapeSorted is TailShape with a full sort (sort.Float64s), the
// reference for the selection of the tail.
func tailShapeSorted(logw []float64) float64 {
	n := len(logw)
	m := int(math.Min(math.Ceil(0.2*float64(n)), math.Ceil(3*math.Sqrt(float64(n)))))
	if m < 5 || n <= m {
		return math.NaN()
	}
	lw := append([]float64(nil), logw...)
	sort.Float64s(lw)
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

// same reports whether a and b are the same float64 bit for bit, or both NaN.
func same(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || (math.IsNaN(a) && math.IsNaN(b))
}

// TestWorstStratumMeanMatchesStableSort: the radix order gives exactly the
// value of the stable comparison sort, ties in record order, including
// with a NaN key (the comparison sort's fall-back).
func TestWorstStratumMeanMatchesStableSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for name, key := range orderCases() {
		logr := make([]float64, len(key))
		for i := range logr {
			// Ratios that depend on the key, so the strata differ.
			logr[i] = 0.3*key[i] + 0.2*rng.NormFloat64()
		}
		if got, want := WorstStratumMean(logr, key), worstStratumMeanSorted(logr, key); !same(got, want) {
			t.Errorf("%s: %v, stable sort gives %v", name, got, want)
		}
		nan := append([]float64(nil), key...)
		nan[len(nan)/2] = math.NaN()
		if got, want := WorstStratumMean(logr, nan), worstStratumMeanSorted(logr, nan); !same(got, want) {
			t.Errorf("%s with a NaN key: %v, stable sort gives %v", name, got, want)
		}
	}
}

// TestTailShapeMatchesFullSort: selecting the tail gives exactly the value
// of the full sort, with ties at the tail's boundary and with a NaN.
func TestTailShapeMatchesFullSort(t *testing.T) {
	for name, v := range orderCases() {
		if got, want := TailShape(v), tailShapeSorted(v); !same(got, want) {
			t.Errorf("%s: %v, full sort gives %v", name, got, want)
		}
		nan := append([]float64(nil), v...)
		nan[0] = math.NaN()
		if got, want := TailShape(nan), tailShapeSorted(nan); !same(got, want) {
			t.Errorf("%s with a NaN: %v, full sort gives %v", name, got, want)
		}
	}
}
