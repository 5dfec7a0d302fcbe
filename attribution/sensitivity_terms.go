package attribution

import "github.com/gapwise/gapwise/metrics"

// sensitivityTerms writes a metric as a self-normalised weighted mean over
// a subset of one side's records, M = Σ_{r∈R} w_r f_r / Σ_{r∈R} w_r, the
// form WeightedMeanBounds bounds. With d_r = 1{s_r ≥ threshold}:
//
//	fnr: R = {y = 1}, f = 1 − d      tpr: R = {y = 1}, f = d
//	fpr: R = {y = 0}, f = d          ppv: R = {d = 1}, f = y
//	npv: R = {d = 0}, f = 1 − y      selection_rate: all, f = d
//	accuracy: all, f = 1{y = d}      brier: all, f = (s − y)²
//	log_loss: all, f = ℓ(y, s)       calibration_in_the_large: all, f = s − y
//
// (these are the definitions of metrics.Confusion.Rate and metrics.Stats).
// keep[r] marks the records of R; binary is true when f takes only the
// values 0 and 1. ECE (a sum of absolute differences per score bin, not a
// ratio of sums linear in the weights) and AUC (a ratio of sums over pairs
// of records, bilinear in the weights) are not of this form: for them
// reason says why and f is nil.
func sensitivityTerms(name string, y, s []float64, threshold float64) (f []float64, keep []bool, binary bool, reason string) {
	n := len(y)
	f, keep = make([]float64, n), make([]bool, n)
	for r := range y {
		d := 0.0
		if s[r] >= threshold {
			d = 1
		}
		in, v, ok := sensitivityTerm(name, y[r], s[r], d)
		if !ok {
			return nil, nil, false, skipReason(name)
		}
		keep[r], f[r] = in, v
	}
	switch name {
	case metrics.NameBrier, metrics.NameLogLoss, metrics.NameCalibrationInTheLarge:
		return f, keep, false, ""
	}
	return f, keep, true, ""
}

// sensitivityTerm returns whether a record with label y, score s and decision d
// counts towards the metric, and its f; ok is false for a metric that is
// not a weighted mean.
func sensitivityTerm(name string, y, s, d float64) (in bool, f float64, ok bool) {
	switch name {
	case metrics.NameFNR:
		return y == 1, 1 - d, true
	case metrics.NameTPR:
		return y == 1, d, true
	case metrics.NameFPR:
		return y == 0, d, true
	case metrics.NamePPV:
		return d == 1, y, true
	case metrics.NameNPV:
		return d == 0, 1 - y, true
	case metrics.NameSelectionRate:
		return true, d, true
	case metrics.NameAccuracy:
		if y == d {
			return true, 1, true
		}
		return true, 0, true
	case metrics.NameBrier:
		return true, (s - y) * (s - y), true
	case metrics.NameLogLoss:
		return true, metrics.LogLossTerm(y, s), true
	case metrics.NameCalibrationInTheLarge:
		return true, s - y, true
	}
	return false, 0, false
}

// Reasons a metric's sensitivity is not bounded.
const (
	SkipTooLarge = "too many records × coalitions for the sensitivity bounds of a metric that is not a rate (above 2^22); rates are still bounded"
	SkipECE      = "ECE sums absolute differences per score bin, so it is not a ratio of sums linear in the weights and the sorting bound does not apply"
	SkipAUC      = "AUC sums over pairs of records (bilinear in the weights), so the sorting bound for a weighted mean does not apply"
	SkipSampled  = "the Shapley values were sampled (more mechanisms than exact_limit), so the coalition values are not all available"
	SkipUnknown  = "the metric is not a weighted mean of per-record values"
)

func skipReason(name string) string {
	switch name {
	case metrics.NameECE:
		return SkipECE
	case metrics.NameAUC:
		return SkipAUC
	}
	return SkipUnknown
}
