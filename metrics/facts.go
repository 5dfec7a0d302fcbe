package metrics

import "math"

// Records says which records a metric counts; a metric is undefined on a
// sample that has none of them.
type Records int

const (
	AllRecords      Records = iota // every record
	Negatives                      // records with label 0 (FPR)
	Positives                      // records with label 1 (TPR, FNR)
	DecidedPositive                // records with score ≥ threshold (PPV)
	DecidedNegative                // records with score < threshold (NPV)
	BothClasses                    // needs label 0 and label 1 records (AUC)
)

// Fact is what the rest of gapwise needs to know about a metric besides
// how to compute it: its name in specs and outputs, its title in running
// text, whether it is a share of records (printed as a percentage, gaps in
// percentage points), whether it depends on the decision threshold, which
// records it counts (hence when it is undefined), and the range [Min,
// Max] its values can take (Max is +Inf for the log loss), so that a gap
// or a Shapley value of it lies within ±(Max − Min).
type Fact struct {
	Name       string
	Title      string
	Proportion bool
	Threshold  bool
	Counts     Records
	Min, Max   float64
}

// facts is the one table of metric facts, in the order of Names. The
// ranges follow from the definitions: rates, predictive values, the Brier
// score, the ECE and the AUC lie in [0, 1]; the mean score minus the event
// rate in [−1, 1]; the log loss in [0, ∞).
var facts = []Fact{
	{NameFPR, "false-positive rate", true, true, Negatives, 0, 1},
	{NameTPR, "true-positive rate", true, true, Positives, 0, 1},
	{NameFNR, "false-negative rate", true, true, Positives, 0, 1},
	{NamePPV, "positive predictive value", true, true, DecidedPositive, 0, 1},
	{NameNPV, "negative predictive value", true, true, DecidedNegative, 0, 1},
	{NameSelectionRate, "share flagged positive", true, true, AllRecords, 0, 1},
	{NameAccuracy, "accuracy", true, true, AllRecords, 0, 1},
	{NameBrier, "Brier score", false, false, AllRecords, 0, 1},
	{NameLogLoss, "log loss", false, false, AllRecords, 0, math.Inf(1)},
	{NameCalibrationInTheLarge, "calibration-in-the-large (mean score − event rate)", false, false, AllRecords, -1, 1},
	{NameECE, "expected calibration error", false, false, AllRecords, 0, 1},
	{NameAUC, "area under the ROC curve", false, false, BothClasses, 0, 1},
}

// Facts returns the facts of every supported metric, in the order of Names.
func Facts() []Fact { return append([]Fact(nil), facts...) }

// FactOf returns the facts of the metric called name; ok is false for an
// unknown name.
func FactOf(name string) (f Fact, ok bool) {
	for _, f := range facts {
		if f.Name == name {
			return f, true
		}
	}
	return Fact{}, false
}

// UndefinedReason says, as a clause for error messages, why a metric has
// no value on a group: "it has no negatives", "it has no positives", ...
func (f Fact) UndefinedReason() string {
	switch f.Counts {
	case Negatives:
		return "it has no negatives"
	case Positives:
		return "it has no positives"
	case DecidedPositive:
		return "no record is decided positive at this threshold"
	case DecidedNegative:
		return "no record is decided negative at this threshold"
	case BothClasses:
		return "it needs both positives and negatives"
	}
	return "it has no records"
}

// BasisNoun names, in the plural, the records Basis counts: "positives",
// "negatives", "records decided positive", ...
func (f Fact) BasisNoun() string {
	switch f.Counts {
	case Negatives:
		return "negatives"
	case Positives:
		return "positives"
	case DecidedPositive:
		return "records decided positive"
	case DecidedNegative:
		return "records decided negative"
	case BothClasses:
		return "records in the rarer class"
	}
	return "records"
}

// Basis returns how many records a metric rests on in a sample with the
// given labels (0/1) and scores: the records it counts (negatives for the
// FPR, positives for the TPR and FNR, records decided positive, score ≥
// threshold, for the PPV, decided negative for the NPV, every record for
// the others), and for the AUC the smaller of the two classes, since its
// precision is limited by the rarer one (Hanley & McNeil 1982, Radiology
// 143:29, cited from memory). It panics when labels and scores differ in
// length.
func (f Fact) Basis(labels, scores []float64, threshold float64) int {
	if len(labels) != len(scores) {
		panic("metrics: Basis: labels and scores differ in length")
	}
	var pos, neg, decPos int
	for i, y := range labels {
		if y == 1 {
			pos++
		} else {
			neg++
		}
		if scores[i] >= threshold {
			decPos++
		}
	}
	switch f.Counts {
	case Negatives:
		return neg
	case Positives:
		return pos
	case DecidedPositive:
		return decPos
	case DecidedNegative:
		return len(labels) - decPos
	case BothClasses:
		return min(pos, neg)
	}
	return len(labels)
}
