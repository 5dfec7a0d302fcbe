package fairness

import (
	"fmt"
	"github.com/gapwise/gapwise/attribution"
	"math"
	"strconv"
	"strings"
)

// Thresholds above which Warnings speaks up. They live here only: the
// reports judge nothing themselves, they read the warnings and the
// Reliability verdicts (and quote WarnESSShare in their wording).
const (
	// WarnESSShare and WarnESSMin: a mechanism's effective sample size
	// n_eff = (Σw)²/Σw² below WarnESSShare·n_reference or below WarnESSMin
	// records: with n_eff under a tenth of n, a few records carry the
	// estimate. Both cut-offs are common practice in importance sampling
	// diagnostics, not derived bounds.
	WarnESSShare = 0.10
	WarnESSMin   = 100
	// WarnMaxShare: one record carries more than this share of Σw.
	WarnMaxShare = 0.05
	// WarnMeanRatioLow/High: the mean of r_i over the reference records,
	// which is 1 when the ratios are right, falls outside this range.
	WarnMeanRatioLow  = 0.9
	WarnMeanRatioHigh = 1.1
	// WarnResidualShare and WarnResidualMin: |residual| exceeds both this
	// share of |gap| and this absolute amount.
	WarnResidualShare = 0.25
	WarnResidualMin   = 0.005
	// WarnAUC: the out-of-fold AUC of a mechanism's group classifier is at
	// least this, so the groups barely overlap on it.
	WarnAUC = 0.95
	// WarnExtremeShare: more than this share of the records of the side(s)
	// that estimate the hybrids carry a weight above 20 for a mechanism.
	WarnExtremeShare = 0.01
	// WarnStratumLow/High: the mean ratio in some fifth of the reference
	// records (grouped by the parents) falls outside this range.
	WarnStratumLow  = 0.8
	WarnStratumHigh = 1.25
	// WarnSidesZ and WarnSidesZUnreliable: the two sides' estimates of a
	// metric differ somewhere by more than this many standard errors
	// (attribution.SideAgreement.MaxZ). The standard errors hold the
	// fitted ratios fixed, so the threshold was calibrated on simulated
	// clean draws rather than taken from the normal distribution; see the
	// README's accuracy section for the false-alarm and detection rates.
	WarnSidesZ           = 4.0
	WarnSidesZUnreliable = 8.0
	// WarnSplitShare and WarnSplitMin: a contribution's seed noise, the
	// standard error SplitSD/√R of the mean over R fold splits, exceeds
	// WarnSplitShare of its interval's half-width; without intervals, both
	// WarnSplitShare·|value| and WarnSplitMin. At 0.3 half-widths, ten
	// reruns with other seeds would spread over about the half-width (the
	// range of ten normal draws is about 3.1 standard deviations; common
	// practice).
	WarnSplitShare = 0.3
	WarnSplitMin   = 0.005
)

// Warnings lists the problems a reader of r should know about, in a fixed
// order: dropped rows and group values resembling a chosen one; metrics
// resting on few records and small groups; model inputs outside the
// graph; then per mechanism in graph order its overlap (AUC,
// extreme ratios), effective sample size, heavy tail, largest weight
// share, mean ratio overall and per stratum of the parents, and clipping;
// then per side of estimation its worst hybrid; then per metric its
// effective records, a large residual and disagreeing sides; then the
// contributions that depend on the fold split; last, failed bootstrap
// replicates (r.Settings.Intervals.Failed). The result is never nil.
//
// Effective sample sizes are judged on the side(s) that estimate the
// hybrids (Settings.EstimateFrom); with both sides, only when both are low,
// since the combination leans on the better one. Each check's kind and
// severity are listed with the Kind… constants.
func Warnings(r *Result) []Warning {
	words := r.Suppression.words
	out := append(dataWarnings(r.Groups, r.ReferenceName(), r.ComparisonName(), words), sampleSizeWarnings(r)...)
	out = append(out, modelInputWarnings(r.ModelInputs, r.Groups.Column, r.Score, scoreIsNode(r), r.Details, r.Names)...)
	down := downstreamOfSeparation(r)
	for _, m := range r.Mechanisms {
		if !down[m.Node] {
			out = append(out, mechanismWarnings(r, m)...)
		}
	}
	out = append(out, inheritedSeparationWarnings(r, down)...)
	out = append(out, hybridWarnings(r)...)
	for _, mr := range r.Metrics {
		out = append(out, metricWarnings(mr, r.Settings.EstimateFrom, r.Names)...)
	}
	if w, ok := splitWarning(r, out); ok {
		out = append(out, w)
	}
	out = append(out, outlyingWarnings(r.Details, r.Names, words)...)
	if iv := r.Settings.Intervals; iv != nil && iv.Failed > 0 {
		out = append(out, Warning{Kind: KindBootstrapFailures, Severity: SeverityNote, Nodes: []string{},
			Message: fmt.Sprintf("%d of %d bootstrap replicates could not be computed (e.g. a metric without a value in a resample); the intervals rest on the rest", iv.Failed, iv.Replicates)})
	}
	return out
}

