package attribution

import (
	"fmt"
	"math"
	"sort"

	"github.com/gapwise/gapwise/internal/rank"
	"github.com/gapwise/gapwise/metrics"
)

// CoalitionWeight describes the importance weights of one coalition S over
// one side's records: w_S(r) = exp(Σ_{i∈S} clip(log r_i(r))).
type CoalitionWeight struct {
	Coalition uint64  // bitmask over the mechanisms
	ESS       float64 // n_eff = (Σw)²/Σw² (Kish 1965, "Survey Sampling")
	MaxShare  float64 // max_r w(r) / Σw
}

// CoalitionWeights returns, for every coalition S ⊆ {0..k−1}, k = len(logr),
//
//	logSum[S]   = log Σ_r w_S(r),
//	logSumSq[S] = log Σ_r w_S(r)²,   w_S(r) = exp(Σ_{i∈S} clip(logr[i][r])),
//
// over the n = len(logr[0]) records, with clip the engine's bound
// ClipLogRatio. The effective sample size of coalition S is
// n_eff(S) = exp(2·logSum[S] − logSumSq[S]). Σw² is the Σw of the weights
// built from 2·log r, so for larger k both come from the coalition engine's
// matrix products over split halves (productEngine), kept on the log scale
// so that nothing overflows. (A direct walk over coalitions, one exp per
// record and coalition, was slower at every k measured, n = 50,000 on 2
// shared cores: k = 6, 204 ms vs 97 ms; k = 8, 793 vs 158 ms; k = 10,
// 3.5 s vs 0.33 s.)
// Results do not depend on opt.Workers.
//
// It returns an error for no mechanisms, no records, a NaN log-ratio or
// k > MaxExactMechanisms, and panics if the logr[i] differ in length.
func CoalitionWeights(logr [][]float64, opt EngineOptions) (logSum, logSumSq []float64, err error) {
	k := len(logr)
	if k == 0 || len(logr[0]) == 0 {
		return nil, nil, fmt.Errorf("attribution: coalition weights need at least one mechanism and one record")
	}
	if k > MaxExactMechanisms {
		return nil, nil, fmt.Errorf("attribution: coalition weights support at most %d mechanisms, got %d", MaxExactMechanisms, k)
	}
	n := len(logr[0])
	zeros := make([]float64, n)
	in, err := newEngineInput(zeros, zeros, 0.5, logr, []string{metrics.NameFPR}, opt)
	if err != nil {
		return nil, nil, err
	}
	logSum = productLogSums(in)
	doubled := make([][]float64, k)
	for i, l := range in.logr {
		doubled[i] = make([]float64, n)
		for r, x := range l {
			doubled[i][r] = 2 * x
		}
	}
	in.logr = doubled
	logSumSq = productLogSums(in)
	return logSum, logSumSq, nil
}

// productLogSums returns log Σ_r exp(Σ_{i∈S} in.logr[i][r]) for every S,
// from the product engine's scaled sums T[sA, sB] and the scales c_A, c_B
// it divided out: log Σw_S = log T + c_A(sA) + c_B(sB).
func productLogSums(in *engineInput) []float64 {
	e := newProductEngine(in)
	cA, cB := scalesFromSteps(e.gA), scalesFromSteps(e.gB)
	slot := in.plan.slot[metrics.Cell(0, 0, in.threshold, in.plan.bins)]
	nBPad := e.nBPad()
	perRow := len(in.plan.cells) * len(in.plan.feats) * nBPad * 8
	rowsPerPass := e.nA
	if perRow*rowsPerPass > passByteLimit {
		rowsPerPass = max(tileRows, passByteLimit/perRow/tileRows*tileRows)
	}
	out := make([]float64, e.nA*e.nB)
	for a0 := 0; a0 < e.nA; a0 += rowsPerPass {
		a1 := min(e.nA, a0+rowsPerPass)
		t := e.accumulate(a0, a1)[slot][0]
		for a := a0; a < a1; a++ {
			for b := 0; b < e.nB; b++ {
				out[a*e.nB+b] = math.Log(t[(a-a0)*nBPad+b]) + cA[a] + cB[b]
			}
		}
	}
	return out
}

