package metrics

import (
	"fmt"
	"math"
	"slices"

	"github.com/gapwise/gapwise/internal/rank"
)

// AUC returns the weighted area under the ROC curve, which equals the
// weighted Mann–Whitney statistic (Mann & Whitney 1947; Hanley & McNeil
// 1982, from memory):
//
//	AUC = Σ_{i: y_i=1} Σ_{j: y_j=0} w_i·w_j·([s_i > s_j] + ½·[s_i = s_j]) / (W₊·W₋),
//
// where W₊ and W₋ are the total weights of events and non-events: the
// probability that a random event scores above a random non-event, ties
// counting one half. It runs in O(n) by a radix sort of the scores. A label equal to 1 is
// an event, any other label a non-event; scores must not be NaN. If w is nil
// every record weighs 1. Without positive weight in both classes it returns
// NaN and an error wrapping ErrUndefined. It panics if the slices differ in
// length.
//
// To evaluate AUC under many weight vectors, build an AUCSorter once.
func AUC(labels, scores []float64, w []float64) (float64, error) {
	mustMatch("AUC", labels, scores, w)
	return NewAUCSorter(labels, scores).Value(w)
}

// AUCSorter holds records sorted by score with ties grouped, so that the
// weighted AUC under a new weight vector costs O(n) instead of O(n log n).
// It is safe for concurrent use by several goroutines once built.
type AUCSorter struct {
	order []int32   // record indices by ascending score (stable for ties)
	y     []float64 // y[k] = 1 if record order[k] is an event, else 0
	ends  []int32   // ends[g] is one past the last position of tie group g
}

// NewAUCSorter sorts the records by score once, in O(n) by a radix sort
// (rank.Ascending), ties in record order. Labels and scores are not
// retained. It panics if the slices differ in length or hold more than
// 2³¹−1 records.
func NewAUCSorter(labels, scores []float64) *AUCSorter {
	mustMatch("NewAUCSorter", labels, scores, nil)
	n := len(scores)
	if n > math.MaxInt32 {
		panic("metrics: NewAUCSorter: too many records")
	}
	order, ok := rank.Ascending(scores)
	if !ok {
		order = compareOrder(scores)
	}
	return sorterFrom(labels, scores, order)
}

// sorterFrom builds the AUCSorter of records in the given ascending order
// of scores.
func sorterFrom(labels, scores []float64, order []int32) *AUCSorter {
	n := len(order)
	s := &AUCSorter{order: order, y: make([]float64, n)}
	for k, i := range order {
		s.y[k] = event(labels[i])
		if k > 0 && scores[i] != scores[order[k-1]] {
			s.ends = append(s.ends, int32(k))
		}
	}
	if n > 0 {
		s.ends = append(s.ends, int32(n))
	}
	return s
}

// Len returns the number of records.
func (s *AUCSorter) Len() int { return len(s.order) }

// Value returns the weighted AUC (see AUC) with weights w indexed like the
// labels and scores given to NewAUCSorter; nil means every record weighs 1.
// Sweeping tie groups g in ascending score order,
//
//	AUC = Σ_g W₊(g)·(W₋(<g) + ½·W₋(g)) / (W₊·W₋),
//
// where W₊(g), W₋(g) are the event and non-event weights of group g and
// W₋(<g) the non-event weight of all lower groups. The sums run in a fixed
// order, so the result is deterministic. Without positive weight in both
// classes it returns NaN and an error wrapping ErrUndefined. It panics if w
// is not nil and its length differs from Len.
func (s *AUCSorter) Value(w []float64) (float64, error) {
	if w != nil && len(w) != len(s.order) {
		panic("metrics: AUCSorter.Value: weights and records differ in length")
	}
	if w == nil {
		return s.sweep(nil, nil)
	}
	return s.sweep(w, s.order)
}

// ValueSorted is Value with the weights already in sorted order:
// ws[k] is the weight of record Order()[k]. It gives exactly the same result
// as Value with w[Order()[k]] = ws[k], without the scattered reads; callers
// that evaluate many weight vectors can permute their inputs once. It panics
// if len(ws) differs from Len.
func (s *AUCSorter) ValueSorted(ws []float64) (float64, error) {
	if len(ws) != len(s.order) {
		panic("metrics: AUCSorter.ValueSorted: weights and records differ in length")
	}
	return s.sweep(ws, nil)
}

// Order returns a copy of the record indices in ascending score order (ties
// in input order).
func (s *AUCSorter) Order() []int {
	out := make([]int, len(s.order))
	for k, i := range s.order {
		out[k] = int(i)
	}
	return out
}

// sweep computes the AUC with the weight of sorted position k being
// w[perm[k]], w[k] when perm is nil, or 1 when w is nil.
func (s *AUCSorter) sweep(w []float64, perm []int32) (float64, error) {
	var num, negBelow, pos float64
	start := int32(0)
	for _, end := range s.ends {
		var gp, gn float64
		for k := start; k < end; k++ {
			wi := 1.0
			switch {
			case perm != nil:
				wi = w[perm[k]]
			case w != nil:
				wi = w[k]
			}
			yk := s.y[k]
			gp += yk * wi
			gn += (1 - yk) * wi
		}
		num += gp * (negBelow + 0.5*gn)
		negBelow += gn
		pos += gp
		start = end
	}
	if !(pos > 0) || !(negBelow > 0) {
		return math.NaN(), fmt.Errorf("%w: %s needs both events and non-events (weights %g and %g)", ErrUndefined, NameAUC, pos, negBelow)
	}
	return num / (pos * negBelow), nil
}

// compareOrder is the order NewAUCSorter used before rank.Ascending, kept
// for scores with a NaN, which no order ranks: a comparison sort of
// (score, index) pairs, a NaN comparing equal to every score.
func compareOrder(scores []float64) []int32 {
	type keyed struct {
		s float64
		i int32
	}
	recs := make([]keyed, len(scores))
	for i, sc := range scores {
		recs[i] = keyed{sc, int32(i)}
	}
	slices.SortFunc(recs, func(a, b keyed) int {
		switch {
		case a.s < b.s:
			return -1
		case a.s > b.s:
			return 1
		}
		return int(a.i - b.i)
	})
	order := make([]int32, len(scores))
	for k, r := range recs {
		order[k] = r.i
	}
	return order
}
