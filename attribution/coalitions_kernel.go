package attribution

import "math"

// Panel shapes of the product kernel: the output is updated in blocks of
// kernelRows coalitions of half A × kernelCols coalitions of half B.
const (
	kernelRows = 4
	kernelCols = 8
)

// productKernel adds to the kernelRows × kernelCols block of c at row
// stride ldc the product of a packed A panel and a packed B panel:
//
//	c[i·ldc + j] += Σ_{p<kc} a[p·kernelRows + i] · b[p·kernelCols + j],
//
// each sum accumulated from zero in ascending p with fused multiply-adds and
// then added to c. The vector kernel (amd64 with AVX2 and FMA) and the
// portable one round identically, so results are the same bits on any
// machine. It panics if a panel is too short.
func productKernel(kc int, a, b, c []float64, ldc int) {
	if len(a) < kc*kernelRows || len(b) < kc*kernelCols || len(c) < (kernelRows-1)*ldc+kernelCols {
		panic("attribution: productKernel: panel too short")
	}
	if kc == 0 {
		return
	}
	if useVectorKernel {
		vectorKernel(kc, &a[0], &b[0], &c[0], ldc)
		return
	}
	portableKernel(kc, a, b, c, ldc)
}

// portableKernel is productKernel in plain Go; math.FMA rounds like the
// vector instruction.
func portableKernel(kc int, a, b, c []float64, ldc int) {
	var acc [kernelRows][kernelCols]float64
	for p := 0; p < kc; p++ {
		ap := a[p*kernelRows : p*kernelRows+kernelRows]
		bp := b[p*kernelCols : p*kernelCols+kernelCols]
		for i, x := range ap {
			for j, y := range bp {
				acc[i][j] = math.FMA(x, y, acc[i][j])
			}
		}
	}
	for i := range acc {
		row := c[i*ldc : i*ldc+kernelCols]
		for j := range row {
			row[j] += acc[i][j]
		}
	}
}
