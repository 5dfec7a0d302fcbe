package fairness

// Warning is one problem a reader of a Result should know about, in a form
// both people and programs can read. Message is the sentence the reports
// print; the other fields say what it is about, so that a program never
// has to parse the sentence.
type Warning struct {
	// Kind names the check that spoke up (one of the Kind… constants).
	Kind WarningKind `json:"kind"`
	// Severity says how much the warning should weigh on the numbers it
	// concerns.
	Severity Severity `json:"severity"`
	// Metric is the metric the warning concerns, for the metric-level
	// kinds (KindMetricRecords, KindLargeResidual, KindSidesDisagree,
	// KindEstimatorsDisagree); ""
	// otherwise.
	Metric string `json:"metric,omitempty"`
	// Nodes lists, in graph order, the nodes whose mechanisms the warning
	// concerns: the mechanism checked for the mechanism-level kinds, the
	// nodes in comparison form for KindWorstHybrid; empty (never nil) for
	// warnings about the data, a metric or the bootstrap.
	Nodes []string `json:"nodes"`
	// Message is the warning as a sentence, nodes and mechanisms quoted in
	// backticks.
	Message string `json:"message"`
}

// String returns the warning's sentence.
func (w Warning) String() string { return w.Message }

// WarningKind identifies the check behind a Warning. Its values are part
// of the JSON contract and never change meaning.
type WarningKind string

