package rank

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSelectKth compares every order statistic with the sorted slice (the
// definition of the k-th smallest value), on random, tied, sorted and
// reversed inputs, and checks the partition property.
func TestSelectKth(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	gen := map[string]func(n int) []float64{
		"normal": func(n int) []float64 {
			v := make([]float64, n)
			for i := range v {
				v[i] = rng.NormFloat64()
			}
			return v
		},
		"ties": func(n int) []float64 {
			v := make([]float64, n)
			for i := range v {
				v[i] = float64(rng.IntN(3))
			}
			return v
		},
		"sorted": func(n int) []float64 {
			v := make([]float64, n)
			for i := range v {
				v[i] = float64(i)
			}
			return v
		},
		"reversed": func(n int) []float64 {
			v := make([]float64, n)
			for i := range v {
				v[i] = float64(n - i)
			}
			return v
		},
	}
	for name, g := range gen {
		for _, n := range []int{1, 2, 17, 100, 1001} {
			base := g(n)
			want := slices.Clone(base)
			slices.Sort(want)
			for _, k := range []int{0, n / 100, n / 2, n - 1 - n/100, n - 1} {
				v := slices.Clone(base)
				if got := SelectKth(v, k); got != want[k] {
					t.Fatalf("%s n=%d k=%d: %v, want %v", name, n, k, got, want[k])
				}
				for i, x := range v {
					if (i < k && x > v[k]) || (i > k && x < v[k]) {
						t.Fatalf("%s n=%d k=%d: v[%d] = %v on the wrong side of %v", name, n, k, i, x, v[k])
					}
				}
			}
		}
	}
}
