// Package classify provides probabilistic binary classifiers used to estimate
// density ratios between two groups: a classifier of group membership
// P(comparison | x) turns into the ratio p_cmp(x)/p_ref(x) through its
// log-odds (Bickel, Brückner & Scheffer 2009, "Discriminative learning under
// covariate shift").
//
// Every learner here is deterministic for a given seed and input.
package classify

import "gonum.org/v1/gonum/mat"

// Learner fits a binary classifier. Implementations must be safe for
// concurrent use by several goroutines (Fit must not mutate the Learner).
type Learner interface {
	// Name identifies the learner in diagnostics and specs, e.g. "linear".
	Name() string
	// Fit trains on the rows of x with 0/1 targets y and optional
	// non-negative weights w (nil means all 1). seed drives any randomness.
	// It returns an error when the data cannot be fitted (e.g. no rows).
	Fit(x *mat.Dense, y, w []float64, seed uint64) (Model, error)
}

// Model is a fitted classifier.
type Model interface {
	// LogOdds writes log P(y=1|x)/P(y=0|x) for every row of x into dst,
	// which must have length x.Rows(); it panics otherwise.
	LogOdds(x *mat.Dense, dst []float64)
}
