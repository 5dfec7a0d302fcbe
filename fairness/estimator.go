package fairness

import (
	"math"
	"slices"

	"github.com/gapwise/gapwise/attribution"
	"gonum.org/v1/gonum/stat/distuv"
)

// The estimator of the coalition values (spec key estimator, --estimator;
// attribution.Estimator): weighting (the default), robust (sequential
// regressions corrected by the density ratios, Quintas-Martínez et al.
// 2024; AUC stays weighted), or both (the weighting numbers, with the
// robust ones computed beside them). Whenever both are computed their
// disagreement is reported per contribution against its standard error
// (EstimatorCheck, EstimatorDifference) and warned about beyond
// WarnEstimatorsZ (estimatorsWarning).

// UncertaintyInfluence names the standard errors of MetricUncertainty:
// the influence function of the robust estimator, valid with its fitted
// nuisances (its estimating equation is orthogonal to them), which gives
// Wald intervals without refitting.
const UncertaintyInfluence = "influence_function"

// MetricUncertainty holds, for a metric the robust estimator gives, the
// influence-function standard errors of the observed group metrics and
// their gap and the Wald intervals estimate ± z·SE at Level.
type MetricUncertainty struct {
	Method       string   `json:"method"`
	Level        float64  `json:"level"`
	ReferenceSE  float64  `json:"reference_std_error"`
	ComparisonSE float64  `json:"comparison_std_error"`
	GapSE        float64  `json:"gap_std_error"`
	ReferenceCI  Interval `json:"reference_interval"`
	ComparisonCI Interval `json:"comparison_interval"`
	GapCI        Interval `json:"gap_interval"`
}

// ContributionUncertainty holds a robust contribution's influence-function
// standard error and Wald interval, and the standard errors of its
// what-if values (Alone, IfEqualised).
type ContributionUncertainty struct {
	StdError            float64  `json:"std_error"`
	CI                  Interval `json:"interval"`
	AloneStdError       float64  `json:"alone_std_error"`
	IfEqualisedStdError float64  `json:"gap_if_equalised_std_error"`
}

// EstimatorCheck compares a metric's robust and weighting estimates
// (attribution.EstimatorCheck): the estimated gaps, their difference with
// its standard error (from the two estimators' joint influence, the
// weighting part holding the fitted ratios fixed), and MaxZ, the largest
// |difference| / std_error over the gap and the contributions (absent
// when no standard error is known). The robust estimated gap is the
// observed gap, so the gap difference is minus the weighting residual.
type EstimatorCheck struct {
	RobustEstimated    float64        `json:"robust_estimated_gap"`
	WeightingEstimated float64        `json:"weighting_estimated_gap"`
	GapDifference      SideDifference `json:"gap_difference"`
	MaxZ               *float64       `json:"max_z,omitempty"`
}

// EstimatorDifference is one contribution by both estimators: the robust
// value minus the weighting value, with its standard error.
type EstimatorDifference struct {
	Robust     float64  `json:"robust"`
	Weighting  float64  `json:"weighting"`
	Difference float64  `json:"difference"`
	StdError   *float64 `json:"std_error,omitempty"`
}

// estimatorOf returns the estimator of spec's estimator key.
func estimatorOf(spec *Spec) (attribution.Estimator, error) {
	name, key := spec.Estimator, "estimator"
	if name == "" {
		return attribution.EstimatorDefault, nil
	}
	e, err := attribution.ParseEstimator(name)
	if err != nil {
		return 0, specErr(spec.File, spec.KeyLine(key), key, ErrBadValue, "%v", err)
	}
	return e, nil
}

// nodeReads says which graph nodes the label and the score are functions
// of, in spec.Graph order (the mechanisms' order): the label's node; the
// score's node when the score is a node, or else the nodes of the declared
// model inputs when every input is a graph column and the model does not
// read the group; otherwise unknown (nil: every node).
func nodeReads(spec *Spec) attribution.NodeReads {
	owner := func(col string) int {
		for i, n := range spec.Graph {
			if slices.Contains(n.Columns, col) {
				return i
			}
		}
		return -1
	}
	var r attribution.NodeReads
	if i := owner(spec.Label); i >= 0 {
		r.Label = []int{i}
	}
	switch {
	case spec.ScoreIsNode():
		r.Score = []int{owner(spec.Score)}
	case len(spec.ModelInputs) > 0 && len(spec.OutsideInputs()) == 0 && !readsGroup(spec):
		r.Score = []int{}
		for _, c := range spec.ModelInputs {
			if i := owner(c); i >= 0 && !slices.Contains(r.Score, i) {
				r.Score = append(r.Score, i)
			}
		}
		slices.Sort(r.Score)
	}
	return r
}

