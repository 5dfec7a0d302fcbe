package fairness

import "github.com/gapwise/gapwise/attribution"

// WarningsOf returns the warnings Run would give for a decomposition of
// nRef reference and nCmp comparison records, with no rows dropped, no
// bootstrap and no column descriptions (so no outlying-value check). It
// lets studies of the checks (cmd/gapwise-accuracy) count how often each
// warning fires on simulated data without writing a spec.
func WarningsOf(dec *attribution.Decomposition, nRef, nCmp int) []Warning {
	r := &Result{
		Groups:   GroupInfo{NReference: nRef, NComparison: nCmp},
		Settings: Settings{EstimateFrom: dec.Side.String(), CombineSides: combineSides(dec)},
	}
	addEstimates(r, dec, nil)
	return Warnings(r)
}
