package fairness

import (
	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/fairness/policy"
)

// Result is the outcome of an audit: per metric, the gap between the two
// groups and its split into mechanism contributions, plus diagnostics. Its
// JSON encoding is the tool's machine-readable contract; field names are
// stable.
type Result struct {
	Tool ToolInfo `json:"tool"`
	// Title is the spec's free-text title, shown by the reports.
	Title string `json:"title,omitempty"`
	// Model names the audited model (spec key model); absent when the
	// spec does not.
	Model *ModelInfo `json:"model,omitempty"`
	// AuditDate is the date of the audit, YYYY-MM-DD (spec key audit_date
	// or the --audit-date flag); absent when not given, so that the same
	// inputs give the same bytes on any day.
	AuditDate string    `json:"audit_date,omitempty"`
	Groups    GroupInfo `json:"groups"`
	// Names holds the display names of the groups, nodes and columns
	// (spec key names), keyed by the identifiers the rest of the Result
	// uses; absent when the spec gives none.
	Names *Names `json:"names,omitempty"`
	Label string `json:"label"`
	// LabelValues, present when the spec names the positive label value,
	// says which value was counted as the outcome and which as 0.
	LabelValues *LabelValues `json:"label_values,omitempty"`
	Score       string       `json:"score"`
	// ModelInputs echoes the spec's model_inputs; absent when none are
	// declared.
	ModelInputs *ModelInputs      `json:"model_inputs,omitempty"`
	Threshold   float64           `json:"threshold"`
	Seed        uint64            `json:"seed"`
	Settings    Settings          `json:"settings"`
	Metrics     []MetricResult    `json:"metrics"`
	Mechanisms  []MechanismResult `json:"mechanisms"`
	// Weights describes, per side of estimation used, the weights that
	// emulate the hybrid distributions.
	Weights []WeightSide `json:"weights"`
	// Warnings lists the problems a reader should know about (see
	// Warnings for the order, Warning for the fields).
	Warnings    []Warning `json:"warnings"`
	Assumptions []string  `json:"assumptions"`
	Synthetic   bool      `json:"synthetic,omitempty"` // data is invented (the demo)
	Inputs      InputInfo `json:"inputs"`
	Details     *Details  `json:"details,omitempty"` // per-group descriptions for the report
	// Policy is the judgement of the policy file given to the run
	// (RunOptions.Policy, --policy): every check and whether the run
	// passed; absent without a policy.
	Policy *policy.Outcome `json:"policy,omitempty"`
	// Suppression, present when the spec's suppress_below (or the flag
	// --suppress-below) is set, lists the counts withheld as small cells
	// (null in JSON, 0 here) and what stays shown; see Suppression.
	Suppression *Suppression `json:"suppression,omitempty"`
	// HiddenFactor is the sensitivity of the contributions to an
	// unrecorded factor (spec key hidden_factor; see HiddenFactor);
	// absent when the spec turns it off.
	HiddenFactor *HiddenFactor `json:"hidden_factor,omitempty"`
	// GraphRobustness, present when the audit was rerun under alternative
	// graphs (RunOptions.AltGraphs, decompose --alt-graph), holds every run and
	// what holds across them.
	GraphRobustness *GraphRobustness `json:"graph_robustness,omitempty"`
}

// ToolInfo names the program that produced the result.
type ToolInfo struct {
	Name    string `json:"name"`
	Version string `json:"version"`
}

// InputInfo identifies the inputs for reproducibility.
type InputInfo struct {
	SpecFile   string `json:"spec_file"`
	SpecSHA256 string `json:"spec_sha256"`
	DataFile   string `json:"data_file"`
	DataSHA256 string `json:"data_sha256"`
}

