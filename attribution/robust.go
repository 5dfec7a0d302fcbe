package attribution

import (
	"fmt"
	"math"
	"sort"

	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/mat"
)

// The multiply robust estimator of coalition values (Quintas-Martínez,
// Bahadori, Santiago, Mu & Heckerman 2024, "Multiply-robust causal change
// attribution", ICML 2024, PMLR 235:41821–41840, arXiv:2404.08839),
// in the terms of DESIGN.md.
//
// Target. For a coalition S let c_j ∈ {ref, cmp} be the group whose
// mechanism node j follows in the hybrid P_S. A metric is g(θ_S) of means
// θ_S = E_S[f(V)] of per-record terms f (robust_terms.go). The nodes f
// depends on, and their ancestors, ordered topologically, are
// V_{k_1} … V_{k_R} (robustChain; no other node matters to θ_S). Backwards
// from μ_{R+1} = f,
//
//	μ_r(D_r) = E_{c_{k_r}}[ μ_{r+1}(D_{r+1}) | D_r ],
//
// the regression of the next step's function in the group whose mechanism
// node k_r follows (D_r as in robustChain), and θ_S = E_{c_{k_1}}[μ_2].
//
// Estimator. With μ̂_r the fitted regressions and ω_r the density ratio
// of the hybrid's distribution of An(D_{r+1}) to group c_{k_r}'s own,
//
//	ω_r = Π_{j ∈ An(D_{r+1}) ∖ {k_r}, c_j ≠ c_{k_r}} r_j^{±1}
//
// (r_j = P_cmp(x_j | pa_j)/P_ref(x_j | pa_j) for reference records, 1/r_j
// for comparison records, from the cross-fitted group classifiers of
// EstimateRatios),
//
//	θ̂_S = mean_{i ∈ c_{k_1}} μ̂_2(i)
//	     + Σ_{r=2}^{R} Σ_{i ∈ c_{k_r}} ω_r(i)·(μ̂_{r+1}(i) − μ̂_r(i)) / Σ_{i ∈ c_{k_r}} ω_r(i),
//
// with μ̂_{R+1} = f and the weights self-normalised within each step
// (which changes nothing in the limit and bounds every correction by the
// range of f). With exact weights the corrections telescope to the
// weighting estimate of E_S[f]; with exact regressions every correction
// has mean zero and the first term is θ_S. The error is a sum over steps
// of products of a regression error and a weight error, so θ̂_S is
// consistent when, at each step, either the regression or the weights are
// right (multiply robust), and with cross-fitting it is asymptotically
// normal with influence function the centred summands (robustVariances),
// which gives Wald intervals without refitting. For S = ∅ and S = N every
// weight is 1 and the corrections telescope to the observed group mean, so
// both ends of the gap are the observed metrics and the residual is 0.
//
// Nuisance fits and cross-fitting. Records are split into the folds of
// the density ratios (assignFolds, stratified by group). For fold j, every
// regression of every step is fitted on the records outside fold j (the
// responses of step r being step r+1's fold-j fits at those records) and
// evaluated on fold j; the ratios at a fold-j record come from classifiers
// that did not see fold j either. Each regression is fitted on at most
// Options.MaxFitRows records of its group (a fixed subsample per fold).
// The learner of each regression is chosen among least squares on the
// linear and expanded bases, and for a binary term at the last step the
// two logistic learners, by squared error on the held-out records of
// every fold (robust_fit.go). A step's regressions depend on the groups
// of that step and the later ones only, (c_{k_r}, …, c_{k_R}), so they are
// fitted once per such suffix and shared by every coalition that agrees
// on it: 2^{R−r+1} regressions per fold at step r, 2^{R+1} − 4 in all.
// Terms that depend on the same nodes share their steps' bases and Gram
// matrices.

// RobustMaxSteps bounds R, the relevant nodes of one term: the regressions
// number about 2^{R+1} per term and fold.
const RobustMaxSteps = 12

// robustInput is what the robust estimator reads.
type robustInput struct {
	x         *mat.Dense // learner features (probability columns as logits)
	cmp       []bool
	folds     []int
	k         int         // number of folds
	logr      [][]float64 // per mechanism, log r at every record (clipped)
	y, s      []float64
	threshold float64
	bins      int
	mechs     []Mechanism
	graph     *mechanismGraph
	reads     NodeReads
	workers   int
	group     [2][]int // records of each group (0: reference, 1: comparison)
	pool      bool     // Options.RobustPool
	hooks     *robustHooks
}

