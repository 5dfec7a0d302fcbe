package metrics

// BrierScore is the weighted mean squared error of the scores,
//
//	Brier = Σ w·(s − y)² / Σ w,
//
// (Brier 1950, "Verification of forecasts expressed in terms of
// probability"). A label equal to 1 counts as y = 1, any other as y = 0. If
// w is nil every record weighs 1. A zero total weight gives NaN and an error
// wrapping ErrUndefined. It panics if the slices differ in length.
func BrierScore(labels, scores []float64, w []float64) (float64, error) {
	mustMatch("BrierScore", labels, scores, w)
	var num, den float64
	for i, s := range scores {
		wi := weightAt(w, i)
		d := s - event(labels[i])
		num += wi * d * d
		den += wi
	}
	return ratio(NameBrier, num, den, "records")
}

// LogLoss is the weighted mean negative log-likelihood of the labels,
//
//	LogLoss = Σ w·ℓ(y, s) / Σ w,   ℓ(y, s) = −[y·log s + (1−y)·log(1−s)],
//
// with s clipped to [LogLossEps, 1−LogLossEps] (see LogLossTerm). If w is
// nil every record weighs 1. A zero total weight gives NaN and an error
// wrapping ErrUndefined. It panics if the slices differ in length.
func LogLoss(labels, scores []float64, w []float64) (float64, error) {
	mustMatch("LogLoss", labels, scores, w)
	var num, den float64
	for i, s := range scores {
		wi := weightAt(w, i)
		num += wi * LogLossTerm(labels[i], s)
		den += wi
	}
	return ratio(NameLogLoss, num, den, "records")
}

// event maps a label to 1 if it equals 1 and to 0 otherwise.
func event(label float64) float64 {
	if label == 1 {
		return 1
	}
	return 0
}
