package attribution

import (
	"errors"
	"fmt"
	"math"

	"github.com/gapwise/gapwise/internal/workers"
	"github.com/gapwise/gapwise/metrics"
)

// Decompose estimates, for each requested metric, the gap
// M(P_cmp) − M(P_ref) and its Shapley split over the mechanisms.
//
// It estimates every mechanism's density ratio with EstimateRatios, then
// evaluates the metric of every hybrid distribution P_S by reweighting the
// reference records with w_S = Π_{i∈S} r_i (EvaluateCoalitions), forms the
// game v(S) = M(P_S) − M(P_∅), and returns φ = ExactShapley(v). Because the
// reweighted grand coalition only estimates the comparison group's metric,
// Residual = Gap − Σφ is reported rather than absorbed. All of this is
// repeated on Options.FoldSplits independent fold splits and averaged
// (decomposeSplits, aggregateSplits).
func Decompose(s *Sample, mechs []Mechanism, metricNames []string, opt Options) (*Decomposition, error) {
	d, _, err := decomposeSplits(s, mechs, metricNames, opt)
	return d, err
}

// groupSplit holds one group's labels and scores and its record indices in
// the Sample.
type groupSplit struct {
	refIdx, cmpIdx []int
	refY, refS     []float64
	cmpY, cmpS     []float64
}

func splitGroups(s *Sample) groupSplit {
	var g groupSplit
	for i, c := range s.Comparison {
		if c {
			g.cmpIdx = append(g.cmpIdx, i)
		} else {
			g.refIdx = append(g.refIdx, i)
		}
	}
	g.refY, g.refS = pick(s.Labels, g.refIdx), pick(s.Scores, g.refIdx)
	g.cmpY, g.cmpS = pick(s.Labels, g.cmpIdx), pick(s.Scores, g.cmpIdx)
	return g
}

// decompose is Decompose that also returns the density ratios; chosen, if
// non-nil, fixes the learner per column set (a bootstrap replicate, see
// estimateRatios), and then (as for a split after the first,
// Options.splitOnly) only the metric splits are computed, not the weight
// diagnostics. The phases, in order: observe (observed metrics, so
// that an undefined metric is reported before any fitting),
// estimateRatios, estimateSides (clipped log-ratios and mechanism
// diagnostics), splitGapsSides (Shapley values), and for the point
// estimate sideWeights and effectiveRecords.
func decompose(s *Sample, mechs []Mechanism, metricNames []string, opt Options, chosen fixedLearners) (*Decomposition, []MechanismRatio, error) {
	s.mustAlign()
	opt = withDefaults(opt)
	g := splitGroups(s)
	out := &Decomposition{}
	var err error
	if out.Metrics, err = observe(metricNames, g, opt); err != nil {
		return nil, nil, err
	}
	ratios, err := estimateRatios(s, mechs, RatioOptions{Folds: opt.Folds, Seed: opt.Seed, Learners: opt.Learners, Workers: opt.Workers, MaxFitRows: opt.MaxFitRows, Fits: opt.Fits}, chosen)
	if err != nil {
		return nil, nil, err
	}
	out.Side = opt.Side.resolve()
	mix := MixDefault
	if out.Side == SideBoth {
		mix = opt.Mix.resolve()
	}
	out.Mix = mix
	diag := chosen == nil && !opt.splitOnly
	sides, reports, err := estimateSides(s, ratios, g, opt, out.Side, diag)
	if err != nil {
		return nil, nil, err
	}
	out.Mechanisms = reports
	if err := splitGapsSides(out.Metrics, sides, opt, mix, diag); err != nil {
		return nil, nil, err
	}
	out.Estimator = opt.Estimator.resolve()
	if out.Regressions, err = estimateGames(out.Metrics, s, mechs, ratios, sides, g, opt, out.Estimator, diag); err != nil {
		return nil, nil, err
	}
	if !diag {
		return out, ratios, nil
	}
	if out.Weights, err = sideWeights(sides, opt); err != nil {
		return nil, nil, err
	}
	effectiveRecords(out.Metrics, sides, opt)
	out.sens = &sensitivityInput{side: sides[0], threshold: opt.Threshold, exact: len(ratios) <= exactLimit(opt)}
	return out, ratios, nil
}

