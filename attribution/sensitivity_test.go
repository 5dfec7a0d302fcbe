package attribution

import (
	"math"
	"math/rand/v2"
	"testing"
)

// vertexExtremes enumerates every vertex of the box w'_r ∈ {w_r/Λ, w_r·Λ}
// and returns the smallest and largest Σ w' f / Σ w'. A linear-fractional
// function with a positive denominator is quasi-linear, so its extremes
// over a box are attained at vertices (Charnes & Cooper 1962, "Programming
// with linear fractional functionals", Naval Research Logistics Quarterly
// 9, 181–186, from memory): this brute force is the ground truth.
func vertexExtremes(f, w []float64, lambda float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for mask := 0; mask < 1<<len(f); mask++ {
		var num, den float64
		for r := range f {
			x := w[r] / lambda
			if mask&(1<<r) != 0 {
				x = w[r] * lambda
			}
			num += x * f[r]
			den += x
		}
		lo, hi = math.Min(lo, num/den), math.Max(hi, num/den)
	}
	return lo, hi
}

// The sorting solution must equal brute-force enumeration of the box's
// vertices, with continuous and binary f, ties and zero weights.
func TestWeightedMeanBoundsMatchesVertices(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	for trial := 0; trial < 200; trial++ {
		n := 1 + rng.IntN(10)
		f, w := make([]float64, n), make([]float64, n)
		for r := range f {
			switch trial % 3 {
			case 0:
				f[r] = rng.NormFloat64()
			case 1:
				f[r] = float64(rng.IntN(2))
			default:
				f[r] = float64(rng.IntN(3)) // ties
			}
			w[r] = math.Exp(rng.NormFloat64())
			if trial%7 == 0 && r > 0 && rng.IntN(3) == 0 {
				w[r] = 0
			}
		}
		lambda := 1 + 3*rng.Float64()
		lo, hi := WeightedMeanBounds(f, w, lambda)
		blo, bhi := vertexExtremes(f, w, lambda)
		if math.Abs(lo-blo) > 1e-12 || math.Abs(hi-bhi) > 1e-12 {
			t.Fatalf("trial %d: sorting [%v, %v], vertices [%v, %v] (f %v, w %v, Λ %v)", trial, lo, hi, blo, bhi, f, w, lambda)
		}
	}
}

// Λ = 1 gives the weighted mean itself, and the bounds are nested as Λ
// grows (the box at a smaller Λ lies inside the box at a larger one, so
// its extremes cannot lie outside: analytic).
func TestWeightedMeanBoundsPointAndMonotone(t *testing.T) {
	f := []float64{0.3, 1.2, -0.5, 2, 0.7}
	w := []float64{1, 0.5, 2, 0.25, 1.5}
	var num, den float64
	for r := range f {
		num += w[r] * f[r]
		den += w[r]
	}
	lo, hi := WeightedMeanBounds(f, w, 1)
	if lo != hi || math.Abs(lo-num/den) > 1e-15 {
		t.Fatalf("Λ = 1: [%v, %v], weighted mean %v", lo, hi, num/den)
	}
	prevLo, prevHi := lo, hi
	for _, l := range []float64{1.01, 1.1, 1.25, 1.5, 2, 5, 100, 1e4} {
		lo, hi := WeightedMeanBounds(f, w, l)
		if lo > prevLo || hi < prevHi {
			t.Fatalf("Λ %v: [%v, %v] not containing [%v, %v]", l, lo, hi, prevLo, prevHi)
		}
		prevLo, prevHi = lo, hi
	}
	// As Λ grows without bound the bounds tend to the smallest and largest f.
	if math.Abs(prevLo-(-0.5)) > 1e-3 || math.Abs(prevHi-2) > 1e-3 {
		t.Fatalf("Λ = 10⁴: [%v, %v], want about [−0.5, 2]", prevLo, prevHi)
	}
}

// tinySide is a reference side of n records and k = 2 mechanisms.
func tinySide(rng *rand.Rand, n int) *sideEstimate {
	y, s := make([]float64, n), make([]float64, n)
	logr := [][]float64{make([]float64, n), make([]float64, n)}
	for r := 0; r < n; r++ {
		y[r] = float64(r % 2)
		s[r] = rng.Float64()
		logr[0][r], logr[1][r] = rng.NormFloat64(), 0.5*rng.NormFloat64()
	}
	return newSideEstimate(SideReference, y, s, logr)
}

