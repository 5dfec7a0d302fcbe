package attribution

import "math"

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

// prepareInfluence returns, for the coalitions of plan p, the per-record
// influence of every metric the robust estimator covers (defined[m]; not
// AUC, nor a metric undefined under some coalition): u[m][c] =
// ∇g(θ̂_S)·ψ_S(i) at S = p.cs[c].
func (e *robustEstimate) prepareInfluence(p influencePlan) (func(lo, hi int) recordInfluence, []bool) {
	nm := len(e.metrics)
	defined := make([]bool, nm)
	grads := make([][][]float64, nm) // [m][c] ∇g at θ̂_{cs[c]}
	for m := range grads {
		if !e.ok[m] {
			continue
		}
		defined[m] = true
		grads[m] = make([][]float64, len(p.cs))
		for c, S := range p.cs {
			th := e.theta(m, S, nil)
			if _, err := e.metrics[m].value(th); err != nil {
				defined[m] = false
				break
			}
			g := make([]float64, len(th))
			e.metrics[m].grad(th, g)
			grads[m][c] = g
		}
	}
	keyOf := make([][]int, len(e.families)) // [family][c] leaf of cs[c]
	for fi, fam := range e.families {
		keyOf[fi] = make([]int, len(p.cs))
		for c, S := range p.cs {
			keyOf[fi][c] = fam.leafKey(S)
		}
	}
	return func(lo, hi int) recordInfluence {
		psi := make([][][][]float64, len(e.families)) // [family][leaf][term][a]
		for fi, fam := range e.families {
			psi[fi] = fam.blockInfluence(e.in, lo, hi)
		}
		return func(a int, u [][]float64) {
			for m := range u {
				if !defined[m] {
					continue
				}
				for c := range p.cs {
					var v float64
					for j, id := range e.metrics[m].terms {
						w := e.where[id]
						v += grads[m][c][j] * psi[w[0]][keyOf[w[0]][c]][w[1]][a]
					}
					u[m][c] = v
				}
				// Both ends are the observed metrics.
				u[m][len(p.cs)], u[m][len(p.cs)+1] = u[m][0], u[m][p.fullAt()]
			}
		}
	}, defined
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
	// Normalised weights ω(i)/ω̄ of the block's records per weight
	// configuration, shared by the leaves that use it.
	wcache := map[*weightMoments][]float64{}
	var walk func(r, suffix int)
	walk = func(r, suffix int) {
		for g := 0; g < 2; g++ {
			key := g | suffix<<1
			if r == 0 {
				out[key] = fam.leafInfluence(in, key, lo, hi, pred, wcache)
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
// from the path's predictions pred[r][term][a] (pred[R]: the terms): for
// each step and each of its parts, the part's share times the centred,
// normalised weighted summand of a record of the part's group.
func (fam *robustFamily) leafInfluence(in *robustInput, key, lo, hi int, pred [][][]float64, wcache map[*weightMoments][]float64) [][]float64 {
	T := len(fam.terms)
	lf := &fam.leaves[key]
	out := zeros(T, hi-lo)
	weights := func(wm *weightMoments) []float64 {
		if w, ok := wcache[wm]; ok {
			return w
		}
		w := make([]float64, hi-lo)
		for a := range w {
			i := lo + a
			if g := pick01(in.cmp[i]); int(g) != wm.cfg.g {
				continue
			}
			w[a] = 1
			if wm.cfg.mask != 0 {
				w[a] = math.Exp(in.logWeight(wm.cfg, i)-wm.logScale) / (wm.sum / float64(wm.n))
			}
		}
		wcache[wm] = w
		return w
	}
	for a := 0; a < hi-lo; a++ {
		i := lo + a
		g := 0
		if in.cmp[i] {
			g = 1
		}
		ng := float64(len(in.group[g]))
		for r, parts := range lf.parts {
			for _, p := range parts {
				wm := p.w
				if wm.cfg.g != g {
					continue
				}
				w := weights(wm)[a]
				for t := 0; t < T; t++ {
					var d float64
					if r == 0 {
						d = pred[1][t][a]
					} else {
						d = pred[r+1][t][a] - pred[r][t][a]
					}
					out[t][a] += p.share * w * (d - p.mean[t]) / ng
				}
			}
		}
	}
	return out
}
