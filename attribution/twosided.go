package attribution

import (
	"fmt"
	"math"
)

// Side names the records from which the metrics of the hybrid
// distributions P_S are estimated.
//
//   - SideReference: the reference records with weights
//     w_S = Π_{i∈S} r_i. M̂(∅) is the observed reference metric; the
//     estimation error shows at the N end.
//   - SideComparison: the comparison records with weights
//     w'_S = Π_{i∉S} 1/r_i, since P_S/P_cmp = Π_{i∉S} P_ref,i/P_cmp,i.
//     M̂(N) is the observed comparison metric; the error shows at the ∅ end.
//     This is EvaluateCoalitions on the comparison records with every log
//     ratio negated, read at index N∖S.
//   - SideBoth: the two estimates combined as Options.Mix says (see Mix;
//     DefaultMix): by default one weight per metric, inverse to each side's
//     variance. Where the reference weights have infinite variance (a
//     mechanism wider in the comparison group) their variance is large and
//     the comparison records carry the estimate, and the other way round.
//
// Whatever the side, v(S) = M̂(S) − M̂(∅), Estimated = v(N) = Σφ and
// Residual = Gap − Estimated, where Gap is the observed comparison minus the
// observed reference metric.
type Side int

// Sides. The zero value means DefaultSide.
const (
	SideDefault Side = iota
	SideReference
	SideComparison
	SideBoth
)

// DefaultSide is the side used when Options.Side is SideDefault. The
// accuracy study against simulated ground truth decided it:
//
//	go run ./cmd/gapwise-accuracy -sides -learners expanded,linear -reps 3 -sizes 2000,10000
//
// pooled over the six synthetic screening cases (including a spread shift
// in each direction), four metrics and 3 replicates, max / mean / null-
// mechanism |φ̂ − φ| at 2,000 / 10,000 records per group with the expanded
// learner was
//
//	reference             0.0647/0.0058/0.0647  0.0303/0.0026/0.0303
//	comparison            0.0793/0.0055/0.0793  0.0363/0.0023/0.0363
//	both, metric-variance 0.0407/0.0046/0.0407  0.0171/0.0020/0.0171
//	both, coalition       0.0290/0.0043/0.0270  0.0118/0.0018/0.0102
//
// Both sides beat either alone whatever the combination; DefaultMix says
// which combination, and why not the per-coalition one.
const DefaultSide = SideBoth

// String returns "reference", "comparison", "both" or "default".
func (s Side) String() string {
	switch s {
	case SideReference:
		return "reference"
	case SideComparison:
		return "comparison"
	case SideBoth:
		return "both"
	case SideDefault:
		return "default"
	}
	return fmt.Sprintf("Side(%d)", int(s))
}

// ParseSide turns "reference", "comparison" or "both" into a Side.
func ParseSide(name string) (Side, error) {
	for _, s := range []Side{SideReference, SideComparison, SideBoth} {
		if s.String() == name {
			return s, nil
		}
	}
	return SideDefault, fmt.Errorf("attribution: unknown side %q (want reference, comparison or both)", name)
}

// resolve maps SideDefault to DefaultSide.
func (s Side) resolve() Side {
	if s == SideDefault {
		return DefaultSide
	}
	return s
}

// sideEstimate evaluates the hybrid metrics from one group's records.
type sideEstimate struct {
	side  Side // SideReference or SideComparison
	y, s  []float64
	logr  [][]float64 // log-weights per mechanism: log r_i (reference) or −log r_i (comparison)
	essAt []float64   // lazily, n_eff of the weights of every weight coalition
}

func newSideEstimate(side Side, y, s []float64, logRatio [][]float64) *sideEstimate {
	e := &sideEstimate{side: side, y: y, s: s, logr: logRatio}
	if side == SideComparison {
		e.logr = make([][]float64, len(logRatio))
		for i, l := range logRatio {
			e.logr[i] = make([]float64, len(l))
			for r, x := range l {
				e.logr[i][r] = -x
			}
		}
	}
	return e
}

// weightCoalition maps a hybrid coalition S to the coalition of log-weights
// that emulates it on this side's records.
func (e *sideEstimate) weightCoalition(S, full uint64) uint64 {
	if e.side == SideComparison {
		return full ^ S
	}
	return S
}

// all returns values[m][S] = M̂(P_S) for every hybrid coalition S.
func (e *sideEstimate) all(names []string, threshold float64, eopt EngineOptions) ([][]float64, error) {
	g, err := EvaluateCoalitions(e.y, e.s, threshold, e.logr, names, eopt)
	if err != nil {
		return nil, e.coalitionErr(err)
	}
	if e.side != SideComparison {
		return g.Values, nil
	}
	full := uint64(1)<<len(e.logr) - 1
	out := make([][]float64, len(names))
	for m, v := range g.Values {
		out[m] = make([]float64, len(v))
		for S := range v {
			out[m][S] = v[full^uint64(S)]
		}
	}
	return out, nil
}