// robustHooks replace the robust estimator's nuisances, for tests of its
// double robustness: LogRatios the estimated log-ratios ([mechanism]
// [record]), Regression every fitted regression. Regression(term, mech,
// group, i) returns μ_r at record i for the step of mechanism mech, where
// group(j) is the group (0 reference, 1 comparison) of the step of
// mechanism j for the steps from mech on.
type robustHooks struct {
	LogRatios  [][]float64
	Regression func(term termID, mech int, group func(int) int, i int) float64
}

// newRobustInput checks and lays out the input: folds, training
// subsamples and the mechanism graph.
func newRobustInput(s *Sample, mechs []Mechanism, logr [][]float64, folds []int, k int, opt Options) (*robustInput, error) {
	x, err := learnerFeatures(s)
	if err != nil {
		return nil, err
	}
	g, err := newMechanismGraph(mechs)
	if err != nil {
		return nil, err
	}
	in := &robustInput{x: x, cmp: s.Comparison, folds: folds, k: k, logr: logr, y: s.Labels, s: s.Scores,
		threshold: opt.Threshold, bins: opt.ECEBins, mechs: mechs, graph: g, reads: opt.Reads,
		workers: workers.Count(opt.Workers), hooks: opt.robustHooks, pool: opt.RobustPool}
	for i, c := range s.Comparison {
		gi := 0
		if c {
			gi = 1
		}
		in.group[gi] = append(in.group[gi], i)
	}
	return in, nil
}

// robustFamily is the robust estimate of the terms that share one chain.
type robustFamily struct {
	chain   robustChain
	terms   []meanTerm
	f       [][]float64 // [term][record] f
	lo, hi  []float64   // per term, its range over the records
	pos     map[int]int // mechanism → step index
	bases   []*regBasis // per step (step 0: none)
	moments []*stepMoments
	solvers []*stepSolver
	topH    [][2][]float64
	nodes   [][]*treeNode // [step][suffix key], step ≥ 1
	leaves  []robustLeaf  // [leaf key]: bit r = group of step r
	configs map[weightConfig]*weightMoments
	// oracle[r][col][record], with hooks: the step's design is the
	// injected regressions, one column per (suffix key, term).
	oracle [][][]float64
	fits   int      // regressions fitted (every fold and candidate)
	chosen [][2]int // [step] how often each learner was chosen
}

// treeNode holds the fitted regressions of one step and suffix.
type treeNode struct {
	beta    [][][]float64 // [term][fold] coefficients on the step's design
	learner []int         // [term] chosen learner
}

// robustLeaf is the estimate of one relevant coalition: θ̂ per term, and
// per step (step 0: the first term) the weighted parts it averages
// (robust_pool.go).
type robustLeaf struct {
	theta []float64    // [term] θ̂
	parts [][]leafPart // [step] one part, or with pooling one per group
}

// leafKey returns the leaf of coalition S (bit i: mechanism i in its
// comparison form) in this family.
func (fam *robustFamily) leafKey(S uint64) int {
	key := 0
	for r, st := range fam.chain.steps {
		if S&(1<<uint(st.mech)) != 0 {
			key |= 1 << r
		}
	}
	return key
}

// newRobustFamily prepares the family of chain ch with terms.
func newRobustFamily(in *robustInput, ch robustChain, terms []meanTerm) *robustFamily {
	n := len(in.y)
	fam := &robustFamily{chain: ch, terms: terms, pos: map[int]int{}, configs: map[weightConfig]*weightMoments{}}
	for _, t := range terms {
		f := make([]float64, n)
		lo, hi := math.Inf(1), math.Inf(-1)
		for i := range f {
			f[i] = t.value(in.y[i], in.s[i], in.threshold, in.bins)
			lo, hi = min(lo, f[i]), max(hi, f[i])
		}
		fam.f = append(fam.f, f)
		fam.lo, fam.hi = append(fam.lo, lo), append(fam.hi, hi)
	}
	R := len(ch.steps)
	fam.bases = make([]*regBasis, R)
	fam.moments = make([]*stepMoments, R)
	fam.solvers = make([]*stepSolver, R)
	fam.nodes = make([][]*treeNode, R)
	fam.chosen = make([][2]int, R)
	for r, st := range ch.steps {
		fam.pos[st.mech] = r
		if r == 0 {
			continue
		}
		var cols []int
		for _, m := range st.regs {
			cols = append(cols, in.mechs[m].NodeCols...)
		}
		sort.Ints(cols)
		fam.nodes[r] = make([]*treeNode, 1<<(R-r))
		if in.hooks != nil && in.hooks.Regression != nil {
			fam.bases[r] = &regBasis{d: (1 << (R - r)) * len(terms), nLin: 1}
			continue
		}
		fam.bases[r] = newRegBasis(in.x, cols)
	}
	fam.leaves = make([]robustLeaf, 1<<R)
	return fam
}

