package compare

import (
	"math"

	"github.com/gapwise/gapwise/fairness"
)

// Interval methods for the change of a quantity between two runs.
const (
	// MethodBonferroni combines the runs' intervals without assuming
	// anything of how their estimates depend on each other: when each of
	// [b₋, b₊] and [a₋, a₊] covers its quantity with probability at least
	// 1 − α, both cover with probability at least 1 − 2α (Bonferroni's
	// inequality, P(A ∩ B) ≥ 1 − P(Aᶜ) − P(Bᶜ)), and then the change
	// θ_after − θ_before lies in [a₋ − b₊, a₊ − b₋]. Its half-widths are
	// the sums of the runs' half-widths. Valid for runs on the same
	// cohort, whose estimates are dependent; coverage at least 2·level − 1
	// (0.90 for two 95% intervals), usually more.
	MethodBonferroni = "bonferroni"
	// MethodIndependent is for runs on disjoint cohorts (independent
	// estimates): the method of variance estimates recovery (MOVER; Zou
	// and Donner 2008, "Construction of confidence limits about effect
	// measures: a general approach", Statistics in Medicine 27:1693–1702),
	// which combines each side's distance to its bound in quadrature:
	//
	//	low  = d − √((a − a₋)² + (b₊ − b)²)
	//	high = d + √((a₊ − a)² + (b − b₋)²),   d = a − b.
	//
	// Coverage is about the runs' level when the estimates are
	// independent and each interval is about right; it is too narrow for
	// runs that share records.
	MethodIndependent = "independent"
)

// ChangeIntervals says how the intervals of the changes were made.
type ChangeIntervals struct {
	// Method is MethodBonferroni or MethodIndependent.
	Method string `json:"method"`
	// RunLevel is the level of both runs' intervals.
	RunLevel float64 `json:"run_level"`
	// Level is the coverage the method guarantees: 2·RunLevel − 1 for
	// bonferroni (a lower bound), RunLevel for independent (approximate).
	Level float64 `json:"level"`
}

// newChangeIntervals returns the interval settings for runs whose
// intervals have levels lb and la (0: none), or nil and the reason when
// no change has an interval.
func newChangeIntervals(lb, la float64, independent bool) (*ChangeIntervals, string) {
	switch {
	case lb == 0 && la == 0:
		return nil, "neither run has intervals"
	case lb == 0:
		return nil, "the earlier run has no intervals"
	case la == 0:
		return nil, "the later run has no intervals"
	case math.Abs(lb-la) > 1e-9:
		return nil, "the runs' intervals have different levels"
	}
	if independent {
		return &ChangeIntervals{Method: MethodIndependent, RunLevel: la, Level: la}, ""
	}
	return &ChangeIntervals{Method: MethodBonferroni, RunLevel: la, Level: 2*la - 1}, ""
}

// changeCI is the interval of a − b from the intervals bi of b and ai of
// a by the method (see MethodBonferroni, MethodIndependent); nil when
// either is nil.
func changeCI(method string, b, a float64, bi, ai *fairness.Interval) *fairness.Interval {
	if bi == nil || ai == nil {
		return nil
	}
	if method == MethodIndependent {
		d := a - b
		lo := d - math.Hypot(a-ai.Low, bi.High-b)
		hi := d + math.Hypot(ai.High-a, b-bi.Low)
		return &fairness.Interval{Low: lo, High: hi}
	}
	return &fairness.Interval{Low: ai.Low - bi.High, High: ai.High - bi.Low}
}