// estimateSides returns the estimators of the side(s) that estimate
// (reference first; see Side): each holds that side's labels, scores and
// per-mechanism log-ratios, clipped by sideLogRatios. With diag it also
// returns every mechanism's diagnostics (mechanismReport), in mechanism
// order; without, nil. Mechanisms run in parallel on opt.Workers
// goroutines (each reads every record once or a few times: O(n) per
// mechanism, see mechanismReport); the results do not depend on their
// number.
func estimateSides(s *Sample, ratios []MechanismRatio, g groupSplit, opt Options, side Side, diag bool) ([]*sideEstimate, []MechanismReport, error) {
	useRef := side != SideComparison
	useCmp := side != SideReference
	logr := make([][]float64, len(ratios))
	var logrCmp [][]float64
	if useCmp {
		logrCmp = make([][]float64, len(ratios))
	}
	member := s.comparisonLabels()
	var reports []MechanismReport
	if diag {
		reports = make([]MechanismReport, len(ratios))
	}
	// Mechanisms in parallel, each writing its own slots; the first error
	// in mechanism order is returned, as a serial loop would.
	errs := make([]error, len(ratios))
	workers.For(opt.Workers, len(ratios), func(_, i int) {
		mr := ratios[i]
		ref, cmp, clipped, err := sideLogRatios(mr, g, opt, useRef, useCmp)
		if err != nil {
			errs[i] = err
			return
		}
		logr[i] = ref
		if useCmp {
			logrCmp[i] = cmp
		}
		if diag {
			reports[i] = mechanismReport(mr, g, ref, cmp, clipped, member)
		}
	})
	for _, err := range errs {
		if err != nil {
			return nil, nil, err
		}
	}
	var sides []*sideEstimate
	if useRef {
		sides = append(sides, newSideEstimate(SideReference, g.refY, g.refS, logr))
	}
	if useCmp {
		sides = append(sides, newSideEstimate(SideComparison, g.cmpY, g.cmpS, logrCmp))
	}
	return sides, reports, nil
}

// sideLogRatios returns a mechanism's log-ratios at the reference records
// and, when useCmp, at the comparison records, each clipped to its central
// ClipQuantile interval (ClipAtQuantiles) when clipping is on; reference
// ratios are clipped only when the reference side estimates (useRef).
// clipped counts the clipped records of each side.
func sideLogRatios(mr MechanismRatio, g groupSplit, opt Options, useRef, useCmp bool) (ref, cmp []float64, clipped [2]int, err error) {
	ref = pick(mr.LogRatio, g.refIdx)
	if opt.ClipQuantile != 0 && useRef {
		if ref, clipped[0], err = ClipAtQuantiles(ref, opt.ClipQuantile); err != nil {
			return nil, nil, clipped, err
		}
	}
	if useCmp {
		cmp = pick(mr.LogRatio, g.cmpIdx)
		if opt.ClipQuantile != 0 {
			if cmp, clipped[1], err = ClipAtQuantiles(cmp, opt.ClipQuantile); err != nil {
				return nil, nil, clipped, err
			}
		}
	}
	return ref, cmp, clipped, nil
}

// mechanismReport builds the diagnostics of one mechanism: the learners
// chosen, and over the reference records the extreme share, tail shape,
// mean ratio and worst-stratum mean ratio of its unclipped ratios and the
// effective sample size and largest weight share of the (clipped) ref; with
// comparison log-ratios cmp (nil when unused) the same checks of the
// inverse ratios 1/r over the comparison records; and the out-of-fold AUC
// of its (node, parents) classifier over both groups (member: 1 for
// comparison records).
func mechanismReport(mr MechanismRatio, g groupSplit, ref, cmp []float64, clipped [2]int, member []float64) MechanismReport {
	raw := pick(mr.LogRatio, g.refIdx)
	rep := MechanismReport{
		Mechanism:         mr.Mechanism,
		Learner:           mr.Learner,
		ParentLearner:     mr.ParentLearner,
		Losses:            mr.Losses,
		ExtremeShare:      ExtremeShare(raw),
		TailShape:         TailShape(raw),
		ClippedReference:  clipped[0],
		ClippedComparison: clipped[1],
	}
	var key []float64
	if mr.ParentLearner != PriorLearner {
		// logit P(cmp | pa_i) = logit P(cmp | x_i, pa_i) − log r_i.
		key = make([]float64, len(raw))
		for a, r := range g.refIdx {
			key[a] = mr.JointLogOdds[r] - mr.LogRatio[r]
		}
	}
	rep.WorstStratumMean = WorstStratumMean(raw, key)
	ws := SummariseLogWeights(ref)
	if clipped[0] != 0 || len(ref) != len(raw) {
		// Clipping changed ref; otherwise it holds raw's values and the
		// one summary serves both.
		rep.MeanRatio = SummariseLogWeights(raw).MeanRatio
	} else {
		rep.MeanRatio = ws.MeanRatio
	}
	rep.ESS, rep.MaxShare = ws.ESS, ws.MaxShare
	if cmp != nil {
		neg := make([]float64, len(cmp))
		for r, x := range cmp {
			neg[r] = -x
		}
		rep.ComparisonESS = SummariseLogWeights(neg).ESS
		rep.ComparisonTailShape = TailShape(neg)
		rep.ComparisonExtremeShare = ExtremeShare(neg)
	}
	// Both groups are present, so the AUC is defined.
	var err error
	if rep.AUC, err = metrics.AUC(member, mr.JointLogOdds, nil); err != nil {
		rep.AUC = math.NaN()
	}
	return rep
}