// scalesFromSteps inverts the engine's scale steps g[s] = exp(c(s∖low) −
// c(s)) into c(s), with c(∅) = 0.
func scalesFromSteps(g []float64) []float64 {
	c := make([]float64, len(g))
	for s := 1; s < len(g); s++ {
		c[s] = c[s&(s-1)] - math.Log(g[s])
	}
	return c
}

// SomeCoalitionWeights returns the weight summary of each listed coalition
// over the records, w_S as in CoalitionWeights (clipped log-ratios). Each
// costs O(n·|S|); use it for the few coalitions that matter when 2^k is
// too many. It panics if the logr[i] differ in length.
func SomeCoalitionWeights(logr [][]float64, coalitions []uint64) []CoalitionWeight {
	out := make([]CoalitionWeight, len(coalitions))
	if len(logr) == 0 {
		return out
	}
	n := len(logr[0])
	for _, l := range logr {
		if len(l) != n {
			panic("attribution: log-ratio vectors differ in length")
		}
	}
	lw := make([]float64, n)
	for j, S := range coalitions {
		clear(lw)
		for i, l := range logr {
			if S&(1<<i) == 0 {
				continue
			}
			for r, x := range l {
				lw[r] += math.Max(-ClipLogRatio, math.Min(ClipLogRatio, x))
			}
		}
		ws := SummariseLogWeights(lw)
		out[j] = CoalitionWeight{Coalition: S, ESS: ws.ESS, MaxShare: ws.MaxShare}
	}
	return out
}

// ESSFromLogSums is n_eff = (Σw)²/Σw² from log Σw and log Σw².
func ESSFromLogSums(logSum, logSumSq float64) float64 {
	return math.Exp(2*logSum - logSumSq)
}

// ExtremeLogRatio bounds the "extreme" importance weights: log w > log 20,
// a weight above 20. ln 20 = 2.995732273553991.
const ExtremeLogRatio = 2.995732273553991

// ExtremeShare is the share of records whose importance weight exp(logw)
// exceeds 20 (log w > ExtremeLogRatio): records the other group produces
// far more often, each of which stands for many, so that a handful can
// dominate a reweighted estimate. Only this direction matters for the
// estimate: a record with a weight near 0 is merely discounted (its cost
// shows in the effective sample size). Pass log r_i for the reference
// records and −log r_i for the comparison records. It is 0 for an empty
// input.
func ExtremeShare(logw []float64) float64 {
	if len(logw) == 0 {
		return 0
	}
	n := 0
	for _, x := range logw {
		if x > ExtremeLogRatio {
			n++
		}
	}
	return float64(n) / float64(len(logw))
}

// RatioStrata is the number of strata of the parents in WorstStratumMean.
const RatioStrata = 5

// WorstStratumMean checks E_ref[r_i | pa_i] = 1, which holds for the true
// ratio r_i = P_cmp(x_i | pa_i)/P_ref(x_i | pa_i) at every value of the
// parents. It sorts the records by key (a summary of the parents, such as
// the parent classifier's out-of-fold log-odds; ties keep record order; in
// O(n) by a radix sort, rank.Ascending),
// cuts them into RatioStrata strata of (nearly) equal size, and returns the
// stratum mean of r_i = exp(logr) farthest from 1 on the log scale. With a
// nil key (a root node) there is one stratum, all records. It returns NaN
// for an empty input and panics if key and logr differ in length.
func WorstStratumMean(logr, key []float64) float64 {
	n := len(logr)
	if n == 0 {
		return math.NaN()
	}
	strata := 1
	var order []int32
	if key != nil {
		if len(key) != n {
			panic("attribution: WorstStratumMean: key and logr differ in length")
		}
		strata = min(RatioStrata, n)
		order = stableOrder(key)
	}
	worst := 1.0
	for q := 0; q < strata; q++ {
		lo, hi := splitRange(n, strata, q)
		var s float64
		if order == nil {
			for _, x := range logr {
				s += math.Exp(x)
			}
		} else {
			for _, r := range order[lo:hi] {
				s += math.Exp(logr[r])
			}
		}
		m := s / float64(hi-lo)
		if math.Abs(math.Log(m)) > math.Abs(math.Log(worst)) {
			worst = m
		}
	}
	return worst
}

