package attribution

import (
	"math"

	"github.com/gapwise/gapwise/internal/workers"
)

// Influence-function standard errors of the robust estimator.
//
// With cross-fitting the robust estimate is asymptotically linear,
// θ̂_S − θ_S ≈ Σ_i ψ_S(i), where for record i of group g (n_g records)
//
//	ψ_S(i) = (1/n_g)·( [g = c_{k_1}]·(μ̂_2(i) − m_1)
//	                 + Σ_{r ≥ 2, c_{k_r} = g} (ω_r(i)/ω̄_r)·(μ̂_{r+1}(i) − μ̂_r(i) − C_r) ),
//
// m_1 the first term, C_r the step's correction and ω̄_r the mean weight
// over group g: the centred summands of the estimator itself
// (Quintas-Martínez et al. 2024, asymptotic normality of the multiply
// robust estimator; the nuisance fits add nothing at first order because
// the estimating equation is orthogonal to both). A metric's value
// M̂(S) = g(θ̂_S) has influence ∇g(θ̂_S)·ψ_S (the delta method), and a
// linear functional L = Σ_S a_S M̂(S) — a Shapley value, an end of the
// gap, a what-if value — has influence Σ_S a_S ∇g·ψ_S and variance
// Σ_i (its influence at i)², the two groups being independent samples.

// InfluenceSE holds the influence-function standard errors of one
// metric's estimates; NaN where unknown.
type InfluenceSE struct {
	Reference, Comparison, Gap float64
	// Contributions[i] is the standard error of φ̂_i, Alone[i] of v({i})
	// and IfEqualised[i] of v(N∖{i}).
	Contributions, Alone, IfEqualised []float64
}

// robustBlock is the number of records per block of the influence pass;
// blocks are the unit of parallel work and are summed in order, so the
// result does not depend on the number of goroutines.
const robustBlock = 512

// influenceFunctionals returns, per record, from u[m][S] (the influence
// of the record on M̂(S) of metric m), the influences dst[m] on φ_0 …
// φ_{k−1}, M̂(∅), M̂(N), v(N), v({i}) (k) and v(N∖{i}) (k).
func influenceFunctionals(k int) functional {
	w := shapleyWeights(k)
	full := 1<<k - 1
	return func(u, dst [][]float64) {
		for m := range u {
			d, um := dst[m], u[m]
			for i := range d {
				d[i] = 0
			}
			for S := 0; S <= full; S++ {
				size := popcount(S)
				for i := 0; i < k; i++ {
					if S&(1<<i) == 0 {
						d[i] += w[size] * (um[S|1<<i] - um[S])
					}
				}
			}
			d[k], d[k+1], d[k+2] = um[0], um[full], um[full]-um[0]
			for i := 0; i < k; i++ {
				d[k+3+i] = um[1<<i] - um[0]
				d[2*k+3+i] = um[full&^(1<<i)] - um[0]
			}
		}
	}
}

func popcount(x int) int {
	n := 0
	for ; x != 0; x &= x - 1 {
		n++
	}
	return n
}

