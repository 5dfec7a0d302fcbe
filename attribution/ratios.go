package attribution

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/mat"
)

// RatioOptions controls density-ratio estimation.
type RatioOptions struct {
	Folds    int                // cross-fitting folds; 0 means 5
	Seed     uint64             // drives fold assignment and learners
	Learners []classify.Learner // candidates, chosen per column set by out-of-fold log loss
	Workers  int                // goroutines; 0 means GOMAXPROCS
	// MaxFitRows caps the training records of each fit (a stratified
	// subsample); 0 means FitRowsFor the sample's size, negative means no
	// cap.
	MaxFitRows int
	// Fits, if non-nil, shares the fits of column sets between
	// decompositions under different graphs (FitCache).
	Fits *FitCache
}

// MechanismRatio is the estimated density ratio of one mechanism.
type MechanismRatio struct {
	Mechanism Mechanism
	// LogRatio[r] = log r_i at record r of the Sample (both groups), from
	// classifiers that did not see record r.
	LogRatio      []float64
	Learner       string        // chosen for (node, parents)
	ParentLearner string        // chosen for parents; "prior" for a root
	Losses        []LearnerLoss // held-out log loss of each candidate on (node, parents): over the folds used for the choice (see fitAll), all folds for a learner without competitors
	JointLogOdds  []float64     // out-of-fold logit P(cmp | node, parents) of the chosen learner

	jointKey, parentKey string // column-set keys, for reusing the learner choice
	// jointRefit and parentRefit are the learners bootstrap replicates fit
	// on the two column sets (see groupFit.refit).
	jointRefit, parentRefit classify.Learner
}

// fixedLearners maps a column-set key (colKey) to the learner to fit on that
// set, skipping model selection; bootstrap replicates reuse the full-data
// choice this way.
type fixedLearners map[string]classify.Learner

// PriorLearner names the constant classifier used for a root node's parents.
const PriorLearner = "prior"

// groupFit is the cross-fitted classifier of group membership on one set of
// feature columns.
type groupFit struct {
	cols    []int
	logOdds [][]float64 // per candidate learner, out-of-fold log-odds per record; after fitAll only the chosen learner's
	// held[l][fold] holds learner l's log-odds on the held-out records of
	// that fold (fitPlan.test[fold], in order), while fitAll runs: a
	// losing learner, scored on fold 0 alone for large samples, then
	// never needs an array over every record.
	held   [][][]float64
	losses []float64 // per candidate learner, out-of-fold mean log loss
	best   int
	only   int // if ≥ 0, the only learner fitted
	// oddsMean per learner: mean over reference records of the
	// out-of-fold odds P(cmp|x)/P(ref|x), times n_ref/n_cmp (≈ 1 when
	// calibrated; see oddsCalibration).
	oddsMean []float64
	// oddsShare per learner: the largest share of one reference record
	// in the sum of the out-of-fold odds (oddsMaxShare).
	oddsShare []float64
	// fixed, if non-nil, is the learner fitted instead of
	// opt.Learners[only] (a bootstrap replicate's refit learner).
	fixed classify.Learner
	// rounds[l][fold] is the number of boosting rounds learner l's model
	// kept on that fold (0 if it is not boosted or was not fitted there).
	rounds [][]int
	// started[l][fold] reports whether that boosted model's trees grew
	// from its Start learner (classify.BoostedModel.Started).
	started [][]bool
	// refit is the learner a bootstrap replicate fits on this column set:
	// the chosen learner, except that a Boosted learner with early
	// stopping becomes one with a fixed number of rounds (the rounded mean
	// over the folds of the rounds early stopping kept), no validation
	// split, and its Start only if most folds kept theirs; and that a
	// classify.WarmStarter starts from the chosen learner's fold-0 model.
	refit classify.Learner
	// warm[l] is learner l's model of fold 0, kept (for the point
	// estimate only) as the warm start of the replicates' refits.
	warm []classify.Model
}