// stableOrder returns the record indices sorted by key, ties in record
// order: in O(n) by rank.Ascending, or with a NaN key, which that order
// does not place, by the stable comparison sort of key < key.
func stableOrder(key []float64) []int32 {
	if order, ok := rank.Ascending(key); ok {
		return order
	}
	order := make([]int32, len(key))
	for r := range order {
		order[r] = int32(r)
	}
	sort.SliceStable(order, func(a, b int) bool { return key[order[a]] < key[order[b]] })
	return order
}

// keyCoalitions returns ∅, N, then {i} and N∖{i} for each mechanism i: the
// coalitions the summary values and what-ifs read.
func keyCoalitions(k int) []uint64 {
	full := uint64(1)<<k - 1
	cs := []uint64{0, full}
	for i := 0; i < k; i++ {
		cs = append(cs, uint64(1)<<i, full&^(uint64(1)<<i))
	}
	return cs
}

// sideWeights summarises each side's weights: the far hybrid and the
// hybrid with the smallest n_eff (over all coalitions when the Shapley
// values are exact, else over keyCoalitions; ties go to the first found).
func sideWeights(sides []*sideEstimate, opt Options) ([]SideWeights, error) {
	eopt := EngineOptions{Workers: opt.Workers, ECEBins: opt.ECEBins}
	var out []SideWeights
	for _, e := range sides {
		k := len(e.logr)
		full := uint64(1)<<k - 1
		sw := SideWeights{Side: e.side, Records: len(e.y)}
		far := full
		if e.side == SideComparison {
			far = 0
		}
		worst, worstESS := uint64(0), math.Inf(1)
		if k <= exactLimit(opt) {
			ess, err := e.essAll(eopt)
			if err != nil {
				return nil, err
			}
			for S, x := range ess {
				if x < worstESS {
					worst, worstESS = uint64(S), x
				}
			}
			sw.AllCoalitions = true
		} else {
			for _, w := range e.someWeights(keyCoalitions(k)) {
				if w.ESS < worstESS {
					worst, worstESS = w.Coalition, w.ESS
				}
			}
		}
		ws := e.someWeights([]uint64{far, worst})
		sw.Far, sw.Worst = ws[0], ws[1]
		// Far's log-weights are the sum over all mechanisms on either side
		// (the comparison side's logr are already negated).
		farLog := make([]float64, len(e.y))
		for _, l := range e.logr {
			for r, x := range l {
				farLog[r] += x
			}
		}
		sw.FarTailShape = TailShape(farLog)
		out = append(out, sw)
	}
	return out, nil
}

// effectiveRecords sets MetricDecomposition.EffectiveRecords: n_eff of the
// far hybrid's weights over the records each metric counts (metricRecords).
func effectiveRecords(mds []MetricDecomposition, sides []*sideEstimate, opt Options) {
	for m := range mds {
		ess := make([]float64, len(sides))
		count := make([]float64, len(sides))
		for j, e := range sides {
			ess[j], count[j] = farMetricESS(e, mds[m].Metric, opt)
		}
		if len(sides) == 1 {
			mds[m].EffectiveRecords = ess[0]
		} else {
			// sides[0] is the reference side, sides[1] the comparison side.
			mds[m].EffectiveRecords = math.Min(ess[0]+count[1], count[0]+ess[1])
		}
	}
}

// farMetricESS returns n_eff of the far hybrid's weights on side e (N on
// the reference side, ∅ on the comparison side) over the records metric
// name counts (metricRecords), and the number of those records.
func farMetricESS(e *sideEstimate, name string, opt Options) (ess, count float64) {
	mask := metricRecords(name, e.y, e.s, opt.Threshold, opt.ECEBins)
	var lw []float64
	for r, in := range mask {
		if !in {
			continue
		}
		var x float64
		for _, l := range e.logr {
			x += math.Max(-ClipLogRatio, math.Min(ClipLogRatio, l[r]))
		}
		lw = append(lw, x)
	}
	return SummariseLogWeights(lw).ESS, float64(len(lw))
}

// metricRecords marks the records whose cell enters metric name's
// denominator (all records for metrics that read every cell, and for AUC).
func metricRecords(name string, y, s []float64, threshold float64, bins int) []bool {
	mask := make([]bool, len(y))
	p, err := newMetricPlan([]string{name}, bins)
	for r := range mask {
		mask[r] = err != nil || p.auc >= 0 || p.combos&(1<<(metrics.Cell(y[r], s[r], threshold, 1)&3)) != 0
	}
	return mask
}
