package attribution

// shiftedBounds turns one side's coalition bounds into bounds of the
// reported values: the shift of each Shapley value (and of v(N)) from its
// point value at Λ = 1 on the bounded game, added to the reported one (see
// Decomposition.Sensitivity).
type shiftedBounds struct {
	g        *gameBounder
	md       *MetricDecomposition
	phi0     []float64 // Shapley values of the bounded game at Λ = 1
	est0     float64   // its v(N) at Λ = 1
	lastL    float64
	lastEst  SensitivityBound
	lastPhis []SensitivityBound
}

func newShiftedBounds(g *gameBounder, md *MetricDecomposition) *shiftedBounds {
	e := &shiftedBounds{g: g, md: md}
	lo, hi := g.bounds(1)
	e.phi0, _ = shapleyBounds(lo, hi, g.k)
	e.est0 = lo[len(lo)-1] - lo[0]
	return e
}

// at returns the bounds of the estimated gap and of every contribution at
// factor Λ (the last call's result is reused for the same Λ).
func (e *shiftedBounds) at(lambda float64) (SensitivityBound, []SensitivityBound) {
	if e.lastPhis != nil && e.lastL == lambda {
		return e.lastEst, e.lastPhis
	}
	lo, hi := e.g.bounds(lambda)
	plo, phi := shapleyBounds(lo, hi, e.g.k)
	full := len(lo) - 1
	est := SensitivityBound{
		Factor: lambda,
		Lower:  e.md.Estimated + (lo[full] - hi[0] - e.est0),
		Upper:  e.md.Estimated + (hi[full] - lo[0] - e.est0),
	}
	out := make([]SensitivityBound, len(plo))
	for i := range plo {
		v := e.md.Contributions[i]
		out[i] = SensitivityBound{Factor: lambda, Lower: v + (plo[i] - e.phi0[i]), Upper: v + (phi[i] - e.phi0[i])}
	}
	e.lastL, e.lastEst, e.lastPhis = lambda, est, out
	return est, out
}