// addEstimators records in r which estimator gave each metric, the
// influence-function uncertainty of robust metrics (Wald intervals at
// level) and, where both estimators were computed, their comparison.
func addEstimators(r *Result, dec *attribution.Decomposition, level float64) {
	r.Settings.Estimator = dec.Estimator.String()
	z := distuv.UnitNormal.Quantile((1 + level) / 2)
	wald := func(v, se float64) Interval { return Interval{Low: v - z*se, High: v + z*se} }
	for m, md := range dec.Metrics {
		mr := &r.Metrics[m]
		mr.Estimator = md.Estimator.String()
		mr.RobustUnavailable = md.RobustUnavailable
		if inf := md.Influence; md.Estimator == attribution.EstimatorRobust && inf != nil && allFinite(inf) {
			mr.Uncertainty = &MetricUncertainty{Method: UncertaintyInfluence, Level: level,
				ReferenceSE: inf.Reference, ComparisonSE: inf.Comparison, GapSE: inf.Gap,
				ReferenceCI: wald(md.Reference, inf.Reference), ComparisonCI: wald(md.Comparison, inf.Comparison), GapCI: wald(md.Gap, inf.Gap)}
			for i := range mr.Contributions {
				c := &mr.Contributions[i]
				c.Uncertainty = &ContributionUncertainty{StdError: inf.Contributions[i], CI: wald(md.Contributions[i], inf.Contributions[i]),
					AloneStdError: inf.Alone[i], IfEqualisedStdError: inf.IfEqualised[i]}
			}
			if mr.GapCI == nil {
				useInfluenceIntervals(mr)
			}
		}
		if ck := md.CrossCheck; ck != nil {
			mr.EstimatorCheck = &EstimatorCheck{RobustEstimated: ck.RobustEstimated, WeightingEstimated: ck.WeightingEstimated,
				GapDifference: differenceOf(ck.Gap), MaxZ: finitePtr(math.Min(ck.MaxZ, maxReportedZ))}
			for i := range mr.Contributions {
				d := ck.Contributions[i]
				mr.Contributions[i].EstimatorDifference = &EstimatorDifference{Robust: ck.Robust[i], Weighting: ck.Weighting[i],
					Difference: d.Value, StdError: finitePtr(d.SE)}
			}
		}
	}
}

// useInfluenceIntervals makes a robust metric's Wald intervals its
// intervals when no bootstrap ran, so that every report shows them (the
// reports name the method: Settings.Intervals is then absent and the
// metric's Uncertainty present).
func useInfluenceIntervals(mr *MetricResult) {
	u := mr.Uncertainty
	ref, cmp, gap := u.ReferenceCI, u.ComparisonCI, u.GapCI
	mr.ReferenceCI, mr.ComparisonCI, mr.GapCI = &ref, &cmp, &gap
	for i := range mr.Contributions {
		c := &mr.Contributions[i]
		lo, hi := c.Uncertainty.CI.Low, c.Uncertainty.CI.High
		c.CILow, c.CIHigh = &lo, &hi
	}
}

// differenceOf maps an engine difference; an unknown standard error
// stays absent.
func differenceOf(d attribution.Difference) SideDifference {
	return SideDifference{Difference: d.Value, StdError: finitePtr(d.SE)}
}

// finitePtr returns &x, or nil when x is NaN or infinite.
func finitePtr(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	return &x
}

// allFinite reports whether every standard error of inf is finite.
func allFinite(inf *attribution.InfluenceSE) bool {
	xs := append([]float64{inf.Reference, inf.Comparison, inf.Gap}, inf.Contributions...)
	xs = append(append(xs, inf.Alone...), inf.IfEqualised...)
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}
