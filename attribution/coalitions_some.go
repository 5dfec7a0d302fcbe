package attribution

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// EvaluateSome computes the metrics of the hybrid distributions P_S for the
// given coalitions only (bitmasks over the k = len(logr) mechanisms, k ≤ 63),
// with the same weights and definitions as EvaluateCoalitions: values[m][j]
// is metric metricNames[m] under coalitions[j]. Use it when 2^k is too many
// coalitions, e.g. with SampledShapley.
//
// The list is cut into chains, maximal runs in which each coalition is a
// superset of the one before. A chain is walked by one goroutine: its first
// coalition's weights exp(Σ_{i∈S} log r_i − max_r Σ_{i∈S} log r_i) are
// computed from the log-ratios, each later one multiplies in the ratios of
// the mechanisms it adds, rescaling by an exact power of two whenever the
// largest weight leaves [2^−300, 2^300] (metrics do not depend on a common
// factor). The chains depend only on the list, so results do not depend on
// opt.Workers. Each coalition costs O(n) plus O(n) per added mechanism.
//
// Errors are those of EvaluateCoalitions, and an error for a coalition with
// a bit at or above k.
func EvaluateSome(labels, scores []float64, threshold float64, logr [][]float64, metricNames []string, coalitions []uint64, opt EngineOptions) ([][]float64, error) {
	k := len(logr)
	if k > 63 {
		return nil, fmt.Errorf("attribution: EvaluateSome supports at most 63 mechanisms, got %d", k)
	}
	for j, S := range coalitions {
		if S>>k != 0 {
			return nil, fmt.Errorf("attribution: coalition %d (%#b) names a mechanism beyond the %d given", j, S, k)
		}
	}
	in, err := newEngineInput(labels, scores, threshold, logr, metricNames, opt)
	if err != nil {
		return nil, err
	}
	values := make([][]float64, len(metricNames))
	for m := range values {
		values[m] = make([]float64, len(coalitions))
	}
	var starts []int
	for j := range coalitions {
		if j == 0 || coalitions[j-1]&^coalitions[j] != 0 {
			starts = append(starts, j)
		}
	}
	ev := newChainEvaluator(in)
	errs := make([]error, len(starts))
	workers.For(in.workers, len(starts), func(_, c int) {
		end := len(coalitions)
		if c+1 < len(starts) {
			end = starts[c+1]
		}
		errs[c] = ev.walk(coalitions[starts[c]:end], values, starts[c])
	})
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return values, nil
}

// chainEvaluator holds per-record data shared by all chains.
type chainEvaluator struct {
	in     *engineInput
	slot   []int       // slot of each record's cell, −1 if unused
	fval   [][]float64 // fval[fi][r] as in productEngine; nil for featW
	ratio  [][]float64 // ratio[i][r] = exp(clip(log r_i(r)))
	sorter *metrics.AUCSorter
}

func newChainEvaluator(in *engineInput) *chainEvaluator {
	p := &in.plan
	n := len(in.labels)
	ev := &chainEvaluator{in: in, slot: make([]int, n), fval: make([][]float64, len(p.feats))}
	for r := range ev.slot {
		ev.slot[r] = p.slot[metrics.Cell(in.labels[r], in.scores[r], in.threshold, p.bins)]
	}
	for fi, f := range p.feats {
		if f != featW {
			ev.fval[fi] = make([]float64, n)
			for r := range ev.fval[fi] {
				ev.fval[fi][r] = featureValue(f, in.labels[r], in.scores[r])
			}
		}
	}
	ev.ratio = make([][]float64, len(in.logr))
	for i, l := range in.logr {
		ev.ratio[i] = make([]float64, n)
		for r, x := range l {
			ev.ratio[i][r] = math.Exp(x)
		}
	}
	if p.auc >= 0 {
		ev.sorter = metrics.NewAUCSorter(in.labels, in.scores)
	}
	return ev
}

const (
	chainScaleHigh = 0x1p300
	chainScaleLow  = 0x1p-300
)

// walk evaluates one chain whose first coalition is coalitions[0] and
// writes values[m][offset+j].
func (ev *chainEvaluator) walk(chainCoalitions []uint64, values [][]float64, offset int) error {
	in := ev.in
	p := &in.plan
	n := len(in.labels)
	w := make([]float64, n)
	first := chainCoalitions[0]
	for i := range in.logr {
		if first&(1<<i) != 0 {
			for r, x := range in.logr[i] {
				w[r] += x
			}
		}
	}
	top := math.Inf(-1)
	for _, x := range w {
		top = math.Max(top, x)
	}
	for r, x := range w {
		w[r] = math.Exp(x - top)
	}
	st := metrics.NewStats(p.bins)
	tg := p.targets(st)
	sums := make([]float64, len(p.cells)*len(p.feats))
	nf := len(p.feats)
	prev := first
	for j, S := range chainCoalitions {
		for i := range in.logr {
			if (S&^prev)&(1<<i) == 0 {
				continue
			}
			big := 0.0
			for r, x := range ev.ratio[i] {
				w[r] *= x
				big = math.Max(big, w[r])
			}
			if big > chainScaleHigh || (big < chainScaleLow && big > 0) {
				_, e := math.Frexp(big)
				f := math.Ldexp(1, -e)
				for r := range w {
					w[r] *= f
				}
			}
		}
		prev = S
		clear(sums)
		for r, s := range ev.slot {
			if s < 0 {
				continue
			}
			for fi := range p.feats {
				x := w[r]
				if ev.fval[fi] != nil {
					x *= ev.fval[fi][r]
				}
				sums[s*nf+fi] += x
			}
		}
		for t, dst := range tg {
			*dst = sums[t]
		}
		for _, m := range p.stat {
			v, err := st.Value(p.names[m])
			if err != nil {
				return &CoalitionError{Metric: p.names[m], Coalition: S, Err: err}
			}
			values[m][offset+j] = v
		}
		if ev.sorter != nil {
			v, err := ev.sorter.Value(w)
			if err != nil {
				return &CoalitionError{Metric: metrics.NameAUC, Coalition: S, Err: err}
			}
			values[p.auc][offset+j] = v
		}
	}
	return nil
}
