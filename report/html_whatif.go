package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// The what-if panel: the reader ticks mechanisms to make the same in both
// groups and the page script shows the estimated gap that would remain,
// read from the metric's game over all coalitions
// (fairness.MetricResult.Coalitions). With T the ticked set and v the game
// (v(S): the estimated change from the reference group's metric with the
// mechanisms of S in the comparison group's form), the remaining estimated
// gap is v(N∖T) when T takes the reference group's form, and v(N) − v(T)
// when it takes the comparison group's; the residual is in neither.

// whatIfMetric is one metric's game as the page script reads it: values[S]
// = v(S) for every bit mask S (bit i: mechanisms[i]), and what it needs to
// print a difference as formatDelta does: scale·|x| with decimals
// decimals, the sign ("+", U+2212 or none when it prints as zero), then
// unit.
type whatIfMetric struct {
	Values    []float64 `json:"values"`
	Scale     float64   `json:"scale"`
	Decimals  int       `json:"decimals"`
	Unit      string    `json:"unit"`
	Estimated string    `json:"estimated"` // v(N), formatted
	Observed  string    `json:"observed"`  // the observed gap, formatted
	Residual  string    `json:"residual"`  // gap − v(N), formatted
}

// whatIfView is the panel in the template: the mechanisms to tick (Bit is
// a mechanism's index in the bit masks), whether some metric has its
// coalitions (Any), and, for each metric without, the reason.
type whatIfView struct {
	Any        bool
	Mechanisms []whatIfMechanism
	Notes      []whatIfNote
}

type whatIfMechanism struct {
	Bit             int
	Node, Mechanism string
}

type whatIfNote struct {
	Metric, Note string
	Selected     bool
}

// takeGames returns every metric's game from res.Coalitions, keyed by
// metric, and a shallow copy of res without the coalitions, so that the
// page's printable copy (visibleCopy) does not copy 2^k lists of node
// names; the caller's Result is not touched.
func takeGames(res *fairness.Result) (map[string][]float64, *fairness.Result) {
	games := map[string][]float64{}
	cp := *res
	cp.Metrics = append([]fairness.MetricResult(nil), res.Metrics...)
	for i, m := range cp.Metrics {
		if m.Coalitions == nil {
			continue
		}
		v := make([]float64, len(m.Coalitions))
		for S, c := range m.Coalitions {
			v[S] = c.ChangeFromReference
		}
		games[m.Metric] = v
		cp.Metrics[i].Coalitions = nil
	}
	return games, &cp
}

// whatIf builds the panel and the script's data from the games (takeGames)
// of res's metrics. A game is used only when it has 2^k values for the k
// mechanisms of res.
func whatIf(res *fairness.Result, games map[string][]float64) (whatIfView, map[string]whatIfMetric) {
	var v whatIfView
	data := map[string]whatIfMetric{}
	k := len(res.Mechanisms)
	for i, m := range res.Mechanisms {
		v.Mechanisms = append(v.Mechanisms, whatIfMechanism{Bit: i, Node: m.Node, Mechanism: mechName(res, m.Node)})
	}
	for i, m := range res.Metrics {
		g := games[m.Metric]
		if k > 30 || len(g) != 1<<k {
			v.Notes = append(v.Notes, whatIfNote{Metric: m.Metric, Note: whatIfOmitted(m.CoalitionsOmitted, k), Selected: i == 0})
			continue
		}
		v.Any = true
		unit := ""
		if isProportion(m.Metric) {
			unit = " pts"
		}
		data[m.Metric] = whatIfMetric{Values: g, Scale: scaleOf(m.Metric), Decimals: baseDecimals(m.Metric), Unit: unit,
			Estimated: formatDelta(m.Metric, m.Estimated), Observed: formatDelta(m.Metric, m.Gap), Residual: formatDelta(m.Metric, m.Residual)}
	}
	return v, data
}

// whatIfOmitted says why a metric has no what-if values, from
// fairness.MetricResult.CoalitionsOmitted and the number of mechanisms k.
func whatIfOmitted(reason string, k int) string {
	switch reason {
	case fairness.OmittedAboveLimit:
		return fmt.Sprintf("Not available for this metric: the values of all %s sets of the %d mechanisms are kept only up to the coalition limit (%d mechanisms by default; decompose --coalition-limit raises it up to %d).",
			setCount(k), k, fairness.DefaultCoalitionLimit, fairness.MaxCoalitionLimit)
	case fairness.OmittedSampled:
		return "Not available for this metric: its Shapley values were sampled (more mechanisms than exact_limit), so not every set of mechanisms was evaluated."
	case fairness.OmittedPerMechanism:
		return "Not available for this metric: with combine_sides: mechanism its contributions combine the two sides mechanism by mechanism and come from no single set function, so no what-if values match them."
	}
	return "Not available for this metric: the result holds no values of the sets of mechanisms (a result read from JSON written without --coalitions has none)."
}

// setCount prints 2^k, in digits up to k = 40.
func setCount(k int) string {
	if k > 40 {
		return fmt.Sprintf("2^%d", k)
	}
	return fmt.Sprint(uint64(1) << k)
}
