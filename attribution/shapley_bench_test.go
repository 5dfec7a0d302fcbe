package attribution

import (
	"math/rand/v2"
	"testing"
)

func BenchmarkExactShapley(b *testing.B) {
	for _, k := range []int{12, 20} {
		rng := rand.New(rand.NewPCG(1, 2))
		v := gameFrom(k, func(uint64) float64 { return rng.Float64() })
		b.Run(benchName("k", k), func(b *testing.B) {
			for b.Loop() {
				ExactShapley(v, k)
			}
		})
	}
}
