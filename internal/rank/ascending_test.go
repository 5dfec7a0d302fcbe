package rank

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestAscendingMatchesStableSort compares Ascending with the definition of
// its result, a stable comparison sort of the indices by key < key
// (slices.SortStableFunc), on inputs with many ties, signed zeros,
// infinities, subnormals, sorted and reversed runs, on both sides of the
// length at which the radix sort takes over.
func TestAscendingMatchesStableSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	gen := map[string]func(i int) float64{
		"normal":  func(int) float64 { return rng.NormFloat64() },
		"ties":    func(int) float64 { return float64(rng.IntN(5)) - 2 },
		"rounded": func(int) float64 { return math.Round(100*rng.NormFloat64()) / 100 },
		"zeros": func(int) float64 {
			return []float64{0, math.Copysign(0, -1), 1, -1, math.Inf(1), math.Inf(-1), 5e-324, -5e-324}[rng.IntN(8)]
		},
		"sorted":   func(i int) float64 { return float64(i) },
		"reversed": func(i int) float64 { return -float64(i) },
		"wide":     func(int) float64 { return math.Ldexp(rng.NormFloat64(), rng.IntN(2000)-1000) },
	}
	for name, g := range gen {
		for _, n := range []int{0, 1, 2, 17, radixMin - 1, radixMin, 5000, 70001} {
			keys := make([]float64, n)
			for i := range keys {
				keys[i] = g(i)
			}
			want := make([]int32, n)
			for i := range want {
				want[i] = int32(i)
			}
			slices.SortStableFunc(want, func(a, b int32) int { return cmp.Compare(keys[a], keys[b]) })
			got, ok := Ascending(keys)
			if !ok || !slices.Equal(got, want) {
				t.Fatalf("%s n=%d: ok=%v, order differs from the stable sort", name, n, ok)
			}
		}
	}
}

// TestAscendingNaN: a NaN key has no place in the order.
func TestAscendingNaN(t *testing.T) {
	for _, n := range []int{3, 3000} {
		keys := make([]float64, n)
		keys[n-1] = math.NaN()
		if order, ok := Ascending(keys); ok || order != nil {
			t.Errorf("n=%d: ok=%v with a NaN key", n, ok)
		}
	}
}

// BenchmarkAscending: 1,000,000 normal keys.
//
//	go test ./internal/rank -run '^$' -bench Ascending
func BenchmarkAscending(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	keys := make([]float64, 1_000_000)
	for i := range keys {
		keys[i] = rng.NormFloat64()
	}
	for b.Loop() {
		Ascending(keys)
	}
}