// EstimateRatios estimates, for every mechanism i, the log density ratio
//
//	log r_i(x) = logit P(cmp | x_i, pa_i) − logit P(cmp | pa_i)
//
// at every record with K-fold cross-fitting: records are split into K folds
// stratified by group and each record's log-odds come from classifiers
// trained on the other K−1 folds. For a root node the second term is the
// log prior odds log(n_cmp/n_ref). Both classifiers are trained on the
// pooled records, so the class prior cancels in the difference. Per column
// set, the candidate learner with the lowest out-of-fold log loss is kept.
// Identical column sets (a node's parents are often another node's
// (node, parents)) are fitted once.
func EstimateRatios(s *Sample, mechs []Mechanism, opt RatioOptions) ([]MechanismRatio, error) {
	return estimateRatios(s, mechs, opt, nil)
}

// estimateRatios is EstimateRatios where chosen, if non-nil, fixes the learner
// per column set so that only that learner is fitted; it must have the name
// of one of opt.Learners, which it then stands in for.
func estimateRatios(s *Sample, mechs []Mechanism, opt RatioOptions, chosen fixedLearners) ([]MechanismRatio, error) {
	k, err := checkRatioInputs(s, opt)
	if err != nil {
		return nil, err
	}
	x, err := learnerFeatures(s)
	if err != nil {
		return nil, err
	}
	folds := assignFolds(s.Comparison, k, opt.Seed)
	fs := &fitSets{learners: opt.Learners, chosen: chosen, index: map[string]*groupFit{}}
	joints := make([]*groupFit, len(mechs))
	parents := make([]*groupFit, len(mechs))
	for i, m := range mechs {
		joints[i] = fs.need(unionCols(m.NodeCols, m.ParentCols))
		parents[i] = fs.need(m.ParentCols)
	}
	scope := fitScope(s, opt, k, chosen != nil)
	todo, keys := opt.Fits.take(s, fs, scope, chosen != nil)
	if err := fitAll(x, s.comparisonLabels(), folds, k, todo, opt); err != nil {
		return nil, err
	}
	opt.Fits.put(todo, keys)
	nRef, nCmp := s.Counts()
	prior := math.Log(float64(nCmp) / float64(nRef))
	out := make([]MechanismRatio, len(mechs))
	for i, m := range mechs {
		out[i] = mechanismRatio(m, joints[i], parents[i], prior, opt.Learners)
	}
	return out, nil
}

// learnerFeatures returns the matrix the group classifiers fit on: s.X
// itself, or, when s.ProbabilityCols is set, a copy of it in which each of
// those columns holds classify.Logit of its values. A value outside [0, 1]
// in such a column is an error naming the record and column; a column
// index outside X is a programmer error and panics.
func learnerFeatures(s *Sample) (*mat.Dense, error) {
	if len(s.ProbabilityCols) == 0 {
		return s.X, nil
	}
	n, p := s.X.Dims()
	x := mat.DenseCopyOf(s.X)
	for _, c := range s.ProbabilityCols {
		if c < 0 || c >= p {
			panic(fmt.Sprintf("attribution: probability column %d outside the %d columns of Sample.X", c, p))
		}
		for r := 0; r < n; r++ {
			v := x.At(r, c)
			if !(v >= 0 && v <= 1) {
				return nil, fmt.Errorf("attribution: record %d, column %d: %g is not a probability in [0, 1]", r, c, v)
			}
			x.Set(r, c, classify.Logit(v))
		}
	}
	return x, nil
}

// checkRatioInputs returns the number of folds (opt.Folds, 5 if zero) after
// checking that there are candidate learners and that each group has at
// least one record per fold. A design matrix whose rows do not match the
// records is a programmer error and panics.
func checkRatioInputs(s *Sample, opt RatioOptions) (int, error) {
	n := len(s.Comparison)
	if s.X == nil || s.X.RawMatrix().Rows != n {
		panic("attribution: Sample.X rows do not match Sample.Comparison")
	}
	if len(opt.Learners) == 0 {
		return 0, fmt.Errorf("attribution: no candidate learners")
	}
	k := opt.Folds
	if k == 0 {
		k = 5
	}
	nRef, nCmp := s.Counts()
	if nRef < k || nCmp < k {
		return 0, fmt.Errorf("attribution: each group needs at least %d records for %d-fold cross-fitting (reference %d, comparison %d)", k, k, nRef, nCmp)
	}
	return k, nil
}

