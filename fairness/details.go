package fairness

import (
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/mat"

	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/metrics"
)

// Details holds the descriptive per-group data that the report shows beside
// the decomposition: confusion counts, reliability curves, and the two
// groups' distributions of every graph column. All of it is computed from
// the unweighted records of each group.
type Details struct {
	Threshold  float64         `json:"threshold"`
	Bins       int             `json:"bins"`
	Reference  GroupDetails    `json:"reference"`
	Comparison GroupDetails    `json:"comparison"`
	Columns    []ColumnDetails `json:"columns"` // in the Dataset's column order, then its Outside columns
}

// GroupDetails describes one group's records.
type GroupDetails struct {
	N         int              `json:"n"`
	Events    int              `json:"events"` // records with label 1
	Confusion ConfusionCounts  `json:"confusion"`
	Curve     []ReliabilityBin `json:"reliability"`
}

// ConfusionCounts are the confusion counts at the threshold: a record is a
// positive decision when its score is at least the threshold. They are
// float64 because the same shape carries weighted counts elsewhere.
type ConfusionCounts struct {
	TP float64 `json:"tp"`
	FP float64 `json:"fp"`
	TN float64 `json:"tn"`
	FN float64 `json:"fn"`
}

// ReliabilityBin is one non-empty equal-width score bin [Lower, Upper) (the
// last bin includes 1) of a reliability curve: its record count, mean score
// and event rate. A calibrated score has MeanScore ≈ EventRate.
type ReliabilityBin struct {
	Lower     float64 `json:"lower"`
	Upper     float64 `json:"upper"`
	Count     int     `json:"count"`
	MeanScore float64 `json:"mean_score"`
	EventRate float64 `json:"event_rate"`
}

// ColumnDetails compares the two groups' distributions of one column.
//
// For a numeric column, Edges are Bins+1 equal-width bin edges spanning the
// pooled minimum and maximum (the last bin is closed, like the others
// half-open [e_j, e_{j+1})), and Reference/Comparison hold each group's
// share of records per bin. For a categorical column, Levels name the
// levels and Reference/Comparison hold each group's share per level. A
// numeric column that takes at most two distinct values over both groups
// (a 0/1 indicator, the label) is Binary: it is described like a
// categorical one, its Levels being the values in ascending order
// (strconv 'g' form: "0", "1"), and keeps its numeric means, SDs and
// standardised difference. Columns described by levels carry each group's
// record count per level too (CountsReference, CountsComparison).
//
// StdDiff is the standardised difference, nil when it is undefined (both
// groups constant at different values). Numeric:
//
//	d = (mean_cmp − mean_ref) / sqrt((s²_ref + s²_cmp) / 2)
//
// with s² the sample variance (denominator n−1); d = 0 when both variances
// and the means are equal. Categorical with K levels, following Yang &
// Dalton (2012), "A unified approach to measuring the effect size between
// two groups using SAS" (SAS Global Forum paper 335-2012; cited from
// memory): with p_g the vector of group g's shares of levels 2..K and
// S_g = diag(p_g) − p_g p_gᵀ,
//
//	d = sqrt( (p_cmp − p_ref)ᵀ [(S_ref + S_cmp)/2]⁻¹ (p_cmp − p_ref) ),
//
// which is non-negative and, for two levels, equals the absolute value of
// the binary-proportion form |p_cmp − p_ref| / sqrt((p_ref(1−p_ref) +
// p_cmp(1−p_cmp))/2). A singular pooled covariance (a level present in only
// one group, with every other level absent from that group) leaves d
// undefined. |d| > 0.1 is a common practice flag for an imbalance worth a
// look (Austin 2009, Statistics in Medicine 28:3083; cited from memory).
type ColumnDetails struct {
	Name        string `json:"name"`
	Categorical bool   `json:"categorical"`
	// OutsideGraph marks a declared model input in no graph node
	// (Dataset.Outside); its missing values are left out of its shares.
	OutsideGraph bool `json:"outside_graph,omitempty"`
	// MissingReference and MissingComparison count each group's missing
	// values, left out of the shares and means: those of a column outside
	// the graph, or filled ones (missing: indicator).
	MissingReference  int `json:"missing_reference,omitempty"`
	MissingComparison int `json:"missing_comparison,omitempty"`
	// Binary marks a numeric column with at most two distinct values,
	// described by its values as levels.
	Binary     bool      `json:"binary,omitempty"`
	Edges      []float64 `json:"edges,omitempty"`
	Levels     []string  `json:"levels,omitempty"`
	Reference  []float64 `json:"reference"`
	Comparison []float64 `json:"comparison"`
	// CountsReference and CountsComparison are each group's records per
	// level, for columns described by levels (categorical or Binary).
	CountsReference  []int    `json:"counts_reference,omitempty"`
	CountsComparison []int    `json:"counts_comparison,omitempty"`
	MeanRef          float64  `json:"mean_reference,omitempty"`  // numeric and binary only
	MeanCmp          float64  `json:"mean_comparison,omitempty"` // numeric and binary only
	SDRef            float64  `json:"sd_reference,omitempty"`    // numeric and binary only
	SDCmp            float64  `json:"sd_comparison,omitempty"`   // numeric and binary only
	StdDiff          *float64 `json:"std_diff,omitempty"`
	// Outlying counts the values of a numeric column, over both groups,
	// outside its typical range (classify.TypicalRange of the pooled
	// values), which the logistic learners treat as the range's nearer
	// edge; Farthest is the most extreme of them. Both are absent when no
	// value is outlying.
	Outlying int      `json:"outlying_values,omitempty"`
	Farthest *float64 `json:"farthest_value,omitempty"`
}

