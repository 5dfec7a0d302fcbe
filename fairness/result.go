package fairness

// Result is the outcome of an audit: per metric, the gap between the two
// groups and its split into mechanism contributions, plus diagnostics. Its
// JSON encoding is the tool's machine-readable contract; field names are
// stable.
type Result struct {
	Tool        ToolInfo          `json:"tool"`
	Groups      GroupInfo         `json:"groups"`
	Label       string            `json:"label"`
	Score       string            `json:"score"`
	Threshold   float64           `json:"threshold"`
	Seed        uint64            `json:"seed"`
	Settings    Settings          `json:"settings"`
	Metrics     []MetricResult    `json:"metrics"`
	Mechanisms  []MechanismResult `json:"mechanisms"`
	Warnings    []string          `json:"warnings"`
	Assumptions []string          `json:"assumptions"`
	Synthetic   bool              `json:"synthetic,omitempty"` // data is invented (the demo)
	Inputs      InputInfo         `json:"inputs"`
	Details     *Details          `json:"details,omitempty"` // per-group descriptions for the report
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
	Folds       int      `json:"folds"`
	Classifier  string   `json:"classifier"`
	ECEBins     int      `json:"ece_bins"`
	DropMissing bool     `json:"drop_missing"`
	Learners    []string `json:"learners"`
}

// GroupInfo describes the two groups compared.
type GroupInfo struct {
	Column            string `json:"column"`
	Reference         string `json:"reference"`
	Comparison        string `json:"comparison"`
	NReference        int    `json:"n_reference"`
	NComparison       int    `json:"n_comparison"`
	DroppedReference  int    `json:"dropped_reference"`  // rows dropped for missing values
	DroppedComparison int    `json:"dropped_comparison"` // rows dropped for missing values
}

// MetricResult is one audited metric. Gap = Comparison − Reference and
// Σ Contributions[i].Value + Residual = Gap.
type MetricResult struct {
	Metric     string  `json:"metric"`
	Reference  float64 `json:"reference"`
	Comparison float64 `json:"comparison"`
	Gap        float64 `json:"gap"`
	Estimated  float64 `json:"estimated_gap"` // Σ contributions: the reweighted estimate of the gap
	Residual   float64 `json:"residual"`
	// Intervals are present when the bootstrap ran.
	ReferenceCI   *Interval      `json:"reference_ci,omitempty"`
	ComparisonCI  *Interval      `json:"comparison_ci,omitempty"`
	GapCI         *Interval      `json:"gap_ci,omitempty"`
	Contributions []Contribution `json:"contributions"`
}

// Contribution is one mechanism's Shapley value for a metric.
type Contribution struct {
	Node      string  `json:"node"`
	Mechanism string  `json:"mechanism"`
	Value     float64 `json:"value"`
	// CILow and CIHigh bound Value when the bootstrap ran.
	CILow  *float64 `json:"ci_low,omitempty"`
	CIHigh *float64 `json:"ci_high,omitempty"`
	// Alone is the change in the metric if only this mechanism took the
	// comparison group's form: v({i}).
	Alone float64 `json:"alone"`
	// IfEqualised is the estimated gap if this mechanism alone were made
	// equal to the reference group's while all others differ: v(N∖{i}).
	IfEqualised float64 `json:"gap_if_equalised"`
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
}

// LearnerLoss is one candidate classifier's out-of-fold log loss.
type LearnerLoss struct {
	Classifier string  `json:"classifier"`
	LogLoss    float64 `json:"log_loss"`
}

// Interval is a percentile bootstrap interval.
type Interval struct {
	Low  float64 `json:"ci_low"`
	High float64 `json:"ci_high"`
}
