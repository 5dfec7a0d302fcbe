package metrics

// mustMatch panics with a "metrics: ..." message when labels, scores and
// (non-nil) weights differ in length. Mismatched slices are a programmer
// error, not a data problem.
func mustMatch(fn string, labels, scores, w []float64) {
	if len(labels) != len(scores) {
		panic("metrics: " + fn + ": labels and scores differ in length")
	}
	if w != nil && len(w) != len(labels) {
		panic("metrics: " + fn + ": weights and labels differ in length")
	}
}

// weightAt returns w[i], or 1 when w is nil.
func weightAt(w []float64, i int) float64 {
	if w == nil {
		return 1
	}
	return w[i]
}