// Describe computes the Details of ds: per group the confusion counts at
// threshold and the reliability curve over bins equal-width score bins
// (metrics.ConfusionAt and metrics.ReliabilityCurve without weights), and
// per column of ds the two groups' histograms over bins bins (numeric) or
// level shares and counts (categorical, and numeric columns of at most two
// values) with the standardised difference. It panics
// if bins < 1 or if the Dataset's slices differ in length (programmer
// errors; the loader guarantees consistent data). A group without records
// gets empty curves and shares and a nil StdDiff.
func Describe(ds *Dataset, threshold float64, bins int) *Details {
	if bins < 1 {
		panic("fairness: Describe needs bins >= 1")
	}
	n := len(ds.Comparison)
	if len(ds.Labels) != n || len(ds.Scores) != n {
		panic("fairness: Describe: Labels, Scores and Comparison differ in length")
	}
	for _, c := range append(append([]Column(nil), ds.Columns...), ds.Outside...) {
		if len(c.Values) != n {
			panic("fairness: Describe: column " + c.Name + " has the wrong length")
		}
	}
	d := &Details{Threshold: threshold, Bins: bins}
	d.Reference = describeGroup(ds, false, threshold, bins)
	d.Comparison = describeGroup(ds, true, threshold, bins)
	for _, c := range ds.Columns {
		d.Columns = append(d.Columns, describeColumn(ds, c, bins))
	}
	for _, c := range ds.Outside {
		cd := describeColumn(ds, c, bins)
		cd.OutsideGraph = true
		d.Columns = append(d.Columns, cd)
	}
	return d
}

// describeColumn splits column c by group, leaving out and counting
// missing values (NaN in columns outside the graph, Column.Missing in
// filled ones), and describes it.
func describeColumn(ds *Dataset, c Column, bins int) ColumnDetails {
	var ref, cmp []float64
	var missRef, missCmp int
	for i, v := range c.Values {
		missing := math.IsNaN(v) || (c.Missing != nil && c.Missing[i])
		switch {
		case missing && ds.Comparison[i]:
			missCmp++
		case missing:
			missRef++
		case ds.Comparison[i]:
			cmp = append(cmp, v)
		default:
			ref = append(ref, v)
		}
	}
	var cd ColumnDetails
	if c.Categorical {
		cd = describeCategorical(c.Name, c.Levels, ref, cmp)
	} else if values, ok := twoValues(ref, cmp); ok {
		cd = describeBinary(c.Name, values, ref, cmp, bins)
	} else {
		cd = describeNumeric(c.Name, ref, cmp, bins)
	}
	cd.MissingReference, cd.MissingComparison = missRef, missCmp
	return cd
}

