package fairness

// Data preparation shared by Run and Plan: loading, encoding the graph
// columns, and the mapping of an undefined metric to its input error.

import (
	"errors"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/metrics"
)

// prepare loads the data named by spec (LoadData), checks the level names of its
// names key against the data (levelNames) and encodes the graph columns
// for attribution. Whether every metric has a value in both groups is checked
// once, by the first step that needs the observed metrics: Decompose in
// Run, observeMetrics in Plan; decomposeError maps the error for both.
func prepare(spec *Spec) (*Dataset, *attribution.Sample, []attribution.Mechanism, error) {
	return prepareWith(spec, LoadData)
}

// prepareWith is prepare with the data loaded by load.
func prepareWith(spec *Spec, load func(*Spec) (*Dataset, error)) (*Dataset, *attribution.Sample, []attribution.Mechanism, error) {
	d, err := load(spec)
	if err != nil {
		return nil, nil, nil, err
	}
	if d.levelNames, err = levelNames(spec, d); err != nil {
		return nil, nil, nil, err
	}
	sample, mechs := encode(spec, d)
	return d, sample, mechs, nil
}

// decomposeError names the group's value in an *attribution.MetricError
// (which only knows "reference" or "comparison"); other errors pass through.
func decomposeError(spec *Spec, err error) error {
	var me *attribution.MetricError
	if errors.As(err, &me) {
		return undefinedMetric(spec, me.Metric, me.Group == attribution.GroupComparison)
	}
	return err
}

// groupInfo summarises the groups of a loaded dataset.
func groupInfo(spec *Spec, d *Dataset) GroupInfo {
	nRef, nCmp := d.Counts()
	return GroupInfo{
		Column:            spec.Groups.Column,
		Reference:         spec.Groups.Reference,
		Comparison:        spec.Groups.Comparison,
		Columns:           combinedColumns(spec.Groups),
		Bands:             append([]GroupBands(nil), spec.Groups.Bands...),
		NReference:        nRef,
		NComparison:       nCmp,
		EventsReference:   events(d, false),
		EventsComparison:  events(d, true),
		DroppedReference:  d.DroppedReference,
		DroppedComparison: d.DroppedComparison,
		Excluded:          append([]ExcludedValue{}, d.Excluded...),
		ExcludedRows:      d.ExcludedRows,
		MissingGroupRows:  d.MissingGroupRows,
	}
}

// events counts the records with label 1 in one group.
func events(d *Dataset, comparison bool) int {
	n := 0
	for i, y := range d.Labels {
		if y == 1 && d.Comparison[i] == comparison {
			n++
		}
	}
	return n
}

// metricBasis returns how many records of each group the metric rests on
// (metrics.Fact.Basis).
func metricBasis(spec *Spec, d *Dataset, metric string) (ref, cmp int) {
	f, _ := metrics.FactOf(metric)
	var ys, ss [2][]float64
	for i, y := range d.Labels {
		g := 0
		if d.Comparison[i] {
			g = 1
		}
		ys[g], ss[g] = append(ys[g], y), append(ss[g], d.Scores[i])
	}
	return f.Basis(ys[0], ss[0], spec.Threshold), f.Basis(ys[1], ss[1], spec.Threshold)
}

