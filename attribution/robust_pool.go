package attribution

// The leaves of the robust estimator, and pooling over the two groups.
//
// Each step r of a coalition's estimate (r = 0 the first term, the mean
// of μ̂_2 over group c_{k_1}; r ≥ 1 the correction of step r) is a
// weighted mean over the records of one group: at step r ≥ 1,
//
//	C_r = Σ_i ω_r(i)·(μ̂_{r+1}(i) − μ̂_r(i)) / Σ_i ω_r(i)
//
// over group c_{k_r}, ω_r carrying its records to the hybrid's
// distribution of An(D_{r+1}), as in Quintas-Martínez et al. (2024).
// With pooling (Options.RobustPool, for studies), every
// step also averages the other group's records, carried to the same
// hybrid distribution including node k_r itself (ω over An(D_{r+1}) ∪
// {k_r}, the factor of k_r the ratio from the other group's mechanism to
// c_{k_r}'s), and the two groups' means are combined with weights
// proportional to their effective sample sizes (Σω)²/Σω² (Kish 1965,
// "Survey Sampling", from memory). Both means are consistent for the same
// correction whenever the weights are right. A mechanism that does not
// differ between the groups (ratio about 1) then gives about the same
// regression and the same corrections whichever group its step takes, as
// the weighting estimator does; without pooling the two choices read
// different records, and a read but unshifted mechanism's contribution
// carries that sampling noise. The price: the other group's part has mean
// zero under a right regression only if the step's own ratio is right too
// (its records' node k follows the other mechanism), so the estimate is no
// longer multiply robust, nor orthogonal to the ratios, and the ends of the
// gap are no longer the observed metrics; the influence-function standard
// errors, which hold the ratios fixed, then understate the variance
// (measured: README, Accuracy).

// leafPart is one group's weighted mean at one step of a leaf: its
// weights (w), its value per term (mean) and its share of the step.
type leafPart struct {
	w     *weightMoments
	mean  []float64
	share float64
}

// leafConfigs returns the weight configurations of step r under leaf key:
// the own group's, and with pooling the other group's.
func (fam *robustFamily) leafConfigs(in *robustInput, key, r int) []weightConfig {
	g := key >> r & 1
	var own weightConfig
	if r == 0 {
		own = weightConfig{r: 0, g: g}
	} else {
		own = fam.configOf(key, r)
	}
	if !in.pool {
		return []weightConfig{own}
	}
	other := weightConfig{r: r, g: 1 - g, mask: 1 << uint(fam.chain.steps[r].mech)}
	if r > 0 {
		for _, j := range fam.chain.steps[r].weights {
			if key>>fam.pos[j]&1 != other.g {
				other.mask |= 1 << uint(j)
			}
		}
	}
	return []weightConfig{own, other}
}

// leaf computes θ̂ of the relevant coalition key (bit r: the group of step
// r) from the coefficients on its path: per step, the weighted means of
// its parts from the moments,
//
//	first term: Σ_j W_{1,j}·β_{1,j} / Σω,
//	step r ≥ 1: Σ_j (W_{r+1,j}·β_{r+1,j} − W_{r,j}·β_{r,j}) / Σω,
//
// W the ω-weighted design sums of each fold's records (weightMoments;
// the top's design is the terms themselves), and their ESS-weighted
// combination.
func (fam *robustFamily) leaf(in *robustInput, key int, path [][][][]float64) {
	R := len(fam.chain.steps)
	T := len(fam.terms)
	lf := robustLeaf{theta: make([]float64, T), parts: make([][]leafPart, R)}
	for r := 0; r < R; r++ {
		cfgs := fam.leafConfigs(in, key, r)
		parts := make([]leafPart, len(cfgs))
		var essSum float64
		for pi, c := range cfgs {
			wm := fam.weightedAt(in, c)
			p := leafPart{w: wm, mean: make([]float64, T)}
			for t := 0; t < T; t++ {
				var s float64
				for j := 0; j < in.k; j++ {
					if r == 0 {
						s += dot(wm.cur[j], path[1][t][j])
					} else {
						s += dot(wm.next[j], path[r+1][t][j]) - dot(wm.cur[j], path[r][t][j])
					}
				}
				p.mean[t] = s / wm.sum
			}
			p.share = wm.ess()
			essSum += p.share
			parts[pi] = p
		}
		for pi := range parts {
			parts[pi].share /= essSum
			for t := 0; t < T; t++ {
				lf.theta[t] += parts[pi].share * parts[pi].mean[t]
			}
		}
		lf.parts[r] = parts
	}
	fam.leaves[key] = lf
}

// weightedAt returns the weighted moments of configuration c (computed on
// first use).
func (fam *robustFamily) weightedAt(in *robustInput, c weightConfig) *weightMoments {
	if c.r == 0 && c.mask == 0 {
		return fam.unitMoments(in, c.g)
	}
	if wm, ok := fam.configs[c]; ok {
		return wm
	}
	wm := fam.weightMomentsOf(in, c)
	fam.configs[c] = wm
	return wm
}

// ess is the effective sample size (Σω)²/Σω² of the weights.
func (wm *weightMoments) ess() float64 {
	if wm.sumSq == 0 {
		return 0
	}
	return wm.sum * wm.sum / wm.sumSq
}