// Settings echoes the estimation settings that shaped the numbers.
type Settings struct {
	Folds int `json:"folds"`
	// FoldSplits is the number R of independent fold splits whose
	// estimates were averaged (spec key fold_splits or its default).
	FoldSplits  int    `json:"fold_splits"`
	Classifier  string `json:"classifier"`
	ECEBins     int    `json:"ece_bins"`
	DropMissing bool   `json:"drop_missing"`
	// Missing is the spec's missing setting: error, drop or indicator.
	Missing  string   `json:"missing"`
	Learners []string `json:"learners"`
	// ProbabilityColumns lists the graph columns the classifiers read as
	// clipped logits: those under the spec key probabilities, and the
	// score when it is a node (Spec.ProbabilityColumns).
	ProbabilityColumns []string `json:"probability_columns"`
	// Estimator names the estimator of the coalition values: weighting,
	// robust, or both (the weighting numbers, checked against the robust
	// ones); see attribution.Estimator.
	Estimator string `json:"estimator"`
	// EstimateFrom names the records that estimate the hybrid metrics:
	// reference, comparison or both (see attribution.Side).
	EstimateFrom string `json:"estimate_from"`
	// CombineSides names how both sides' games are combined when
	// estimate_from is both: "coalition" (per coalition by effective
	// sample size), "metric-ess", "metric-variance" or "pick" (one weight
	// per metric; see attribution.Mix); absent for one side.
	CombineSides string `json:"combine_sides,omitempty"`
	// ClipRatios is the central probability kept when clipping log-ratios;
	// absent when no clipping.
	ClipRatios float64 `json:"clip_ratios,omitempty"`
	// ExactLimit: Shapley values are exact up to this many mechanisms and
	// sampled (with std_error) above.
	ExactLimit int `json:"exact_limit"`
	// Intervals describes the bootstrap behind the intervals; absent when
	// no bootstrap ran.
	Intervals *IntervalSettings `json:"intervals,omitempty"`
}

// IntervalSettings records how the bootstrap intervals were made: the
// settings used (replicates requested, level, keep_ratios, form), the
// method (bootstrap-refit or bootstrap-fast) and the replicates that
// failed. It is the engine's own summary.
type IntervalSettings = attribution.BootstrapSummary

// GroupInfo describes the two groups compared.
type GroupInfo struct {
	// Column is the group column, or for groups formed by several columns
	// or bands (groups.columns, groups.bands) those columns joined by
	// " × "; Reference and Comparison are then combinations such as
	// "sex F, age 40–65", listed in Columns with Bands.
	Column     string `json:"column"`
	Reference  string `json:"reference"`
	Comparison string `json:"comparison"`
	// Columns lists the group columns and Bands the banded ones with
	// their edges (each band holds its lower edge); both absent for a
	// group column's plain values.
	Columns           []string     `json:"columns,omitempty"`
	Bands             []GroupBands `json:"bands,omitempty"`
	NReference        int          `json:"n_reference"`
	NComparison       int          `json:"n_comparison"`
	EventsReference   int          `json:"events_reference"`   // records with label 1
	EventsComparison  int          `json:"events_comparison"`  // records with label 1
	DroppedReference  int          `json:"dropped_reference"`  // rows dropped for missing values
	DroppedComparison int          `json:"dropped_comparison"` // rows dropped for missing values

	// Rows not audited because their group value is another one, counted
	// per value (most rows first; at most 1,000 values are listed, and
	// ExcludedRows counts all), and rows whose group value is missing
	// (missing: drop).
	Excluded         []ExcludedValue `json:"excluded_values"`
	ExcludedRows     int             `json:"excluded_rows"`
	MissingGroupRows int             `json:"missing_group_rows"`
}

