package metrics

import (
	"fmt"
	"math"
)

// CalibrationInTheLarge is the weighted mean score minus the weighted event
// rate,
//
//	CITL = Σ w·s / Σ w − Σ w·y / Σ w = Σ w·(s − y) / Σ w.
//
// Positive values mean the model over-predicts on average. If w is nil every
// record weighs 1. A zero total weight gives NaN and an error wrapping
// ErrUndefined. It panics if the slices differ in length.
func CalibrationInTheLarge(labels, scores []float64, w []float64) (float64, error) {
	mustMatch("CalibrationInTheLarge", labels, scores, w)
	var num, den float64
	for i, s := range scores {
		wi := weightAt(w, i)
		num += wi * (s - event(labels[i]))
		den += wi
	}
	return ratio(NameCalibrationInTheLarge, num, den, "records")
}

// ExpectedCalibrationError is the weighted expected calibration error over
// equal-width score bins on [0, 1]. Record i falls in bin
// b = min(⌊s_i·bins⌋, bins−1) (scores below 0 fall in bin 0), and
//
//	ECE = Σ_b (W_b / W) · |mean s_b − mean y_b| = Σ_b |Σ_{i∈b} w_i·(s_i − y_i)| / W,
//
// where W_b is the weight in bin b, W the total weight, and the means are
// weighted. Bins with no weight contribute nothing. If w is nil every
// record weighs 1. bins < 1 gives an error; a zero total weight gives NaN
// and an error wrapping ErrUndefined. It panics if the slices differ in
// length.
func ExpectedCalibrationError(labels, scores []float64, bins int, w []float64) (float64, error) {
	mustMatch("ExpectedCalibrationError", labels, scores, w)
	if bins < 1 {
		return math.NaN(), fmt.Errorf("metrics: %s needs at least 1 bin, got %d", NameECE, bins)
	}
	gap := make([]float64, bins)
	var den float64
	for i, s := range scores {
		wi := weightAt(w, i)
		gap[ScoreBin(s, bins)] += wi * (s - event(labels[i]))
		den += wi
	}
	var num float64
	for _, g := range gap {
		num += math.Abs(g)
	}
	return ratio(NameECE, num, den, "records")
}

// ScoreBin returns the equal-width bin of score on [0, 1]:
// min(⌊score·bins⌋, bins−1), and 0 for scores below 0. It is the binning
// used by ExpectedCalibrationError, ReliabilityCurve and Cell.
func ScoreBin(score float64, bins int) int {
	b := int(score * float64(bins))
	if b >= bins {
		b = bins - 1
	}
	if b < 0 {
		b = 0
	}
	return b
}