// some returns values[m][j] = M̂(P_{cs[j]}).
func (e *sideEstimate) some(names []string, cs []uint64, threshold float64, eopt EngineOptions) ([][]float64, error) {
	full := uint64(1)<<len(e.logr) - 1
	wc := make([]uint64, len(cs))
	for j, S := range cs {
		wc[j] = e.weightCoalition(S, full)
	}
	v, err := EvaluateSome(e.y, e.s, threshold, e.logr, names, wc, eopt)
	if err != nil {
		return nil, e.coalitionErr(err)
	}
	return v, nil
}

// coalitionErr restates a *CoalitionError of the comparison side in terms
// of the hybrid coalition.
func (e *sideEstimate) coalitionErr(err error) error {
	if ce, ok := err.(*CoalitionError); ok && e.side == SideComparison {
		full := uint64(1)<<len(e.logr) - 1
		return &CoalitionError{Metric: ce.Metric, Coalition: full ^ ce.Coalition, Err: ce.Err}
	}
	return err
}

// essAll returns n_eff of the weights emulating every hybrid coalition S.
func (e *sideEstimate) essAll(eopt EngineOptions) ([]float64, error) {
	if e.essAt != nil {
		return e.essAt, nil
	}
	ls, lss, err := CoalitionWeights(e.logr, eopt)
	if err != nil {
		return nil, err
	}
	full := uint64(1)<<len(e.logr) - 1
	e.essAt = make([]float64, len(ls))
	for S := range e.essAt {
		w := e.weightCoalition(uint64(S), full)
		e.essAt[S] = ESSFromLogSums(ls[w], lss[w])
	}
	return e.essAt, nil
}

// someWeights returns the weight summaries of the listed hybrid coalitions
// (Coalition fields in hybrid terms).
func (e *sideEstimate) someWeights(cs []uint64) []CoalitionWeight {
	full := uint64(1)<<len(e.logr) - 1
	wc := make([]uint64, len(cs))
	for j, S := range cs {
		wc[j] = e.weightCoalition(S, full)
	}
	out := SomeCoalitionWeights(e.logr, wc)
	for j := range out {
		out[j].Coalition = cs[j]
	}
	return out
}

// sideValuesAll returns vals[j][m][S] = M̂(P_S) of every metric m and
// hybrid coalition S estimated from sides[j] alone.
func sideValuesAll(sides []*sideEstimate, names []string, threshold float64, eopt EngineOptions) ([][][]float64, error) {
	vals := make([][][]float64, len(sides))
	for j, e := range sides {
		var err error
		if vals[j], err = e.all(names, threshold, eopt); err != nil {
			return nil, err
		}
	}
	return vals, nil
}

// sideValuesSome is sideValuesAll for the listed coalitions only:
// vals[j][m][c] = M̂(P_{cs[c]}) from sides[j].
func sideValuesSome(sides []*sideEstimate, names []string, cs []uint64, threshold float64, eopt EngineOptions) ([][][]float64, error) {
	vals := make([][][]float64, len(sides))
	for j, e := range sides {
		var err error
		if vals[j], err = e.some(names, cs, threshold, eopt); err != nil {
			return nil, err
		}
	}
	return vals, nil
}

// hybridAll returns M̂(P_S) for every S from one side, or from both
// combined per coalition by effective sample size (MixCoalition).
func hybridAll(sides []*sideEstimate, names []string, threshold float64, eopt EngineOptions) ([][]float64, error) {
	vals, err := sideValuesAll(sides, names, threshold, eopt)
	if err != nil {
		return nil, err
	}
	if len(sides) == 1 {
		return vals[0], nil
	}
	ess, err := essAllSides(sides, eopt)
	if err != nil {
		return nil, err
	}
	return combineByESS(vals, ess), nil
}

// essAllSides returns ess[j][S], n_eff of the weights of hybrid S on
// sides[j].
func essAllSides(sides []*sideEstimate, eopt EngineOptions) ([][]float64, error) {
	ess := make([][]float64, len(sides))
	for j, e := range sides {
		var err error
		if ess[j], err = e.essAll(eopt); err != nil {
			return nil, err
		}
	}
	return ess, nil
}

// essSomeSides returns ess[j][c], n_eff of the weights of hybrid cs[c] on
// sides[j].
func essSomeSides(sides []*sideEstimate, cs []uint64) [][]float64 {
	ess := make([][]float64, len(sides))
	for j, e := range sides {
		ws := e.someWeights(cs)
		ess[j] = make([]float64, len(cs))
		for c, w := range ws {
			ess[j][c] = w.ESS
		}
	}
	return ess
}

// combineByESS returns Σ_j ess[j][c]·vals[j][m][c] / Σ_j ess[j][c]: per
// coalition c, the sides' estimates weighted by their effective sample
// sizes.
func combineByESS(vals [][][]float64, ess [][]float64) [][]float64 {
	out := make([][]float64, len(vals[0]))
	for m := range out {
		out[m] = make([]float64, len(vals[0][m]))
		for c := range out[m] {
			var num, den float64
			for j := range vals {
				e := ess[j][c]
				if math.IsNaN(e) {
					continue
				}
				num += e * vals[j][m][c]
				den += e
			}
			out[m][c] = num / den
		}
	}
	return out
}