// MetricResult is one audited metric. Gap = Comparison − Reference and
// Σ Contributions[i].Value + Residual = Gap.
type MetricResult struct {
	Metric string `json:"metric"`
	// Estimator is the estimator behind this metric's contributions:
	// robust or weighting (auc is always weighted).
	Estimator  string  `json:"estimator"`
	Reference  float64 `json:"reference"`
	Comparison float64 `json:"comparison"`
	Gap        float64 `json:"gap"`
	Estimated  float64 `json:"estimated_gap"` // Σ contributions: the reweighted estimate of the gap
	// Residual = Gap − Estimated holds the estimation error and the effect
	// of anything that differs between the groups outside the graph. When
	// both sides estimate with a weight per coalition, both ends of the
	// gap are pinned to the observed metrics and the residual is small by
	// construction whatever the estimate's quality: read SideAgreement.
	Residual float64 `json:"residual"`
	// ResidualSE is the residual's standard error from the sampling of
	// the records (delta method, fitted ratios held fixed); present when
	// both sides estimate.
	ResidualSE *float64 `json:"residual_std_error,omitempty"`
	// ReferenceWeight is the weight of the reference records' game in the
	// estimate (1 for estimate_from reference, 0 for comparison, one
	// weight per metric for both); absent when both sides are mixed per
	// coalition.
	ReferenceWeight *float64 `json:"reference_weight,omitempty"`
	// SideAgreement compares the two one-sided estimates; present when
	// both sides estimate.
	SideAgreement *SideAgreement `json:"side_agreement,omitempty"`
	// EffectiveRecords is the effective sample size behind the estimate
	// of the far end of the gap, over the records the metric counts
	// (attribution.MetricDecomposition.EffectiveRecords).
	EffectiveRecords float64 `json:"effective_records"`
	// RecordsReference and RecordsComparison count the records the metric
	// rests on in each group (metrics.Fact.Basis: the negatives for the
	// FPR, the positives for the FNR, ...).
	RecordsReference  int `json:"records_reference"`
	RecordsComparison int `json:"records_comparison"`
	// AllRecords, present when rows were dropped for missing values, is
	// the metric on every audited record whose label and score are
	// present, dropped or not: the question before dropping.
	AllRecords *AllRecords `json:"all_records,omitempty"`
	// Intervals are present when the bootstrap ran.
	ReferenceCI  *Interval `json:"reference_ci,omitempty"`
	ComparisonCI *Interval `json:"comparison_ci,omitempty"`
	GapCI        *Interval `json:"gap_ci,omitempty"`
	// ResidualCI is the bootstrap interval of the residual: the large
	// residual warning fires only when it excludes zero.
	ResidualCI *Interval `json:"residual_ci,omitempty"`
	// ImpactRatio is Comparison ÷ Reference for a rate (metrics.Fact.
	// Proportion), reported beside the gap; absent for other metrics and
	// when Reference is 0. ImpactRatioCI is its bootstrap interval and
	// LowerToHigherCI that of min ÷ max of the two values (what a policy's
	// min_ratio judges on a bound); absent without intervals or when a
	// replicate leaves the ratio undefined.
	ImpactRatio     *float64       `json:"impact_ratio,omitempty"`
	ImpactRatioCI   *Interval      `json:"impact_ratio_ci,omitempty"`
	LowerToHigherCI *Interval      `json:"lower_to_higher_ci,omitempty"`
	Contributions   []Contribution `json:"contributions"`
	// Uncertainty holds the influence-function standard errors and Wald
	// intervals of the group metrics and the gap; present when the robust
	// estimator gives the metric.
	Uncertainty *MetricUncertainty `json:"uncertainty,omitempty"`
	// RobustUnavailable says why the robust estimator, asked for, could not
	// give this metric (its estimate is undefined under some coalition);
	// the weighting estimate is reported. Absent otherwise.
	RobustUnavailable string `json:"robust_unavailable,omitempty"`
	// EstimatorCheck compares the robust and weighting estimates; present
	// when both were computed (estimator robust or both; not for auc).
	EstimatorCheck *EstimatorCheck `json:"estimator_check,omitempty"`
	// Coalitions lists every coalition of the mechanisms with its value in
	// the game whose Shapley values are the contributions (Coalition), in
	// the order of the bit masks S = 0 … 2^k − 1, bit i standing for
	// mechanisms[i]; present for at most RunOptions.CoalitionLimit
	// mechanisms (DefaultCoalitionLimit) and exact Shapley values. The
	// command line writes it into JSON only with --coalitions.
	Coalitions []Coalition `json:"coalitions,omitempty"`
	// CoalitionsOmitted says why Coalitions is absent: OmittedAboveLimit,
	// OmittedSampled or OmittedPerMechanism; absent when they are present.
	CoalitionsOmitted string `json:"coalitions_omitted,omitempty"`
	// Headline names the mechanism of the largest contribution, its
	// share of the gap and a verdict from the warnings (setHeadlines).
	Headline Headline `json:"headline"`
}

