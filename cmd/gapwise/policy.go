package main

import (
	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
	"github.com/gapwise/gapwise/report"
)

// policyOptions is the --policy flag of the commands that judge a result
// against a policy file (decompose; a command comparing results can bind
// it the same way and judge with policy.Evaluate).
type policyOptions struct{ file string }

// bindPolicyFlag adds --policy to cmd.
func bindPolicyFlag(cmd *cobra.Command, o *policyOptions) {
	cmd.Flags().StringVar(&o.file, "policy", "", "judge the result against the policy `FILE` (YAML); exit status 3 when a check breaches")
}

// load parses the policy file and, before the run, refuses a rule that the
// run could not judge when the policy says unjudged: error
// (policy.Preflight); nil without --policy.
func (o policyOptions) load(spec *fairness.Spec, iv fairness.Intervals) (*policy.Policy, error) {
	if o.file == "" {
		return nil, nil
	}
	p, err := policy.Load(o.file)
	if err != nil {
		return nil, err
	}
	if err := policy.Preflight(p, fairness.PolicyRun(spec, iv)); err != nil {
		return nil, err
	}
	return p, nil
}

// policyBreachError is returned, after every output was written, by a
// run whose result breaches its policy. It exits with status 3.
type policyBreachError struct {
	outcome *policy.Outcome
	more    []*policy.Outcome // further breached outcomes: other comparisons of one run
}

func (e *policyBreachError) Error() string {
	msg := report.PolicyBreachMessage(e.outcome)
	for _, o := range e.more {
		msg += "; " + report.PolicyBreachMessage(o)
	}
	return msg
}

// policyVerdict returns a *policyBreachError when res was judged against a
// policy and breached it, else nil.
func policyVerdict(res *fairness.Result) error {
	if res.Policy == nil || res.Policy.Passed {
		return nil
	}
	return &policyBreachError{outcome: res.Policy}
}
