package scm

import "github.com/gapwise/gapwise/metrics"

// leafScorer accumulates one record's label and score into the statistics
// of a coalition. It remembers the previous leaf's label and score inputs
// and reuses its score when they are unchanged (see Model.ScoreInputs). Not
// safe for concurrent use.
type leafScorer struct {
	m         *Model
	threshold float64
	logLoss   bool // fill Stats.WL; off saves a logarithm per leaf
	prev      []float64
	prevScore float64
	primed    bool
}

func newLeafScorer(m *Model, threshold float64, logLoss bool) *leafScorer {
	return &leafScorer{m: m, threshold: threshold, logLoss: logLoss, prev: make([]float64, len(m.Nodes))}
}

// score returns m.Score(v), reusing the previous value when allowed.
func (l *leafScorer) score(v []float64) float64 {
	if l.m.ScoreInputs == nil {
		return l.m.Score(v)
	}
	same := l.primed && v[l.m.Label] == l.prev[l.m.Label]
	for _, i := range l.m.ScoreInputs {
		same = same && v[i] == l.prev[i]
	}
	if !same {
		copy(l.prev, v)
		l.prevScore = l.m.Score(v)
		l.primed = true
	}
	return l.prevScore
}

// add adds the record with node values v to st with weight 1, as
// metrics.Stats.Add does, skipping the log-loss term unless l.logLoss.
func (l *leafScorer) add(st *metrics.Stats, v []float64) {
	y, s := v[l.m.Label], l.score(v)
	if l.logLoss {
		st.Add(y, s, l.threshold, 1)
		return
	}
	c := metrics.Cell(y, s, l.threshold, st.Bins)
	st.W[c]++
	st.WS[c] += s
	st.WS2[c] += s * s
}