// describeGroup returns the confusion counts, event count and reliability
// curve of the records in one group.
func describeGroup(ds *Dataset, comparison bool, threshold float64, bins int) GroupDetails {
	var labels, scores []float64
	for i, c := range ds.Comparison {
		if c == comparison {
			labels = append(labels, ds.Labels[i])
			scores = append(scores, ds.Scores[i])
		}
	}
	g := GroupDetails{N: len(labels), Curve: []ReliabilityBin{}}
	for _, y := range labels {
		if y == 1 {
			g.Events++
		}
	}
	cm := metrics.ConfusionAt(labels, scores, threshold, nil)
	g.Confusion = ConfusionCounts{TP: cm.TP, FP: cm.FP, TN: cm.TN, FN: cm.FN}
	if len(labels) == 0 {
		return g
	}
	for _, b := range metrics.ReliabilityCurve(labels, scores, bins, nil) {
		g.Curve = append(g.Curve, ReliabilityBin{Lower: b.Lower, Upper: b.Upper, Count: b.Count, MeanScore: b.MeanScore, EventRate: b.EventRate})
	}
	return g
}

// Columns whose largest magnitude exceeds hugeMagnitude are described in
// units of 2^600 (an exact rescaling), so that spans, sums and squares of
// finite values stay finite.
const (
	hugeMagnitude = 0x1p500
	hugeUnit      = 0x1p600
)

// describeNumeric builds the shared-edge histograms and the standardised
// mean difference of a numeric column. A column with a value beyond
// ±hugeMagnitude is described in units of hugeUnit and the edges, means
// and standard deviations converted back, so that every number is finite;
// otherwise the arithmetic is that of describeScaled alone.
func describeNumeric(name string, ref, cmp []float64, bins int) ColumnDetails {
	c := describeMagnitude(name, ref, cmp, bins)
	c.Outlying, c.Farthest = outlying(ref, cmp)
	return c
}

// outlying counts the values of ref and cmp outside the typical range of
// their pooled values and returns the one farthest from that range.
func outlying(ref, cmp []float64) (int, *float64) {
	pooled := append(append([]float64(nil), ref...), cmp...)
	lo, hi := classify.TypicalRange(pooled, nil)
	n, far, dist := 0, 0.0, 0.0
	for _, v := range pooled {
		d := max(lo-v, v-hi)
		if d > 0 {
			n++
			if d >= dist {
				far, dist = v, d
			}
		}
	}
	if n == 0 {
		return 0, nil
	}
	return n, &far
}

// describeMagnitude is describeNumeric without the outlying values.
func describeMagnitude(name string, ref, cmp []float64, bins int) ColumnDetails {
	unit := 1.0
	for _, xs := range [][]float64{ref, cmp} {
		for _, v := range xs {
			if math.Abs(v) > hugeMagnitude {
				unit = hugeUnit
			}
		}
	}
	if unit == 1 {
		return describeScaled(name, ref, cmp, bins)
	}
	scaled := func(xs []float64) []float64 {
		out := make([]float64, len(xs))
		for i, v := range xs {
			out[i] = v / unit
		}
		return out
	}
	c := describeScaled(name, scaled(ref), scaled(cmp), bins)
	for j := range c.Edges {
		c.Edges[j] *= unit
	}
	c.MeanRef, c.MeanCmp = c.MeanRef*unit, c.MeanCmp*unit
	c.SDRef, c.SDCmp = c.SDRef*unit, c.SDCmp*unit
	return c
}

