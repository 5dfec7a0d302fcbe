package fairness

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/gapwise/gapwise/attribution"
)

// Thresholds below which a mechanism's contribution is not estimable here:
// no reweighting of one group can then stand in for the other, so a point
// estimate with an interval would claim precision the data cannot give.
const (
	// NotEstimableAUC: the out-of-fold AUC of the mechanism's group
	// classifier is at least this, so the groups' mechanisms barely
	// overlap (common practice in overlap diagnostics of propensity
	// scores: near-perfect separation leaves no comparable records).
	NotEstimableAUC = 0.99
	// NotEstimableESS: the effective sample size of the mechanism's
	// weights is below this on every side that estimates the hybrids.
	NotEstimableESS = 20
)

// estimability returns why the contribution of m cannot be estimated from
// r's data, or "" when it can: near-perfect separation of the groups by
// the node and its parents (NotEstimableAUC), or effective records below
// NotEstimableESS on each estimating side (Settings.EstimateFrom; both
// sides with "both").
//
// Separation by the parents alone also makes a child's mechanism not
// estimable: a hybrid that gives the child the comparison group's
// mechanism P_cmp(node | parents) at the reference group's parent values
// needs comparison records there, and there are none, so the data cannot
// tell P_cmp(node | parents) on that region (it is not identified; only
// extrapolation would fill it). The reason then names the separating
// parents, so the cause is read once.
func estimability(r *Result, m MechanismResult) string {
	if m.AUC >= NotEstimableAUC {
		var seps []string
		for _, o := range r.Mechanisms {
			if slices.Contains(m.Parents, o.Node) && o.AUC >= NotEstimableAUC {
				seps = append(seps, "`"+r.NodeName(o.Node)+"`")
			}
		}
		if len(seps) > 0 {
			return fmt.Sprintf("its parents %s already separate the groups, so the comparison group's `%s` is not observed where the reference records lie (out-of-fold AUC %.3f on the node and its parents)", strings.Join(seps, ", "), r.MechanismName(m.Node), m.AUC)
		}
		return fmt.Sprintf("the groups' records barely overlap on `%s` (out-of-fold AUC %.3f of the group classifier on the node and its parents), so one group's mechanism is not observed where the other group's records lie", r.MechanismName(m.Node), m.AUC)
	}
	ref, cmp := m.ESS < NotEstimableESS, m.ComparisonESS < NotEstimableESS
	switch r.Settings.EstimateFrom {
	case "comparison":
		if cmp {
			return fmt.Sprintf("its weights rest on %.0f effective comparison records", m.ComparisonESS)
		}
	case "both":
		if ref && cmp {
			return fmt.Sprintf("its weights rest on %.0f effective reference and %.0f comparison records", m.ESS, m.ComparisonESS)
		}
	default:
		if ref {
			return fmt.Sprintf("its weights rest on %.0f effective records", m.ESS)
		}
	}
	return ""
}

// notEstimableWarning is the warning for a reason from estimability; node
// is m's node as the sentence names it.
func notEstimableWarning(m MechanismResult, node, reason string) Warning {
	return Warning{Kind: KindNotEstimable, Severity: SeverityUnreliable, Nodes: []string{m.Node},
		Message: fmt.Sprintf("the contribution of `%s` is not estimable here: %s; the reports show no value for it, and the other contributions, which share its weights in their hybrids, are less certain", node, reason)}
}

// learnerWarning speaks up when the learner chosen for m's node and
// parents fails its self-checks (attribution.PassesChecks): with
// classifier auto no candidate passed and the least bad was used; with a
// learner set in the spec, that learner is the one at fault.
func learnerWarning(r *Result, m MechanismResult) (Warning, bool) {
	for _, l := range m.Losses {
		if l.Classifier != m.Classifier || attribution.PassesChecks(l.OddsCheck, l.MaxShare) {
			continue
		}
		what := fmt.Sprintf("mean odds check %.2f (sound within a factor %.2f of 1), largest single-record share %.1f%% (sound up to %.0f%%)",
			l.OddsCheck, attribution.OddsTolerance, 100*l.MaxShare, 100*attribution.ShareTolerance)
		if math.IsNaN(l.OddsCheck) {
			what = "its odds could not be checked"
		}
		mech := r.MechanismName(m.Node)
		msg := fmt.Sprintf("no candidate learner passed the self-checks for `%s`; the least bad, %s, was used: %s; its weights are degenerate, so treat its contribution as unreliable", mech, l.Classifier, what)
		if r.Settings.Classifier != ClassifierAuto {
			msg = fmt.Sprintf("the learner %s set by the spec's classifier key fails the self-checks for `%s`: %s; its weights are degenerate (classifier: auto would choose among the learners that pass)", l.Classifier, mech, what)
		}
		return Warning{Kind: KindLearnerChecks, Severity: SeverityUnreliable, Nodes: []string{m.Node}, Message: msg}, true
	}
	return Warning{}, false
}
