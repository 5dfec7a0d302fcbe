package fairness

import (
	"fmt"
	"math"
	"strings"

	"github.com/gapwise/gapwise/attribution"
)

// HiddenFactor is the sensitivity analysis for an unrecorded factor (the
// result key hidden_factor; attribution.Decomposition.Sensitivity): under
// a marginal sensitivity model (Tan 2006; Zhao, Small & Bhattacharya
// 2019) the weights that emulate every hybrid distribution may each be off
// by a factor in [1/Λ, Λ], which is what an unrecorded factor shifting the
// odds of group membership by up to Λ does to the grand coalition's
// weights. It is computed on the weighting game of one side (Side) and
// applied to the reported values as a shift; the Shapley bounds are
// conservative.
type HiddenFactor struct {
	// Factors are the Λ of every bound, ascending.
	Factors []float64 `json:"factors"`
	// MaxFactor is the largest Λ searched for a sign or lead change.
	MaxFactor float64 `json:"max_factor"`
	// Side names the records whose weighting game was bounded:
	// reference or comparison.
	Side    string               `json:"side"`
	Metrics []HiddenFactorMetric `json:"metrics"`
}

// HiddenFactorMetric is one metric's sensitivity.
type HiddenFactorMetric struct {
	Metric string `json:"metric"`
	// Skipped says why the metric is not bounded (AUC, ECE, sampled
	// Shapley values); the other fields are then absent.
	Skipped string `json:"skipped,omitempty"`
	// EstimatedGap bounds the estimated gap (Σ contributions).
	EstimatedGap *HiddenFactorValue `json:"estimated_gap,omitempty"`
	// Contributions bound each mechanism's contribution, in graph order.
	Contributions []HiddenFactorValue `json:"contributions,omitempty"`
	// LeadNode is the mechanism of largest |contribution| and
	// LeadChangeFactor the smallest Λ at which another mechanism's
	// largest possible |contribution| reaches the lead's smallest: null
	// when not within max_factor (or with one mechanism).
	LeadNode         string   `json:"lead_node,omitempty"`
	LeadChangeFactor *float64 `json:"lead_change_factor"`
}

// HiddenFactorValue is the sensitivity of one value.
type HiddenFactorValue struct {
	Node   string        `json:"node,omitempty"` // the mechanism's node; absent for the gap
	Value  float64       `json:"value"`          // the reported value (Λ = 1)
	Bounds []FactorBound `json:"bounds"`
	// ReversalFactor is the smallest Λ whose bounds reach zero, so that
	// the sign could change (1 for a value of 0); null when not within
	// max_factor.
	ReversalFactor *float64 `json:"reversal_factor"`
}

// FactorBound is the range [Low, High] of a value at factor Λ.
type FactorBound struct {
	Factor float64 `json:"factor"`
	Low    float64 `json:"low"`
	High   float64 `json:"high"`
}

// hiddenFactor runs the analysis of dec for the spec; nil when the spec
// turns it off.
func hiddenFactor(spec *Spec, dec *attribution.Decomposition, nodes []string) (*HiddenFactor, error) {
	if spec.HiddenFactor.Off {
		return nil, nil
	}
	sens, err := dec.Sensitivity(spec.HiddenFactor.sensitivityOptions())
	if err != nil {
		return nil, err
	}
	out := &HiddenFactor{Factors: sens.Factors, MaxFactor: sens.MaxFactor, Side: sens.Side.String(), Metrics: []HiddenFactorMetric{}}
	for m, ms := range sens.Metrics {
		out.Metrics = append(out.Metrics, hiddenFactorMetric(ms, dec.Metrics[m], nodes))
	}
	return out, nil
}

func hiddenFactorMetric(ms attribution.MetricSensitivity, md attribution.MetricDecomposition, nodes []string) HiddenFactorMetric {
	hm := HiddenFactorMetric{Metric: ms.Metric, Skipped: ms.Skipped}
	if ms.Skipped != "" {
		return hm
	}
	hm.EstimatedGap = &HiddenFactorValue{Value: md.Estimated, Bounds: factorBounds(ms.Estimated), ReversalFactor: finiteFactor(ms.EstimatedSignFactor)}
	for i, bs := range ms.Contributions {
		hm.Contributions = append(hm.Contributions, HiddenFactorValue{Node: nodes[i], Value: md.Contributions[i], Bounds: factorBounds(bs), ReversalFactor: finiteFactor(ms.SignFactors[i])})
	}
	if len(nodes) > 0 {
		hm.LeadNode = nodes[ms.Lead]
		hm.LeadChangeFactor = finiteFactor(ms.LeadFactor)
	}
	return hm
}

