package attribution

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestProductKernel checks the kernel against the defining sum computed in
// plain float64 (to 1e-13 relative) and, where the vector kernel runs,
// requires it to match the portable kernel bit for bit.
func TestProductKernel(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 9))
	for _, kc := range []int{1, 2, 7, 64, 256} {
		ldc := 24
		a := make([]float64, kc*kernelRows)
		b := make([]float64, kc*kernelCols)
		for i := range a {
			a[i] = rng.ExpFloat64()
		}
		for i := range b {
			b[i] = rng.ExpFloat64()
		}
		c0 := make([]float64, 3*ldc+kernelCols)
		for i := range c0 {
			c0[i] = rng.Float64()
		}
		got := append([]float64(nil), c0...)
		productKernel(kc, a, b, got, ldc)
		port := append([]float64(nil), c0...)
		portableKernel(kc, a, b, port, ldc)
		for i := 0; i < kernelRows; i++ {
			for j := 0; j < ldc; j++ {
				idx := i*ldc + j
				if idx >= len(c0) {
					continue
				}
				want := c0[idx]
				if j < kernelCols {
					var s float64
					for p := 0; p < kc; p++ {
						s += a[p*kernelRows+i] * b[p*kernelCols+j]
					}
					want += s
				}
				if !relClose(got[idx], want, 1e-13) {
					t.Errorf("kc=%d c[%d][%d] = %v, want %v", kc, i, j, got[idx], want)
				}
				if math.Float64bits(got[idx]) != math.Float64bits(port[idx]) {
					t.Errorf("kc=%d c[%d][%d]: vector %v, portable %v", kc, i, j, got[idx], port[idx])
				}
			}
		}
	}
}

func BenchmarkProductKernel(b *testing.B) {
	kc := 256
	a := make([]float64, kc*kernelRows)
	bb := make([]float64, kc*kernelCols)
	c := make([]float64, kernelRows*kernelCols)
	for i := range a {
		a[i] = 1
	}
	for i := range bb {
		bb[i] = 0.5
	}
	for b.Loop() {
		productKernel(kc, a, bb, c, kernelCols)
	}
	b.ReportMetric(float64(2*kc*kernelRows*kernelCols)*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFLOPS")
}
