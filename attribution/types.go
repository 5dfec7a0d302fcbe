// Package attribution splits the gap in a performance metric between two
// groups into contributions of causal mechanisms.
//
// The two groups' joint distributions factorise along a user-given DAG into
// mechanisms P_g(x_i | pa_i). For a coalition S of mechanisms, the hybrid
// distribution P_S takes the comparison group's mechanism for i ∈ S and the
// reference group's for the rest. Its metric is estimated by reweighting the
// reference records with w_S = Π_{i∈S} r_i, where
//
//	r_i = P_cmp(x_i | pa_i) / P_ref(x_i | pa_i),
//	log r_i = logit P(cmp | x_i, pa_i) − logit P(cmp | pa_i),
//
// both probabilities coming from cross-fitted group classifiers. The game
// v(S) = M(P_S) − M(P_∅) is split with Shapley values (Shapley 1953, "A value
// for n-person games"); the method is Shapley attribution of performance
// changes to mechanism shifts (Zhang et al. 2023, "Why did the model
// fail?": Attributing model performance changes to distribution shifts,
// ICML 2023).
package attribution

import (
	"fmt"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// Mechanism is one node of the causal graph with its parents, and where they
// live in the feature matrix of a Sample.
type Mechanism struct {
	Node       string
	Parents    []string
	NodeCols   []int // columns of Sample.X encoding the node (one-hot for categorical)
	ParentCols []int // columns of Sample.X encoding all parents, in order
}

// Label renders the mechanism as "node | parent1, parent2", or "node" for a root.
func (m Mechanism) Label() string {
	if len(m.Parents) == 0 {
		return m.Node
	}
	return m.Node + " | " + strings.Join(m.Parents, ", ")
}

// Sample is the pooled data of both groups. Rows of X are records.
type Sample struct {
	X          *mat.Dense // n × p numeric features
	Comparison []bool     // true for the comparison group's records
	Labels     []float64  // 0/1 outcome
	Scores     []float64  // model probability in [0, 1]
	// ProbabilityCols lists the columns of X that hold probabilities in
	// [0, 1], such as the model's score when it is a node; nil means none.
	// The group classifiers read each as its clipped logit
	// (classify.Logit): when a model scores σ(η), the log density ratio of
	// the score given its parents is close to linear in η, not in σ(η).
	ProbabilityCols []int
	// Features, if non-nil, names every column of X (one name per
	// column, unique); a FitCache needs them to recognise a column set
	// under another graph, whose Sample may order its columns differently.
	Features []string
}

// Counts returns the number of reference and comparison records.
func (s *Sample) Counts() (nRef, nCmp int) {
	for _, c := range s.Comparison {
		if c {
			nCmp++
		} else {
			nRef++
		}
	}
	return
}

// Group names used in errors produced by this package.
const (
	GroupReference  = "reference"
	GroupComparison = "comparison"
)

// MetricError reports a metric that cannot be computed on one group, e.g.
// FPR in a group without negatives. Err wraps metrics.ErrUndefined.
type MetricError struct {
	Metric string
	Group  string // GroupReference or GroupComparison
	Err    error
}

func (e *MetricError) Error() string {
	return fmt.Sprintf("metric %s is undefined in the %s group: %v", e.Metric, e.Group, e.Err)
}

func (e *MetricError) Unwrap() error { return e.Err }
