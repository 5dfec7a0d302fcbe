package metrics

import (
	"fmt"
	"math"
)

// Compute returns the metric called name (one of Names) on the records.
// threshold is used only by the threshold metrics (see IsThreshold) and
// bins only by NameECE. If w is nil every record weighs 1. An unknown name
// gives NaN and an error; a metric without a value on this sample gives NaN
// and an error wrapping ErrUndefined. It panics if the slices differ in
// length.
func Compute(name string, labels, scores []float64, threshold float64, bins int, w []float64) (float64, error) {
	if IsThreshold(name) {
		return ConfusionAt(labels, scores, threshold, w).Rate(name)
	}
	switch name {
	case NameBrier:
		return BrierScore(labels, scores, w)
	case NameLogLoss:
		return LogLoss(labels, scores, w)
	case NameCalibrationInTheLarge:
		return CalibrationInTheLarge(labels, scores, w)
	case NameECE:
		return ExpectedCalibrationError(labels, scores, bins, w)
	case NameAUC:
		return AUC(labels, scores, w)
	}
	mustMatch("Compute", labels, scores, w)
	return math.NaN(), fmt.Errorf("metrics: unknown metric %q (known: %v)", name, Names())
}
