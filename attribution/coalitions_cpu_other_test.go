//go:build !unix

package attribution

import "math"

// cpuSeconds is not measured on this platform.
func cpuSeconds() float64 { return math.NaN() }
