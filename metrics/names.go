// Package metrics computes weighted performance metrics of a binary
// classifier's scores: threshold rates (FPR, TPR, ...), proper scoring rules
// (Brier, log loss), calibration summaries and AUC. Every function takes
// optional weights; nil means every record weighs 1.
package metrics

import "errors"

// Metric names accepted in specs and printed in outputs.
const (
	NameFPR                   = "fpr"
	NameTPR                   = "tpr"
	NameFNR                   = "fnr"
	NamePPV                   = "ppv"
	NameNPV                   = "npv"
	NameSelectionRate         = "selection_rate"
	NameAccuracy              = "accuracy"
	NameBrier                 = "brier"
	NameLogLoss               = "log_loss"
	NameCalibrationInTheLarge = "calibration_in_the_large"
	NameECE                   = "ece"
	NameAUC                   = "auc"
	DefaultECEBins            = 10
)

// Names lists every supported metric name in a fixed order (that of the
// facts table, Facts).
func Names() []string {
	out := make([]string, len(facts))
	for i, f := range facts {
		out[i] = f.Name
	}
	return out
}

// Known reports whether name is a supported metric.
func Known(name string) bool {
	_, ok := FactOf(name)
	return ok
}

// ErrUndefined is wrapped by errors for a metric that has no value on the
// given sample, e.g. FPR when there are no negatives.
var ErrUndefined = errors.New("metric undefined")