func factorBounds(bs []attribution.SensitivityBound) []FactorBound {
	out := make([]FactorBound, len(bs))
	for j, b := range bs {
		out[j] = FactorBound{Factor: b.Factor, Low: b.Lower, High: b.Upper}
	}
	return out
}

func finiteFactor(f float64) *float64 {
	if math.IsInf(f, 0) || math.IsNaN(f) {
		return nil
	}
	return &f
}

// FragileFactor is the Λ up to which a reversal makes a warning: an
// unrecorded factor shifting the odds of group membership by up to 25%
// is modest next to the factors that sensitivity analyses of observational
// studies commonly consider (common practice: values of Λ from 1.1 to 2
// and beyond).
const FragileFactor = 1.25

// hiddenFactorWarnings returns one KindHiddenFactor note, for all
// metrics at once (one cause, reported once), when a clear conclusion
// could reverse at Λ ≤ FragileFactor: the sign of a metric's leading
// contribution, when its interval excludes zero (or without intervals),
// or the sign of its estimated gap, when the observed gap's interval
// excludes zero (or without intervals). Nodes lists the leading
// mechanisms concerned, in graph order.
func hiddenFactorWarnings(r *Result) []Warning {
	if r.HiddenFactor == nil {
		return nil
	}
	var parts []string
	lead := map[string]bool{}
	for _, hm := range r.HiddenFactor.Metrics {
		mr := r.metric(hm.Metric)
		if hm.Skipped != "" || mr == nil {
			continue
		}
		var what []string
		if c, ok := leadValue(hm); ok && fragile(c.ReversalFactor) && clearContribution(mr, c.Node) {
			what = append(what, fmt.Sprintf("the sign of the contribution of `%s` (from a factor of %s)", r.MechanismName(c.Node), factorText(*c.ReversalFactor)))
			lead[c.Node] = true
		}
		if g := hm.EstimatedGap; fragile(g.ReversalFactor) && clearInterval(mr.GapCI) {
			what = append(what, fmt.Sprintf("the sign of the estimated gap (from a factor of %s)", factorText(*g.ReversalFactor)))
		}
		if len(what) > 0 {
			parts = append(parts, fmt.Sprintf("for %s %s", hm.Metric, joinAnd(what)))
		}
	}
	if len(parts) == 0 {
		return nil
	}
	nodes := []string{}
	for _, m := range r.Mechanisms {
		if lead[m.Node] {
			nodes = append(nodes, m.Node)
		}
	}
	msg := fmt.Sprintf("an unrecorded factor that shifts the odds of group membership by up to %s could reverse %s; see the sensitivity section for the factor each conclusion withstands", percentText(FragileFactor), strings.Join(parts, "; "))
	return []Warning{{Kind: KindHiddenFactor, Severity: SeverityNote, Nodes: nodes, Message: msg}}
}

func (r *Result) metric(name string) *MetricResult {
	for i := range r.Metrics {
		if r.Metrics[i].Metric == name {
			return &r.Metrics[i]
		}
	}
	return nil
}

func leadValue(hm HiddenFactorMetric) (HiddenFactorValue, bool) {
	for _, c := range hm.Contributions {
		if c.Node == hm.LeadNode {
			return c, true
		}
	}
	return HiddenFactorValue{}, false
}

func fragile(f *float64) bool { return f != nil && *f <= FragileFactor }

// clearContribution reports whether node's contribution in mr is a clear
// conclusion: its interval excludes zero, or it has none.
func clearContribution(mr *MetricResult, node string) bool {
	for _, c := range mr.Contributions {
		if c.Node == node {
			if c.CILow == nil || c.CIHigh == nil {
				return c.Value != 0
			}
			return *c.CILow > 0 || *c.CIHigh < 0
		}
	}
	return false
}

func clearInterval(iv *Interval) bool {
	return iv == nil || iv.Low > 0 || iv.High < 0
}

// factorText writes Λ with two decimals ("1.12").
func factorText(f float64) string { return fmt.Sprintf("%.2f", f) }

// percentText writes Λ as the shift of the odds it allows ("25%").
func percentText(f float64) string { return fmt.Sprintf("%.0f%%", 100*(f-1)) }

func joinAnd(xs []string) string {
	switch len(xs) {
	case 0:
		return ""
	case 1:
		return xs[0]
	}
	return xs[0] + " and " + xs[1]
}

// mechanismNodes lists the node of every mechanism of dec, in order.
func mechanismNodes(dec *attribution.Decomposition) []string {
	out := make([]string, len(dec.Mechanisms))
	for i, m := range dec.Mechanisms {
		out[i] = m.Mechanism.Node
	}
	return out
}