// encode builds the attribution sample and one mechanism per graph node.
// The feature matrix X has one column per numeric graph column and one 0/1
// column per level of a categorical column (x = [level = ℓ]), in the order
// of Dataset.Columns; a numeric column with filled missing values
// (missing: indicator) is followed by its 0/1 missingness indicator, which
// thus belongs to the column's node and so to that node's mechanism.
// A mechanism's NodeCols are the feature columns of the
// node's data columns and its ParentCols those of its parents, in the order
// the parents are listed. The value columns of Spec.ProbabilityColumns
// (the score when it is a node, and columns declared under probabilities)
// are the sample's ProbabilityCols: X keeps the probabilities, and the
// group classifiers read them as clipped logits (classify.Logit), since a
// density ratio of a score σ(η) is close to linear in η.
func encode(spec *Spec, d *Dataset) (*attribution.Sample, []attribution.Mechanism) {
	n := len(d.Labels)
	cols, features := featureLayout(d)
	p := len(features)
	x := mat.NewDense(n, max(p, 1), nil)
	for _, c := range d.Columns {
		idx := cols[c.Name]
		for i, v := range c.Values {
			if c.Categorical {
				x.Set(i, idx[int(v)], 1)
			} else {
				x.Set(i, idx[0], v)
			}
			if c.Missing != nil && c.Missing[i] {
				x.Set(i, idx[1], 1)
			}
		}
	}
	mechs := graphMechanisms(spec.Graph, cols)
	sample := &attribution.Sample{
		X:          x,
		Comparison: append([]bool(nil), d.Comparison...),
		Labels:     append([]float64(nil), d.Labels...),
		Scores:     append([]float64(nil), d.Scores...),
		Features:   features,
	}
	for _, c := range spec.ProbabilityColumns() {
		sample.ProbabilityCols = append(sample.ProbabilityCols, cols[c][0])
	}
	return sample, mechs
}

// featureLayout maps every data column of d to its columns in the
// feature matrix (encode) and names each feature column: a numeric
// column's name, name␟level for a categorical level, name␟missing for a
// missingness indicator (␟ the unit separator, which no column name
// holds). It depends on d alone, not on the graph.
func featureLayout(d *Dataset) (cols map[string][]int, features []string) {
	cols = map[string][]int{}
	for _, c := range d.Columns {
		names := []string{c.Name}
		if c.Categorical {
			names = names[:0]
			for _, l := range c.Levels {
				names = append(names, c.Name+"\x1f"+l)
			}
		}
		if c.Missing != nil {
			names = append(names, c.Name+"\x1fmissing") // the missingness indicator, after the value
		}
		for _, f := range names {
			cols[c.Name] = append(cols[c.Name], len(features))
			features = append(features, f)
		}
	}
	return cols, features
}

// graphMechanisms returns one mechanism per node of graph over the
// feature columns cols (featureLayout): its NodeCols are the features of
// the node's data columns, its ParentCols those of its parents in the
// order the parents are listed.
func graphMechanisms(graph []NodeSpec, cols map[string][]int) []attribution.Mechanism {
	nodeCols := map[string][]int{}
	for _, node := range graph {
		for _, c := range node.Columns {
			nodeCols[node.Node] = append(nodeCols[node.Node], cols[c]...)
		}
	}
	mechs := make([]attribution.Mechanism, len(graph))
	for i, node := range graph {
		m := attribution.Mechanism{Node: node.Node, Parents: append([]string(nil), node.Parents...), NodeCols: nodeCols[node.Node]}
		for _, par := range node.Parents {
			m.ParentCols = append(m.ParentCols, nodeCols[par]...)
		}
		mechs[i] = m
	}
	return mechs
}

// observeMetrics computes every metric on each group's records
// (attribution.Observe) and turns a metric without a value into a
// *MetricUndefinedError naming the group's value (decomposeError).
func observeMetrics(spec *Spec, s *attribution.Sample) error {
	_, err := attribution.Observe(s, spec.Metrics, spec.Threshold, spec.ECEBins)
	return decomposeError(spec, err)
}

// undefinedMetric builds the error for metric name in one group; the
// reason is that of the metric's row in the facts table (metrics.FactOf).
func undefinedMetric(spec *Spec, name string, comparison bool) *MetricUndefinedError {
	g := spec.Groups.Reference
	if comparison {
		g = spec.Groups.Comparison
	}
	f, _ := metrics.FactOf(name)
	return &MetricUndefinedError{Metric: name, Group: g, Column: spec.Groups.Column, Reason: f.UndefinedReason()}
}
