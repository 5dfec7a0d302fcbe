package synth

import (
	"math"
	"math/rand/v2"
)

// stream is a source of uniform draws in the open interval (0, 1). Every
// draw consumes exactly one 64-bit output of the generator, so two runs that
// make the same sequence of calls see the same numbers, whatever the values
// drawn: samplers built on it can be coupled across hybrid distributions
// (common random numbers).
type stream struct{ r *rand.Rand }

// newStream seeds a PCG generator from seed. The second PCG word is a fixed
// odd constant so that seed 0 is as good as any other.
func newStream(seed uint64) stream {
	return stream{rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))}
}

// uniform returns (k + 0.5) / 2^53 for a random 53-bit k: never 0 or 1.
func (s stream) uniform() float64 {
	return (float64(s.r.Uint64()>>11) + 0.5) / (1 << 53)
}

// normalQuantile is Φ⁻¹(u) = −√2 · erfc⁻¹(2u), the standard normal quantile.
func normalQuantile(u float64) float64 {
	return -math.Sqrt2 * math.Erfcinv(2*u)
}

// normalCDF is Φ(z) = erfc(−z/√2) / 2.
func normalCDF(z float64) float64 {
	return 0.5 * math.Erfc(-z/math.Sqrt2)
}

// truncNormal maps a uniform u to N(mu, sd²) truncated to [lo, hi] by
// inversion: x = mu + sd·Φ⁻¹(Φ(a) + u·(Φ(b) − Φ(a))), a = (lo−mu)/sd,
// b = (hi−mu)/sd.
func truncNormal(u, mu, sd, lo, hi float64) float64 {
	pa := normalCDF((lo - mu) / sd)
	pb := normalCDF((hi - mu) / sd)
	x := mu + sd*normalQuantile(pa+u*(pb-pa))
	return math.Min(hi, math.Max(lo, x)) // guard against rounding at the ends
}

// sigmoid is 1 / (1 + e^(−z)).
func sigmoid(z float64) float64 {
	return 1 / (1 + math.Exp(-z))
}

// round returns x rounded to d decimals, as a recorded lab value would be.
func round(x float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(x*p) / p
}