func withDefaults(opt Options) Options {
	if opt.ECEBins == 0 {
		opt.ECEBins = metrics.DefaultECEBins
	}
	if opt.Folds == 0 {
		opt.Folds = 5
	}
	return opt
}

// Observe computes every metric on each group's records of s (the
// observed values and their gap, Comparison − Reference; the estimates are
// left zero), at threshold and with eceBins bins (0: the default). It is
// the first step of Decompose. A metric without a value in a group gives a
// *MetricError naming the group: all metrics are computed on the
// reference group first, in the order of metricNames, then on the
// comparison group, so the error names the first such pair in that order.
// It panics if the Sample's slices differ in length.
func Observe(s *Sample, metricNames []string, threshold float64, eceBins int) ([]MetricDecomposition, error) {
	s.mustAlign()
	return observe(metricNames, splitGroups(s), withDefaults(Options{Threshold: threshold, ECEBins: eceBins}))
}

// observe computes each metric on the two groups' records, unweighted,
// the reference group's first (see Observe).
func observe(metricNames []string, g groupSplit, opt Options) ([]MetricDecomposition, error) {
	groups := []struct {
		name string
		y, s []float64
	}{{GroupReference, g.refY, g.refS}, {GroupComparison, g.cmpY, g.cmpS}}
	var values [2][]float64
	for gi, grp := range groups {
		values[gi] = make([]float64, len(metricNames))
		for m, name := range metricNames {
			v, err := metrics.Compute(name, grp.y, grp.s, opt.Threshold, opt.ECEBins, nil)
			if err != nil {
				return nil, metricErr(name, grp.name, err)
			}
			values[gi][m] = v
		}
	}
	var out []MetricDecomposition
	for m, name := range metricNames {
		ref, cmp := values[0][m], values[1][m]
		out = append(out, MetricDecomposition{Metric: name, Estimator: EstimatorWeighting, Reference: ref, Comparison: cmp, Gap: cmp - ref})
	}
	return out, nil
}

// splitGapsSides evaluates the game of every metric from one side's records
// or from both combined (see Side and Mix), and fills the Shapley values:
// exactly over all coalitions when k ≤ opt.ExactLimit, otherwise by
// antithetic permutation sampling (SampledShapleyGames) with Monte Carlo
// standard errors. With both sides and diag it also compares the two
// one-sided games (SideAgreement).
func splitGapsSides(mds []MetricDecomposition, sides []*sideEstimate, opt Options, mix Mix, diag bool) error {
	names := make([]string, len(mds))
	for m := range mds {
		names[m] = mds[m].Metric
	}
	k := len(sides[0].logr)
	eopt := EngineOptions{Workers: opt.Workers, ECEBins: opt.ECEBins}
	if k > exactLimit(opt) {
		return splitGapsSampled(mds, names, sides, opt, eopt, mix, diag)
	}
	perSide, err := sideValuesAll(sides, names, opt.Threshold, eopt)
	if err != nil {
		return fmt.Errorf("attribution: evaluating coalitions: %w", err)
	}
	vars := sideVarianceSet(sides, names, opt, mix, diag, diag || mix == MixMechanism || mix == MixGuarded)
	values, err := combinedValues(mds, perSide, sides, names, vars, opt, eopt, mix)
	if err != nil {
		return err
	}
	full := uint64(1)<<k - 1
	for m := range mds {
		v := shifted(values[m])
		fillSummary(&mds[m], ExactShapley(v, k), func(S uint64) float64 { return v[S] }, k, full)
		mds[m].Game = v
		if len(sides) == 2 && mix == MixMechanism {
			if phi, ok := mechanismShapley(perSide[0][m], perSide[1][m], vars[0][m], vars[1][m], k); ok {
				setContributions(&mds[m], phi)
				mds[m].Game = nil
			}
		}
		if diag && len(sides) == 2 {
			mds[m].Agreement = agreement(perSide, vars, m, k, true)
			mds[m].ResidualSE = residualSE(mds[m], sides, vars, m, mix)
			mds[m].FixedRatioSE = fixedRatioSE(vars, m, mds[m].ReferenceWeight)
		}
	}
	setOneSideWeight(mds, sides)
	return nil
}

