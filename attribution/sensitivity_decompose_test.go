package attribution_test

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// On a decomposition of the three-mechanism sample (threeNodeSample),
// Λ = 1 must return the reported contributions and estimated gap exactly
// (no hidden factor: the point estimate, by definition of the model), the
// bounds must be nested as Λ grows (analytic: the box of weights at a
// smaller Λ lies inside that at a larger one), and ECE and AUC must be
// skipped with their reasons.
func TestSensitivityOfDecomposition(t *testing.T) {
	s, mechs := threeNodeSample(400, 21)
	names := []string{"fnr", "brier", "ece", "auc"}
	d, err := attribution.Decompose(s, mechs, names, attribution.Options{Threshold: 0.5, Seed: 4, FoldSplits: 2, Learners: []classify.Learner{classify.NewLinear()}})
	if err != nil {
		t.Fatal(err)
	}
	factors := []float64{1, 1.1, 1.25, 1.5, 2, 4}
	sens, err := d.Sensitivity(attribution.SensitivityOptions{Factors: factors})
	if err != nil {
		t.Fatal(err)
	}
	if sens.Side != attribution.SideReference {
		t.Errorf("side %v, want the reference side (it estimates by default)", sens.Side)
	}
	for m, ms := range sens.Metrics {
		md := d.Metrics[m]
		if md.Metric == "ece" || md.Metric == "auc" {
			if ms.Skipped == "" {
				t.Errorf("%s: not skipped", md.Metric)
			}
			continue
		}
		if ms.Skipped != "" {
			t.Fatalf("%s skipped: %s", md.Metric, ms.Skipped)
		}
		if b := ms.Estimated[0]; b.Lower != md.Estimated || b.Upper != md.Estimated {
			t.Errorf("%s: Λ = 1 gives [%v, %v], estimate %v", md.Metric, b.Lower, b.Upper, md.Estimated)
		}
		t.Logf("%s: sign factors %v, lead %d at %v, gap %v", md.Metric, ms.SignFactors, ms.Lead, ms.LeadFactor, ms.EstimatedSignFactor)
		for i, bs := range ms.Contributions {
			v := md.Contributions[i]
			if bs[0].Lower != v || bs[0].Upper != v {
				t.Errorf("%s φ_%d: Λ = 1 gives [%v, %v], estimate %v", md.Metric, i, bs[0].Lower, bs[0].Upper, v)
			}
			for j := 1; j < len(bs); j++ {
				if bs[j].Lower > bs[j-1].Lower+1e-12 || bs[j].Upper < bs[j-1].Upper-1e-12 {
					t.Errorf("%s φ_%d: bounds at Λ %v [%v, %v] not containing those at %v [%v, %v]", md.Metric, i, factors[j], bs[j].Lower, bs[j].Upper, factors[j-1], bs[j-1].Lower, bs[j-1].Upper)
				}
			}
			// The smallest reversing Λ is where the bound crosses zero.
			if f := ms.SignFactors[i]; !math.IsInf(f, 1) && f > 1.01 {
				at, err := d.Sensitivity(attribution.SensitivityOptions{Factors: []float64{f, f / (1 + 2e-3)}})
				if err != nil {
					t.Fatal(err)
				}
				b := at.Metrics[m].Contributions[i]
				if !(b[0].Lower <= 0 && b[0].Upper >= 0) || (b[1].Lower <= 0 && b[1].Upper >= 0) {
					t.Errorf("%s φ_%d: sign factor %v, bounds there %v and just below %v", md.Metric, i, f, b[0], b[1])
				}
			}
		}
	}
}
