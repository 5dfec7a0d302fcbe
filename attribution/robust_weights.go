package attribution

import (
	"math"
	"math/bits"
	"sort"

	"github.com/gapwise/gapwise/internal/workers"
)

// weightConfig identifies the weights ω_r of one step under a coalition:
// the step, its group, and the set of the step's weight mechanisms whose
// group differs (bit j: mechanism j). Coalitions that agree on these
// share the weights.
type weightConfig struct {
	r, g int
	mask uint64
}

// weightMoments are the ω_r-weighted design sums of one weightConfig over
// the records of its group, per fold: cur = Σ ω x_r, next = Σ ω x_{r+1}
// (x_R: the terms), sum = Σ ω, with ω scaled by exp(−logScale) so that
// its largest value is 1 (the estimator is a ratio in ω, so the scale
// cancels).
type weightMoments struct {
	cfg        weightConfig
	cur, next  [][]float64 // next is nil for the first term (r = 0)
	sum, sumSq float64
	logScale   float64
	n          int // records of the group
}

// configOf returns the weightConfig of step r (r ≥ 1) under leaf key.
func (fam *robustFamily) configOf(key, r int) weightConfig {
	g := key >> r & 1
	var mask uint64
	for _, j := range fam.chain.steps[r].weights {
		if key>>fam.pos[j]&1 != g {
			mask |= 1 << uint(j)
		}
	}
	return weightConfig{r: r, g: g, mask: mask}
}

// prepareWeights computes the weighted moments of every configuration
// the leaves use, in parallel, before the leaves are formed.
func (fam *robustFamily) prepareWeights(in *robustInput) {
	R := len(fam.chain.steps)
	seen := map[weightConfig]bool{}
	var cfgs []weightConfig
	for key := 0; key < 1<<R; key++ {
		for r := 0; r < R; r++ {
			for _, c := range fam.leafConfigs(in, key, r) {
				if !seen[c] && !(c.r == 0 && c.mask == 0) {
					seen[c] = true
					cfgs = append(cfgs, c)
				}
			}
		}
	}
	sort.Slice(cfgs, func(a, b int) bool {
		x, y := cfgs[a], cfgs[b]
		if x.r != y.r {
			return x.r < y.r
		}
		if x.g != y.g {
			return x.g < y.g
		}
		return x.mask < y.mask
	})
	out := make([]*weightMoments, len(cfgs))
	workers.For(in.workers, len(cfgs), func(_, c int) {
		out[c] = fam.weightMomentsOf(in, cfgs[c])
	})
	for _, wm := range out {
		fam.configs[wm.cfg] = wm
	}
}

// weighted returns the weighted moments of step r under leaf key.
func (fam *robustFamily) weighted(in *robustInput, key, r int) *weightMoments {
	c := fam.configOf(key, r)
	if wm, ok := fam.configs[c]; ok {
		return wm
	}
	wm := fam.weightMomentsOf(in, c)
	fam.configs[c] = wm
	return wm
}

// logWeight returns log ω at record i under c before scaling: the sum of
// log r_j over the mechanisms of c.mask, negated for the comparison group
// (whose records are carried to the reference mechanisms by 1/r_j).
func (in *robustInput) logWeight(c weightConfig, i int) float64 {
	var v float64
	for b := c.mask; b != 0; b &= b - 1 {
		v += in.logr[bits.TrailingZeros64(b)][i]
	}
	if c.g == 1 {
		return -v
	}
	return v
}

// weightMomentsOf computes the weighted moments of configuration c.
func (fam *robustFamily) weightMomentsOf(in *robustInput, c weightConfig) *weightMoments {
	recs := in.group[c.g]
	logw := make([]float64, len(recs))
	scale := math.Inf(-1)
	for a, i := range recs {
		logw[a] = in.logWeight(c, i)
		scale = max(scale, logw[a])
	}
	if math.IsInf(scale, -1) {
		scale = 0
	}
	// The first term (r = 0) averages step 1's fit; a correction the
	// difference of steps r+1 and r.
	cur := fam.design(in, max(c.r, 1))
	var next *stepDesign
	wm := &weightMoments{cfg: c, logScale: scale, n: len(recs), cur: make([][]float64, in.k)}
	if c.r > 0 {
		next = fam.design(in, c.r+1)
		wm.next = make([][]float64, in.k)
	}
	for j := range wm.cur {
		wm.cur[j] = make([]float64, cur.width())
		if next != nil {
			wm.next[j] = make([]float64, next.width())
		}
	}
	x := make([]float64, cur.width())
	var xn []float64
	if next != nil {
		xn = make([]float64, next.width())
	}
	for a, i := range recs {
		w := math.Exp(logw[a] - scale)
		wm.sum += w
		wm.sumSq += w * w
		cur.row(i, x)
		cj := wm.cur[in.folds[i]]
		for p, v := range x {
			cj[p] += w * v
		}
		if next != nil {
			next.row(i, xn)
			nj := wm.next[in.folds[i]]
			for p, v := range xn {
				nj[p] += w * v
			}
		}
	}
	return wm
}

// unitMoments returns, per fold, the sums of step 1's design (the terms
// when R = 1) over group g's records: the first term of the estimate is
// their mean prediction.
func (fam *robustFamily) unitMoments(in *robustInput, g int) *weightMoments {
	c := weightConfig{r: 0, g: g}
	if wm, ok := fam.configs[c]; ok {
		return wm
	}
	ds := fam.design(in, 1)
	wm := &weightMoments{cfg: c, n: len(in.group[g]), cur: make([][]float64, in.k)}
	for j := range wm.cur {
		wm.cur[j] = make([]float64, ds.width())
	}
	x := make([]float64, ds.width())
	for _, i := range in.group[g] {
		ds.row(i, x)
		cj := wm.cur[in.folds[i]]
		for p, v := range x {
			cj[p] += v
		}
	}
	wm.sum, wm.sumSq = float64(wm.n), float64(wm.n)
	fam.configs[c] = wm
	return wm
}