// combinedValues returns M̂(S) of every metric and coalition from one
// side, or from both combined by mix (recording metric-level weights in
// mds).
func combinedValues(mds []MetricDecomposition, perSide [][][]float64, sides []*sideEstimate, names []string, vars [][]sideVariances, opt Options, eopt EngineOptions, mix Mix) ([][]float64, error) {
	switch {
	case len(sides) == 1:
		return perSide[0], nil
	case mix == MixCoalition:
		ess, err := essAllSides(sides, eopt)
		if err != nil {
			return nil, err
		}
		return combineByESS(perSide, ess), nil
	case mix == MixGuarded:
		return guardedValues(mds, perSide, sides, names, vars, opt, eopt, len(sides[0].logr))
	}
	return combineByLambda(perSide, setLambda(mds, mixWeights(mix, sides, names, vars, opt))), nil
}

// sideVarianceSet returns vars[j][m], the delta-method variances of side j
// for metric m (of the Shapley values too when withPhi), when both sides
// estimate and the mix or the agreement (diag) needs them; nil otherwise.
func sideVarianceSet(sides []*sideEstimate, names []string, opt Options, mix Mix, diag, withPhi bool) [][]sideVariances {
	if len(sides) != 2 || !(diag || mix.needsVariance()) {
		return nil
	}
	vars := make([][]sideVariances, 2)
	for j, e := range sides {
		vars[j] = e.variances(names, opt.Threshold, opt.ECEBins, withPhi)
	}
	return vars
}

// setLambda records λ in every metric and returns it.
func setLambda(mds []MetricDecomposition, lambda []float64) []float64 {
	for m := range mds {
		l := lambda[m]
		mds[m].ReferenceWeight = &l
	}
	return lambda
}

// setOneSideWeight sets ReferenceWeight for one side: 1 or 0.
func setOneSideWeight(mds []MetricDecomposition, sides []*sideEstimate) {
	if len(sides) != 1 {
		return
	}
	for m := range mds {
		l := pick01(sides[0].side == SideReference)
		mds[m].ReferenceWeight = &l
	}
}

// guardedValues combines the sides by MixGuarded: per metric, per
// coalition by n_eff while the sides agree (agreement MaxZ ≤ GuardZ), by
// MixMetricVariance's λ (recorded in ReferenceWeight) otherwise.
func guardedValues(mds []MetricDecomposition, perSide [][][]float64, sides []*sideEstimate, names []string, vars [][]sideVariances, opt Options, eopt EngineOptions, k int) ([][]float64, error) {
	ess, err := essAllSides(sides, eopt)
	if err != nil {
		return nil, err
	}
	byCoalition := combineByESS(perSide, ess)
	lambda := mixWeights(MixGuarded, sides, names, vars, opt)
	byMetric := combineByLambda(perSide, lambda)
	out := make([][]float64, len(mds))
	for m := range mds {
		out[m] = byCoalition[m]
		if z := agreement(perSide, vars, m, k, true).MaxZ; z > GuardZ {
			out[m] = byMetric[m]
			l := lambda[m]
			mds[m].ReferenceWeight = &l
		}
	}
	return out, nil
}

// setContributions replaces a metric's contributions by phi, with the
// estimated gap Σφ and the residual that follow.
func setContributions(md *MetricDecomposition, phi []float64) {
	md.Contributions = phi
	md.Estimated = 0
	for _, x := range phi {
		md.Estimated += x
	}
	md.Residual = md.Gap - md.Estimated
}