// fitSets collects the distinct column sets to fit, in order of first use,
// so that a set shared by several mechanisms (one's joint, another's
// parents) is fitted once.
type fitSets struct {
	learners []classify.Learner
	chosen   fixedLearners // nil, or the learner a replicate fixes per set
	sets     []*groupFit
	index    map[string]*groupFit // by colKey
}

// need returns the fit of the column set cols, adding it on first use
// (nil for no columns: the prior stands in). A learner fixed by chosen
// restricts the fit to the candidate of the same name.
func (fs *fitSets) need(cols []int) *groupFit {
	if len(cols) == 0 {
		return nil
	}
	key := colKey(cols)
	if f, ok := fs.index[key]; ok {
		return f
	}
	f := &groupFit{cols: cols, only: -1}
	if fixed, ok := fs.chosen[key]; ok {
		for l, learner := range fs.learners {
			if learner.Name() == fixed.Name() {
				f.only, f.fixed = l, fixed
			}
		}
	}
	fs.index[key] = f
	fs.sets = append(fs.sets, f)
	return f
}

// mechanismRatio assembles mechanism m's estimate from the fits of its
// joint and parent column sets: per record,
//
//	log r(x) = logit P(cmp | node, parents) − logit P(cmp | parents),
//
// with the parents' term the prior log(n_cmp/n_ref) for a root (p nil),
// each from the candidate learner with the lowest out-of-fold loss.
func mechanismRatio(m Mechanism, j, p *groupFit, prior float64, learners []classify.Learner) MechanismRatio {
	jo := j.logOdds[j.best]
	mr := MechanismRatio{
		Mechanism:     m,
		LogRatio:      make([]float64, len(jo)),
		Learner:       learners[j.best].Name(),
		ParentLearner: PriorLearner,
		JointLogOdds:  jo,
		jointKey:      colKey(j.cols),
		jointRefit:    j.refit,
	}
	for l, learner := range learners {
		mr.Losses = append(mr.Losses, LearnerLoss{Learner: learner.Name(), LogLoss: j.losses[l], OddsCheck: j.oddsMean[l], MaxShare: j.oddsShare[l]})
	}
	if p == nil {
		for r := range mr.LogRatio {
			mr.LogRatio[r] = jo[r] - prior
		}
		return mr
	}
	mr.ParentLearner = learners[p.best].Name()
	mr.parentKey = colKey(p.cols)
	mr.parentRefit = p.refit
	po := p.logOdds[p.best]
	for r := range mr.LogRatio {
		mr.LogRatio[r] = jo[r] - po[r]
	}
	return mr
}

// fitAll fits the classifiers of every column set and fills the
// out-of-fold log-odds of the chosen learner. With several candidate
// learners, each is first fitted and scored on held-out records (log loss
// and odds self-check) — fold 0 alone from SelectAllFoldsBelow records up,
// every fold below — and the chosen one is then fitted on the remaining
// folds. Every fit sees at most
// opt.MaxFitRows training records, a subsample stratified by group and
// shared by all column sets of a fold, so that the joint and parent
// classifiers share one class prior. Jobs run on opt.Workers goroutines
// (0 means GOMAXPROCS); each writes only its own slots and is seeded by its
// (set, learner, fold), so the result does not depend on scheduling. When
// several jobs run at once, learners that spread their own work over
// goroutines (classify.Threaded) get an equal share of the workers, so that
// the busy goroutines do not outnumber them.
func fitAll(x *mat.Dense, y []float64, folds []int, k int, sets []*groupFit, opt RatioOptions) error {
	p := newFitPlan(x, y, folds, k, sets, opt)
	p.resetSets()
	selFolds, err := p.scoreCandidates()
	if err != nil {
		return err
	}
	if err := p.completeFolds(selFolds); err != nil {
		return err
	}
	p.finish()
	return nil
}

// fitPlan is the work of fitAll: the column sets to fit, the candidate
// learners and, per fold, its held-out records (test) and the stratified
// training subsample (train).
type fitPlan struct {
	x           *mat.Dense
	y           []float64
	k, nl, nw   int
	sets        []*groupFit
	opt         RatioOptions
	test, train [][]int
}

