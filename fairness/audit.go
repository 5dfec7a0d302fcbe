package fairness

import (
	"math"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// ToolName is the name recorded in every Result.
const ToolName = "gapwise"

// RunOptions controls an audit run.
type RunOptions struct {
	Workers int    // goroutines for estimation; 0 means GOMAXPROCS
	Version string // recorded in Result.Tool

	// Intervals, if non-nil, replaces the spec's intervals key for this
	// run (Replicates 0: no intervals); nil runs what spec.Intervals asks
	// for. The CLI's bootstrap flags set it.
	Intervals *Intervals
	// Progress, if non-nil, is called after each bootstrap replicate.
	Progress func(done, total int)
	// SamplingProgress, if non-nil, is called after each batch of sampled
	// permutation pairs when Shapley values are sampled (more mechanisms
	// than exact_limit), with the pairs spent and the budget.
	SamplingProgress func(pairs, budget int)
	// CoalitionLimit is the largest number of mechanisms for which every
	// metric carries the values of all coalitions (MetricResult.Coalitions):
	// 0 means DefaultCoalitionLimit, a negative value none, and values
	// above MaxCoalitionLimit count as MaxCoalitionLimit.
	CoalitionLimit int
	// AltGraphs, if not empty, makes Run decompose again under each of
	// these graphs (same data, seed and settings) and record what holds
	// across them in Result.GraphRobustness (runGraphs).
	AltGraphs []AltGraph

	// fits shares group classifiers between the graphs' runs (runGraphs).
	fits *attribution.FitCache
}

// Run performs the audit described by spec: it loads the data, checks that
// every metric has a value in both groups, encodes the graph columns,
// estimates the mechanisms' density ratios and the Shapley split of every
// metric's gap (attribution.Decompose), and maps the outcome into a Result
// with warnings and the assumptions the numbers rest on. For each metric,
//
//	Gap = Comparison − Reference = Σ_i Contributions[i].Value + Residual.
//
// The result depends only on spec and the data, not on opt.Workers.
// Input problems are reported as errors for which IsInputError is true.
func Run(spec *Spec, opt RunOptions) (*Result, error) {
	if len(opt.AltGraphs) > 0 {
		return runGraphs(spec, opt)
	}
	return run(spec, opt, LoadData)
}

// run is Run with the data loaded by load (RunGroups loads the file's
// bytes once for every comparison).
func run(spec *Spec, opt RunOptions, load func(*Spec) (*Dataset, error)) (*Result, error) {
	d, sample, mechs, err := prepareWith(spec, load)
	if err != nil {
		return nil, err
	}
	learners, ok := candidateLearners(spec.Classifier)
	if !ok {
		return nil, specErr(spec.File, spec.KeyLine("classifier"), "classifier", ErrClassifierUnavailable, "classifier %s is not available", spec.Classifier)
	}
	aopt := attribution.Options{
		Threshold:  spec.Threshold,
		Folds:      spec.Folds,
		Seed:       spec.Seed,
		FoldSplits: spec.FoldSplits,
		Learners:   learners,
		ECEBins:    spec.ECEBins,
		Workers:    opt.Workers,

		ExactLimit:   spec.ExactLimit,
		ClipQuantile: spec.ClipRatios,
		Sampling:     attribution.SamplingOptions{Progress: opt.SamplingProgress},
		Fits:         opt.fits,
	}
	if aopt.Estimator, err = estimatorOf(spec); err != nil {
		return nil, err
	}
	aopt.Reads = nodeReads(spec)
	if spec.EstimateFrom != "" {
		side, err := attribution.ParseSide(spec.EstimateFrom)
		if err != nil {
			return nil, specErr(spec.File, spec.KeyLine("estimate_from"), "estimate_from", ErrBadValue, "%v", err)
		}
		aopt.Side = side
	}
	if spec.CombineSides != "" {
		mix, err := attribution.ParseMix(spec.CombineSides)
		if err != nil {
			return nil, specErr(spec.File, spec.KeyLine("combine_sides"), "combine_sides", ErrBadValue, "%v", err)
		}
		aopt.Mix = mix
	}
	var dec *attribution.Decomposition
	var boot *attribution.BootstrapSummary
	if iv := opt.intervals(spec); iv.Replicates != 0 {
		dec, boot, err = attribution.DecomposeWithIntervals(sample, mechs, spec.Metrics, aopt, attribution.BootstrapOptions{
			Intervals: iv,
			Progress:  opt.Progress,
		})
	} else {
		dec, err = attribution.Decompose(sample, mechs, spec.Metrics, aopt)
	}
	if err != nil {
		return nil, decomposeError(spec, err)
	}
	r := buildResult(spec, d, dec, learners, opt)
	if boot != nil {
		r.Settings.Intervals = boot
	}
	r.Details = Describe(d, spec.Threshold, spec.ECEBins)
	if spec.SuppressBelow > 0 {
		r.Suppression = planSuppression(r, spec.SuppressBelow) // before the warnings, which word withheld counts so
	}
	if r.HiddenFactor, err = hiddenFactor(spec, dec, mechanismNodes(dec)); err != nil {
		return nil, err
	}
	r.Warnings = Warnings(r) // after Settings.Intervals, whose failed replicates it reports
	r.Warnings = append(r.Warnings, hiddenFactorWarnings(r)...)
	setReliability(r)
	setHeadlines(r)
	r.Assumptions = Assumptions(spec.ScoreIsNode(), spec.Synthetic)
	if err := checkFinite(r); err != nil {
		return nil, err
	}
	applySuppression(r) // last: every number above comes from all records
	return r, nil
}

// intervals returns the bootstrap settings of a run: opt.Intervals when
// set, otherwise the spec's intervals key.
func (opt RunOptions) intervals(spec *Spec) Intervals {
	if opt.Intervals != nil {
		return *opt.Intervals
	}
	return spec.Intervals
}

// candidateLearners returns the learners a classifier setting stands for
// (classify.Learners); ok is false when the setting is unknown or its
// learner is not built in.
func candidateLearners(name string) (learners []classify.Learner, ok bool) {
	ls, err := classify.Learners(name)
	return ls, err == nil
}

// buildResult maps a decomposition into the Result contract.
func buildResult(spec *Spec, d *Dataset, dec *attribution.Decomposition, learners []classify.Learner, opt RunOptions) *Result {
	groups := groupInfo(spec, d)
	r := &Result{
		Tool:        ToolInfo{Name: ToolName, Version: opt.Version},
		Title:       spec.Title,
		Model:       spec.Model,
		AuditDate:   spec.AuditDate,
		Groups:      groups,
		Names:       resultNames(spec, d.levelNames),
		Label:       spec.Label,
		LabelValues: d.LabelValues,
		ModelInputs: modelInputs(spec),
		Score:       spec.Score,
		Threshold:   spec.Threshold,
		Seed:        spec.Seed,
		Settings: Settings{
			Folds:       spec.Folds,
			FoldSplits:  dec.FoldSplits,
			Classifier:  spec.Classifier,
			ECEBins:     spec.ECEBins,
			DropMissing: spec.DropMissing(),
			Missing:     spec.Missing,
			Learners:    classify.NamesOf(learners),
			// Never nil, so that JSON shows an empty list.
			ProbabilityColumns: append([]string{}, spec.ProbabilityColumns()...),

			EstimateFrom: dec.Side.String(),
			CombineSides: combineSides(dec),
			ClipRatios:   spec.ClipRatios,
			ExactLimit:   spec.ExactLimit,
		},
		Synthetic: spec.Synthetic,
		Inputs: InputInfo{
			SpecFile:   spec.File,
			SpecSHA256: spec.SHA256,
			DataFile:   d.Path,
			DataSHA256: d.SHA256,
		},
		Metrics:     []MetricResult{},
		Mechanisms:  []MechanismResult{},
		Weights:     []WeightSide{},
		Warnings:    []Warning{},
		Assumptions: []string{},
	}
	columns := map[string][]string{}
	for _, n := range spec.Graph {
		columns[n.Node] = n.Columns
	}
	addEstimates(r, dec, columns)
	addEstimators(r, dec, spec.Intervals.Level)
	setCoalitions(r, dec, opt.coalitionLimit())
	for i, md := range dec.Metrics {
		r.Metrics[i].RecordsReference, r.Metrics[i].RecordsComparison = metricBasis(spec, d, md.Metric)
		r.Metrics[i].AllRecords = allRecords(spec, d.Complete, md.Metric)
	}
	return r
}

// addEstimates maps the mechanisms, metrics and weights of dec into r;
// columns gives each node's data columns (nil: none).
func addEstimates(r *Result, dec *attribution.Decomposition, columns map[string][]string) {
	for _, m := range dec.Mechanisms {
		r.Mechanisms = append(r.Mechanisms, mechanismResult(m, columns[m.Mechanism.Node], r.Groups.NReference))
	}
	for _, md := range dec.Metrics {
		r.Metrics = append(r.Metrics, metricResult(md, dec.Mechanisms))
	}
	for _, w := range dec.Weights {
		r.Weights = append(r.Weights, WeightSide{
			Side:          w.Side.String(),
			Records:       w.Records,
			Far:           hybridWeight(w.Far, dec.Mechanisms),
			FarTailShape:  finite(w.FarTailShape),
			Worst:         hybridWeight(w.Worst, dec.Mechanisms),
			AllCoalitions: w.AllCoalitions,
		})
	}
}

// mechanismResult maps one mechanism's diagnostics; nRef is the size of
// the reference group, for the ESS share.
func mechanismResult(m attribution.MechanismReport, columns []string, nRef int) MechanismResult {
	mr := MechanismResult{
		Node:             m.Mechanism.Node,
		Mechanism:        m.Mechanism.Label(),
		Parents:          append([]string{}, m.Mechanism.Parents...),
		Columns:          append([]string{}, columns...),
		Classifier:       m.Learner,
		ParentClassifier: m.ParentLearner,
		Losses:           []LearnerLoss{},
		AUC:              m.AUC,
		ESS:              m.ESS,
		MaxShare:         m.MaxShare,
		MeanRatio:        m.MeanRatio,

		ExtremeShare:      m.ExtremeShare,
		WorstStratumMean:  m.WorstStratumMean,
		ComparisonESS:     m.ComparisonESS,
		TailShape:         finite(m.TailShape),
		ClippedReference:  m.ClippedReference,
		ClippedComparison: m.ClippedComparison,
	}
	if m.ComparisonESS > 0 {
		mr.ComparisonTailShape = finite(m.ComparisonTailShape)
		mr.ComparisonExtremeShare = finite(m.ComparisonExtremeShare)
	}
	if nRef > 0 {
		mr.ESSShare = m.ESS / float64(nRef)
	}
	for _, l := range m.Losses {
		mr.Losses = append(mr.Losses, LearnerLoss{Classifier: l.Learner, LogLoss: l.LogLoss, OddsCheck: l.OddsCheck, MaxShare: l.MaxShare})
	}
	return mr
}

// metricResult maps one metric's split, with one contribution per
// mechanism in graph order.
func metricResult(md attribution.MetricDecomposition, mechs []attribution.MechanismReport) MetricResult {
	res := MetricResult{
		Metric:           md.Metric,
		Reference:        md.Reference,
		Comparison:       md.Comparison,
		Gap:              md.Gap,
		Estimated:        md.Estimated,
		Residual:         md.Residual,
		EffectiveRecords: md.EffectiveRecords,
		ReferenceCI:      interval(md.ReferenceCI),
		ComparisonCI:     interval(md.ComparisonCI),
		GapCI:            interval(md.GapCI),
		ResidualCI:       interval(md.ResidualCI),
		ImpactRatio:      impactRatio(md),
		ImpactRatioCI:    interval(md.ImpactRatioCI),
		LowerToHigherCI:  interval(md.LowerToHigherCI),
		Contributions:    []Contribution{},
		ReferenceWeight:  md.ReferenceWeight,
		ResidualSE:       md.ResidualSE,
		SideAgreement:    sideAgreement(md.Agreement),
	}
	for i, m := range mechs {
		c := Contribution{
			Node:        m.Mechanism.Node,
			Mechanism:   m.Mechanism.Label(),
			Value:       md.Contributions[i],
			Alone:       md.Alone[i],
			IfEqualised: md.IfEqualised[i],
		}
		if i < len(md.ContributionCIs) {
			lo, hi := md.ContributionCIs[i].Low, md.ContributionCIs[i].High
			c.CILow, c.CIHigh = &lo, &hi
		}
		if i < len(md.StdErrors) {
			se := md.StdErrors[i]
			c.StdError = &se
		}
		if a := md.Agreement; a != nil && i < len(a.Contributions) {
			c.SideDifference = sideDifference(a.Contributions[i])
		}
		if i < len(md.SplitSD) {
			sd := md.SplitSD[i]
			c.SplitSD = &sd
		}
		res.Contributions = append(res.Contributions, c)
	}
	return res
}

// combineSides names the Mix of a two-sided decomposition, "" for one
// side.
func combineSides(dec *attribution.Decomposition) string {
	if dec.Side != attribution.SideBoth {
		return ""
	}
	return dec.Mix.String()
}

// maxReportedZ caps SideAgreement.MaxZ, which is infinite when a
// difference has a zero standard error, so that it stays a JSON number.
const maxReportedZ = 1e6

// sideAgreement maps the engine's comparison of the two sides; nil stays
// nil.
func sideAgreement(a *attribution.SideAgreement) *SideAgreement {
	if a == nil {
		return nil
	}
	return &SideAgreement{
		ComparisonEnd: *sideDifference(a.AtFull),
		ReferenceEnd:  *sideDifference(a.AtEmpty),
		EndsAverage:   *sideDifference(a.Ends),
		MaxZ:          finite(math.Min(a.MaxZ, maxReportedZ)),
	}
}

func sideDifference(d attribution.Difference) *SideDifference {
	return &SideDifference{Difference: d.Value, StdError: finite(d.SE)}
}

// hybridWeight names the mechanisms of a coalition by their nodes.
func hybridWeight(c attribution.CoalitionWeight, mechs []attribution.MechanismReport) HybridWeight {
	h := HybridWeight{ComparisonNodes: []string{}, ESS: c.ESS, MaxShare: c.MaxShare}
	for i, m := range mechs {
		if c.Coalition&(1<<i) != 0 {
			h.ComparisonNodes = append(h.ComparisonNodes, m.Mechanism.Node)
		}
	}
	return h
}

func interval(iv *attribution.Interval) *Interval {
	if iv == nil {
		return nil
	}
	return &Interval{Low: iv.Low, High: iv.High}
}

// finite returns &x, or nil when x is NaN or infinite (JSON has no NaN).
func finite(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	return &x
}