// scoreIsNode reports whether the score is a node of the result's graph.
func scoreIsNode(r *Result) bool {
	for _, m := range r.Mechanisms {
		if m.Node == r.Score {
			return true
		}
	}
	return false
}

// lowESS reports whether an effective sample size ess out of n records is
// too low: below WarnESSShare·n, or below WarnESSMin while also below half
// of n (in a group of a few dozen records the floor of WarnESSMin says
// nothing the small_group warning does not; a weighting that keeps most
// of the records is not the problem there).
func lowESS(ess float64, n int) bool {
	return ess < WarnESSShare*float64(n) || (ess < WarnESSMin && ess < 0.5*float64(n))
}

// mechanismWarnings runs the checks of one mechanism, each warning naming
// its node. One cause is reported once: a mechanism that is not estimable
// gets that warning alone (its weight diagnostics would only restate it,
// and its contribution is not shown), and a learner that fails its
// self-checks is not also reported as a mean ratio off 1, which is what
// its odds check measured; the worst fifth of the parents is reported only
// when the overall mean ratio is fine.
func mechanismWarnings(r *Result, m MechanismResult) []Warning {
	var out []Warning
	add := func(kind WarningKind, sev Severity, format string, args ...any) {
		out = append(out, Warning{Kind: kind, Severity: sev, Nodes: []string{m.Node}, Message: fmt.Sprintf(format, args...)})
	}
	side := r.Settings.EstimateFrom
	node, mech := r.NodeName(m.Node), r.MechanismName(m.Node)
	if reason := estimability(r, m); reason != "" {
		out = append(out, notEstimableWarning(m, node, reason))
		if m.ClippedReference+m.ClippedComparison > 0 {
			add(KindRatiosClipped, SeverityCaution, "the ratios of `%s` were clipped for %s reference and %s comparison records (clip_ratios %g); its contribution is pulled towards zero", node, thousands(m.ClippedReference), thousands(m.ClippedComparison), r.Settings.ClipRatios)
		}
		return out
	}
	learnerFailed := false
	if w, ok := learnerWarning(r, m); ok {
		out = append(out, w)
		learnerFailed = true
	}
	if m.AUC >= WarnAUC {
		add(KindPoorOverlap, SeverityUnreliable, "the groups are nearly separable on `%s` (out-of-fold AUC %.3f): overlap is poor, so its contribution is unreliable", mech, m.AUC)
	}
	if msg := extremeWarning(m, side, mech); msg != "" {
		add(KindExtremeWeights, SeverityCaution, "%s", msg)
	}
	if msg, sev := essWarning(r, m); msg != "" {
		add(KindLowEffectiveRecords, sev, "%s", msg)
	}
	if msg, sev := tailWarning(r, m); msg != "" {
		add(KindHeavyTail, sev, "%s", msg)
	}
	if m.MaxShare > WarnMaxShare {
		add(KindDominantRecord, SeverityCaution, "a single record carries %.1f%% of the weight for `%s`; its contribution hinges on a few records", 100*m.MaxShare, node)
	}
	meanOff := m.MeanRatio < WarnMeanRatioLow || m.MeanRatio > WarnMeanRatioHigh
	if meanOff && !learnerFailed {
		add(KindMeanRatioOff, SeverityCaution, "the density ratios of `%s` average %.3f over the reference records instead of 1; its classifiers may be miscalibrated", mech, m.MeanRatio)
	}
	if !meanOff && !learnerFailed && (m.WorstStratumMean < WarnStratumLow || m.WorstStratumMean > WarnStratumHigh) {
		add(KindStratumRatioOff, SeverityCaution, "the density ratios of `%s` average %.3f in one fifth of the reference records (grouped by its parents) instead of 1; its classifiers may misjudge how the parents differ", mech, m.WorstStratumMean)
	}
	if m.ClippedReference+m.ClippedComparison > 0 {
		add(KindRatiosClipped, SeverityCaution, "the ratios of `%s` were clipped for %s reference and %s comparison records (clip_ratios %g); its contribution is pulled towards zero", node, thousands(m.ClippedReference), thousands(m.ClippedComparison), r.Settings.ClipRatios)
	}
	return out
}

