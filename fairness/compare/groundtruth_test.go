package compare

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/synth"
)

// rates returns FNR and FPR at threshold 0.5 of recs, from their
// definitions FNR = FN/(TP+FN), FPR = FP/(FP+TN).
func rates(recs []synth.Record) [2]float64 {
	var tp, fn, fp, tn float64
	for _, r := range recs {
		pos := r.Score >= 0.5
		switch {
		case r.Anaemia == 1 && pos:
			tp++
		case r.Anaemia == 1:
			fn++
		case pos:
			fp++
		default:
			tn++
		}
	}
	return [2]float64{fn / (tp + fn), fp / (fp + tn)}
}

// trueShapley returns the Shapley values φ[metric][node] (FNR, FPR; nodes
// in synth.AnaemiaNodes order) of the scenario's mechanisms: v(S) is the
// metric under the hybrid P_S that takes women's mechanism for the nodes
// of S, sampled with common random numbers, and φ_i = Σ_{S ∌ i}
// |S|!(k−|S|−1)!/k! (v(S∪{i}) − v(S)) (Shapley 1953, "A value for
// n-person games"). Nothing of gapwise's estimator is used.
func trueShapley(s synth.Scenario, n int) [2][]float64 {
	nodes := synth.AnaemiaNodes()
	k := len(nodes)
	v := make([][2]float64, 1<<k)
	for m := range v {
		var from []string
		for i, nd := range nodes {
			if m>>i&1 == 1 {
				from = append(from, nd)
			}
		}
		v[m] = rates(s.GenerateHybrid(n, 99, from))
	}
	fact := []float64{1, 1, 2, 6, 24, 120}
	var phi [2][]float64
	for q := range phi {
		phi[q] = make([]float64, k)
	}
	for i := range k {
		for m := range v {
			if m>>i&1 == 1 {
				continue
			}
			size := 0
			for j := range k {
				size += m >> j & 1
			}
			w := fact[size] * fact[k-size-1] / fact[k]
			for q := range phi {
				phi[q][i] += w * (v[m|1<<i][q] - v[m][q])
			}
		}
	}
	return phi
}

// auditCohort writes n records of s drawn with seed into a folder with
// the demo's spec and audits them with 40 fast bootstrap replicates.
func auditCohort(t *testing.T, s synth.Scenario, n int, seed uint64) *fairness.Result {
	t.Helper()
	dir := t.TempDir()
	var csv bytes.Buffer
	if err := synth.AnaemiaTable(s.Generate(n, seed)).WriteCSV(&csv); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "cohort.csv"), csv.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	spec := filepath.Join(dir, "spec.yaml")
	if err := os.WriteFile(spec, synth.AnaemiaSpec("cohort.csv"), 0o644); err != nil {
		t.Fatal(err)
	}
	sp, err := fairness.LoadSpec(spec)
	if err != nil {
		t.Fatal(err)
	}
	res, err := fairness.Run(sp, fairness.RunOptions{Intervals: &fairness.Intervals{Replicates: 40, Level: 0.95, KeepRatios: true}})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// TestReviewAgainstGroundTruth audits two periods of the anaemia scenario
// on disjoint cohorts: in the second, women's haemoglobin presents closer
// to men's (healthy 14.3 instead of 13.5 g/dL, anaemic 11.3 instead of
// 10.8), so the shift of the hb mechanism, and its contribution, shrinks
// while the other mechanisms stay as they were. The review's change of
// every contribution is checked against the change of the true Shapley
// values (simulated from the known mechanisms, trueShapley): within the
// change interval (independent cohorts, MOVER) widened by the estimator's
// bias allowance of the demo's ground-truth test (0.03 + 25 % of the true
// value, per run), and the hb change must be the largest and have the
// true sign, and for the FPR (thousands of negatives) an interval that
// excludes zero.
func TestReviewAgainstGroundTruth(t *testing.T) {
	if testing.Short() {
		t.Skip("audits two cohorts and simulates 64 hybrid cohorts")
	}
	s1 := synth.DefaultScenario()
	s2 := s1
	s2.Female.HbHealthy, s2.Female.HbAnaemic = 14.3, 11.3
	const n = 12000
	before, after := auditCohort(t, s1, n, 11), auditCohort(t, s2, n, 12)
	rv, err := NewReview("period1.json", before, "period2.json", after, Options{Independent: true})
	if err != nil {
		t.Fatal(err)
	}
	if rv.Intervals == nil || rv.Intervals.Method != MethodIndependent {
		t.Fatalf("change intervals %+v, want the independent method", rv.Intervals)
	}
	t1, t2 := trueShapley(s1, 60000), trueShapley(s2, 60000)
	nodes := synth.AnaemiaNodes()
	for q, metric := range []string{"fnr", "fpr"} {
		var mc *MetricChange
		for i := range rv.Comparisons[0].Metrics {
			if rv.Comparisons[0].Metrics[i].Metric == metric {
				mc = &rv.Comparisons[0].Metrics[i]
			}
		}
		if mc == nil {
			t.Fatalf("metric %s missing from the review", metric)
		}
		largest := ""
		for i, c := range mc.Contributions {
			want := t2[q][i] - t1[q][i]
			bias := 0.03 + 0.25*(math.Abs(t1[q][i])+math.Abs(t2[q][i]))/2
			ci := c.ChangeCI
			if ci == nil {
				t.Fatalf("%s %s: no change interval", metric, c.Node)
			}
			t.Logf("%s %-7s change %+.4f [%+.4f, %+.4f], true %+.4f", metric, c.Node, c.Change.Change, ci.Low, ci.High, want)
			if want < ci.Low-bias || want > ci.High+bias {
				t.Errorf("%s %s: change %+.4f [%+.4f, %+.4f], true change %+.4f (allowance %.4f)", metric, c.Node, c.Change.Change, ci.Low, ci.High, want, bias)
			}
			if largest == "" || math.Abs(c.Change.Change) > math.Abs(contribution(mc, largest).Change.Change) {
				largest = nodes[i]
			}
		}
		hb := contribution(mc, synth.ColHb)
		wantHb := t2[q][2] - t1[q][2]
		if largest != synth.ColHb || math.Signbit(hb.Change.Change) != math.Signbit(wantHb) {
			t.Errorf("%s: largest change from %s (hb %+.4f, true %+.4f), want hb with the true sign", metric, largest, hb.Change.Change, wantHb)
		}
		// The FPR change is large against its noise (thousands of
		// negatives); the FNR one, on a few hundred positives, is not.
		if metric == "fpr" && hb.ChangeCI.Low <= 0 && hb.ChangeCI.High >= 0 {
			t.Errorf("%s: hb change interval [%+.4f, %+.4f] includes zero; the true change is %+.4f", metric, hb.ChangeCI.Low, hb.ChangeCI.High, wantHb)
		}
		if d := mc.Gap.Change; math.Abs(d-(mc.Gap.After-mc.Gap.Before)) > 1e-12 {
			t.Errorf("%s: gap change %v is not after − before", metric, d)
		}
	}
}

func contribution(mc *MetricChange, node string) ContributionChange {
	for _, c := range mc.Contributions {
		if c.Node == node {
			return c
		}
	}
	return ContributionChange{}
}
