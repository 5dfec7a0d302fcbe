package report

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// unreliable returns, per mechanism node, why its contributions should be
// read with caution: those whose fairness.Reliability verdict is a
// caution or worse. When a low-effective-records warning concerns the
// mechanism and its reference ESS share is below fairness.WarnESSShare,
// the reason quotes that share; otherwise it says that a warning names
// the mechanism. Nodes absent from the map are not flagged.
func unreliable(res *fairness.Result) map[string]string {
	out := map[string]string{}
	for _, m := range res.Mechanisms {
		rel := m.Reliability
		switch {
		case !rel.Verdict.AtLeast(fairness.SeverityCaution):
		case slices.Contains(rel.Kinds, fairness.KindLowEffectiveRecords) && m.ESSShare > 0 && m.ESSShare < fairness.WarnESSShare:
			out[m.Node] = fmt.Sprintf("effective sample size %s is %.0f%% of the reference group", formatCount(math.Round(m.ESS)), 100*m.ESSShare)
		default:
			out[m.Node] = "a warning names it"
		}
	}
	return out
}

// warningOrder returns the indices of ws in the order the reports list
// them: most serious first (unreliable, caution, note), in the order of
// ws within a severity.
func warningOrder(ws []fairness.Warning) []int {
	idx := make([]int, len(ws))
	for i := range idx {
		idx[i] = i
	}
	rank := func(s fairness.Severity) int {
		for r, t := range []fairness.Severity{fairness.SeverityUnreliable, fairness.SeverityCaution, fairness.SeverityNote} {
			if s == t {
				return r
			}
		}
		return 3
	}
	sort.SliceStable(idx, func(a, b int) bool { return rank(ws[idx[a]].Severity) < rank(ws[idx[b]].Severity) })
	return idx
}

// warningNumbers maps the index of each warning of ws to its number (from
// 1) in warningOrder.
func warningNumbers(ws []fairness.Warning) map[int]int {
	out := map[int]int{}
	for n, i := range warningOrder(ws) {
		out[i] = n + 1
	}
	return out
}

// warningReasons give the cause of each kind of warning as a clause, for
// the overview's verdict ("because …"); the warning's sentence says more.
var warningReasons = map[fairness.WarningKind]string{
	fairness.KindRowsDropped:         "rows were dropped unevenly for missing values",
	fairness.KindGroupValueNearMiss:  "rows were left out whose group value resembles a chosen one",
	fairness.KindFewRecords:          "the metric rests on few records",
	fairness.KindSmallGroup:          "a group is small",
	fairness.KindModelInputOutside:   "a model input is outside the graph",
	fairness.KindModelReadsGroup:     "the model reads the group column",
	fairness.KindNotEstimable:        "the data cannot estimate a contribution",
	fairness.KindLearnerChecks:       "the chosen classifier fails its checks",
	fairness.KindPoorOverlap:         "the groups barely overlap",
	fairness.KindExtremeWeights:      "some records carry extreme weights",
	fairness.KindLowEffectiveRecords: "few effective records carry the estimate",
	fairness.KindHeavyTail:           "the weights have a heavy tail",
	fairness.KindDominantRecord:      "one record carries much of the weight",
	fairness.KindMeanRatioOff:        "the density ratios do not average 1",
	fairness.KindStratumRatioOff:     "the density ratios are off in part of the records",
	fairness.KindRatiosClipped:       "clipping the ratios pulls the contribution towards 0",
	fairness.KindWorstHybrid:         "a mix of the groups' mechanisms rests on few effective records",
	fairness.KindMetricRecords:       "the estimate rests on few effective records",
	fairness.KindLargeResidual:       "much of the gap is not assigned to a mechanism",
	fairness.KindSidesDisagree:       "the estimates from the two groups' records disagree",
	fairness.KindEstimatorsDisagree:  "the robust and the weighting estimates disagree",
	fairness.KindRobustUnavailable:   "the robust estimator gives no estimate here",
	fairness.KindSplitDependent:      "the contribution still moves with the seed (the fold split)",
	fairness.KindOutlyingValues:      "some values are outside their typical range",
	fairness.KindBootstrapFailures:   "some bootstrap replicates failed",
	fairness.KindHiddenFactor:        "an unrecorded factor could reverse a clear conclusion",
}

// warningReason is the cause of w as a clause (warningReasons, or its
// kind's name), followed by the mechanism it concerns when it concerns
// one (by its display name), in style st: "the weights have a heavy tail
// for the mechanism of `hb`".
func warningReason(res *fairness.Result, w fairness.Warning, st inlineStyle) string {
	r, ok := warningReasons[w.Kind]
	if !ok {
		r = "of a " + strings.ReplaceAll(string(w.Kind), "_", " ") + " warning"
	}
	r = st.text(r)
	if len(w.Nodes) == 1 {
		r += " for the mechanism of " + st.code(nodeName(res, w.Nodes[0]))
	}
	return r
}

// severityWord names a warning's severity for a reader.
func severityWord(s fairness.Severity) string {
	switch s {
	case fairness.SeverityUnreliable:
		return "unreliable"
	case fairness.SeverityCaution:
		return "caution"
	}
	return "note"
}
