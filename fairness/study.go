package fairness

import (
	"slices"

	"github.com/gapwise/gapwise/attribution"
)

// WarningsOf returns the warnings Run would give on the estimate for a
// decomposition of nRef reference and nCmp comparison records: those about
// the mechanisms, the weights and the metrics' estimates. The warnings
// about the data (rows dropped or excluded, sample sizes, model inputs,
// outlying values) and the bootstrap need what a decomposition does not
// carry and are left out. It lets studies of the checks
// (cmd/gapwise-accuracy) count how often each warning fires on simulated
// data without writing a spec.
func WarningsOf(dec *attribution.Decomposition, nRef, nCmp int) []Warning {
	r := &Result{
		Groups:   GroupInfo{NReference: nRef, NComparison: nCmp},
		Settings: Settings{EstimateFrom: dec.Side.String(), CombineSides: combineSides(dec), FoldSplits: dec.FoldSplits},
	}
	addEstimates(r, dec, nil)
	addEstimators(r, dec, DefaultIntervalLevel)
	return slices.DeleteFunc(Warnings(r), func(w Warning) bool {
		return slices.Contains(dataKinds, w.Kind)
	})
}

// dataKinds are the warnings about the data rather than the estimate,
// which WarningsOf leaves out.
var dataKinds = []WarningKind{KindRowsDropped, KindGroupValueNearMiss, KindFewRecords, KindSmallGroup,
	KindModelInputOutside, KindModelReadsGroup, KindOutlyingValues, KindBootstrapFailures}
