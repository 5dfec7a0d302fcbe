package fairness

import (
	"math"

	"github.com/gapwise/gapwise/metrics"
)

// MissingLevel is the level a missing value of a categorical graph column
// takes with missing: indicator, so that the column's one-hot coding
// carries its own missingness indicator.
const MissingLevel = "(missing)"

// Outcomes are the labels and scores of a set of records with their
// groups.
type Outcomes struct {
	Labels, Scores []float64
	Comparison     []bool
}

func (o *Outcomes) add(label, score float64, comparison bool) {
	o.Labels = append(o.Labels, label)
	o.Scores = append(o.Scores, score)
	o.Comparison = append(o.Comparison, comparison)
}

// group returns the labels and scores of one group.
func (o *Outcomes) group(comparison bool) (labels, scores []float64) {
	for i, c := range o.Comparison {
		if c == comparison {
			labels, scores = append(labels, o.Labels[i]), append(scores, o.Scores[i])
		}
	}
	return labels, scores
}

// columnError is a problem with a whole column.
type columnError struct {
	column string
	err    error
}

// fillMissing replaces, with missing: indicator, each missing value (NaN)
// of a numeric graph column by the mean of the column's observed values
// over both groups, and marks it in Column.Missing. The fill is neutral
// only in the sense that the indicator feature, which encode adds beside
// the column, lets the group classifiers model missingness on its own
// (the missing-indicator method; Groenwold et al. 2012, CMAJ 184:1265,
// from memory, discuss when it biases regression estimates; here it only
// describes how the groups differ). A column without any observed value is
// refused.
func fillMissing(d *Dataset) *columnError {
	for j := range d.Columns {
		c := &d.Columns[j]
		if c.Categorical {
			continue
		}
		sum, n := 0.0, 0
		for _, v := range c.Values {
			if !math.IsNaN(v) {
				sum, n = sum+v, n+1
			}
		}
		if n == len(c.Values) {
			continue
		}
		if n == 0 {
			return &columnError{c.Name, wrapf(ErrMissingValue, "every value is missing in the audited rows")}
		}
		c.Missing = make([]bool, len(c.Values))
		for i, v := range c.Values {
			if math.IsNaN(v) {
				c.Values[i], c.Missing[i] = sum/float64(n), true
			}
		}
	}
	return nil
}

// missingShares returns the share of each group's audited rows that were
// dropped for missing values, and the two-proportion z statistic of their
// difference (pooled standard error; common practice).
func missingShares(g GroupInfo) (ref, cmp, z float64) {
	nr, nc := float64(g.NReference+g.DroppedReference), float64(g.NComparison+g.DroppedComparison)
	if nr == 0 || nc == 0 {
		return 0, 0, 0
	}
	ref, cmp = float64(g.DroppedReference)/nr, float64(g.DroppedComparison)/nc
	p := float64(g.DroppedReference+g.DroppedComparison) / (nr + nc)
	se := math.Sqrt(p * (1 - p) * (1/nr + 1/nc))
	if se == 0 {
		return ref, cmp, 0
	}
	return ref, cmp, (cmp - ref) / se
}

// AllRecords is a metric on every audited record with its label and
// score present (Dataset.Complete): what the gap was before rows were
// dropped for missing values in graph columns.
type AllRecords struct {
	Reference   float64 `json:"reference"`
	Comparison  float64 `json:"comparison"`
	Gap         float64 `json:"gap"`
	NReference  int     `json:"n_reference"`
	NComparison int     `json:"n_comparison"`
}

// allRecords computes metric on the complete outcomes (metrics.Compute
// without weights), or returns nil when there are none or the metric is
// undefined in a group.
func allRecords(spec *Spec, o *Outcomes, metric string) *AllRecords {
	if o == nil {
		return nil
	}
	ry, rs := o.group(false)
	cy, cs := o.group(true)
	ref, err1 := metrics.Compute(metric, ry, rs, spec.Threshold, spec.ECEBins, nil)
	cmp, err2 := metrics.Compute(metric, cy, cs, spec.Threshold, spec.ECEBins, nil)
	if err1 != nil || err2 != nil {
		return nil
	}
	return &AllRecords{Reference: ref, Comparison: cmp, Gap: cmp - ref, NReference: len(ry), NComparison: len(cy)}
}