// On a game of two mechanisms and five records, the coalition bounds of
// gameBounder must equal vertex enumeration of each coalition's weights,
// and shapleyBounds must equal the extremes of the Shapley value over
// every combination of the coalitions' vertex weights (the model lets each
// coalition's weights move on their own, so the conservative bound is
// attained there: brute force, Shapley 1953 formula for k = 2).
func TestGameBoundsMatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 1))
	const n, lambda = 5, 1.7
	for _, metric := range []string{"brier", "accuracy", "calibration_in_the_large"} {
		side := tinySide(rng, n)
		f, keep, binary, reason := sensitivityTerms(metric, side.y, side.s, 0.5)
		if reason != "" {
			t.Fatal(reason)
		}
		g := newGameBounder(side, f, keep, binary)
		lo, hi := g.bounds(lambda)
		// Every coalition's vertex values.
		vals := make([][]float64, 4)
		for S := 0; S < 4; S++ {
			w := make([]float64, n)
			for r := range w {
				var l float64
				for i := 0; i < 2; i++ {
					if S&(1<<i) != 0 {
						l += side.logr[i][r]
					}
				}
				w[r] = math.Exp(l)
			}
			la := lambda
			if S == 0 {
				la = 1
			}
			for mask := 0; mask < 1<<n; mask++ {
				var num, den float64
				for r := range w {
					x := w[r] / la
					if mask&(1<<r) != 0 {
						x = w[r] * la
					}
					num += x * f[r]
					den += x
				}
				vals[S] = append(vals[S], num/den)
			}
			blo, bhi := minMax(vals[S])
			if math.Abs(blo-lo[S]) > 1e-12 || math.Abs(bhi-hi[S]) > 1e-12 {
				t.Fatalf("%s S=%d: bounder [%v, %v], vertices [%v, %v]", metric, S, lo[S], hi[S], blo, bhi)
			}
		}
		// φ_0 = ½[v(1) − v(0)] + ½[v(3) − v(2)], φ_1 likewise.
		plo, phi := shapleyBounds(lo, hi, 2)
		var p0, p1 []float64
		v0 := vals[0][0]
		for _, a := range vals[1] {
			for _, b := range vals[2] {
				for _, c := range vals[3] {
					p0 = append(p0, 0.5*(a-v0)+0.5*(c-b))
					p1 = append(p1, 0.5*(b-v0)+0.5*(c-a))
				}
			}
		}
		for i, p := range [][]float64{p0, p1} {
			blo, bhi := minMax(p)
			if math.Abs(blo-plo[i]) > 1e-12 || math.Abs(bhi-phi[i]) > 1e-12 {
				t.Fatalf("%s φ_%d: bounds [%v, %v], brute force [%v, %v]", metric, i, plo[i], phi[i], blo, bhi)
			}
		}
	}
}

func minMax(x []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	return lo, hi
}

// smallestFactor must find the crossing of a known monotone condition
// (Λ ≥ 1.37) to its tolerance.
func TestSmallestFactorBisection(t *testing.T) {
	got := smallestFactor(10, func(l float64) bool { return l >= 1.37 })
	if got < 1.37 || got > 1.37*(1+sensitivityTolerance) {
		t.Fatalf("got %v, want 1.37 within %v", got, sensitivityTolerance)
	}
	if !math.IsInf(smallestFactor(10, func(l float64) bool { return l > 11 }), 1) {
		t.Fatal("a condition that never holds within the range must give +Inf")
	}
	if smallestFactor(10, func(float64) bool { return true }) != 1 {
		t.Fatal("a condition holding at 1 must give 1")
	}
}

// The running-sum bisection of prefixSums must give the scan's extremes
// (boundsSorted, itself checked against the box's vertices above) on
// larger random inputs with ties and zero weights.
func TestPrefixSumsMatchScan(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 2))
	for trial := 0; trial < 300; trial++ {
		n := 1 + rng.IntN(200)
		f, w := make([]float64, n), make([]float64, n)
		for r := range f {
			f[r] = float64(rng.IntN(1 + trial%7))
			if trial%2 == 0 {
				f[r] = rng.NormFloat64()
			}
			w[r] = math.Exp(2 * rng.NormFloat64())
			if r > 0 && rng.IntN(5) == 0 {
				w[r] = 0
			}
		}
		order := sortedByValue(f)
		p := newPrefixSums(order, f, w)
		for _, l := range []float64{1, 1.1, 1.25, 2, 7} {
			lo, hi := p.bounds(l)
			slo, shi := boundsSorted(order, f, w, l)
			if math.Abs(lo-slo) > 1e-9*(1+math.Abs(slo)) || math.Abs(hi-shi) > 1e-9*(1+math.Abs(shi)) {
				t.Fatalf("trial %d Λ %v: running sums [%v, %v], scan [%v, %v]", trial, l, lo, hi, slo, shi)
			}
		}
	}
}