// estimate computes the moments of every step, fits every regression and
// fills the leaves.
func (fam *robustFamily) estimate(in *robustInput) error {
	R := len(fam.chain.steps)
	if R > RobustMaxSteps {
		return fmt.Errorf("attribution: the robust estimator supports terms that depend on at most %d mechanisms (with their ancestors), got %d; use the weighting estimator", RobustMaxSteps, R)
	}
	if in.hooks != nil && in.hooks.Regression != nil {
		fam.fillOracle(in)
	}
	workers.For(in.workers, R, func(_, r int) {
		if r == 0 {
			fam.topH = fam.topGram(in)
			return
		}
		fam.moments[r] = fam.momentsOf(in, r)
		fam.solvers[r] = newStepSolver(fam.moments[r], fam.bases[r].nLin, in.k)
	})
	T := len(fam.terms)
	top := make([][][]float64, T) // [term][fold]: e_t on the top design
	for t := range top {
		top[t] = make([][]float64, in.k)
		for j := range top[t] {
			top[t][j] = make([]float64, T)
			top[t][j][t] = 1
		}
	}
	fam.prepareWeights(in)
	fam.unitMoments(in, 0)
	fam.unitMoments(in, 1)
	path := make([][][][]float64, R+1) // [step][term][fold] coefficients on the current path
	path[R] = top
	return fam.visit(in, R-1, 0, path)
}

// visit fits step r for both groups under suffix key (the groups of steps
// r+1 … R−1) and recurses; path[r+1] holds the coefficients of step r+1
// on the current path. At step 0 it computes the leaves.
func (fam *robustFamily) visit(in *robustInput, r, suffix int, path [][][][]float64) error {
	for g := 0; g < 2; g++ {
		key := g | suffix<<1
		if r == 0 {
			fam.leaf(in, key, path)
			continue
		}
		node, err := fam.fitNode(in, r, g, path[r+1], key)
		if err != nil {
			return err
		}
		fam.nodes[r][key] = node
		path[r] = node.beta
		if err := fam.visit(in, r-1, key, path); err != nil {
			return err
		}
	}
	return nil
}

// fitNode fits step r's regressions in group g on every fold from the
// parent coefficients up ([term][fold], on step r+1's design), for every
// term and candidate learner, and keeps per term the learner with the
// least held-out squared error over group g's records of all folds:
// for fold j, with b' the parent's coefficients and β the fit,
//
//	Σ_{held out} (x_{r+1}·b' − x_r·β)² = b'ᵀH_{r+1}b' − 2βᵀK_r b' + βᵀH_rβ
//
// over fold j's records of group g.
func (fam *robustFamily) fitNode(in *robustInput, r, g int, up [][][]float64, key int) (*treeNode, error) {
	T := len(fam.terms)
	if fam.oracle != nil {
		return fam.oracleNode(in, r, key), nil
	}
	m, sv := fam.moments[r], fam.solvers[r]
	var hNext [][2][]float64
	if r+1 < len(fam.chain.steps) {
		hNext = fam.moments[r+1].H
	} else {
		hNext = fam.topH
	}
	node := &treeNode{beta: make([][][]float64, T), learner: make([]int, T)}
	for t := 0; t < T; t++ {
		var betas [numRegLearners][][]float64
		var loss [numRegLearners]float64
		var ok [numRegLearners]bool
		for l := range betas {
			betas[l] = make([][]float64, in.k)
			ok[l] = true
		}
		for j := 0; j < in.k; j++ {
			b := up[t][j]
			xz := mulVec(m.trainCross(j, g), m.d, b)
			held := quad(b, hNext[j][g], b)
			for l := 0; l < numRegLearners; l++ {
				beta := sv.solve(j, g, l, xz)
				if beta == nil {
					ok[l] = false
					continue
				}
				fam.fits++
				betas[l][j] = beta
				loss[l] += held - 2*quad(beta, m.K[j][g], b) + quad(beta, m.H[j][g], beta)
			}
		}
		best := -1
		for l := 0; l < numRegLearners; l++ {
			if ok[l] && (best < 0 || loss[l] < loss[best]) {
				best = l
			}
		}
		if best < 0 {
			return nil, fmt.Errorf("attribution: robust estimator: no regression could be fitted at the step of node %q", in.mechs[fam.chain.steps[r].mech].Node)
		}
		node.learner[t] = best
		node.beta[t] = betas[best]
		fam.chosen[r][best]++
	}
	return node, nil
}
