package attribution

import (
	"github.com/gapwise/gapwise/internal/workers"
)

// robustEstimate is the robust estimate of every term the requested
// metrics need, grouped in families that share a chain.
type robustEstimate struct {
	in       *robustInput
	families []*robustFamily
	where    map[termID][2]int // term → (family, index in the family)
	metrics  []robustMetric    // per requested metric
	ok       []bool            // the metric is estimated robustly (not AUC)
}

// estimateRobust fits the robust estimator of every term of the metrics
// names (AUC excepted; see robustMetricOf), one family per distinct set of
// nodes the terms depend on, families on in.workers goroutines in turn.
func estimateRobust(in *robustInput, names []string) (*robustEstimate, error) {
	e := &robustEstimate{in: in, where: map[termID][2]int{}}
	byChain := map[string]int{}
	var chains []robustChain
	var terms [][]meanTerm
	for _, name := range names {
		m, ok := robustMetricOf(name, in.bins)
		e.metrics = append(e.metrics, m)
		e.ok = append(e.ok, ok)
		for _, id := range m.terms {
			if _, seen := e.where[id]; seen {
				continue
			}
			t := termOf(id)
			ch := in.graph.chain(termNodes(t, in.reads, len(in.mechs)))
			fi, ok := byChain[ch.key]
			if !ok {
				fi = len(chains)
				byChain[ch.key] = fi
				chains = append(chains, ch)
				terms = append(terms, nil)
			}
			e.where[id] = [2]int{fi, len(terms[fi])}
			terms[fi] = append(terms[fi], t)
		}
	}
	for fi, ch := range chains {
		fam := newRobustFamily(in, ch, terms[fi])
		if err := fam.estimate(in); err != nil {
			return nil, err
		}
		e.families = append(e.families, fam)
	}
	return e, nil
}

// theta returns θ̂_S of every term of metric m, in the metric's order,
// each clamped to the range of its term over the records: a mean lies
// within it, and with few records the estimate (regressions are not
// clamped, corrections are weighted) can stray outside.
func (e *robustEstimate) theta(m int, S uint64, dst []float64) []float64 {
	dst = dst[:0]
	for _, id := range e.metrics[m].terms {
		w := e.where[id]
		fam := e.families[w[0]]
		v := fam.leaves[fam.leafKey(S)].theta[w[1]]
		dst = append(dst, min(max(v, fam.lo[w[1]]), fam.hi[w[1]]))
	}
	return dst
}

// values returns M̂(P_S) of metric m for every coalition S of k
// mechanisms; a metric undefined under some coalition gives a
// *CoalitionError.
func (e *robustEstimate) values(m, k int) ([]float64, error) {
	out := make([]float64, 1<<k)
	errs := make([]error, 1<<k)
	workers.For(e.in.workers, len(out), func(_, S int) {
		th := e.theta(m, uint64(S), nil)
		v, err := e.metrics[m].value(th)
		if err != nil {
			errs[S] = &CoalitionError{Metric: e.metrics[m].name, Coalition: uint64(S), Err: err}
		}
		out[S] = v
	})
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}

// regressions returns the number of regressions fitted, over every fold
// and candidate learner.
func (e *robustEstimate) regressions() int {
	var n int
	for _, f := range e.families {
		n += f.fits
	}
	return n
}
