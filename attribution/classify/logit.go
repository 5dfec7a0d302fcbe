package classify

import "math"

// ProbabilityClip is how far a probability-valued column is kept from 0
// and 1 before its logit is taken (Logit), so that a value of exactly 0 or
// 1 (a rule, or a saturated model) gets the finite log-odds ∓13.8 rather
// than ∓∞; the logistic learners' typical-range clamp (TypicalRange) then
// limits how far such values pull a fit.
const ProbabilityClip = 1e-6

// Logit returns the log-odds log(q/(1−q)) of p clipped to
// q ∈ [ProbabilityClip, 1 − ProbabilityClip]: the scale on which a
// probability-valued column, such as a model's score, enters the learners.
// A score made by a logistic model is σ(η) for a linear predictor η of its
// inputs; when the groups differ in inputs the table does not hold, the
// log density ratio of the score given its recorded parents is close to
// linear in η = logit(score) and far from linear in the score itself,
// which the logistic learners would otherwise have to fit with squares
// near 0 and 1 (measured on the score-node case of internal/scm; see
// README "Accuracy"). NaN stays NaN. Logit(1−p) = −Logit(p) exactly: above
// 1/2 it works on 1 − p, which is exact there in floating point (Sterbenz
// lemma).
func Logit(p float64) float64 {
	if p > 0.5 {
		return -Logit(1 - p)
	}
	if math.IsNaN(p) {
		return p
	}
	q := max(p, ProbabilityClip)
	return math.Log(q) - math.Log1p(-q)
}