// exactLimit is opt.ExactLimit with its default.
func exactLimit(opt Options) int {
	if opt.ExactLimit == 0 {
		return DefaultExactLimit
	}
	return opt.ExactLimit
}

// fillSummary sets the contributions and the what-if values of one metric
// from φ and the game v (v(∅) = 0).
func fillSummary(md *MetricDecomposition, phi []float64, v func(uint64) float64, k int, full uint64) {
	md.Contributions = phi
	md.Estimated = v(full)
	md.Residual = md.Gap - md.Estimated
	md.Alone = make([]float64, k)
	md.IfEqualised = make([]float64, k)
	for i := 0; i < k; i++ {
		md.Alone[i] = v(uint64(1) << i)
		md.IfEqualised[i] = v(full &^ (uint64(1) << i))
	}
}

// splitGapsSampled is splitGapsSides for many mechanisms. The Shapley values of
// S ↦ M(P_S) and of v(S) = M(P_S) − M(P_∅) coincide, so the sampler works
// on M directly; ∅, N, {i} and N∖{i} are evaluated exactly for the summary
// (and for a metric-level mix's λ). The agreement compares the ends only.
func splitGapsSampled(mds []MetricDecomposition, names []string, sides []*sideEstimate, opt Options, eopt EngineOptions, mix Mix, diag bool) error {
	k := len(sides[0].logr)
	special := keyCoalitions(k)
	perSide, err := sideValuesSome(sides, names, special, opt.Threshold, eopt)
	if err != nil {
		return fmt.Errorf("attribution: evaluating coalitions: %w", err)
	}
	vars := sideVarianceSet(sides, names, opt, mix, diag, false)
	var lambda []float64
	if len(sides) == 2 && mix != MixCoalition {
		lambda = setLambda(mds, mixWeights(mix, sides, names, vars, opt))
	}
	combine := func(vals [][][]float64, cs []uint64) [][]float64 {
		switch {
		case len(sides) == 1:
			return vals[0]
		case lambda == nil:
			return combineByESS(vals, essSomeSides(sides, cs))
		}
		return combineByLambda(vals, lambda)
	}
	value := func(cs []uint64, dst [][]float64) error {
		vals, err := sideValuesSome(sides, names, cs, opt.Threshold, eopt)
		if err != nil {
			return err
		}
		for m, v := range combine(vals, cs) {
			copy(dst[m], v)
		}
		return nil
	}
	sopt := opt.Sampling
	sopt.Seed = opt.Seed
	phi, se, err := SampledShapleyGames(k, len(names), value, sopt)
	if err != nil {
		return fmt.Errorf("attribution: sampling Shapley values: %w", err)
	}
	full := uint64(1)<<k - 1
	vals := combine(perSide, special)
	for m := range mds {
		at := map[uint64]float64{}
		for j, S := range special {
			at[S] = vals[m][j] - vals[m][0]
		}
		fillSummary(&mds[m], phi[m], func(S uint64) float64 { return at[S] }, k, full)
		mds[m].StdErrors = se[m]
		if diag && len(sides) == 2 {
			// special begins with ∅ and N, the order agreement reads.
			mds[m].Agreement = agreement(perSide, vars, m, k, false)
			mds[m].ResidualSE = residualSE(mds[m], sides, vars, m, mix)
		}
	}
	setOneSideWeight(mds, sides)
	return nil
}

func metricErr(name, group string, err error) error {
	if errors.Is(err, metrics.ErrUndefined) {
		return &MetricError{Metric: name, Group: group, Err: err}
	}
	return fmt.Errorf("attribution: metric %s in the %s group: %w", name, group, err)
}

func pick(x []float64, idx []int) []float64 {
	out := make([]float64, len(idx))
	for a, i := range idx {
		out[a] = x[i]
	}
	return out
}

// comparisonLabels returns 1 for comparison records and 0 otherwise.
func (s *Sample) comparisonLabels() []float64 {
	y := make([]float64, len(s.Comparison))
	for i, c := range s.Comparison {
		if c {
			y[i] = 1
		}
	}
	return y
}

// mustAlign panics unless the Sample's slices have one entry per record.
func (s *Sample) mustAlign() {
	n := len(s.Comparison)
	if len(s.Labels) != n || len(s.Scores) != n {
		panic("attribution: Sample slices differ in length")
	}
}