// essWarning speaks up when the effective sample size of a mechanism's
// weights is low (lowESS) on the side(s) that estimate the hybrids
// (unreliable); with both sides, when both are low, and as a note when one
// is, naming the side that carries the estimate.
func essWarning(r *Result, m MechanismResult) (string, Severity) {
	nRef, nCmp := r.Groups.NReference, r.Groups.NComparison
	refLow, cmpLow := lowESS(m.ESS, nRef), lowESS(m.ComparisonESS, nCmp)
	ref, cmp := thousands(int(math.Round(m.ESS))), thousands(int(math.Round(m.ComparisonESS)))
	side, node := r.Settings.EstimateFrom, r.NodeName(m.Node)
	switch {
	case side == "comparison" && cmpLow:
		return fmt.Sprintf("the contribution of `%s` rests on %s effective comparison records out of %s; treat it as unreliable", node, cmp, thousands(nCmp)), SeverityUnreliable
	case side == "both" && refLow && cmpLow:
		return fmt.Sprintf("the contribution of `%s` rests on %s effective reference records out of %s and %s comparison records out of %s; treat it as unreliable", node, ref, thousands(nRef), cmp, thousands(nCmp)), SeverityUnreliable
	case side == "both" && refLow:
		return fmt.Sprintf("the reference records give `%s` only %s effective records out of %s; the two-sided estimate leans on the comparison records (%s effective out of %s)", node, ref, thousands(nRef), cmp, thousands(nCmp)), SeverityNote
	case side == "both" && cmpLow:
		return fmt.Sprintf("the comparison records give `%s` only %s effective records out of %s; the two-sided estimate leans on the reference records (%s effective out of %s)", node, cmp, thousands(nCmp), ref, thousands(nRef)), SeverityNote
	case side != "comparison" && side != "both" && refLow:
		return fmt.Sprintf("the contribution of `%s` rests on %s effective records out of %s; treat it as unreliable", node, ref, thousands(nRef)), SeverityUnreliable
	}
	return "", ""
}

// hybridWarnings speaks up, per side of estimation, when the worst hybrid
// rests on too few effective records (lowESS); not with both sides, whose
// combination leans on the better side per coalition. Each warning names
// the nodes in comparison form in that hybrid.
func hybridWarnings(r *Result) []Warning {
	var out []Warning
	if r.Settings.EstimateFrom == "both" {
		return bothHybridsWarning(r)
	}
	for _, w := range r.Weights {
		if lowESS(w.Worst.ESS, w.Records) {
			out = append(out, Warning{Kind: KindWorstHybrid, Severity: SeverityUnreliable, Nodes: append([]string{}, w.Worst.ComparisonNodes...),
				Message: fmt.Sprintf("on the %s records, the hybrid with the comparison group's mechanisms for %s rests on %s effective records out of %s; contributions that use it are unreliable", w.Side, nodeList(r.Names, w.Worst.ComparisonNodes), thousands(int(math.Round(w.Worst.ESS))), thousands(w.Records))})
		}
	}
	return out
}

