package fairness

import (
	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/fairness/policy"
	"github.com/gapwise/gapwise/metrics"
)

// impactRatio is Comparison ÷ Reference for a rate (metrics.Fact.
// Proportion); nil for other metrics and when Reference is 0.
func impactRatio(md attribution.MetricDecomposition) *float64 {
	if f, ok := metrics.FactOf(md.Metric); !ok || !f.Proportion || md.Reference == 0 {
		return nil
	}
	r := md.Comparison / md.Reference
	return &r
}

// PolicySubjects returns what a policy judges in r: per metric, the two
// groups' values and, when the run has intervals, those of the gap and
// of lower ÷ higher (policy.Subject).
func PolicySubjects(r *Result) []policy.Subject {
	level := 0.0
	if r.Settings.Intervals != nil {
		level = r.Settings.Intervals.Level
	}
	var out []policy.Subject
	for _, m := range r.Metrics {
		out = append(out, policy.Subject{
			Metric:          m.Metric,
			Reference:       r.Groups.Reference,
			Comparison:      r.Groups.Comparison,
			ReferenceValue:  m.Reference,
			ComparisonValue: m.Comparison,
			GapCI:           policyInterval(m.GapCI),
			LowerToHigherCI: policyInterval(m.LowerToHigherCI),
			Level:           level,
		})
	}
	return out
}

// PolicyRun describes the run spec asks for, with the bootstrap settings
// iv, for policy.Preflight.
func PolicyRun(spec *Spec, iv Intervals) policy.Run {
	cmps := []string{spec.Groups.Comparison}
	switch {
	case spec.Groups.EveryOther:
		cmps = nil // found in the data: judged after the run
	case spec.Groups.Comparisons != nil:
		cmps = spec.Groups.Comparisons
	}
	return policy.Run{Metrics: spec.Metrics, Comparisons: cmps, Intervals: iv.Replicates > 0}
}

// ApplyPolicy judges the policy p on the result r (policy.Evaluate on
// PolicySubjects) and records the outcome in r.Policy; nil p leaves r
// alone. With p's unjudged: error, a check that cannot be judged is a
// *policy.Error (an input error, IsInputError) and r is left alone.
func ApplyPolicy(r *Result, p *policy.Policy) error {
	if p == nil {
		return nil
	}
	out, err := policy.Evaluate(p, PolicySubjects(r))
	if err != nil {
		return err
	}
	r.Policy = out
	return checkFinite(r)
}

func policyInterval(iv *Interval) *policy.Interval {
	if iv == nil {
		return nil
	}
	return &policy.Interval{Low: iv.Low, High: iv.High}
}
