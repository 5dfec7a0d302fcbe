package report

import (
	"fmt"
	"math"
	"slices"

	"github.com/gapwise/gapwise/fairness"
)

// messages returns the sentences of ws, in order.
func messages(ws []fairness.Warning) []string {
	out := make([]string, len(ws))
	for i, w := range ws {
		out[i] = w.Message
	}
	return out
}

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