// The kinds of warning, in the order Warnings emits them. The severity of
// each is fixed except for KindHeavyTail, KindSidesDisagree and
// KindEstimatorsDisagree.
const (
	// KindRowsDropped (note; caution when the groups' dropped shares
	// differ beyond chance, droppedWarnings): rows were dropped for
	// missing values.
	KindRowsDropped WarningKind = "rows_dropped"
	// KindGroupValueNearMiss (caution): rows were excluded whose group
	// value differs from the reference or comparison value only in letter
	// case, white space or invisible characters (ExcludedValue.Resembles).
	KindGroupValueNearMiss WarningKind = "group_value_near_miss"
	// KindFewRecords (caution, or unreliable below WarnVeryFewRecords): a
	// metric rests on fewer than WarnFewRecords records of a group (e.g.
	// an FNR from seven deaths).
	KindFewRecords WarningKind = "few_records"
	// KindSmallGroup: a group is too small for the fold count (caution)
	// or smaller than the accuracy study's StudiedGroupSize (note).
	KindSmallGroup WarningKind = "small_group"
	// KindModelInputOutside (caution; note when the score is a node): a
	// declared model input is in no graph node (modelInputWarnings).
	KindModelInputOutside WarningKind = "model_input_outside_graph"
	// KindModelReadsGroup (caution): the model reads the group column
	// and the score is not a node.
	KindModelReadsGroup WarningKind = "model_reads_group"
	// KindNotEstimable (unreliable): a mechanism's contribution cannot be
	// estimated from the data (estimability); it replaces the overlap and
	// effective-records warnings of the same cause.
	KindNotEstimable WarningKind = "not_estimable"
	// KindLearnerChecks (unreliable): the learner chosen for a mechanism
	// fails its self-checks (learnerWarning).
	KindLearnerChecks WarningKind = "learner_checks_failed"
	// KindPoorOverlap (unreliable): the out-of-fold AUC of a mechanism's
	// group classifier is at least WarnAUC.
	KindPoorOverlap WarningKind = "poor_overlap"
	// KindExtremeWeights (caution): more than WarnExtremeShare of the
	// records that estimate the hybrids carry a weight above 20.
	KindExtremeWeights WarningKind = "extreme_weights"
	// KindLowEffectiveRecords (unreliable): a mechanism's effective sample
	// size is below WarnESSShare of its group or below WarnESSMin records.
	KindLowEffectiveRecords WarningKind = "low_effective_records"
	// KindHeavyTail: the Pareto tail shape of a mechanism's weights is
	// above attribution.TailInfiniteVariance (caution), or above
	// attribution.TailUnreliable (unreliable).
	KindHeavyTail WarningKind = "heavy_tail"
	// KindDominantRecord (caution): one record carries more than
	// WarnMaxShare of a mechanism's total weight.
	KindDominantRecord WarningKind = "dominant_record"
	// KindMeanRatioOff (caution): a mechanism's mean density ratio over the
	// reference records is outside [WarnMeanRatioLow, WarnMeanRatioHigh].
	KindMeanRatioOff WarningKind = "mean_ratio_off"
	// KindStratumRatioOff (caution): the mean ratio in some fifth of the
	// reference records is outside [WarnStratumLow, WarnStratumHigh].
	KindStratumRatioOff WarningKind = "stratum_ratio_off"
	// KindRatiosClipped (caution): clip_ratios clipped some of a
	// mechanism's log-ratios, pulling its contribution towards zero.
	KindRatiosClipped WarningKind = "ratios_clipped"
	// KindWorstHybrid (unreliable): the hybrid with the smallest effective
	// sample size on one side rests on too few effective records; Nodes
	// are the nodes in comparison form in that hybrid.
	KindWorstHybrid WarningKind = "worst_hybrid"
	// KindMetricRecords (unreliable): the estimate of a metric's far end
	// rests on fewer than WarnESSMin effective records.
	KindMetricRecords WarningKind = "metric_effective_records"
	// KindLargeResidual (caution): a metric's residual exceeds both
	// WarnResidualShare of its gap and WarnResidualMin.
	KindLargeResidual WarningKind = "large_residual"
	// KindSidesDisagree: the estimates of a metric from the reweighted
	// reference records and from the reweighted comparison records differ
	// by more than WarnSidesZ standard errors (caution) or more than
	// WarnSidesZUnreliable (unreliable), at an end of the gap or in a
	// contribution; Nodes are the mechanisms whose contributions differ
	// by more than WarnSidesZ.
	KindSidesDisagree WarningKind = "sides_disagree"
	// KindEstimatorsDisagree: the robust and the weighting estimates of a
	// metric differ by more than WarnEstimatorsZ standard errors (caution)
	// or more than WarnEstimatorsZUnreliable (unreliable), in the
	// estimated gap or a contribution (estimatorsWarning); Nodes are the
	// mechanisms whose contributions differ by more than WarnEstimatorsZ.
	KindEstimatorsDisagree WarningKind = "estimators_disagree"
	// KindRobustUnavailable (note): the robust estimator could not give
	// a metric (its estimate is undefined under some coalition, on very
	// few records); the weighting estimate is reported
	// (MetricResult.RobustUnavailable).
	KindRobustUnavailable WarningKind = "robust_unavailable"
	// KindSplitDependent (caution): some contributions still move with
	// the seed by more than WarnSplitShare of their interval's half-width
	// (or, without intervals, of their value and WarnSplitMin): their fold
	// splits disagree (Contribution.SplitSD). One warning for all metrics;
	// Nodes are the mechanisms concerned, leaving out those already
	// unreliable or not estimable.
	KindSplitDependent WarningKind = "split_dependent"
	// KindOutlyingValues (note): a numeric graph column has values outside
	// its typical range (classify.TypicalRange), which the logistic
	// learners treat as the range's nearer edge; they may be entry errors.
	KindOutlyingValues WarningKind = "outlying_values"
	// KindBootstrapFailures (note): some bootstrap replicates could not be
	// computed; the intervals rest on the others.
	KindBootstrapFailures WarningKind = "bootstrap_failures"
	// KindHiddenFactor (note): an unrecorded factor that shifts the odds
	// of group membership by up to FragileFactor could reverse a clear
	// conclusion (the sign of the leading contribution or of the
	// estimated gap; hiddenFactorWarnings), one warning for all metrics.
	KindHiddenFactor WarningKind = "hidden_factor_could_reverse"
)

// Severity grades a Warning, and the Reliability verdict on a mechanism.
// The scale, from least to most serious: SeverityNote, SeverityCaution,
// SeverityUnreliable. Its values are part of the JSON contract.
type Severity string

const (
	// SeverityNote: worth knowing; it does not by itself cast doubt on
	// the numbers.
	SeverityNote Severity = "note"
	// SeverityCaution: the numbers concerned may be biased or less
	// precise than their intervals suggest; read them with care.
	SeverityCaution Severity = "caution"
	// SeverityUnreliable: the numbers concerned should not be relied on.
	SeverityUnreliable Severity = "unreliable"
	// VerdictSound is the Reliability verdict on a mechanism that no
	// warning concerns; no Warning has it as its severity.
	VerdictSound Severity = "sound"
)

// rank orders severities: VerdictSound (and anything unknown) 0, then
// note 1, caution 2, unreliable 3.
func (s Severity) rank() int {
	switch s {
	case SeverityNote:
		return 1
	case SeverityCaution:
		return 2
	case SeverityUnreliable:
		return 3
	}
	return 0
}

// AtLeast reports whether s is as serious as t or more, on the scale
// sound < note < caution < unreliable.
func (s Severity) AtLeast(t Severity) bool { return s.rank() >= t.rank() }
