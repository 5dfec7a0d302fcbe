package report

import "github.com/gapwise/gapwise/fairness"

// hybridRow is the weights of one hybrid on one side of estimation, as
// both the text and the HTML diagnostics show them; each formats the
// numbers its own way.
type hybridRow struct {
	Side    string
	Records int
	Which   string   // "farthest" or "worst"
	Nodes   []string // the nodes in comparison form
	ESS     float64
	// ESSShare is ESS / Records, nil when the side has no records.
	ESSShare *float64
	MaxShare float64
}

// hybridRows returns, per side of res.Weights, the rows of its farthest
// and its worst hybrid, and whether some side's worst hybrid was searched
// among a subset of the coalitions only.
func hybridRows(res *fairness.Result) (rows []hybridRow, partial bool) {
	for _, w := range res.Weights {
		for _, h := range []struct {
			which string
			hw    fairness.HybridWeight
		}{{"farthest", w.Far}, {"worst", w.Worst}} {
			row := hybridRow{Side: w.Side, Records: w.Records, Which: h.which, Nodes: h.hw.ComparisonNodes, ESS: h.hw.ESS, MaxShare: h.hw.MaxShare}
			if w.Records > 0 {
				share := h.hw.ESS / float64(w.Records)
				row.ESSShare = &share
			}
			rows = append(rows, row)
		}
		partial = partial || !w.AllCoalitions
	}
	return rows, partial
}