// metricWarnings runs the checks of one metric: fewer than WarnESSMin
// effective records behind its far end, and a residual above both
// WarnResidualShare·|gap| and WarnResidualMin. Each warning names the
// metric; names gives the nodes' display names.
func metricWarnings(mr MetricResult, side string, names *Names) []Warning {
	var out []Warning
	add := func(kind WarningKind, sev Severity, msg string) {
		out = append(out, Warning{Kind: kind, Severity: sev, Metric: mr.Metric, Nodes: []string{}, Message: msg})
	}
	if basis := float64(mr.RecordsReference + mr.RecordsComparison); mr.EffectiveRecords < WarnESSMin && (basis == 0 || mr.EffectiveRecords < 0.5*basis) {
		what := "the reweighted comparison group"
		switch side {
		case "comparison":
			what = "the reweighted reference group"
		case "both":
			what = "the combined estimate"
		}
		add(KindMetricRecords, SeverityUnreliable, fmt.Sprintf("for %s, %s rests on %s effective records; the estimated gap is unreliable", mr.Metric, what, thousands(int(math.Round(mr.EffectiveRecords)))))
	}
	if msg := residualWarning(mr); msg != "" {
		add(KindLargeResidual, SeverityCaution, msg)
	}
	if w, ok := sidesWarning(mr, names); ok {
		out = append(out, w)
	}
	if w, ok := estimatorsWarning(mr, names); ok {
		out = append(out, w)
	}
	if mr.RobustUnavailable != "" {
		add(KindRobustUnavailable, SeverityNote, fmt.Sprintf("for %s the robust estimator gives no estimate (%s), as happens with very few records; the weighting estimate is reported", mr.Metric, mr.RobustUnavailable))
	}
	return out
}

// sidesWarning speaks up when the reference-side and comparison-side
// estimates of a metric differ by more than WarnSidesZ standard errors at
// an end of the gap or in a contribution (SideAgreement.MaxZ); above
// WarnSidesZUnreliable it is SeverityUnreliable. Nodes are the mechanisms
// whose contributions differ by more than WarnSidesZ, named in the
// sentence by their display names.
func sidesWarning(mr MetricResult, names *Names) (Warning, bool) {
	a := mr.SideAgreement
	if a == nil || a.MaxZ == nil || *a.MaxZ <= WarnSidesZ {
		return Warning{}, false
	}
	sev := SeverityCaution
	if *a.MaxZ > WarnSidesZUnreliable {
		sev = SeverityUnreliable
	}
	nodes := []string{}
	for _, c := range mr.Contributions {
		if d := c.SideDifference; d != nil && d.StdError != nil && math.Abs(d.Difference) > WarnSidesZ**d.StdError {
			nodes = append(nodes, c.Node)
		}
	}
	where := ""
	if len(nodes) > 0 {
		where = fmt.Sprintf("; the contributions of %s differ most", nodeList(names, nodes))
	}
	msg := fmt.Sprintf("for %s the estimates from the reweighted reference records and from the reweighted comparison records disagree by up to %.1f standard errors (comparison end %s, reference end %s%s): the density ratios are likely wrong, or something that differs between the groups is missing from the graph; the contributions are in doubt even though the residual is %.4f",
		mr.Metric, *a.MaxZ, plusMinus(a.ComparisonEnd), plusMinus(a.ReferenceEnd), where, mr.Residual)
	return Warning{Kind: KindSidesDisagree, Severity: sev, Metric: mr.Metric, Nodes: nodes, Message: msg}, true
}

// plusMinus renders a side difference as "+0.0123 ± 0.0045" (one
// standard error), without the ± part when its error is unknown.
func plusMinus(d SideDifference) string {
	if d.StdError == nil {
		return fmt.Sprintf("%+.4f", d.Difference)
	}
	return fmt.Sprintf("%+.4f ± %.4f", d.Difference, *d.StdError)
}