// describeScaled is describeNumeric for a column of moderate magnitude.
func describeScaled(name string, ref, cmp []float64, bins int) ColumnDetails {
	c := ColumnDetails{Name: name}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, xs := range [][]float64{ref, cmp} {
		for _, v := range xs {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if lo > hi { // no records at all
		c.Reference, c.Comparison = []float64{}, []float64{}
		return c
	}
	c.Edges = make([]float64, bins+1)
	for j := range c.Edges {
		c.Edges[j] = lo + (hi-lo)*float64(j)/float64(bins)
	}
	c.Edges[bins] = hi
	c.Reference = histogramShares(ref, lo, hi, bins)
	c.Comparison = histogramShares(cmp, lo, hi, bins)
	var vr, vc float64
	c.MeanRef, vr = meanVar(ref)
	c.MeanCmp, vc = meanVar(cmp)
	c.SDRef, c.SDCmp = math.Sqrt(vr), math.Sqrt(vc)
	if len(ref) == 0 || len(cmp) == 0 {
		return c
	}
	pooled := math.Sqrt((vr + vc) / 2)
	switch {
	case pooled > 0:
		c.StdDiff = ptrTo((c.MeanCmp - c.MeanRef) / pooled)
	case c.MeanCmp == c.MeanRef:
		c.StdDiff = ptrTo(0)
	}
	return c
}

// histogramShares returns the share of xs in each of bins equal-width bins
// over [lo, hi], the last bin closed; a constant column (lo = hi) puts
// every record in the first bin.
func histogramShares(xs []float64, lo, hi float64, bins int) []float64 {
	out := make([]float64, bins)
	if len(xs) == 0 {
		return out
	}
	for _, v := range xs {
		j := 0
		if hi > lo {
			j = int((v - lo) / (hi - lo) * float64(bins))
		}
		if j >= bins {
			j = bins - 1
		}
		out[j]++
	}
	for j := range out {
		out[j] /= float64(len(xs))
	}
	return out
}

// meanVar returns the mean and the sample variance (denominator n−1, zero
// for fewer than two values).
func meanVar(xs []float64) (mean, variance float64) {
	if len(xs) == 0 {
		return 0, 0
	}
	for _, v := range xs {
		mean += v
	}
	mean /= float64(len(xs))
	if len(xs) < 2 {
		return mean, 0
	}
	for _, v := range xs {
		variance += (v - mean) * (v - mean)
	}
	return mean, variance / float64(len(xs)-1)
}

// describeCategorical builds the level shares and the multinomial
// standardised difference of a categorical column whose values are level
// indices into levels.
func describeCategorical(name string, levels []string, ref, cmp []float64) ColumnDetails {
	c := ColumnDetails{Name: name, Categorical: true, Levels: levels}
	c.Reference, c.CountsReference = levelShares(ref, len(levels))
	c.Comparison, c.CountsComparison = levelShares(cmp, len(levels))
	if len(ref) == 0 || len(cmp) == 0 {
		return c
	}
	k := len(levels) - 1
	if k < 1 {
		c.StdDiff = ptrTo(0)
		return c
	}
	diff := mat.NewVecDense(k, nil)
	pooled := mat.NewSymDense(k, nil)
	for a := 0; a < k; a++ {
		pr, pc := c.Reference[a+1], c.Comparison[a+1]
		diff.SetVec(a, pc-pr)
		for b := a; b < k; b++ {
			qr, qc := c.Reference[b+1], c.Comparison[b+1]
			v := -(pr*qr + pc*qc) / 2
			if a == b {
				v += (pr + pc) / 2
			}
			pooled.SetSym(a, b, v)
		}
	}
	var chol mat.Cholesky
	if !chol.Factorize(pooled) {
		return c
	}
	var x mat.VecDense
	if err := chol.SolveVecTo(&x, diff); err != nil {
		return c
	}
	c.StdDiff = ptrTo(math.Sqrt(math.Max(0, mat.Dot(diff, &x))))
	return c
}

// levelShares returns the share and the count of each level index among
// xs.
func levelShares(xs []float64, levels int) ([]float64, []int) {
	out, counts := make([]float64, levels), make([]int, levels)
	for _, v := range xs {
		counts[int(v)]++
	}
	if len(xs) == 0 {
		return out, counts
	}
	for j := range out {
		out[j] = float64(counts[j]) / float64(len(xs))
	}
	return out, counts
}

// twoValues returns the distinct values of ref and cmp in ascending order
// when there are one or two; ok is false for none or more than two.
func twoValues(ref, cmp []float64) (values []float64, ok bool) {
	for _, xs := range [][]float64{ref, cmp} {
		for _, v := range xs {
			if !slices.Contains(values, v) {
				if len(values) == 2 {
					return nil, false
				}
				values = append(values, v)
			}
		}
	}
	slices.Sort(values)
	return values, len(values) > 0
}

// describeBinary describes a numeric column whose only values are values
// (one or two, ascending): its numeric summaries (describeNumeric), with
// the histogram replaced by each value's share and count per group.
func describeBinary(name string, values, ref, cmp []float64, bins int) ColumnDetails {
	c := describeNumeric(name, ref, cmp, bins)
	c.Binary, c.Edges = true, nil
	c.Levels = make([]string, len(values))
	for j, v := range values {
		c.Levels[j] = strconv.FormatFloat(v, 'g', -1, 64)
	}
	index := func(xs []float64) []float64 {
		out := make([]float64, len(xs))
		for i, v := range xs {
			out[i] = float64(slices.Index(values, v))
		}
		return out
	}
	c.Reference, c.CountsReference = levelShares(index(ref), len(values))
	c.Comparison, c.CountsComparison = levelShares(index(cmp), len(values))
	return c
}

func ptrTo(v float64) *float64 { return &v }
