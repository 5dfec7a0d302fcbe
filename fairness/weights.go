package fairness

import (
	"fmt"
	"math"

	"github.com/gapwise/gapwise/attribution"
)

// Directions of record weights (WeightsOptions.Toward): the group whose
// mechanism the weighted records are made to follow.
const (
	TowardComparison = "comparison" // reweight reference records
	TowardReference  = "reference"  // reweight comparison records
)

// WeightsOptions selects the mechanism and direction of Weights.
type WeightsOptions struct {
	Node    string // graph node whose mechanism the weights move
	Toward  string // TowardComparison (default when "") or TowardReference
	Workers int    // goroutines for the classifiers; 0 means GOMAXPROCS
}

// RecordWeights are per-record weights that make the source group's
// records follow the target group's mechanism of one node.
type RecordWeights struct {
	Node      string // the node
	Mechanism string // "node | parents"
	Toward    string // TowardComparison or TowardReference
	// Source and Target are the group values of the reweighted group and
	// of the group whose mechanism it is made to follow.
	Source, Target string
	// Lines are the 1-based CSV lines (Parquet rows) of the source group's
	// records; Weights and Clipped are in the same order.
	Lines   []int
	Weights []float64 // mean 1 over the source group's records
	Clipped []bool    // log-ratio raised or lowered by clip_ratios
	// ESS is Kish's effective sample size (Σw)²/Σw² of Weights.
	ESS        float64
	NClipped   int
	ClipRatios float64 // the spec's clip_ratios (0: none)
	// Learner and ParentLearner are the classifiers chosen for
	// (node, parents) and for the parents (attribution.PriorLearner for a
	// root).
	Learner, ParentLearner string
}

// Weights loads the data of spec and returns the weights of the source
// group's records that carry node i's mechanism to the target group's
// (Zhang et al. 2023, "Why did the model fail?": Attributing model
// performance changes to distribution shifts, ICML 2023): towards the
// comparison group, reference record r gets
//
//	w_r ∝ r_i(x_r) = P_cmp(x_i | pa_i) / P_ref(x_i | pa_i),
//
// towards the reference group, comparison record r gets w_r ∝ 1/r_i(x_r),
// with the cross-fitted log-ratios of attribution.EstimateRatios (spec
// keys folds, seed, classifier) clipped as the decomposition clips them
// (clip_ratios, over the source group's records) — see MechanismWeights.
// The other mechanisms, the parents' distribution among them, are left
// as the source group has them. An unknown node is a *SpecError.
func Weights(spec *Spec, opt WeightsOptions) (*RecordWeights, error) {
	toward := opt.Toward
	if toward == "" {
		toward = TowardComparison
	}
	if toward != TowardComparison && toward != TowardReference {
		return nil, fmt.Errorf("fairness: weights toward %q: want %s or %s", toward, TowardComparison, TowardReference)
	}
	idx := -1
	for i, n := range spec.Graph {
		if n.Node == opt.Node {
			idx = i
		}
	}
	if idx < 0 {
		return nil, specErr(spec.File, spec.KeyLine("graph"), "graph", ErrBadValue, "no node %s in the graph", opt.Node)
	}
	d, sample, mechs, err := prepare(spec)
	if err != nil {
		return nil, err
	}
	learners, ok := candidateLearners(spec.Classifier)
	if !ok {
		return nil, specErr(spec.File, spec.KeyLine("classifier"), "classifier", ErrClassifierUnavailable, "classifier %s is not available", spec.Classifier)
	}
	ropt := attribution.RatioOptions{Folds: spec.Folds, Seed: spec.Seed, Learners: learners, Workers: opt.Workers}
	mw, err := MechanismWeights(sample, mechs[idx], toward == TowardComparison, spec.ClipRatios, ropt)
	if err != nil {
		return nil, err
	}
	rw := &RecordWeights{
		Node: opt.Node, Mechanism: mechs[idx].Label(), Toward: toward,
		Source: spec.Groups.Reference, Target: spec.Groups.Comparison,
		Weights: mw.Weights, Clipped: mw.Clipped, ESS: mw.ESS, NClipped: mw.NClipped,
		ClipRatios: spec.ClipRatios, Learner: mw.Learner, ParentLearner: mw.ParentLearner,
	}
	if toward == TowardReference {
		rw.Source, rw.Target = rw.Target, rw.Source
	}
	for _, r := range mw.Records {
		rw.Lines = append(rw.Lines, d.Lines[r])
	}
	return rw, nil
}

// SampleWeights are the weights of MechanismWeights: Records are the
// indices in the Sample of the source group's records, in order, and
// Weights, Clipped the weight and clipping flag of each.
type SampleWeights struct {
	Records                []int
	Weights                []float64
	Clipped                []bool
	ESS                    float64
	NClipped               int
	Learner, ParentLearner string
}

// MechanismWeights estimates m's log density ratio log r at every record
// (attribution.EstimateRatios: out-of-fold logit P(cmp | node, parents) −
// logit P(cmp | parents), the parents' term the prior odds for a root) and
// returns weights of the source group's records: the reference records
// with w ∝ r when towardComparison, the comparison records with w ∝ 1/r
// otherwise. With clip in (0, 1) the source group's log-ratios are first
// clipped to their central interval of probability clip
// (attribution.ClipAtQuantiles), as the decomposition clips each side's.
// The weights are scaled to mean 1 over the source records, so Σw is their
// number, and ESS = (Σw)²/Σw² (Kish 1965, Survey Sampling, §11.7).
func MechanismWeights(s *attribution.Sample, m attribution.Mechanism, towardComparison bool, clip float64, ropt attribution.RatioOptions) (*SampleWeights, error) {
	mrs, err := attribution.EstimateRatios(s, []attribution.Mechanism{m}, ropt)
	if err != nil {
		return nil, err
	}
	mr := mrs[0]
	out := &SampleWeights{Learner: mr.Learner, ParentLearner: mr.ParentLearner}
	sign := 1.0
	if !towardComparison {
		sign = -1
	}
	var logw []float64
	for r, cmp := range s.Comparison {
		if cmp != towardComparison {
			out.Records = append(out.Records, r)
			logw = append(logw, sign*mr.LogRatio[r])
		}
	}
	raw := logw
	if clip != 0 {
		if logw, out.NClipped, err = attribution.ClipAtQuantiles(raw, clip); err != nil {
			return nil, err
		}
	}
	top := math.Inf(-1)
	for _, v := range logw {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("fairness: mechanism %s: log density ratio %v is not finite", m.Label(), v)
		}
		top = math.Max(top, v)
	}
	out.Weights = make([]float64, len(logw))
	out.Clipped = make([]bool, len(logw))
	sum, sq := 0.0, 0.0
	for a, v := range logw {
		out.Weights[a] = math.Exp(v - top) // ≤ 1: no overflow
		out.Clipped[a] = v != raw[a]
		sum += out.Weights[a]
	}
	scale := float64(len(logw)) / sum
	for a := range out.Weights {
		out.Weights[a] *= scale
		sq += out.Weights[a] * out.Weights[a]
	}
	if len(logw) > 0 {
		out.ESS = float64(len(logw)) * float64(len(logw)) / sq
	}
	return out, nil
}

// NodeNames lists the graph's nodes in spec order, e.g. for the
// did-you-mean of an unknown one.
func (s *Spec) NodeNames() []string {
	names := make([]string, len(s.Graph))
	for i, n := range s.Graph {
		names[i] = n.Node
	}
	return names
}