// splitWarning speaks up once when contributions still move with the
// seed after averaging R = r.Settings.FoldSplits > 1 fold splits: a
// contribution's standard error SplitSD/√R exceeds WarnSplitShare of its
// interval's half-width, or without an interval both
// WarnSplitShare·|value| and WarnSplitMin (splitNoise). A mechanism that
// is not estimable or already has an unreliable warning in prior (whose
// cause also explains the spread) is left out. Nodes lists the mechanisms
// concerned in graph order; the sentence names, per node, the metrics and
// quotes the largest case relative to its yardstick.
func splitWarning(r *Result, prior []Warning) (Warning, bool) {
	skip := map[string]bool{}
	for _, m := range r.Mechanisms {
		skip[m.Node] = estimability(r, m) != ""
	}
	for _, w := range prior {
		if w.Severity == SeverityUnreliable {
			for _, n := range w.Nodes {
				skip[n] = true
			}
		}
	}
	metricsOf := map[string][]string{}
	var order []string // nodes in graph order: the order of the contributions
	var worst splitCase
	for _, mr := range r.Metrics {
		for _, c := range mr.Contributions {
			sc, ok := splitNoise(c, r.Settings.FoldSplits)
			if !ok || skip[c.Node] {
				continue
			}
			if _, seen := metricsOf[c.Node]; !seen {
				order = append(order, c.Node)
			}
			metricsOf[c.Node] = append(metricsOf[c.Node], mr.Metric)
			if sc.ratio > worst.ratio {
				sc.metric = mr.Metric
				worst = sc
			}
		}
	}
	if len(metricsOf) == 0 {
		return Warning{}, false
	}
	parts := make([]string, len(order))
	for i, n := range order {
		parts[i] = fmt.Sprintf("`%s` (%s)", r.NodeName(n), strings.Join(metricsOf[n], ", "))
	}
	msg := fmt.Sprintf("the contributions of %s depend on the fold split: averaged over %d splits they still move with the seed by more than %.0f%% of their interval's half-width (without intervals, of their value); the largest, `%s` for %s, has standard deviation %.4f between the splits and moves by about %.4f with the seed, against %s; raise fold_splits (this noise falls as 1/√fold_splits)",
		strings.Join(parts, ", "), r.Settings.FoldSplits, 100*WarnSplitShare, r.MechanismName(worst.c.Node), worst.metric, *worst.c.SplitSD, worst.se, worst.against)
	return Warning{Kind: KindSplitDependent, Severity: SeverityCaution, Nodes: order, Message: msg}, true
}

// splitCase is a contribution whose mean over the fold splits moves with
// the seed: its standard error se, the yardstick it is judged against (in
// words) and se over WarnSplitShare times the yardstick.
type splitCase struct {
	c       Contribution
	metric  string
	se      float64
	against string
	ratio   float64
}

// splitNoise reports whether contribution c, the mean over R fold splits,
// moves with the seed: se = SplitSD/√R above WarnSplitShare of its
// interval's half-width, or without an interval above both
// WarnSplitShare·|value| and WarnSplitMin.
func splitNoise(c Contribution, R int) (splitCase, bool) {
	if c.SplitSD == nil || R < 2 {
		return splitCase{}, false
	}
	sc := splitCase{c: c, se: *c.SplitSD / math.Sqrt(float64(R))}
	if c.CILow != nil && c.CIHigh != nil {
		hw := (*c.CIHigh - *c.CILow) / 2
		sc.against, sc.ratio = fmt.Sprintf("its interval's half-width %.4f", hw), sc.se/(WarnSplitShare*hw)
		return sc, sc.ratio > 1
	}
	sc.against, sc.ratio = fmt.Sprintf("its value %+.4f", c.Value), sc.se/(WarnSplitShare*math.Abs(c.Value))
	return sc, sc.ratio > 1 && sc.se > WarnSplitMin
}

