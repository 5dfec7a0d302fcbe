package scm

import "github.com/gapwise/gapwise/attribution"

// Reads returns which nodes the label and the score of m are functions
// of, for the robust estimator (attribution.NodeReads): the label node,
// and ScoreInputs (nil, every node, when the model does not list them).
// Node indices are mechanism indices of Pooled's mechanisms.
func (m *Model) Reads() attribution.NodeReads {
	r := attribution.NodeReads{Label: []int{m.Label}}
	if m.ScoreInputs != nil {
		r.Score = append([]int(nil), m.ScoreInputs...)
	}
	return r
}
