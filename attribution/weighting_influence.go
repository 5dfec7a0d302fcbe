package attribution

import (
	"math"
	"math/bits"

	"github.com/gapwise/gapwise/metrics"
)

// The weighting estimator's influence, record by record. One side's
// estimate M̂_j(S) = g(T) of weighted cell sums has influence (the delta
// method, deltaVariances)
//
//	u_{j,S}(r) = w_S(r) · Σ_h ∂g/∂T_{cell(r),h} · h(r)
//
// at a record r of side j, 0 elsewhere; with both sides the combined
// M̂(S) = λ_S·M̂_ref(S) + (1−λ_S)·M̂_cmp(S) has influence λ_S·u_ref,S at a
// reference record and (1−λ_S)·u_cmp,S at a comparison record, λ_S the
// metric's weight of the reference side (ReferenceWeight) or, for a
// per-coalition combination, n_eff,ref(S)/(n_eff,ref(S) + n_eff,cmp(S)).
// The log-ratios are held fixed: unlike the robust estimator's, this
// influence leaves out the noise of the fitted classifiers, which enters
// the weighting estimate at first order. For MixMechanism, whose
// contributions combine the sides per mechanism, the metric-level λ
// stands in.

// prepareWeightingInfluence returns the per-record influence of the
// weighting estimate of every metric for the coalitions of plan p (nil
// when the Shapley values were sampled), and which metrics have one (not
// AUC, nor a metric undefined under a coalition on a side).
func prepareWeightingInfluence(mds []MetricDecomposition, sides []*sideEstimate, g groupSplit, names []string, p influencePlan, opt Options) (func(lo, hi int) recordInfluence, []bool) {
	ins, logc, grads, defined := weightingSideInputs(sides, names, p, opt)
	lambda := sideShares(mds, sides, len(names), p.cs)
	side, pos := recordSides(sides, g)
	return func(lo, hi int) recordInfluence {
		subset := make([]float64, 1<<p.k)
		return func(a int, u [][]float64) {
			i := lo + a
			for m := range u {
				clear(u[m])
			}
			j := side[i] - 1
			if j < 0 {
				return
			}
			in := &ins[j]
			r := pos[i]
			cell := metrics.Cell(in.y[r], in.s[r], in.threshold, in.bins)
			s := in.s[r]
			h := [4]float64{1, s, s * s, metrics.LogLossTerm(in.y[r], s)}
			lw := logWeights(in, r, p, subset)
			for c := range in.wc {
				w := math.Exp(lw[c] - logc[j][c])
				for m := range u {
					gr := grads[j][c][m]
					if gr == nil || !defined[m] {
						continue
					}
					l := lambda[m][c]
					if j == 1 {
						l = 1 - l
					}
					x := w * (gr[4*cell]*h[0] + gr[4*cell+1]*h[1] + gr[4*cell+2]*h[2] + gr[4*cell+3]*h[3])
					u[m][c] = l * x
					// The observed metric of the side's own group: its
					// unweighted end (∅ for the reference side, N for the
					// comparison side).
					switch {
					case in.wc[c] != 0:
					case sides[j].side == SideComparison:
						u[m][len(p.cs)+1] = x
					default:
						u[m][len(p.cs)] = x
					}
				}
			}
		}
	}, defined
}

// weightingSideInputs returns, per side, the delta-method inputs with the
// coalitions' weight masks, their log scales and the gradients of every
// metric, and which metrics are defined on every side and coalition.
func weightingSideInputs(sides []*sideEstimate, names []string, p influencePlan, opt Options) ([]deltaInput, [][]float64, [][][][]float64, []bool) {
	defined := make([]bool, len(names))
	for m := range defined {
		defined[m] = names[m] != metrics.NameAUC
	}
	full := uint64(1)<<p.k - 1
	ins := make([]deltaInput, len(sides))
	logc := make([][]float64, len(sides))
	grads := make([][][][]float64, len(sides))
	for j, e := range sides {
		ins[j] = deltaInput{y: e.y, s: e.s, logr: e.logr, names: names, threshold: opt.Threshold, bins: opt.ECEBins, wc: make([]uint64, len(p.cs))}
		for c, S := range p.cs {
			ins[j].wc[c] = e.weightCoalition(S, full)
		}
		logc[j] = ins[j].logScales()
		grads[j] = ins[j].gradients(logc[j])
		for c := range p.cs {
			for m := range names {
				if grads[j][c][m] == nil {
					defined[m] = false
				}
			}
		}
	}
	return ins, logc, grads, defined
}

// sideShares returns λ[m][c], the weight of sides[0] in metric m's (of nm)
// combined estimate at coalition cs[c]: 1 with one side, the metric's
// ReferenceWeight when fixed, else the sides' effective sample sizes'
// share (0 or 1 when one side's is undefined).
func sideShares(mds []MetricDecomposition, sides []*sideEstimate, nm int, cs []uint64) [][]float64 {
	lambda := make([][]float64, nm)
	var ess [][]float64
	for m := range lambda {
		lambda[m] = make([]float64, len(cs))
		for c := range lambda[m] {
			switch {
			case len(sides) == 1:
				lambda[m][c] = 1
			case mds[m].ReferenceWeight != nil:
				lambda[m][c] = *mds[m].ReferenceWeight
			default:
				if ess == nil {
					ess = essSomeSides(sides, cs)
				}
				lambda[m][c] = essShare(ess[0][c], ess[1][c])
			}
		}
	}
	return lambda
}

// essShare is a/(a+b), or 0 when a is undefined and 1 when b is.
func essShare(a, b float64) float64 {
	switch {
	case math.IsNaN(a):
		return 0
	case math.IsNaN(b):
		return 1
	}
	return a / (a + b)
}

// recordSides maps each record of the split to its side (1-based; 0 for
// none) and its position within that side's arrays.
func recordSides(sides []*sideEstimate, g groupSplit) (side, pos []int) {
	side = make([]int, len(g.refIdx)+len(g.cmpIdx))
	pos = make([]int, len(side))
	for j, e := range sides {
		idx := g.refIdx
		if e.side == SideComparison {
			idx = g.cmpIdx
		}
		for a, r := range idx {
			side[r], pos[r] = j+1, a
		}
	}
	return side, pos
}

// logWeights returns log w at record r of side in for every weight
// coalition in.wc[c]: the sums of the clipped log-ratios of its
// mechanisms. With every coalition present (p.full) they are the subset
// sums of the clipped log-ratios, 2^k additions into sums (scratch of
// length 2^k); otherwise each is summed on its own.
func logWeights(in *deltaInput, r int, p influencePlan, sums []float64) []float64 {
	out := make([]float64, len(in.wc))
	if !p.full {
		for c, wc := range in.wc {
			out[c] = in.logWeight(wc, r)
		}
		return out
	}
	sums[0] = 0
	for W := 1; W < len(sums); W++ {
		low := bits.TrailingZeros(uint(W))
		sums[W] = sums[W&(W-1)] + math.Max(-ClipLogRatio, math.Min(ClipLogRatio, in.logr[low][r]))
	}
	for c, wc := range in.wc {
		out[c] = sums[wc]
	}
	return out
}
