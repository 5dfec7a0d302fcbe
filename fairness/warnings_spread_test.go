package fairness

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// spreadData draws dx ~ Bernoulli(0.3) and x | dx ~ N(1.5·dx, σ_g²) with
// σ_ref = 1 and σ_cmp = sigma, score = σ(−1 + 1.2·x).
func spreadData(n int, sigma float64, seed uint64) string {
	rng := rand.New(rand.NewPCG(seed, 11))
	var b strings.Builder
	b.WriteString("site,dx,x,score\n")
	for i := range n {
		site, sd := "a", 1.0
		if i%2 == 1 {
			site, sd = "b", sigma
		}
		dx := 0
		if rng.Float64() < 0.3 {
			dx = 1
		}
		x := 1.5*float64(dx) + sd*rng.NormFloat64()
		fmt.Fprintf(&b, "%s,%d,%.4f,%.6f\n", site, dx, x, 1/(1+math.Exp(1-1.2*x)))
	}
	return b.String()
}

const spreadSpec = `data: cohort.csv
label: dx
score: score
threshold: 0.5
groups: {column: site, reference: a, comparison: b}
metrics: [fpr, fnr]
graph:
  - node: dx
  - node: x
    parents: [dx]
classifier: expanded
`

// TestWarningsOnSpreadShift: when the comparison group's finding is wider
// (σ_cmp = 2 > √2·σ_ref), the reference weights r = N(σ_cmp)/N(1) have an
// infinite second moment — E_ref[r²] = ∫ p_cmp²/p_ref diverges unless
// σ_cmp² < 2σ_ref² (analytic: the exponent of p_cmp²/p_ref is
// x²(1/2 − 1/σ_cmp²)) — so estimating from the reference records must be
// flagged for `x` (by the Pareto tail shape, attribution.TailShape: here
// the effective sample size alone, 17% of the records, does not look
// alarming). In the safe direction (σ_cmp = 0.7) it must not be.
func TestWarningsOnSpreadShift(t *testing.T) {
	for _, tc := range []struct {
		sigma float64
		want  bool
	}{{2.0, true}, {0.7, false}} {
		spec := writeAudit(t, spreadSpec+"estimate_from: reference\n", spreadData(8000, tc.sigma, 3))
		r, err := Run(spec, RunOptions{})
		if err != nil {
			t.Fatal(err)
		}
		flagged := false
		var all []string
		for _, w := range r.Warnings {
			all = append(all, w.Message)
			// Reliability warnings only: the share of extreme ratios also
			// counts ratios near 0, which are harmless when reweighting
			// the reference records.
			switch w.Kind {
			case KindHeavyTail, KindLowEffectiveRecords, KindDominantRecord, KindWorstHybrid:
				if slices.Contains(w.Nodes, "x") {
					flagged = true
				}
			}
		}
		if flagged != tc.want {
			t.Errorf("σ_cmp = %v: weight warning for x = %v, want %v; warnings:\n%s\nmechanisms: %+v", tc.sigma, flagged, tc.want, strings.Join(all, "\n"), r.Mechanisms)
		}
		// Run sets every verdict; the one on x follows its warnings:
		// flagged means at least a caution.
		for _, m := range r.Mechanisms {
			if m.Reliability.Verdict == "" || m.Reliability.Kinds == nil {
				t.Errorf("σ_cmp = %v: Run left the reliability of %s unset", tc.sigma, m.Node)
			}
		}
		if x := r.Mechanisms[1]; x.Node != "x" || (tc.want && !x.Reliability.Verdict.AtLeast(SeverityCaution)) {
			t.Errorf("σ_cmp = %v: mechanism %s has verdict %q (%v), want at least caution", tc.sigma, x.Node, x.Reliability.Verdict, x.Reliability.Kinds)
		}
	}
}
