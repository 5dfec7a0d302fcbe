package attribution

import "golang.org/x/sys/cpu"

// useVectorKernel selects the AVX2/FMA product kernel when the processor
// and operating system support it.
var useVectorKernel = cpu.X86.HasAVX2 && cpu.X86.HasFMA

// vectorKernel is productKernel in AVX2 with FMA; see
// coalitions_kernel_amd64.s. The caller guarantees kc > 0 and the panel
// lengths.
//
//go:noescape
func vectorKernel(kc int, a, b, c *float64, ldc int)
