package fairness

import "github.com/gapwise/gapwise/attribution"

// Coalitions: every metric's game over all coalitions of the mechanisms,
// for what-if questions about any set of mechanisms.

// DefaultCoalitionLimit is the largest number of mechanisms whose
// coalitions a Result carries unless RunOptions.CoalitionLimit says
// otherwise: 2^12 = 4,096 values per metric.
const DefaultCoalitionLimit = 12

// MaxCoalitionLimit is the largest RunOptions.CoalitionLimit: 2^16 =
// 65,536 values per metric, the default exact limit of the Shapley values
// (attribution.DefaultExactLimit), above which no game is computed.
const MaxCoalitionLimit = attribution.DefaultExactLimit

// Why a metric's coalitions are absent (MetricResult.CoalitionsOmitted).
const (
	// OmittedAboveLimit: more mechanisms than the coalition limit.
	OmittedAboveLimit = "above_limit"
	// OmittedSampled: the Shapley values were sampled (more mechanisms
	// than exact_limit), so the game was evaluated on a few coalitions
	// only.
	OmittedSampled = "sampled"
	// OmittedPerMechanism: combine_sides mechanism combined the two
	// sides' contributions per mechanism; they are the Shapley values of
	// no single game.
	OmittedPerMechanism = "per_mechanism"
)

// Coalition is one coalition S of the mechanisms and its value in a
// metric's game.
type Coalition struct {
	// ComparisonNodes lists the nodes of S, in graph order: the mechanisms
	// that take the comparison group's form while the others keep the
	// reference group's.
	ComparisonNodes []string `json:"comparison_nodes"`
	// ChangeFromReference is v(S) = M̂(P_S) − M̂(P_∅): the estimated change
	// of the metric from the reference group's value when the mechanisms
	// of S, and only they, take the comparison group's form. It is not a
	// remaining gap: with T made equal to the reference group's form, the
	// estimated gap that remains is v(N∖T); with T made equal to the
	// comparison group's, v(N) − v(T). v(N) is the estimated gap, and the
	// residual (gap − v(N)) is attributed to no coalition.
	ChangeFromReference float64 `json:"change_from_reference"`
}

// coalitionLimit is opt.CoalitionLimit with its default, within
// [0, MaxCoalitionLimit].
func (opt RunOptions) coalitionLimit() int {
	switch l := opt.CoalitionLimit; {
	case l == 0:
		return DefaultCoalitionLimit
	case l < 0:
		return 0
	default:
		return min(l, MaxCoalitionLimit)
	}
}

// setCoalitions fills, for every metric of r, either Coalitions from the
// engine's game (attribution.MetricDecomposition.Game: the combined game of
// both sides, the mean over fold splits, whose Shapley values are the
// contributions), in the order of the bit masks S = 0 … 2^k − 1 (bit i:
// mechanism i of r.Mechanisms), or CoalitionsOmitted with the reason.
func setCoalitions(r *Result, dec *attribution.Decomposition, limit int) {
	k := len(dec.Mechanisms)
	for m, md := range dec.Metrics {
		res := &r.Metrics[m]
		switch {
		case k > limit:
			res.CoalitionsOmitted = OmittedAboveLimit
		case md.Game == nil && k > r.Settings.ExactLimit:
			res.CoalitionsOmitted = OmittedSampled
		case md.Game == nil:
			res.CoalitionsOmitted = OmittedPerMechanism
		default:
			res.Coalitions = coalitions(md.Game, dec.Mechanisms)
		}
	}
}

// coalitions lists every coalition of game with its member nodes.
func coalitions(game []float64, mechs []attribution.MechanismReport) []Coalition {
	out := make([]Coalition, len(game))
	for S, v := range game {
		nodes := []string{}
		for i, m := range mechs {
			if S&(1<<i) != 0 {
				nodes = append(nodes, m.Mechanism.Node)
			}
		}
		out[S] = Coalition{ComparisonNodes: nodes, ChangeFromReference: v}
	}
	return out
}
