package fairness

import (
	"errors"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/metrics"
)

// PlanInfo describes what an audit would estimate, without fitting
// anything: it is what `gapwise check` prints.
type PlanInfo struct {
	Title      string
	Synthetic  bool
	Label      string
	Score      string
	Threshold  float64
	Groups     GroupInfo
	Metrics    []string
	Nodes      []PlanNode // in spec order
	Features   int        // columns of the encoded feature matrix
	Classifier string
	Learners   []string // candidate learners per mechanism
	Folds      int
	Warnings   []Warning // problems visible before fitting, e.g. dropped rows
}

// PlanNode is one mechanism of the plan.
type PlanNode struct {
	Node      string
	Mechanism string // "node | parent1, parent2"
	Parents   []string
	Columns   []string // data columns of the node
	Features  int      // encoded feature columns of the node (one per level for a categorical column)
}

// Plan loads the data named by spec and checks everything an audit needs
// before any fitting: the data file, every column, the groups, and that
// every metric has a value in both groups. Errors are input errors (see
// IsInputError).
func Plan(spec *Spec) (*PlanInfo, error) {
	d, sample, mechs, err := prepare(spec)
	if err != nil {
		return nil, err
	}
	learners, _ := candidateLearners(spec.Classifier)
	info := &PlanInfo{
		Title:      spec.Title,
		Synthetic:  spec.Synthetic,
		Label:      spec.Label,
		Score:      spec.Score,
		Threshold:  spec.Threshold,
		Groups:     groupInfo(spec, d),
		Metrics:    append([]string(nil), spec.Metrics...),
		Features:   sample.X.RawMatrix().Cols,
		Classifier: spec.Classifier,
		Learners:   classify.NamesOf(learners),
		Folds:      spec.Folds,
		Warnings:   droppedWarnings(groupInfo(spec, d)),
	}
	for i, n := range spec.Graph {
		info.Nodes = append(info.Nodes, PlanNode{
			Node:      n.Node,
			Mechanism: mechs[i].Label(),
			Parents:   append([]string{}, n.Parents...),
			Columns:   append([]string(nil), n.Columns...),
			Features:  len(mechs[i].NodeCols),
		})
	}
	return info, nil
}

// groupInfo summarises the groups of a loaded dataset.
func groupInfo(spec *Spec, d *Dataset) GroupInfo {
	nRef, nCmp := d.Counts()
	return GroupInfo{
		Column:            spec.Groups.Column,
		Reference:         spec.Groups.Reference,
		Comparison:        spec.Groups.Comparison,
		NReference:        nRef,
		NComparison:       nCmp,
		DroppedReference:  d.DroppedReference,
		DroppedComparison: d.DroppedComparison,
	}
}

// encode builds the attribution sample and one mechanism per graph node.
// The feature matrix X has one column per numeric graph column and one 0/1
// column per level of a categorical column (x = [level = ℓ]), in the order
// of Dataset.Columns. A mechanism's NodeCols are the feature columns of the
// node's data columns and its ParentCols those of its parents, in the order
// the parents are listed.
func encode(spec *Spec, d *Dataset) (*attribution.Sample, []attribution.Mechanism) {
	n := len(d.Labels)
	p := 0
	cols := map[string][]int{}
	for _, c := range d.Columns {
		width := 1
		if c.Categorical {
			width = len(c.Levels)
		}
		for k := 0; k < width; k++ {
			cols[c.Name] = append(cols[c.Name], p+k)
		}
		p += width
	}
	x := mat.NewDense(n, max(p, 1), nil)
	for _, c := range d.Columns {
		idx := cols[c.Name]
		for i, v := range c.Values {
			if c.Categorical {
				x.Set(i, idx[int(v)], 1)
			} else {
				x.Set(i, idx[0], v)
			}
		}
	}
	nodeCols := map[string][]int{}
	for _, node := range spec.Graph {
		for _, c := range node.Columns {
			nodeCols[node.Node] = append(nodeCols[node.Node], cols[c]...)
		}
	}
	mechs := make([]attribution.Mechanism, len(spec.Graph))
	for i, node := range spec.Graph {
		m := attribution.Mechanism{Node: node.Node, Parents: append([]string(nil), node.Parents...), NodeCols: nodeCols[node.Node]}
		for _, par := range node.Parents {
			m.ParentCols = append(m.ParentCols, nodeCols[par]...)
		}
		mechs[i] = m
	}
	sample := &attribution.Sample{
		X:          x,
		Comparison: append([]bool(nil), d.Comparison...),
		Labels:     append([]float64(nil), d.Labels...),
		Scores:     append([]float64(nil), d.Scores...),
	}
	return sample, mechs
}

// checkMetricsDefined computes every metric on each group's records and
// turns a metric without a value into a *MetricUndefinedError naming the
// group's value.
func checkMetricsDefined(spec *Spec, d *Dataset) error {
	for _, cmp := range []bool{false, true} {
		var y, s []float64
		for i, c := range d.Comparison {
			if c == cmp {
				y = append(y, d.Labels[i])
				s = append(s, d.Scores[i])
			}
		}
		for _, name := range spec.Metrics {
			if _, err := metrics.Compute(name, y, s, spec.Threshold, spec.ECEBins, nil); err != nil {
				if errors.Is(err, metrics.ErrUndefined) {
					return undefinedMetric(spec, name, cmp)
				}
				return err
			}
		}
	}
	return nil
}

// undefinedMetric builds the error for metric name in one group.
func undefinedMetric(spec *Spec, name string, comparison bool) *MetricUndefinedError {
	g := spec.Groups.Reference
	if comparison {
		g = spec.Groups.Comparison
	}
	return &MetricUndefinedError{Metric: name, Group: g, Column: spec.Groups.Column, Reason: undefinedReason(name)}
}

// undefinedReason says what a group lacks when metric name has no value:
// the denominator of each metric (see metrics.Confusion.Rate).
func undefinedReason(name string) string {
	switch name {
	case metrics.NameFPR:
		return "it has no negatives"
	case metrics.NameTPR, metrics.NameFNR:
		return "it has no positives"
	case metrics.NamePPV:
		return "no record is decided positive at this threshold"
	case metrics.NameNPV:
		return "no record is decided negative at this threshold"
	case metrics.NameAUC:
		return "it needs both positives and negatives"
	}
	return "it has no records"
}
