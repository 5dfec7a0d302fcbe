package fairness

import (
	"slices"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/metrics"
	"gonum.org/v1/gonum/mat"
)

// overconfident multiplies a learner's log-odds by factor: a deliberately
// broken classifier (badly overfitted or miscalibrated), whose density
// ratios r^factor are far too extreme, so the weights collapse.
type overconfident struct {
	base   classify.Learner
	factor float64
}

func (o overconfident) Name() string { return "overconfident" }

func (o overconfident) Fit(x *mat.Dense, y, w []float64, seed uint64) (classify.Model, error) {
	m, err := o.base.Fit(x, y, w, seed)
	if err != nil {
		return nil, err
	}
	return scaled{m, o.factor}, nil
}

type scaled struct {
	m classify.Model
	f float64
}

func (s scaled) LogOdds(x *mat.Dense, dst []float64) {
	s.m.LogOdds(x, dst)
	for i := range dst {
		dst[i] *= s.f
	}
}

// TestSidesCheckOnSimulatedSetups runs the checks on simulated screening
// data (package scm; the truth of each setup is known by construction):
// a clean fit must not raise sides_disagree; a broken learner and a model
// input left out of the graph must. With both sides mixed per coalition
// the broken learner's residual stays small (both ends are pinned to the
// observed metrics), so large_residual alone would miss it. The checks
// study (go run ./cmd/gapwise-accuracy -checks) measures the same setups
// over many draws; with one fixed draw each, these cases sit far from the
// threshold (clean: largest z about 2; broken and left out: above 5).
func TestSidesCheckOnSimulatedSetups(t *testing.T) {
	const n = 3000
	names := []string{metrics.NameFNR, metrics.NameFPR, metrics.NameCalibrationInTheLarge, metrics.NameBrier}
	tests := []struct {
		name      string
		caseName  string
		learner   classify.Learner
		drop      int // mechanism left out of the graph, or −1
		mix       attribution.Mix
		fire      bool // sides_disagree must fire (else must not)
		residFree bool // large_residual must not fire
	}{
		{"clean", "prevalence", classify.NewExpanded(), -1, attribution.MixDefault, false, false},
		{"broken learner", "prevalence", overconfident{classify.NewLinear(), 8}, -1, attribution.MixDefault, true, false},
		{"broken learner, residual pinned", "prevalence", overconfident{classify.NewLinear(), 8}, -1, attribution.MixCoalition, true, true},
		{"input left out", "interaction", classify.NewExpanded(), scm.NodeMarkerA, attribution.MixDefault, true, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var c scm.Case
			for _, x := range scm.Cases() {
				if x.Name == tc.caseName {
					c = x
				}
			}
			s, mechs, err := scm.Pooled(c.Model, n, n, 11)
			if err != nil {
				t.Fatal(err)
			}
			if tc.drop >= 0 {
				mechs = slices.Delete(mechs, tc.drop, tc.drop+1)
			}
			d, err := attribution.Decompose(s, mechs, names, attribution.Options{Threshold: scm.ScreeningThreshold, Seed: 3, Learners: []classify.Learner{tc.learner}, Mix: tc.mix})
			if err != nil {
				t.Fatal(err)
			}
			var kinds []WarningKind
			for _, w := range WarningsOf(d, n, n) {
				kinds = append(kinds, w.Kind)
			}
			var z []float64
			for _, md := range d.Metrics {
				z = append(z, md.Agreement.MaxZ)
			}
			t.Logf("largest z per metric %.2f; warnings %v", z, kinds)
			if got := slices.Contains(kinds, KindSidesDisagree); got != tc.fire {
				t.Errorf("sides_disagree fired: %v, want %v", got, tc.fire)
			}
			if tc.residFree && slices.Contains(kinds, KindLargeResidual) {
				t.Error("large_residual fired; this case is meant to show the residual missing a broken estimate")
			}
		})
	}
}
