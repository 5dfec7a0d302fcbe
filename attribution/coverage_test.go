package attribution_test

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
	"gonum.org/v1/gonum/mat"
)

// independentPooled draws the two groups with different seeds (scm.Pooled
// uses common random numbers across groups, which would make the groups
// dependent and the bootstrap, which resamples them independently, too
// conservative).
func independentPooled(t *testing.T, m *scm.Model, nRef, nCmp int, seed uint64) (*attribution.Sample, []attribution.Mechanism) {
	t.Helper()
	a, mechs, err := scm.Pooled(m, nRef, 1, seed)
	if err != nil {
		t.Fatal(err)
	}
	b, _, err := scm.Pooled(m, 1, nCmp, seed+1_000_003)
	if err != nil {
		t.Fatal(err)
	}
	_, p := a.X.Dims()
	s := &attribution.Sample{X: mat.NewDense(nRef+nCmp, p, nil)}
	for r := 0; r < nRef; r++ {
		s.X.SetRow(r, a.X.RawRowView(r))
		s.Comparison = append(s.Comparison, false)
		s.Labels = append(s.Labels, a.Labels[r])
		s.Scores = append(s.Scores, a.Scores[r])
	}
	for r := 1; r <= nCmp; r++ {
		s.X.SetRow(nRef+r-1, b.X.RawRowView(r))
		s.Comparison = append(s.Comparison, true)
		s.Labels = append(s.Labels, b.Labels[r])
		s.Scores = append(s.Scores, b.Scores[r])
	}
	return s, mechs
}

// TestBootstrapCoverage draws the prevalence-shift screening model
// repeatedly and counts how often the 95% intervals (the default normal
// form: the FNR gap's by Newcombe's score interval, the contributions'
// from the default 50 refitting replicates) of the FNR gap and of every contribution
// contain the ground truth (direct simulation
// of the hybrid distributions with common random numbers + Shapley 1953; see
// package scm). With R draws × 7 quantities, the pooled coverage of a
// correct 95% procedure has a standard error of about √(0.95·0.05/(7R)),
// 0.020 for R = 16 (ignoring correlation between quantities of one draw),
// so we require at least 0.87 — four standard errors below 0.95
// and well above the 0.70s a broken interval (e.g. the fast mode ignoring
// classifier noise on small samples) tends to give.
func TestBootstrapCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("coverage study: skipped in -short")
	}
	const (
		draws = 16
		n     = 800
	)
	reps := attribution.DefaultReplicates(attribution.DefaultIntervalForm)
	c := scm.Cases()[3] // prevalence
	if c.Name != "prevalence" {
		t.Fatalf("case order changed: %s", c.Name)
	}
	truth, err := scm.GroundTruth(c.Model, []string{"fnr"}, 1_000_000, 77, scm.ScreeningThreshold, 1)
	if err != nil {
		t.Fatal(err)
	}
	tr := truth[0]
	covered, total := 0, 0
	for d := 0; d < draws; d++ {
		s, mechs := independentPooled(t, c.Model, n, n, uint64(100+d))
		dec, _, err := attribution.DecomposeWithIntervals(s, mechs, []string{"fnr"}, attribution.Options{
			Threshold: scm.ScreeningThreshold, Seed: uint64(d), Learners: []classify.Learner{classify.NewLinear()},
		}, attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: reps}})
		if err != nil {
			t.Fatal(err)
		}
		md := dec.Metrics[0]
		in := func(iv attribution.Interval, v float64) {
			total++
			if iv.Low <= v && v <= iv.High {
				covered++
			}
		}
		in(*md.GapCI, tr.Gap)
		for i, iv := range md.ContributionCIs {
			in(iv, tr.Shapley[i])
		}
	}
	cov := float64(covered) / float64(total)
	t.Logf("pooled coverage of 95%% intervals: %d/%d = %.3f", covered, total, cov)
	if cov < 0.87 || math.IsNaN(cov) {
		t.Errorf("coverage %.3f below 0.87", cov)
	}
}