// influence returns the standard errors of every robust metric (nil for
// the others) for k mechanisms.
func (e *robustEstimate) influence(k int) []*InfluenceSE {
	in := e.in
	n := len(in.y)
	nm := len(e.metrics)
	full := 1<<k - 1
	// Gradients ∇g(θ̂_S) per metric and coalition; nil where undefined.
	grads := make([][][]float64, nm)
	for m := range grads {
		if !e.ok[m] {
			continue
		}
		grads[m] = make([][]float64, full+1)
		for S := range grads[m] {
			th := e.theta(m, uint64(S), nil)
			if _, err := e.metrics[m].value(th); err != nil {
				continue
			}
			g := make([]float64, len(th))
			e.metrics[m].grad(th, g)
			grads[m][S] = g
		}
	}
	keyOf := make([][]int, len(e.families)) // [family][S] leaf of S
	for fi, fam := range e.families {
		keyOf[fi] = make([]int, full+1)
		for S := range keyOf[fi] {
			keyOf[fi][S] = fam.leafKey(uint64(S))
		}
	}
	nf := 3*k + 3
	blocks := (n + robustBlock - 1) / robustBlock
	partial := make([][][]float64, blocks)
	fn := influenceFunctionals(k)
	workers.For(in.workers, blocks, func(_, b int) {
		lo, hi := b*robustBlock, min(n, (b+1)*robustBlock)
		psi := make([][][][]float64, len(e.families)) // [family][leaf][term][a]
		for fi, fam := range e.families {
			psi[fi] = fam.blockInfluence(in, lo, hi)
		}
		u := zeros(nm, full+1)
		dst := zeros(nm, nf)
		acc := zeros(nm, nf)
		for a := 0; a < hi-lo; a++ {
			for m := 0; m < nm; m++ {
				if !e.ok[m] {
					continue
				}
				for S := 0; S <= full; S++ {
					g := grads[m][S]
					if g == nil {
						u[m][S] = 0
						continue
					}
					var v float64
					for j, id := range e.metrics[m].terms {
						w := e.where[id]
						v += g[j] * psi[w[0]][keyOf[w[0]][S]][w[1]][a]
					}
					u[m][S] = v
				}
			}
			fn(u, dst)
			for m := range acc {
				for f, x := range dst[m] {
					acc[m][f] += x * x
				}
			}
		}
		partial[b] = acc
	})
	total := zeros(nm, nf)
	for _, p := range partial {
		for m := range total {
			for f := range total[m] {
				total[m][f] += p[m][f]
			}
		}
	}
	out := make([]*InfluenceSE, nm)
	for m := range out {
		if !e.ok[m] {
			continue
		}
		undefined := false
		for _, g := range grads[m] {
			undefined = undefined || g == nil
		}
		se := func(f int) float64 {
			if undefined {
				return math.NaN()
			}
			return math.Sqrt(total[m][f])
		}
		o := &InfluenceSE{Reference: se(k), Comparison: se(k + 1), Gap: se(k + 2),
			Contributions: make([]float64, k), Alone: make([]float64, k), IfEqualised: make([]float64, k)}
		for i := 0; i < k; i++ {
			o.Contributions[i], o.Alone[i], o.IfEqualised[i] = se(i), se(k+3+i), se(2*k+3+i)
		}
		out[m] = o
	}
	return out
}

// blockInfluence returns ψ[leaf][term][a] for the records lo … hi−1
// (a = i − lo) of every leaf of the family.
func (fam *robustFamily) blockInfluence(in *robustInput, lo, hi int) [][][]float64 {
	R := len(fam.chain.steps)
	T := len(fam.terms)
	B := hi - lo
	// Design rows of every step over the block (step R: the terms).
	rows := make([][][]float64, R+1)
	for r := 1; r <= R; r++ {
		ds := fam.design(in, r)
		rows[r] = make([][]float64, B)
		for a := range rows[r] {
			rows[r][a] = make([]float64, ds.width())
			ds.row(lo+a, rows[r][a])
		}
	}
	pred := make([][][]float64, R+1) // [step][term][a] on the current path
	pred[R] = make([][]float64, T)
	for t := range pred[R] {
		pred[R][t] = fam.f[t][lo:hi]
	}
	out := make([][][]float64, 1<<R)
	var walk func(r, suffix int)
	walk = func(r, suffix int) {
		for g := 0; g < 2; g++ {
			key := g | suffix<<1
			if r == 0 {
				out[key] = fam.leafInfluence(in, key, lo, hi, pred)
				continue
			}
			node := fam.nodes[r][key]
			p := make([][]float64, T)
			for t := range p {
				p[t] = make([]float64, B)
				for a := range p[t] {
					p[t][a] = dot(rows[r][a], node.beta[t][in.folds[lo+a]])
				}
			}
			pred[r] = p
			walk(r-1, key)
		}
	}
	walk(R-1, 0)
	return out
}

// leafInfluence returns ψ_S[term][a] of leaf key at records lo … hi−1
// from the path's predictions pred[r][term][a] (pred[R]: the terms).
func (fam *robustFamily) leafInfluence(in *robustInput, key, lo, hi int, pred [][][]float64) [][]float64 {
	R := len(fam.chain.steps)
	T := len(fam.terms)
	lf := &fam.leaves[key]
	out := zeros(T, hi-lo)
	for a := 0; a < hi-lo; a++ {
		i := lo + a
		g := 0
		if in.cmp[i] {
			g = 1
		}
		ng := float64(len(in.group[g]))
		if key&1 == g {
			for t := 0; t < T; t++ {
				out[t][a] += (pred[1][t][a] - lf.first[t]) / ng
			}
		}
		for r := 1; r < R; r++ {
			if key>>r&1 != g {
				continue
			}
			wm := lf.w[r]
			w := math.Exp(in.logWeight(wm.cfg, i)-wm.logScale) / (wm.sum / float64(wm.n))
			for t := 0; t < T; t++ {
				out[t][a] += w * (pred[r+1][t][a] - pred[r][t][a] - lf.corr[r][t]) / ng
			}
		}
	}
	return out
}
