package attribution

import "fmt"

// Estimator names the estimator of the coalition values.
//
//   - EstimatorWeighting: the reweighted records of one or both groups
//     (Side, Mix; Zhang et al. 2023).
//   - EstimatorRobust: the multiply robust estimator, sequential
//     regressions corrected by the same density ratios (robust.go;
//     Quintas-Martínez et al. 2024). AUC, a mean over pairs of records,
//     has no such form and keeps the weighting estimator. The weighting
//     estimate, computed on the way, is compared with it
//     (MetricDecomposition.CrossCheck).
//   - EstimatorBoth: the weighting estimate, with the robust one computed
//     beside it and compared (CrossCheck).
type Estimator int

// Estimators. The zero value means DefaultEstimator.
const (
	EstimatorDefault Estimator = iota
	EstimatorWeighting
	EstimatorRobust
	EstimatorBoth
)

// DefaultEstimator is the estimator used when Options.Estimator is
// EstimatorDefault.
const DefaultEstimator = EstimatorWeighting

// Estimators lists the estimators, for studies.
func Estimators() []Estimator {
	return []Estimator{EstimatorWeighting, EstimatorRobust, EstimatorBoth}
}

// String returns "weighting", "robust", "both" or "default".
func (e Estimator) String() string {
	switch e {
	case EstimatorDefault:
		return "default"
	case EstimatorWeighting:
		return "weighting"
	case EstimatorRobust:
		return "robust"
	case EstimatorBoth:
		return "both"
	}
	return fmt.Sprintf("Estimator(%d)", int(e))
}

// ParseEstimator turns "weighting", "robust" or "both" into an Estimator.
func ParseEstimator(name string) (Estimator, error) {
	for _, e := range Estimators() {
		if e.String() == name {
			return e, nil
		}
	}
	return EstimatorDefault, fmt.Errorf("attribution: unknown estimator %q (want weighting, robust or both)", name)
}

// resolve maps EstimatorDefault to DefaultEstimator.
func (e Estimator) resolve() Estimator {
	if e == EstimatorDefault {
		return DefaultEstimator
	}
	return e
}

// robust reports whether the robust estimator is computed.
func (e Estimator) robust() bool { return e == EstimatorRobust || e == EstimatorBoth }
