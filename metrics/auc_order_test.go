package metrics

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestAUCSorterMatchesComparisonSort: the radix order of NewAUCSorter is
// the stable comparison sort of the records by score (ties, −0 and +0
// among them, in record order), and the AUC it gives is the comparison
// sort's bit for bit, on both sides of the radix sort's threshold; with a
// NaN score both take the comparison sort.
func TestAUCSorterMatchesComparisonSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 9))
	for _, n := range []int{5, 300, 2047, 2048, 40000} {
		for _, kind := range []string{"normal", "ties", "zeros", "nan"} {
			y, s, w := make([]float64, n), make([]float64, n), make([]float64, n)
			for i := range s {
				y[i] = float64(rng.IntN(2))
				w[i] = rng.ExpFloat64()
				switch kind {
				case "ties":
					s[i] = float64(rng.IntN(7))
				case "zeros":
					s[i] = []float64{0, math.Copysign(0, -1), 1}[rng.IntN(3)]
				default:
					s[i] = rng.NormFloat64() + y[i]
				}
			}
			if kind == "nan" {
				s[n/3] = math.NaN()
			}
			got := NewAUCSorter(y, s)
			ref := sorterFrom(y, s, compareOrder(s))
			if kind != "nan" {
				want := make([]int, n)
				for i := range want {
					want[i] = i
				}
				slices.SortStableFunc(want, func(a, b int) int { return cmp.Compare(s[a], s[b]) })
				if !slices.Equal(got.Order(), want) {
					t.Fatalf("%s n=%d: order differs from the stable sort", kind, n)
				}
			}
			if !slices.Equal(got.order, ref.order) {
				t.Fatalf("%s n=%d: order differs from the comparison sort", kind, n)
			}
			a, errA := got.Value(w)
			b, errB := ref.Value(w)
			if math.Float64bits(a) != math.Float64bits(b) || (errA == nil) != (errB == nil) {
				t.Errorf("%s n=%d: %v and %v", kind, n, a, b)
			}
		}
	}
}
