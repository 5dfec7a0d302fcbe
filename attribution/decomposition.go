package attribution

import "github.com/gapwise/gapwise/attribution/classify"

// Options controls a decomposition.
type Options struct {
	Threshold float64            // positive decision when score >= Threshold
	Folds     int                // cross-fitting folds; 0 means 5
	Seed      uint64             // drives fold assignment and learners
	Learners  []classify.Learner // candidates, chosen per mechanism by out-of-fold log loss
	ECEBins   int                // bins for ECE; 0 means metrics.DefaultECEBins
	Workers   int                // goroutines; 0 means GOMAXPROCS

	// ExactLimit is the largest number of mechanisms for which Shapley
	// values are computed exactly over all 2^k coalitions; above it they
	// are estimated by permutation sampling. 0 means DefaultExactLimit.
	ExactLimit int
	// MaxFitRows caps the training records of each classifier fit; see
	// RatioOptions.MaxFitRows.
	MaxFitRows int
	// Sampling tunes the permutation sampling used above ExactLimit; its
	// Seed is ignored (Options.Seed is used).
	Sampling SamplingOptions
	// Side chooses the records that estimate the hybrid metrics (see
	// Side); SideDefault means DefaultSide.
	Side Side
	// Mix chooses how SideBoth combines the two sides' games (see Mix);
	// MixDefault means DefaultMix. Ignored for one side.
	Mix Mix
	// ClipQuantile, if in (0, 1), clips every mechanism's log-ratios to
	// their central interval of probability ClipQuantile over the records
	// of each side used (ClipAtQuantiles); 0 means no clipping.
	ClipQuantile float64
	// FoldSplits is the number R of independent cross-fitting fold splits
	// whose estimates are averaged (see aggregateSplits); 0 means
	// DefaultFoldSplits for the Sample's group sizes.
	FoldSplits int
	// Estimator chooses the estimator of the coalition values (see
	// Estimator); EstimatorDefault means DefaultEstimator.
	Estimator Estimator
	// RobustPool, for studies, makes every step of the robust estimator
	// pool both groups' records: the regression of group c's step also
	// reads the other group's records, carried to c's mechanism by the
	// step's own density ratio, and each correction (and the first term)
	// is the effective-sample-size-weighted mean of the two groups'
	// estimates (robust_pool.go). It lowers the error when the ratios are
	// right, but the estimate is then neither multiply robust nor
	// orthogonal to the ratios, so its influence-function intervals do not
	// hold; by default (false) every step reads only the records of the
	// group whose mechanism its node follows, as in Quintas-Martínez et
	// al. (2024).
	RobustPool bool
	// Fits, if non-nil, shares group classifiers with other
	// decompositions of the same records under other graphs (FitCache).
	Fits *FitCache
	// Reads says which mechanisms the label and the score depend on, for
	// the robust estimator (see NodeReads); the zero value means every
	// mechanism for both.
	Reads NodeReads

	// robustHooks, when set (tests only), replaces the robust
	// estimator's nuisances.
	robustHooks *robustHooks

	// splitOnly marks a split after the first: decompose skips the
	// diagnostics, which describe split 0 only.
	splitOnly bool
}

// DefaultExactLimit is the default Options.ExactLimit.
const DefaultExactLimit = 16

// Decomposition is the result of Decompose.
type Decomposition struct {
	Mechanisms []MechanismReport     // in the order given
	Metrics    []MetricDecomposition // in the order requested
	Side       Side                  // the side used (never SideDefault)
	Mix        Mix                   // the combination used for SideBoth (never MixDefault); MixDefault for one side
	FoldSplits int                   // R, the fold splits averaged (Options.FoldSplits)
	Estimator  Estimator             // the estimator asked for (never EstimatorDefault)
	// Regressions counts the robust estimator's regressions fitted in the
	// point estimate's first fold split (every fold and candidate
	// learner); 0 for the weighting estimator.
	Regressions int
	// Weights describes, per side used (reference first), the weights
	// that emulate the hybrid distributions on that side's records.
	Weights []SideWeights

	// sens keeps the point estimate's first side for Sensitivity (nil in
	// bootstrap replicates and splits after the first).
	sens *sensitivityInput
}

