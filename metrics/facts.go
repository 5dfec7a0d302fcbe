package metrics

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
// percentage points), whether it depends on the decision threshold, and
// which records it counts (hence when it is undefined).
type Fact struct {
	Name       string
	Title      string
	Proportion bool
	Threshold  bool
	Counts     Records
}

// facts is the one table of metric facts, in the order of Names.
var facts = []Fact{
	{NameFPR, "false-positive rate", true, true, Negatives},
	{NameTPR, "true-positive rate", true, true, Positives},
	{NameFNR, "false-negative rate", true, true, Positives},
	{NamePPV, "positive predictive value", true, true, DecidedPositive},
	{NameNPV, "negative predictive value", true, true, DecidedNegative},
	{NameSelectionRate, "share flagged positive", true, true, AllRecords},
	{NameAccuracy, "accuracy", true, true, AllRecords},
	{NameBrier, "Brier score", false, false, AllRecords},
	{NameLogLoss, "log loss", false, false, AllRecords},
	{NameCalibrationInTheLarge, "calibration-in-the-large (mean score − event rate)", false, false, AllRecords},
	{NameECE, "expected calibration error", false, false, AllRecords},
	{NameAUC, "area under the ROC curve", false, false, BothClasses},
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
