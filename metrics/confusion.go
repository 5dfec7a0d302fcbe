package metrics

import (
	"fmt"
	"math"
)

// Confusion holds weighted confusion counts of a thresholded score:
//
//	TP = Σ w·[y=1]·[s≥t]   FP = Σ w·[y=0]·[s≥t]
//	TN = Σ w·[y=0]·[s<t]   FN = Σ w·[y=1]·[s<t]
type Confusion struct{ TP, FP, TN, FN float64 }

// ConfusionAt returns the weighted confusion counts when a record is
// decided positive if its score is at least threshold. A label equal to 1
// is an event, any other label a non-event (see CheckLabels). If w is nil
// every record weighs 1. It panics if the slices differ in length.
func ConfusionAt(labels, scores []float64, threshold float64, w []float64) Confusion {
	mustMatch("ConfusionAt", labels, scores, w)
	var c Confusion
	for i, s := range scores {
		wi := weightAt(w, i)
		pos := labels[i] == 1
		dec := s >= threshold
		switch {
		case pos && dec:
			c.TP += wi
		case pos:
			c.FN += wi
		case dec:
			c.FP += wi
		default:
			c.TN += wi
		}
	}
	return c
}

// Total is TP + FP + TN + FN, the total weight.
func (c Confusion) Total() float64 { return c.TP + c.FP + c.TN + c.FN }

// Rate returns the threshold metric called name (NameFPR, NameTPR, NameFNR,
// NamePPV, NameNPV, NameSelectionRate or NameAccuracy):
//
//	fpr = FP/(FP+TN)   tpr = TP/(TP+FN)   fnr = FN/(TP+FN)
//	ppv = TP/(TP+FP)   npv = TN/(TN+FN)
//	selection_rate = (TP+FP)/total       accuracy = (TP+TN)/total
//
// A zero denominator gives NaN and an error wrapping ErrUndefined; any
// other name gives NaN and an error.
func (c Confusion) Rate(name string) (float64, error) {
	switch name {
	case NameFPR:
		return ratio(name, c.FP, c.FP+c.TN, "negatives")
	case NameTPR:
		return ratio(name, c.TP, c.TP+c.FN, "positives")
	case NameFNR:
		return ratio(name, c.FN, c.TP+c.FN, "positives")
	case NamePPV:
		return ratio(name, c.TP, c.TP+c.FP, "positive decisions")
	case NameNPV:
		return ratio(name, c.TN, c.TN+c.FN, "negative decisions")
	case NameSelectionRate:
		return ratio(name, c.TP+c.FP, c.Total(), "records")
	case NameAccuracy:
		return ratio(name, c.TP+c.TN, c.Total(), "records")
	}
	return math.NaN(), fmt.Errorf("metrics: %q is not a threshold metric", name)
}

// RateCounts returns the events and the records behind the rate called
// name, the numerator and denominator of Rate (FP and FP+TN for the FPR,
// and so on); ok is false for a name that is not a threshold rate.
func (c Confusion) RateCounts(name string) (events, records float64, ok bool) {
	switch name {
	case NameFPR:
		return c.FP, c.FP + c.TN, true
	case NameTPR:
		return c.TP, c.TP + c.FN, true
	case NameFNR:
		return c.FN, c.TP + c.FN, true
	case NamePPV:
		return c.TP, c.TP + c.FP, true
	case NameNPV:
		return c.TN, c.TN + c.FN, true
	case NameSelectionRate:
		return c.TP + c.FP, c.Total(), true
	case NameAccuracy:
		return c.TP + c.TN, c.Total(), true
	}
	return 0, 0, false
}

// IsThreshold reports whether the metric called name depends on the
// decision threshold (and so is a function of the confusion counts alone).
func IsThreshold(name string) bool {
	f, _ := FactOf(name)
	return f.Threshold
}
