package report

import "github.com/gapwise/gapwise/fairness"

// gateView is the policy section of the page.
type gateView struct {
	Headline, File, Title string
	Passed                bool
	Rows                  []policyRow
	Notes                 []string
	Caution               string
}

// policyGate formats the policy outcome of res for the page; nil without
// a policy.
func policyGate(res *fairness.Result) *gateView {
	o := res.Policy
	if o == nil {
		return nil
	}
	return &gateView{Headline: policyHeadline(o), File: o.File, Title: o.Title, Passed: o.Passed,
		Rows: policyRows(o, res.Names), Notes: policyNotes(o), Caution: policyCaution}
}