// Contribution is one mechanism's Shapley value for a metric.
type Contribution struct {
	Node      string  `json:"node"`
	Mechanism string  `json:"mechanism"`
	Value     float64 `json:"value"`
	// CILow and CIHigh bound Value when the bootstrap ran.
	CILow  *float64 `json:"ci_low,omitempty"`
	CIHigh *float64 `json:"ci_high,omitempty"`
	// StdError is the Monte Carlo standard error of Value when Shapley
	// values were sampled (more mechanisms than exact_limit).
	StdError *float64 `json:"std_error,omitempty"`
	// NotEstimable marks a contribution the data cannot estimate (its
	// mechanism's reliability.estimable is false): Value and the interval
	// are kept for completeness, but reports show no value.
	NotEstimable bool `json:"not_estimable,omitempty"`
	// SplitSD is the standard deviation of the contribution over the
	// fold splits (Settings.FoldSplits, divisor R − 1), present when there
	// were several: how much one split's estimate depends on which
	// records share a fold. Value, their mean, moves with the seed by
	// about SplitSD/√R.
	SplitSD *float64 `json:"split_sd,omitempty"`
	// Alone is the change in the metric if only this mechanism took the
	// comparison group's form: v({i}).
	Alone float64 `json:"alone"`
	// IfEqualised is the estimated gap if this mechanism alone were made
	// equal to the reference group's while all others differ: v(N∖{i}).
	IfEqualised float64 `json:"gap_if_equalised"`
	// SideDifference is this contribution from the reference records
	// minus the one from the comparison records
	// (attribution.SideAgreement); present when both sides estimate and
	// the Shapley values are exact.
	SideDifference *SideDifference `json:"side_difference,omitempty"`
	// Uncertainty is the contribution's influence-function standard
	// error and Wald interval, with those of its what-if values; present
	// when the robust estimator gives the metric.
	Uncertainty *ContributionUncertainty `json:"uncertainty,omitempty"`
	// EstimatorDifference is the contribution by both estimators and
	// their difference; present with the metric's EstimatorCheck.
	EstimatorDifference *EstimatorDifference `json:"estimator_difference,omitempty"`
}

// SideAgreement compares the estimate from the reweighted reference
// records with the one from the reweighted comparison records
// (attribution.SideAgreement). Both estimate the same quantities when
// the density ratios are right and the graph holds everything that
// differs and matters, so each difference should be within a few
// standard errors of 0.
type SideAgreement struct {
	// ComparisonEnd: the reweighted reference records' estimate of the
	// comparison group's metric minus its observed value.
	ComparisonEnd SideDifference `json:"comparison_end"`
	// ReferenceEnd: the observed reference metric minus the reweighted
	// comparison records' estimate of it.
	ReferenceEnd SideDifference `json:"reference_end"`
	// EndsAverage is the average of the two end differences: both sides
	// miss the effect of something outside the graph the same way, so it
	// shows that with less noise than either end.
	EndsAverage SideDifference `json:"ends_average"`
	// MaxZ is the largest |difference| / std_error over the two ends and
	// the contributions; absent when no standard error is known (auc).
	MaxZ *float64 `json:"max_z,omitempty"`
}

// SideDifference is one difference between the two sides' estimates.
type SideDifference struct {
	Difference float64 `json:"difference"`
	// StdError is its delta-method standard error (sampling noise of the
	// records, ratios held fixed); absent when unknown.
	StdError *float64 `json:"std_error,omitempty"`
}

