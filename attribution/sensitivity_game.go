package attribution

import (
	"math"
	"math/bits"
)

// sensitivityCacheLimit caps the running sums kept between evaluations of
// a continuous metric's coalition bounds (2^k coalitions × records of the
// metric, two sums and f of 8 bytes each: 96 MiB); above it the weights
// are recomputed and scanned at every evaluation.
const sensitivityCacheLimit = 1 << 22

// gameBounder evaluates, for one metric on one side's records, the bounds
// of every coalition value M(P_S) under the marginal sensitivity model
// with factor Λ on the weight vector of each coalition as a whole: the
// true weight of record r in the hybrid S lies in [w_S(r)/Λ, w_S(r)·Λ],
// w_S = exp(Σ_{i∈wc(S)} log r_i) (wc maps the hybrid coalition to the
// coalition of log-weights on this side, see sideEstimate). The coalition
// whose weights are all 1 (∅ on the reference side, N on the comparison
// side) is the group's own observed value and is not moved.
type gameBounder struct {
	k      int
	side   *sideEstimate
	order  []int     // records of the metric, ascending f
	f      []float64 // per record of the side
	binary bool
	// ones[S], zeros[S]: Σ w over the records with f = 1 and f = 0 (binary
	// metrics); sums[S]: the running sums over order (continuous metrics,
	// when they fit sensitivityCacheLimit).
	ones, zeros []float64
	sums        []prefixSums
}

func newGameBounder(side *sideEstimate, f []float64, keep []bool, binary bool) *gameBounder {
	k := len(side.logr)
	var idx []int
	for r, in := range keep {
		if in {
			idx = append(idx, r)
		}
	}
	sub := make([]float64, len(idx))
	for a, r := range idx {
		sub[a] = f[r]
	}
	order := make([]int, len(idx))
	for a, j := range sortedByValue(sub) {
		order[a] = idx[j]
	}
	g := &gameBounder{k: k, side: side, order: order, f: f, binary: binary}
	n := 1 << k
	if binary {
		g.ones, g.zeros = make([]float64, n), make([]float64, n)
	} else if n*len(order) <= sensitivityCacheLimit {
		g.sums = make([]prefixSums, n)
	}
	for S := 0; S < n; S++ {
		if g.ones == nil && g.sums == nil {
			break
		}
		w := g.coalitionWeights(uint64(S))
		if binary {
			for _, r := range order {
				if f[r] == 1 {
					g.ones[S] += w[r]
				} else {
					g.zeros[S] += w[r]
				}
			}
			continue
		}
		g.sums[S] = newPrefixSums(order, f, w)
	}
	return g
}

// coalitionWeights returns the weights of hybrid S at every record of the
// side (zero outside the metric's records), scaled by exp(−max log w) so
// that they stay finite; the scale cancels in a self-normalised mean.
func (g *gameBounder) coalitionWeights(S uint64) []float64 {
	full := uint64(1)<<g.k - 1
	wc := g.side.weightCoalition(S, full)
	w := make([]float64, len(g.f))
	top := math.Inf(-1)
	for _, r := range g.order {
		var l float64
		for i := 0; i < g.k; i++ {
			if wc&(1<<i) != 0 {
				l += g.side.logr[i][r]
			}
		}
		w[r] = l
		top = math.Max(top, l)
	}
	for _, r := range g.order {
		w[r] = math.Exp(w[r] - top)
	}
	return w
}

// bounds returns lo[S] ≤ M(P_S) ≤ hi[S] for every coalition S at factor Λ
// (lo = hi = the point value at Λ = 1 and for the unweighted coalition).
func (g *gameBounder) bounds(lambda float64) (lo, hi []float64) {
	n := 1 << g.k
	lo, hi = make([]float64, n), make([]float64, n)
	full := uint64(1)<<g.k - 1
	for S := 0; S < n; S++ {
		l := lambda
		if g.side.weightCoalition(uint64(S), full) == 0 {
			l = 1
		}
		lo[S], hi[S] = g.coalitionBounds(uint64(S), l)
	}
	return lo, hi
}

func (g *gameBounder) coalitionBounds(S uint64, lambda float64) (lo, hi float64) {
	if g.binary {
		a, b := g.ones[S], g.zeros[S]
		if lambda == 1 {
			m := a / (a + b)
			return m, m
		}
		return (a / lambda) / (a/lambda + b*lambda), (a * lambda) / (a*lambda + b/lambda)
	}
	if g.sums != nil {
		return g.sums[S].bounds(lambda)
	}
	return boundsSorted(g.order, g.f, g.coalitionWeights(S), lambda)
}

// shapleyBounds returns conservative bounds of every Shapley value of the
// game v(S) = M(P_S) − M(P_∅) given lo[S] ≤ M(P_S) ≤ hi[S]. The Shapley
// value is the signed linear combination
//
//	φ_i = Σ_{T∋i} c_{|T|−1} M(P_T) − Σ_{T∌i} c_{|T|} M(P_T),
//	c_s = s!(k−s−1)!/k!,
//
// so φ_i ≥ Σ_{T∋i} c lo[T] − Σ_{T∌i} c hi[T] and likewise above. The bound
// is conservative: it lets every coalition value take its own extreme,
// whereas one set of true weights moves all of them together.
func shapleyBounds(lo, hi []float64, k int) (plo, phi []float64) {
	plo, phi = make([]float64, k), make([]float64, k)
	if k == 0 {
		return plo, phi
	}
	c := shapleyWeights(k)
	for i := 0; i < k; i++ {
		bit := 1 << i
		for T := range lo {
			if T&bit != 0 {
				w := c[bits.OnesCount(uint(T))-1]
				plo[i] += w * lo[T]
				phi[i] += w * hi[T]
			} else {
				w := c[bits.OnesCount(uint(T))]
				plo[i] -= w * hi[T]
				phi[i] -= w * lo[T]
			}
		}
	}
	return plo, phi
}