// SideWeights summarises the importance weights of one side.
type SideWeights struct {
	Side    Side // SideReference or SideComparison
	Records int  // records of the side
	// Far is the hybrid farthest from the side's own group: N on the
	// reference side (the reweighted comparison group), ∅ on the
	// comparison side (the reweighted reference group).
	Far CoalitionWeight
	// Worst is the hybrid coalition with the smallest n_eff, searched over
	// all 2^k coalitions when AllCoalitions, else over ∅, N, {i} and N∖{i}.
	Worst         CoalitionWeight
	AllCoalitions bool
	// FarTailShape is the Pareto tail shape k̂ of Far's weights (see
	// TailShape).
	FarTailShape float64
}

// MetricDecomposition splits one metric's gap. Contributions[i] belongs to
// Mechanisms[i]; Σ Contributions = Estimated and Residual = Gap − Estimated.
type MetricDecomposition struct {
	Metric string
	// Estimator is the estimator of this metric's coalition values:
	// EstimatorWeighting or EstimatorRobust (never EstimatorBoth; AUC is
	// always weighted).
	Estimator     Estimator
	Reference     float64   // observed on the reference records
	Comparison    float64   // observed on the comparison records
	Gap           float64   // Comparison − Reference
	Estimated     float64   // v(N): reweighted estimate of the gap
	Residual      float64   // Gap − Estimated
	Contributions []float64 // Shapley values φ_i
	Alone         []float64 // v({i})
	IfEqualised   []float64 // v(N∖{i})
	// Game[S] is v(S) = M̂(P_S) − M̂(P_∅) for every coalition S (bit i of
	// S set: mechanism i in comparison form; Game[0] = 0), the game whose
	// Shapley values are Contributions: with both sides the combined game
	// of Mix, with several fold splits the mean of the splits' games
	// (aggregateSplits), so ExactShapley(Game, k) = Contributions up to
	// rounding. Nil when the Shapley values were sampled (more mechanisms
	// than ExactLimit), when MixMechanism combined the contributions per
	// mechanism (they are then no game's Shapley values), and in
	// bootstrap replicates.
	Game []float64
	// StdErrors are the Monte Carlo standard errors of Contributions when
	// they were estimated by permutation sampling; nil when exact.
	StdErrors []float64
	// SplitSD[i] is the standard deviation of mechanism i's contribution
	// over the R fold splits (divisor R − 1), and SplitContributions[r]
	// split r's contributions; both nil for one split. The seed-to-seed
	// spread of Contributions[i] is about SplitSD[i]/√R.
	SplitSD            []float64
	SplitContributions [][]float64
	// EffectiveRecords is n_eff of the weights behind the estimate of the
	// far end of the gap, over the records the metric counts (negatives
	// for FPR, positives for FNR and TPR, flagged records for PPV, ...):
	// the reference side's w_N for SideReference, the comparison side's
	// w'_∅ for SideComparison; for SideBoth the smaller over the two ends
	// of n_eff(reference) + n_eff(comparison), an observed end counting
	// all its records.
	EffectiveRecords float64
	// ReferenceWeight is λ, the weight of the reference side's game in
	// the estimate: 1 for SideReference, 0 for SideComparison, the
	// metric-level weight of a Mix for SideBoth; nil for MixCoalition
	// (a weight per coalition).
	ReferenceWeight *float64
	// Agreement compares the two one-sided estimates of the game (see
	// SideAgreement); set for SideBoth in the point estimate, nil otherwise.
	Agreement *SideAgreement
	// ResidualSE is the delta-method standard error of Residual from the
	// sampling of the records (see residualSE); set for SideBoth in the
	// point estimate except with MixMechanism, nil otherwise.
	ResidualSE *float64

	// Influence holds the influence-function standard errors of the
	// estimates of the estimator behind them (influence.go): for the
	// robust estimator valid with the nuisances estimated (its estimating
	// equation is orthogonal to them), for the weighting estimator the
	// delta method with the fitted ratios held fixed. Set in the point
	// estimate (split 0's with several fold splits) when the robust
	// estimator was computed (EstimatorRobust, EstimatorBoth); nil
	// otherwise and in bootstrap replicates.
	Influence *InfluenceSE
	// RobustUnavailable, when set, says why the robust estimator could not
	// give this metric (a ratio metric whose estimated denominator is not
	// positive under some coalition, on very few records): the weighting
	// estimate stands, with no cross-check.
	RobustUnavailable string
	// CrossCheck compares the robust estimate with the weighting one
	// (EstimatorRobust, EstimatorBoth); nil otherwise and for AUC.
	CrossCheck *EstimatorCheck
	// crossSE holds the standard errors of the two estimators'
	// differences until CrossCheck is built.
	crossSE *InfluenceSE
	// weighting keeps the weighting estimate of a metric the robust
	// estimator gives, for unifyFallback.
	weighting *MetricDecomposition
	// weightingSE holds the weighting estimator's standard errors (nil
	// when not computed).
	weightingSE *InfluenceSE

	// Percentile bootstrap intervals, set by Bootstrap; nil otherwise.
	ReferenceCI     *Interval
	ComparisonCI    *Interval
	GapCI           *Interval
	ResidualCI      *Interval
	ContributionCIs []Interval
	// ImpactRatioCI bounds Comparison ÷ Reference and LowerToHigherCI
	// min ÷ max of the two, for rates (ratioIntervals); nil otherwise and
	// when a replicate leaves the ratio undefined.
	ImpactRatioCI   *Interval
	LowerToHigherCI *Interval

	// FixedRatioSE holds delta-method standard errors with the fitted
	// ratios held fixed (see FixedRatioSE), for studies; set for SideBoth
	// with exact Shapley values in the point estimate, nil otherwise.
	FixedRatioSE *FixedRatioSE
}