// fitJob is one fit: a column set, a candidate learner and a fold.
type fitJob struct{ set, learner, fold int }

// newFitPlan splits the records into folds and subsamples each fold's
// training records to opt.MaxFitRows (stratifiedSubsample).
func newFitPlan(x *mat.Dense, y []float64, folds []int, k int, sets []*groupFit, opt RatioOptions) *fitPlan {
	p := &fitPlan{x: x, y: y, k: k, nl: len(opt.Learners), nw: workers.Count(opt.Workers), sets: sets, opt: opt,
		test: make([][]int, k), train: make([][]int, k)}
	for r, fo := range folds {
		for j := 0; j < k; j++ {
			if j == fo {
				p.test[j] = append(p.test[j], r)
			} else {
				p.train[j] = append(p.train[j], r)
			}
		}
	}
	limit := opt.MaxFitRows
	if limit == 0 {
		limit = FitRowsFor(len(y))
	}
	for fo := range p.train {
		p.train[fo] = stratifiedSubsample(p.train[fo], y, limit, opt.Seed, fo)
	}
	return p
}

// resetSets gives every column set empty per-learner results.
func (p *fitPlan) resetSets() {
	for _, f := range p.sets {
		f.logOdds = make([][]float64, p.nl)
		f.held = make([][][]float64, p.nl)
		for l := range f.held {
			f.held[l] = make([][]float64, p.k)
		}
		f.losses = make([]float64, p.nl)
		f.oddsMean = make([]float64, p.nl)
		f.oddsShare = make([]float64, p.nl)
		f.warm = make([]classify.Model, p.nl)
		f.rounds = make([][]int, p.nl)
		f.started = make([][]bool, p.nl)
		for l := range f.rounds {
			f.rounds[l] = make([]int, p.k)
			f.started[l] = make([]bool, p.k)
		}
		for l := range f.losses {
			f.losses[l], f.oddsMean[l], f.oddsShare[l] = math.NaN(), math.NaN(), math.NaN()
		}
	}
}

