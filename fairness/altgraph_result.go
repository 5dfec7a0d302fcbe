package fairness

// GraphRobustness holds an audit rerun under alternative graphs
// (RunOptions.AltGraphs): every run's contributions and, per metric, what holds
// under every graph and what changes. Agreement across graphs is
// reassurance, not proof: the data cannot tell which graph is right.
type GraphRobustness struct {
	// ClearShare is the share of |gap| above which a contribution without
	// an interval counts as having a clear sign (GraphClearShare); with
	// intervals, a sign is clear when the interval excludes 0.
	ClearShare float64 `json:"clear_share"`
	// Runs lists the spec's graph first (the audit's own numbers), then
	// each alternative in the order given.
	Runs []GraphRun `json:"runs"`
	// Metrics compares the runs per metric, in the result's metric order.
	Metrics []GraphMetric `json:"metrics"`
}

// GraphRun is one decomposition under one graph.
type GraphRun struct {
	// Reading says where the graph comes from: ReadingSpec, ReadingFile,
	// ReadingIndependent or ReadingLabelParent.
	Reading string `json:"reading"`
	// File and FileSHA256 identify the graph file of ReadingFile.
	File       string `json:"file,omitempty"`
	FileSHA256 string `json:"file_sha256,omitempty"`
	// Graph lists the run's nodes with their columns and parents.
	Graph []GraphNode `json:"graph"`
	// Metrics holds the run's contributions per metric.
	Metrics []GraphRunMetric `json:"metrics"`
}

// GraphNode is one node of a run's graph.
type GraphNode struct {
	Node    string   `json:"node"`
	Columns []string `json:"columns"`
	Parents []string `json:"parents"`
}

// GraphRunMetric is one metric's split under one graph.
type GraphRunMetric struct {
	Metric string `json:"metric"`
	// Estimated is Σ contributions; Residual is Gap − Estimated. The gap
	// itself is the same under every graph (MetricResult.Gap).
	Estimated float64 `json:"estimated_gap"`
	Residual  float64 `json:"residual"`
	// Lead is the run's Headline.Lead: the estimable contribution of
	// largest |φ|.
	Lead          string              `json:"lead_node"`
	Contributions []GraphContribution `json:"contributions"`
}

// GraphContribution is one mechanism's contribution under one graph.
type GraphContribution struct {
	Node   string   `json:"node"`
	Value  float64  `json:"value"`
	CILow  *float64 `json:"ci_low,omitempty"`
	CIHigh *float64 `json:"ci_high,omitempty"`
	// NotEstimable marks a contribution the data cannot estimate under
	// this graph (Contribution.NotEstimable).
	NotEstimable bool `json:"not_estimable,omitempty"`
	// Sign is the contribution's clear sign: +1 clearly positive, −1
	// clearly negative, 0 not clear (clearSign).
	Sign int `json:"clear_sign"`
}

// GraphMetric says, for one metric, what holds under every graph.
type GraphMetric struct {
	Metric string `json:"metric"`
	// Leads holds each run's lead node, in run order; LeadHolds is true
	// when they are all the same and not "".
	Leads     []string `json:"lead_nodes"`
	LeadHolds bool     `json:"lead_holds"`
	// Nodes judges each node of the spec's graph, in graph order, then
	// any node only an alternative has.
	Nodes []GraphNodeVerdict `json:"nodes"`
	// Dependent is true when the lead changes or a node's sign is clear
	// under some graph and not the same clear sign under every other
	// (SignReverses, SignVaries; KindGraphDependent).
	Dependent bool `json:"graph_dependent"`
}

// GraphNodeVerdict is one node's clear signs across the runs.
type GraphNodeVerdict struct {
	Node string `json:"node"`
	// Signs holds the node's clear sign in each run, in run order (0 also
	// where a run has no node of that name).
	Signs []int `json:"clear_signs"`
	// Status is SignHolds, SignReverses, SignVaries or SignUnclear.
	Status string `json:"status"`
}

// Values of GraphNodeVerdict.Status.
const (
	// SignHolds: the same clear sign under every graph.
	SignHolds = "holds"
	// SignReverses: clearly positive under one graph, clearly negative
	// under another.
	SignReverses = "reverses"
	// SignVaries: clear under some graphs, not clear under others.
	SignVaries = "varies"
	// SignUnclear: clear under no graph.
	SignUnclear = "unclear"
)