// Interval is a two-sided percentile interval.
type Interval struct{ Low, High float64 }

// MechanismReport holds per-mechanism estimation diagnostics.
type MechanismReport struct {
	Mechanism     Mechanism
	Learner       string        // chosen for the (node, parents) classifier
	ParentLearner string        // chosen for the parents classifier; "prior" for a root
	Losses        []LearnerLoss // out-of-fold log loss of each candidate on (node, parents)
	AUC           float64       // out-of-fold AUC of the chosen (node, parents) classifier
	ESS           float64       // (Σw)²/Σw² over reference records, w = r_i
	MaxShare      float64       // max w / Σw over reference records
	MeanRatio     float64       // mean of r_i over reference records (≈ 1 if right)
	// ExtremeShare is the share of reference records with r_i > 20
	// (ExtremeShare; before clipping); ComparisonExtremeShare that of
	// comparison records with 1/r_i > 20, set when that side is used.
	ExtremeShare, ComparisonExtremeShare float64
	// WorstStratumMean is the mean of r_i in the stratum of the parents
	// farthest from 1 (WorstStratumMean; before clipping).
	WorstStratumMean float64
	// ComparisonESS is n_eff of 1/r_i over the comparison records, set
	// when the comparison side is used (0 otherwise).
	ComparisonESS float64
	// TailShape is the Pareto shape k̂ of the right tail of r_i over the
	// reference records (TailShape; before clipping): above 0.5 the
	// weights have infinite variance. ComparisonTailShape is that of
	// 1/r_i over the comparison records, set when that side is used.
	TailShape, ComparisonTailShape float64
	// ClippedReference and ClippedComparison count the records of each
	// side whose log-ratio was clipped (Options.ClipQuantile).
	ClippedReference, ClippedComparison int
}

// LearnerLoss is a candidate learner's out-of-fold log loss.
type LearnerLoss struct {
	Learner string
	LogLoss float64
	// OddsCheck is (n_ref/n_cmp) times the mean out-of-fold odds of the
	// comparison group over the reference records; ≈ 1 when calibrated.
	OddsCheck float64
	// MaxShare is the largest share one reference record holds in the sum
	// of the out-of-fold odds (see PassesChecks).
	MaxShare float64
}