// run fits jobs on p.nw goroutines, each writing the held-out log-odds of
// its fold into its set's slots; threaded learners get an equal share of
// the workers. It returns the first error in job order.
func (p *fitPlan) run(jobs []fitJob) error {
	errs := make([]error, len(jobs))
	threads := max(1, p.nw/max(1, min(p.nw, len(jobs))))
	learners := make([]classify.Learner, p.nl)
	for l, learner := range p.opt.Learners {
		learners[l] = threadedLearner(learner, threads)
	}
	workers.For(p.nw, len(jobs), func(_, ji int) {
		jb := jobs[ji]
		f := p.sets[jb.set]
		tr := p.train[jb.fold]
		seed := p.opt.Seed*1000003 + uint64((jb.set*p.nl+jb.learner)*p.k+jb.fold)
		learner := learners[jb.learner]
		if f.fixed != nil {
			learner = threadedLearner(f.fixed, threads)
		}
		model, err := learner.Fit(subMatrix(p.x, tr, f.cols), pick(p.y, tr), nil, seed)
		if err != nil {
			errs[ji] = fmt.Errorf("attribution: fitting %s on columns %v, fold %d: %w", p.opt.Learners[jb.learner].Name(), f.cols, jb.fold, err)
			return
		}
		if jb.fold == 0 && f.fixed == nil {
			f.warm[jb.learner] = model
		}
		if bm, ok := model.(*classify.BoostedModel); ok {
			f.rounds[jb.learner][jb.fold] = bm.Trees()
			f.started[jb.learner][jb.fold] = bm.Started()
		}
		dst := make([]float64, len(p.test[jb.fold]))
		model.LogOdds(subMatrix(p.x, p.test[jb.fold], f.cols), dst)
		f.held[jb.learner][jb.fold] = dst
	})
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// scoreCandidates is phase 1, model selection where there is a choice: on
// fold 0 alone for large samples, on every fold for small ones (below
// SelectAllFoldsBelow records the held-out part of one fold is too small
// to tell the learners apart reliably, and fits are cheap). It sets each
// set's best learner and returns the number of folds used.
func (p *fitPlan) scoreCandidates() (int, error) {
	n := len(p.y)
	selFolds := 1
	if n < SelectAllFoldsBelow {
		selFolds = p.k
	}
	var jobs []fitJob
	for si, f := range p.sets {
		if f.only < 0 && p.nl > 1 {
			for l := 0; l < p.nl; l++ {
				for fo := 0; fo < selFolds; fo++ {
					jobs = append(jobs, fitJob{si, l, fo})
				}
			}
		}
	}
	if err := p.run(jobs); err != nil {
		return 0, err
	}
	var selRows []int
	for fo := 0; fo < selFolds; fo++ {
		selRows = append(selRows, p.test[fo]...)
	}
	ySel := pick(p.y, selRows)
	for _, f := range p.sets {
		switch {
		case f.only >= 0:
			f.best = f.only
		case p.nl == 1:
			f.best = 0
		default:
			for l := 0; l < p.nl; l++ {
				z := slices.Concat(f.held[l][:selFolds]...) // = the log-odds at selRows
				f.losses[l] = meanLogLoss(ySel, z)
				f.oddsMean[l] = oddsCalibration(ySel, z)
				f.oddsShare[l] = oddsMaxShare(ySel, z)
			}
			f.best = selectLearner(f.losses, f.oddsMean, f.oddsShare)
		}
	}
	return selFolds, nil
}

// completeFolds is phase 2: the chosen learner on the folds it has not
// covered yet.
func (p *fitPlan) completeFolds(selFolds int) error {
	var jobs []fitJob
	for si, f := range p.sets {
		from := 0
		if f.held[f.best][0] != nil {
			from = selFolds // done in phase 1
		}
		for fo := from; fo < p.k; fo++ {
			jobs = append(jobs, fitJob{si, f.best, fo})
		}
	}
	return p.run(jobs)
}

// finish gathers the chosen learner's held-out log-odds into one array
// over every record (dropping the losing learners'), scores it on all
// folds where it was not scored (not in a bootstrap replicate, whose
// learner is fixed) and sets the learner bootstrap
// replicates refit (refitLearner, warm-started from the chosen learner's
// fold-0 model).
func (p *fitPlan) finish() {
	for _, f := range p.sets {
		lo := make([]float64, len(p.y))
		for fo, rows := range p.test {
			for a, r := range rows {
				lo[r] = f.held[f.best][fo][a]
			}
		}
		f.logOdds[f.best], f.held = lo, nil
		// A bootstrap replicate's fixed learner needs no scores: they
		// serve the choice and the diagnostics of the point estimate.
		if math.IsNaN(f.losses[f.best]) && f.fixed == nil {
			f.losses[f.best] = meanLogLoss(p.y, f.logOdds[f.best])
			f.oddsMean[f.best] = oddsCalibration(p.y, f.logOdds[f.best])
			f.oddsShare[f.best] = oddsMaxShare(p.y, f.logOdds[f.best])
		}
		f.refit = p.opt.Learners[f.best]
		if f.fixed != nil {
			f.refit = f.fixed
		} else {
			f.refit = refitLearner(f.refit, f.rounds[f.best], f.started[f.best])
			if ws, ok := f.refit.(classify.WarmStarter); ok && f.warm[f.best] != nil {
				f.refit = ws.WithWarmStart(f.warm[f.best])
			}
		}
		f.warm = nil
	}
}

// threadedLearner returns l limited to threads goroutines if it implements
// classify.Threaded, and l itself otherwise.
func threadedLearner(l classify.Learner, threads int) classify.Learner {
	if t, ok := l.(classify.Threaded); ok {
		return t.WithThreads(threads)
	}
	return l
}

// refitLearner returns the learner bootstrap replicates fit where the point
// estimate fitted l, its fold models kept rounds[fold] boosting rounds and
// started[fold] says whether they grew from their Start learner. A Boosted
// learner with early stopping (and without Platt scaling, which needs the
// validation split) becomes one that grows the rounded mean of those
// rounds on all its training rows, from its Start only if most fitted
// folds kept theirs (without a validation split the start is always kept,
// so the choice is made here); any other learner is returned as it is.
// Early stopping inside a replicate would be both slower (the patience
// rounds and the validation pass) and biased: a resample repeats records,
// so the inner validation split shares records with the training rows and
// stops late.
func refitLearner(l classify.Learner, rounds []int, started []bool) classify.Learner {
	b, ok := l.(classify.Boosted)
	if !ok || b.ValidationFraction == 0 || b.Calibrate {
		return l
	}
	var sum, k, kept int
	for fo, r := range rounds {
		if r > 0 || started[fo] {
			sum += r
			k++
			if started[fo] {
				kept++
			}
		}
	}
	if k == 0 {
		return l
	}
	b.Rounds = max(1, int(math.Round(float64(sum)/float64(k))))
	b.ValidationFraction = 0
	if 2*kept <= k {
		b.Start = nil
	}
	return b
}

// SelectAllFoldsBelow is the sample size below which the learner of a column
// set is chosen on the out-of-fold predictions of every fold rather than of
// fold 0 alone.
const SelectAllFoldsBelow = 60_000

// DefaultMaxFitRows is the smallest cap on a fit's training records that
// FitRowsFor gives: below ten times this many records nothing changes.
const DefaultMaxFitRows = 50_000

// FitRowsDivisor is the share of the records, 1/FitRowsDivisor, that
// FitRowsFor lets a fit train on above DefaultMaxFitRows.
const FitRowsDivisor = 10

// FitRowsFor returns the default cap (RatioOptions.MaxFitRows 0) on the
// training records of each fit for a sample of n records:
//
//	cap(n) = max(DefaultMaxFitRows, ⌊n / FitRowsDivisor⌋).
//
// A fixed cap makes the classifiers' error stop falling with n while the
// sampling error of the weighted means keeps falling as 1/√n, so on very
// large samples the fit's error dominated (the accuracy study measured a
// plateau from 1,000,000 records with a fixed 50,000); growing the cap in
// proportion to n keeps the two in step, at a fit cost that grows as the
// rest of the work does (README, Scale).
func FitRowsFor(n int) int {
	return max(DefaultMaxFitRows, n/FitRowsDivisor)
}

// stratifiedSubsample returns rows unchanged when there are at most limit of
// them; otherwise a subset of limit rows that keeps each class's share
// (rounded), drawn without replacement by a PCG stream seeded by (seed,
// fold), in ascending row order.
func stratifiedSubsample(rows []int, y []float64, limit int, seed uint64, fold int) []int {
	if limit <= 0 || len(rows) <= limit {
		return rows
	}
	var byClass [2][]int
	for _, r := range rows {
		c := 0
		if y[r] == 1 {
			c = 1
		}
		byClass[c] = append(byClass[c], r)
	}
	rng := rand.New(rand.NewPCG(seed, 0x5eed0000+uint64(fold)))
	want1 := int(math.Round(float64(limit) * float64(len(byClass[1])) / float64(len(rows))))
	want := [2]int{limit - want1, want1}
	var out []int
	for c := range byClass {
		idx := byClass[c]
		rng.Shuffle(len(idx), func(a, b int) { idx[a], idx[b] = idx[b], idx[a] })
		out = append(out, idx[:want[c]]...)
	}
	sort.Ints(out)
	return out
}

// meanLogLoss is the mean of log(1+exp(−z)) for y=1 and log(1+exp(z)) for
// y=0, computed stably.
func meanLogLoss(y, z []float64) float64 {
	var s float64
	for i, zi := range z {
		if y[i] == 0 {
			zi = -zi
		}
		// −log σ(zi) = log(1+exp(−zi))
		if zi > 0 {
			s += math.Log1p(math.Exp(-zi))
		} else {
			s += -zi + math.Log1p(math.Exp(zi))
		}
	}
	return s / float64(len(z))
}

// subMatrix copies the given rows and columns of x.
func subMatrix(x *mat.Dense, rows, cols []int) *mat.Dense {
	raw := x.RawMatrix()
	out := make([]float64, len(rows)*len(cols))
	p := len(cols)
	for a, r := range rows {
		src := raw.Data[r*raw.Stride:]
		dst := out[a*p : (a+1)*p]
		for b, c := range cols {
			dst[b] = src[c]
		}
	}
	if len(rows) == 0 {
		return &mat.Dense{}
	}
	return mat.NewDense(len(rows), p, out)
}

// unionCols returns the sorted union of two column lists.
func unionCols(a, b []int) []int {
	seen := map[int]bool{}
	var out []int
	for _, c := range append(append([]int{}, a...), b...) {
		if !seen[c] {
			seen[c] = true
			out = append(out, c)
		}
	}
	sort.Ints(out)
	return out
}

func colKey(cols []int) string {
	c := append([]int(nil), cols...)
	sort.Ints(c)
	parts := make([]string, len(c))
	for i, v := range c {
		parts[i] = strconv.Itoa(v)
	}
	return strings.Join(parts, ",")
}

// OddsTolerance bounds the odds self-check a learner must pass to be chosen:
// |log m| ≤ log OddsTolerance, where m is oddsCalibration.
const OddsTolerance = 1.25

// oddsCalibration returns m = (n_ref/n_cmp) · mean over reference records
// (y = 0) of exp(z). For a calibrated classifier P(cmp|x)/P(ref|x) =
// (n_cmp/n_ref) · p_cmp(x)/p_ref(x), and E_ref[p_cmp/p_ref] = 1, so m ≈ 1.
// A few records with extrapolated, extreme log-odds drive m far from 1 long
// before they move the log loss.
func oddsCalibration(y, z []float64) float64 {
	var s float64
	var nRef, nCmp int
	for i, zi := range z {
		if y[i] == 0 {
			s += math.Exp(math.Min(zi, 700))
			nRef++
		} else {
			nCmp++
		}
	}
	if nRef == 0 || nCmp == 0 {
		return math.NaN()
	}
	return s / float64(nCmp)
}

// ShareTolerance bounds the largest share one reference record may hold
// in the sum of a learner's out-of-fold odds for the learner to pass its
// self-checks: a learner that gives one record half the weight of the
// whole group makes every reweighted estimate rest on that record. The
// bound is loose on purpose: on 200 records per group a sound boosted
// learner gave one record 22% (fairness's one-extreme-value test), while
// the logistic learners thrown off by an extreme value gave 98% and more.
const ShareTolerance = 0.5

// PassesChecks reports whether a learner with odds self-check m
// (oddsCalibration) and largest odds share s (oddsMaxShare) passes the
// self-checks: |log m| ≤ log OddsTolerance and s ≤ ShareTolerance.
func PassesChecks(m, s float64) bool {
	return math.Abs(math.Log(m)) <= math.Log(OddsTolerance) && !(s > ShareTolerance)
}

// oddsMaxShare returns max_i exp(z_i) / Σ_i exp(z_i) over the reference
// records (y = 0): the largest share one record holds of the odds that
// reweight the reference group (NaN without reference records).
func oddsMaxShare(y, z []float64) float64 {
	var s, top float64
	for i, zi := range z {
		if y[i] != 0 {
			continue
		}
		e := math.Exp(math.Min(zi, 700))
		s += e
		top = math.Max(top, e)
	}
	if s == 0 {
		return math.NaN()
	}
	return top / s
}

// selectLearner picks, among the learners that pass their self-checks
// (PassesChecks), the one with the lowest out-of-fold log loss; if none
// passes, the one whose m is closest to 1. Ties go to the earlier learner.
// A degenerate learner is thus never chosen while a sound one exists.
func selectLearner(losses, oddsMean, oddsShare []float64) int {
	best := -1
	for l := range losses {
		if PassesChecks(oddsMean[l], oddsShare[l]) && (best < 0 || losses[l] < losses[best]) {
			best = l
		}
	}
	if best >= 0 {
		return best
	}
	best = 0
	for l := range losses {
		if math.Abs(math.Log(oddsMean[l])) < math.Abs(math.Log(oddsMean[best])) {
			best = l
		}
	}
	return best
}
