//go:build !amd64

package attribution

// useVectorKernel is false: only amd64 has a vector kernel.
var useVectorKernel = false

func vectorKernel(kc int, a, b, c *float64, ldc int) {
	panic("attribution: no vector kernel on this architecture")
}
