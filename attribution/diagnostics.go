package attribution

import "math"

// WeightSummary describes a vector of importance weights w over the
// reference records.
type WeightSummary struct {
	ESS       float64 // effective sample size (Σw)²/Σw² (Kish 1965, "Survey Sampling")
	MaxShare  float64 // max_r w_r / Σw
	MeanRatio float64 // Σw / n; ≈ 1 when w is a correct density ratio
}

// SummariseLogWeights summarises w = exp(logw). It returns zeros for an empty
// input.
func SummariseLogWeights(logw []float64) WeightSummary {
	if len(logw) == 0 {
		return WeightSummary{}
	}
	// Scale by the maximum for ESS and MaxShare, which are scale-free.
	m := math.Inf(-1)
	for _, v := range logw {
		m = math.Max(m, v)
	}
	var s, s2, mx, raw float64
	for _, v := range logw {
		w := math.Exp(v - m)
		s += w
		s2 += w * w
		mx = math.Max(mx, w)
		raw += math.Exp(v)
	}
	return WeightSummary{
		ESS:       s * s / s2,
		MaxShare:  mx / s,
		MeanRatio: raw / float64(len(logw)),
	}
}
