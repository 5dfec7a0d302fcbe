package attribution

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"
)

// IntervalForm is how a bootstrap interval is read off the replicates.
type IntervalForm string

// Interval forms.
const (
	// FormNormal: the estimate ± t_{B−1} times the replicates' standard
	// deviation (NormalInterval); a rate's observed values and gap by
	// their score intervals (WilsonInterval, NewcombeInterval).
	FormNormal IntervalForm = "normal"
	// FormPercentile: the replicates' quantiles (PercentileInterval).
	FormPercentile IntervalForm = "percentile"
)

// DefaultIntervalForm is the form of Intervals.Form "".
const DefaultIntervalForm = FormNormal

// Known reports whether f is FormNormal or FormPercentile.
func (f IntervalForm) Known() bool { return f == FormNormal || f == FormPercentile }

// DefaultReplicates is the number of replicates DecomposeWithIntervals
// draws when Intervals.Replicates is 0: a normal interval needs only the
// standard deviation of the replicates, which 50 estimate to about 10%
// (relative SE 1/√(2(B−1))) and the Student factor t₄₉ = 2.010 accounts
// for, while a percentile interval reads its ends off the tails, 2.5% of
// the replicates each, and needs 200 (Efron & Tibshirani 1993, §6.4 and
// §19.3: 25–200 replicates for a standard error, at least 1,000 for
// percentiles, from memory).
func DefaultReplicates(f IntervalForm) int {
	if f == FormPercentile {
		return 200
	}
	return 50
}

// PercentileInterval returns the percentile bootstrap interval of level L
// from replicates x: the (1−L)/2 and (1+L)/2 quantiles of x by linear
// interpolation between order statistics (Efron & Tibshirani 1993, "An
// Introduction to the Bootstrap", ch. 13; quantiles as Hyndman & Fan 1996,
// definition 7). x is not modified. It panics if x is empty.
func PercentileInterval(x []float64, level float64) Interval {
	s := slices.Clone(x)
	slices.Sort(s)
	return Interval{Low: quantile(s, (1-level)/2), High: quantile(s, (1+level)/2)}
}

// NormalInterval returns the normal-approximation bootstrap interval of
// level L around the estimate θ̂ from B replicates x:
//
//	θ̂ ± t_{B−1, (1+L)/2} · se*,   se* = √(Σ_b (x_b − x̄)² / (B − 1)),
//
// the bootstrap standard error (Efron & Tibshirani 1993, ch. 6 and
// §13.2). The Student quantile with B − 1 degrees of freedom in place of
// the normal one accounts for se* resting on B replicates: if θ̂ is normal
// with standard error σ and (B−1)·se*²/σ² is χ² with B − 1 degrees of
// freedom, independent of θ̂, the interval has level L exactly (the
// definition of Student's t). With B = 50 the factor is 2.010 instead of
// 1.960. It panics if len(x) < 2.
func NormalInterval(estimate float64, x []float64, level float64) Interval {
	if len(x) < 2 {
		panic("attribution: NormalInterval needs at least 2 replicates")
	}
	half := studentQuantile(len(x)-1, (1+level)/2) * sampleSD(x)
	return Interval{Low: estimate - half, High: estimate + half}
}

// WaldInterval returns estimate ± z_{(1+L)/2}·se, the interval of a
// normal estimate with known standard error se.
func WaldInterval(estimate, se, level float64) Interval {
	half := distuv.UnitNormal.Quantile((1+level)/2) * se
	return Interval{Low: estimate - half, High: estimate + half}
}

// studentQuantile returns the p-quantile of Student's t with df degrees
// of freedom.
func studentQuantile(df int, p float64) float64 {
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}.Quantile(p)
}

// sampleSD returns √(Σ (x − x̄)² / (n − 1)), summed in order.
func sampleSD(x []float64) float64 {
	var mean float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var ss float64
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	return math.Sqrt(ss / float64(len(x)-1))
}