// MechanismResult carries per-mechanism diagnostics.
type MechanismResult struct {
	Node             string        `json:"node"`
	Mechanism        string        `json:"mechanism"`
	Parents          []string      `json:"parents"`
	Columns          []string      `json:"columns"`
	Classifier       string        `json:"classifier"`        // chosen for (node, parents)
	ParentClassifier string        `json:"parent_classifier"` // chosen for parents alone ("prior" for a root)
	Losses           []LearnerLoss `json:"oof_log_loss"`
	AUC              float64       `json:"oof_auc"`
	ESS              float64       `json:"ess"`       // effective sample size of the reference weights
	ESSShare         float64       `json:"ess_share"` // ESS / n_reference
	MaxShare         float64       `json:"max_weight_share"`
	MeanRatio        float64       `json:"mean_ratio"` // ≈ 1 when the ratios are right
	// ExtremeShare is the share of reference records whose weight r is
	// above 20 (attribution.ExtremeShare): a few such records can dominate
	// the reweighted estimate. ComparisonExtremeShare is the share of
	// comparison records whose weight 1/r is above 20, present when they
	// are used.
	ExtremeShare           float64  `json:"extreme_ratio_share"`
	ComparisonExtremeShare *float64 `json:"comparison_extreme_ratio_share,omitempty"`
	// WorstStratumMean is the mean ratio in the fifth of the reference
	// records (by the parents' classifier) farthest from 1; ≈ 1 when right.
	WorstStratumMean float64 `json:"worst_stratum_mean_ratio"`
	// ComparisonESS is the effective sample size of 1/r over the
	// comparison records, present when they are used.
	ComparisonESS float64 `json:"comparison_ess,omitempty"`
	// TailShape is the Pareto shape k̂ of the right tail of the ratios over
	// the reference records (attribution.TailShape): above 0.5 the weights
	// have infinite variance, above 0.7 estimates are unreliable.
	// ComparisonTailShape is that of the inverse ratios over the comparison
	// records, present when they are used. Absent when too few records.
	TailShape           *float64 `json:"tail_shape,omitempty"`
	ComparisonTailShape *float64 `json:"comparison_tail_shape,omitempty"`
	// ClippedReference and ClippedComparison count the records whose
	// log-ratio was clipped (clip_ratios) on each side.
	ClippedReference  int `json:"clipped_reference"`
	ClippedComparison int `json:"clipped_comparison"`
	// Reliability is the verdict on this mechanism's contributions from
	// the warnings that name its node.
	Reliability Reliability `json:"reliability"`
}

// WeightSide summarises the importance weights of one side of estimation.
type WeightSide struct {
	Side    string `json:"side"`    // reference or comparison
	Records int    `json:"records"` // records of that group
	// Far is the hybrid farthest from the side's group: every mechanism in
	// comparison form (reference side) or none (comparison side).
	Far HybridWeight `json:"far_hybrid"`
	// FarTailShape is the Pareto tail shape k̂ of Far's weights.
	FarTailShape *float64 `json:"far_tail_shape,omitempty"`
	// Worst is the hybrid with the smallest effective sample size,
	// searched over all coalitions when AllCoalitions, else over the
	// empty, full, single and all-but-one coalitions.
	Worst         HybridWeight `json:"worst_hybrid"`
	AllCoalitions bool         `json:"searched_all_coalitions"`
}

// HybridWeight describes the weights that emulate one hybrid distribution.
type HybridWeight struct {
	// ComparisonNodes lists the nodes whose mechanism takes the comparison
	// group's form, in graph order.
	ComparisonNodes []string `json:"comparison_nodes"`
	ESS             float64  `json:"ess"`
	MaxShare        float64  `json:"max_weight_share"`
}

// LearnerLoss is one candidate classifier's out-of-fold log loss.
type LearnerLoss struct {
	Classifier string  `json:"classifier"`
	LogLoss    float64 `json:"log_loss"`
	// OddsCheck is n_ref/n_cmp times the mean out-of-fold odds of the
	// comparison group over the reference records; ≈ 1 when calibrated.
	OddsCheck float64 `json:"odds_check"`
	// MaxShare is the largest share one reference record holds in the sum
	// of the learner's out-of-fold odds; a learner passes its self-checks
	// when the odds check is within a factor 1.25 of 1 and MaxShare ≤ 0.5.
	MaxShare float64 `json:"max_share"`
}

// Interval is a percentile bootstrap interval.
type Interval struct {
	Low  float64 `json:"ci_low"`
	High float64 `json:"ci_high"`
}
