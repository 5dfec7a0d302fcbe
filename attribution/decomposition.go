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
	// Sampling tunes the permutation sampling used above ExactLimit; its
	// Seed is ignored (Options.Seed is used).
	Sampling SamplingOptions
}

// DefaultExactLimit is the default Options.ExactLimit.
const DefaultExactLimit = 16

// Decomposition is the result of Decompose.
type Decomposition struct {
	Mechanisms []MechanismReport     // in the order given
	Metrics    []MetricDecomposition // in the order requested
}

// MetricDecomposition splits one metric's gap. Contributions[i] belongs to
// Mechanisms[i]; Σ Contributions = Estimated and Residual = Gap − Estimated.
type MetricDecomposition struct {
	Metric        string
	Reference     float64   // observed on the reference records
	Comparison    float64   // observed on the comparison records
	Gap           float64   // Comparison − Reference
	Estimated     float64   // v(N): reweighted estimate of the gap
	Residual      float64   // Gap − Estimated
	Contributions []float64 // Shapley values φ_i
	Alone         []float64 // v({i})
	IfEqualised   []float64 // v(N∖{i})
	// StdErrors are the Monte Carlo standard errors of Contributions when
	// they were estimated by permutation sampling; nil when exact.
	StdErrors []float64

	// Percentile bootstrap intervals, set by Bootstrap; nil otherwise.
	ReferenceCI     *Interval
	ComparisonCI    *Interval
	GapCI           *Interval
	ContributionCIs []Interval
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
}

// LearnerLoss is a candidate learner's out-of-fold log loss.
type LearnerLoss struct {
	Learner string
	LogLoss float64
	// OddsCheck is (n_ref/n_cmp) times the mean out-of-fold odds of the
	// comparison group over the reference records; ≈ 1 when calibrated.
	OddsCheck float64
}