// nodeList renders nodes by their display names as "`a`, `b`", or "no
// node" for none.
func nodeList(names *Names, nodes []string) string {
	if len(nodes) == 0 {
		return "no node"
	}
	q := make([]string, len(nodes))
	for i, n := range nodes {
		q[i] = "`" + names.NodeName(n) + "`"
	}
	return strings.Join(q, ", ")
}

// dataWarnings reports, about the rows of the data file, those dropped for
// missing values and the excluded group values that resemble a chosen one;
// ref and cmp are the groups' display names.
func dataWarnings(g GroupInfo, ref, cmp string, words countWords) []Warning {
	return append(droppedWarnings(g, ref, cmp, words), excludedWarnings(g, words)...)
}

// droppedWarnings reports rows dropped for missing values; never nil. It
// is a caution when the shares dropped differ between the groups by at
// least WarnDroppedGap and by more than sampling explains (two-proportion
// |z| ≥ WarnDroppedZ, missingShares): dropping then changes the two
// groups' case mix unequally, so the audit answers a different question
// (compare each metric's all_records gap). ref and cmp name the groups.
func droppedWarnings(g GroupInfo, ref, cmp string, words countWords) []Warning {
	if g.DroppedReference == 0 && g.DroppedComparison == 0 {
		return []Warning{}
	}
	refShare, cmpShare, z := missingShares(g)
	shareOf := func(path string, p float64) string {
		if words(path, 0) != plainCount(path, 0) {
			return "share withheld" // the share and the group's records would give the count
		}
		return share(p)
	}
	w := Warning{Kind: KindRowsDropped, Severity: SeverityNote, Nodes: []string{},
		Message: fmt.Sprintf("%s rows of group %q (%s) and %s rows of group %q (%s) were dropped for missing values; the audit describes the remaining records only",
			words(PathDroppedReference, g.DroppedReference), ref, shareOf(PathDroppedReference, refShare),
			words(PathDroppedComparison, g.DroppedComparison), cmp, shareOf(PathDroppedComparison, cmpShare))}
	if math.Abs(cmpShare-refShare) >= WarnDroppedGap && math.Abs(z) >= WarnDroppedZ {
		w.Severity = SeverityCaution
		w.Message += fmt.Sprintf(". The shares differ by more than chance explains (z = %.1f): dropping changes the groups unequally; compare the gap on all records with label and score (all_records), or use missing: indicator", z)
	}
	return []Warning{w}
}

// share formats a share as a percentage with one decimal, "<0.1%" for a
// positive share below 0.05%.
func share(p float64) string {
	if p > 0 && p < 0.0005 {
		return "<0.1%"
	}
	return fmt.Sprintf("%.1f%%", 100*p)
}

// thousands formats n with a comma between groups of three digits.
func thousands(n int) string {
	s := strconv.Itoa(n)
	neg := n < 0
	if neg {
		s = s[1:]
	}
	var b []byte
	for i := range len(s) {
		if i > 0 && (len(s)-i)%3 == 0 {
			b = append(b, ',')
		}
		b = append(b, s[i])
	}
	if neg {
		return "-" + string(b)
	}
	return string(b)
}

