package main

import (
	"fmt"

	"github.com/gapwise/gapwise/attribution"
)

// valueEstimator is one estimator of the coalition values the study
// compares: the weighting estimator, the robust one, or the robust one
// with both groups' records pooled at every step (attribution.Options.
// RobustPool, a study option).
type valueEstimator struct {
	est  attribution.Estimator
	pool bool
}

// String names it as -estimators does: weighting, robust, robust-pooled.
func (e valueEstimator) String() string {
	if e.pool {
		return e.est.String() + "-pooled"
	}
	return e.est.String()
}

// apply sets the estimator in opt.
func (e valueEstimator) apply(opt attribution.Options) attribution.Options {
	opt.Estimator, opt.RobustPool = e.est, e.pool
	return opt
}

// parseValueEstimator turns a -estimators name into a valueEstimator.
func parseValueEstimator(name string) (valueEstimator, error) {
	for _, e := range []valueEstimator{{est: attribution.EstimatorWeighting}, {est: attribution.EstimatorRobust}, {est: attribution.EstimatorRobust, pool: true}} {
		if e.String() == name {
			return e, nil
		}
	}
	return valueEstimator{}, fmt.Errorf("-estimators: %q is not weighting, robust or robust-pooled", name)
}

// firstEstimator is the first -estimators choice (weighting when none),
// the one the -checks study uses.
func (opt options) firstEstimator() valueEstimator {
	if len(opt.estimators) == 0 {
		return valueEstimator{est: attribution.EstimatorWeighting}
	}
	return opt.estimators[0]
}
