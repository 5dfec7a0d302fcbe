package classify

// WarmStarter is a learner that can start its fit from a model it fitted
// before on similar data, such as a bootstrap replicate's refit starting
// from the full-data fit. The minimiser, and so the fitted model, is the
// same as from the cold start up to the solver's tolerance; only the
// number of iterations changes.
type WarmStarter interface {
	Learner
	// WithWarmStart returns a copy of the learner that starts from m, or
	// the learner unchanged when m is not a model of its kind.
	WithWarmStart(m Model) Learner
}

// WithWarmStart returns a copy of l whose fits start from m's
// coefficients (see Linear.Warm); l itself if m is not a *LogisticModel.
func (l Linear) WithWarmStart(m Model) Learner {
	if lm, ok := m.(*LogisticModel); ok {
		l.Warm = lm
	}
	return l
}

// WithWarmStart returns a copy of e whose fits start from m's
// coefficients (see Expanded.Warm); e itself if m is not a
// *LogisticModel.
func (e Expanded) WithWarmStart(m Model) Learner {
	if lm, ok := m.(*LogisticModel); ok {
		e.Warm = lm
	}
	return e
}

// WithWarmStart returns a copy of b whose Start learner starts from the
// start model of m (a *BoostedModel whose trees grew from a fitted start),
// when Start is a WarmStarter; b itself otherwise. The trees are grown
// afresh.
func (b Boosted) WithWarmStart(m Model) Learner {
	bm, ok := m.(*BoostedModel)
	if !ok || bm.start == nil {
		return b
	}
	if ws, ok := b.Start.(WarmStarter); ok {
		b.Start = ws.WithWarmStart(bm.start.model)
	}
	return b
}

// startFor writes m's intercept and coefficients into theta (intercept
// first) and returns true when m is non-nil and its basis has the same
// raw column count and terms as b, so that its coefficients apply to the
// new design term by term. The new design standardises its terms on its
// own rows, so the start is close to the new minimiser, not at it, when
// the rows differ (a resample of the same records: means and scales move
// by O(n^−½)). Otherwise theta is left as it is.
func (m *LogisticModel) startFor(b *basis, theta []float64) bool {
	if m == nil || m.b.p != b.p || len(m.b.terms) != len(b.terms) || len(theta) != 1+len(m.coef) {
		return false
	}
	for k, t := range m.b.terms {
		if b.terms[k] != t {
			return false
		}
	}
	theta[0] = m.intercept
	copy(theta[1:], m.coef)
	return true
}