// tailWarning speaks up when the weights of a mechanism have a heavy right
// tail (Pareto k̂ above attribution.TailInfiniteVariance) on the side(s)
// that estimate the hybrids: SeverityUnreliable above
// attribution.TailUnreliable and SeverityCaution below. With both sides it
// does so when both are heavy, and gives a note when one is, naming the
// side that carries the estimate. It advises only settings not in use.
func tailWarning(r *Result, m MechanismResult) (string, Severity) {
	heavy := func(k *float64) bool { return k != nil && *k > attribution.TailInfiniteVariance }
	ref, cmp := heavy(m.TailShape), heavy(m.ComparisonTailShape)
	side := r.Settings.EstimateFrom
	var k float64
	var where string
	switch {
	case side == "comparison" && cmp:
		k, where = *m.ComparisonTailShape, "comparison"
	case side == "both" && ref && cmp:
		k, where = math.Min(*m.TailShape, *m.ComparisonTailShape), "reference and comparison"
	case side == "both" && ref != cmp:
		// Only the heavy side's shape is read: the other may be absent.
		heavySide, other, shape := "reference", "comparison", m.TailShape
		if cmp {
			heavySide, other, shape = "comparison", "reference", m.ComparisonTailShape
		}
		kh := *shape
		return fmt.Sprintf("the weights for `%s` on the %s records have a heavy tail (Pareto shape %s > %.1f); the two-sided estimate leans on the %s records, whose weights for it are lighter-tailed", r.MechanismName(m.Node), heavySide, shapeText(kh, attribution.TailInfiniteVariance), attribution.TailInfiniteVariance, other), SeverityNote
	case side != "comparison" && side != "both" && ref:
		k, where = *m.TailShape, "reference"
	default:
		return "", ""
	}
	verdict, sev := "their variance is infinite, so the estimate converges slowly and its interval may be too narrow", SeverityCaution
	if k > attribution.TailUnreliable {
		verdict, sev = "the estimate is unreliable at this sample size", SeverityUnreliable
	}
	return fmt.Sprintf("the weights for `%s` on the %s records have a heavy tail (Pareto shape %s > %.1f): %s; %s", r.MechanismName(m.Node), where, shapeText(k, attribution.TailInfiniteVariance), attribution.TailInfiniteVariance, verdict, tailAdvice(r)), sev
}

// tailAdvice names what could lighten a heavy tail, among the settings not
// already in use: two-sided estimation, then clipping, then more records.
func tailAdvice(r *Result) string {
	switch {
	case r.Settings.EstimateFrom != "both":
		return "consider estimate_from: both"
	case r.Settings.ClipRatios == 0:
		return "more records would help, or clip_ratios (which trades bias for variance)"
	}
	return "more records would help"
}

// extremeWarning speaks up when more than WarnExtremeShare of the records
// that estimate the hybrids carry a weight above 20 for a mechanism; with
// both sides, only when both do (the combination leans on the better one).
// mech is the mechanism as the sentence names it.
func extremeWarning(m MechanismResult, side, mech string) string {
	ref := m.ExtremeShare > WarnExtremeShare
	cmp := m.ComparisonExtremeShare != nil && *m.ComparisonExtremeShare > WarnExtremeShare
	switch {
	case side == "comparison" && cmp:
		return fmt.Sprintf("%.1f%% of comparison records carry a weight above 20 for `%s`: the groups barely overlap there, and a few records dominate", 100**m.ComparisonExtremeShare, mech)
	case side == "both" && ref && cmp:
		return fmt.Sprintf("%.1f%% of reference and %.1f%% of comparison records carry a weight above 20 for `%s`: the groups barely overlap there, and a few records dominate", 100*m.ExtremeShare, 100**m.ComparisonExtremeShare, mech)
	case side != "comparison" && side != "both" && ref:
		return fmt.Sprintf("%.1f%% of reference records carry a weight above 20 for `%s`: the groups barely overlap there, and a few records dominate", 100*m.ExtremeShare, mech)
	}
	return ""
}

// outlyingWarnings names each numeric column with values outside its
// typical range (ColumnDetails.Outlying), by its display name and then
// its identifier (columnWords).
func outlyingWarnings(d *Details, names *Names, words countWords) []Warning {
	if d == nil {
		return nil
	}
	var out []Warning
	for i, c := range d.Columns {
		if c.Outlying == 0 || c.Farthest == nil {
			continue
		}
		values := "values"
		count := words(OutlyingPath(i), c.Outlying)
		if count == "1" {
			values = "value"
		}
		out = append(out, Warning{Kind: KindOutlyingValues, Severity: SeverityNote, Nodes: []string{},
			Message: fmt.Sprintf("column %s has %s %s far outside the bulk of its values (the farthest is %g); the classifiers treat such values as the edge of the typical range; check them for entry errors", columnWords(names, c.Name), count, values, *c.Farthest)})
	}
	return out
}
