package metrics

// The threshold metrics below decide a record positive when its score is at
// least threshold and return ratios of the weighted confusion counts of
// ConfusionAt (see Confusion.Rate for the formulas). If w is nil every record
// weighs 1. A zero denominator gives NaN and an error wrapping ErrUndefined
// that names the metric. They panic if the slices differ in length.

// FalsePositiveRate is FP/(FP+TN): the weighted share of non-events decided
// positive.
func FalsePositiveRate(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NameFPR)
}

// TruePositiveRate (sensitivity, recall) is TP/(TP+FN): the weighted share
// of events decided positive.
func TruePositiveRate(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NameTPR)
}

// FalseNegativeRate is FN/(TP+FN) = 1 − TPR: the weighted share of events
// missed.
func FalseNegativeRate(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NameFNR)
}

// PositivePredictiveValue (precision) is TP/(TP+FP): the weighted share of
// positive decisions that are events.
func PositivePredictiveValue(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NamePPV)
}

// NegativePredictiveValue is TN/(TN+FN): the weighted share of negative
// decisions that are non-events.
func NegativePredictiveValue(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NameNPV)
}

// SelectionRate is (TP+FP)/total: the weighted share of records decided
// positive.
func SelectionRate(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NameSelectionRate)
}

// Accuracy is (TP+TN)/total: the weighted share of correct decisions.
func Accuracy(labels, scores []float64, threshold float64, w []float64) (float64, error) {
	return ConfusionAt(labels, scores, threshold, w).Rate(NameAccuracy)
}
