//go:build unix

package attribution

import (
	"math"
	"syscall"
)

// cpuSeconds is the process's user+system CPU time, reported by the
// benchmarks beside wall time because a shared machine is often loaded.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return math.NaN()
	}
	return float64(ru.Utime.Sec+ru.Stime.Sec) + float64(ru.Utime.Usec+ru.Stime.Usec)/1e6
}
