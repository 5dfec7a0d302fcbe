package fairness

import (
	"bytes"
	"encoding/json"
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
)

// TestRunEstimators maps each estimator into the Result on the small
// table: robust gives every metric's contributions with a residual of 0
// (both ends are the observed metrics), influence-function standard errors
// and Wald intervals (the intervals when no bootstrap ran) and the check
// against the weighting estimate; both keeps the weighting numbers exactly
// and adds the same check; weighting has neither.
func TestRunEstimators(t *testing.T) {
	run := func(est string) *Result {
		t.Helper()
		spec := writeAudit(t, smallSpec+"estimator: "+est+"\n", smallData(400))
		r, err := Run(spec, RunOptions{Workers: 2, Version: "test"})
		if err != nil {
			t.Fatal(err)
		}
		if r.Settings.Estimator != est {
			t.Fatalf("settings.estimator %q, want %q", r.Settings.Estimator, est)
		}
		return r
	}
	weighting, robust, both := run("weighting"), run("robust"), run("both")
	for m := range weighting.Metrics {
		w, r, b := weighting.Metrics[m], robust.Metrics[m], both.Metrics[m]
		if w.Estimator != "weighting" || b.Estimator != "weighting" || r.Estimator != "robust" {
			t.Errorf("%s: estimators %q, %q, %q", w.Metric, w.Estimator, r.Estimator, b.Estimator)
		}
		if w.Uncertainty != nil || b.Uncertainty != nil || w.EstimatorCheck != nil {
			t.Errorf("%s: uncertainty or check where the weighting estimate alone gives the numbers", w.Metric)
		}
		if !reflect.DeepEqual(contributionValues(w), contributionValues(b)) {
			t.Errorf("%s: both changed the weighting contributions", w.Metric)
		}
		if math.Abs(r.Residual) > 1e-9 {
			t.Errorf("%s: robust residual %g, want 0", r.Metric, r.Residual)
		}
		u := r.Uncertainty
		if u == nil || u.Method != UncertaintyInfluence || r.GapCI == nil || *r.GapCI != u.GapCI {
			t.Fatalf("%s: robust uncertainty %+v, gap interval %v", r.Metric, u, r.GapCI)
		}
		if !(u.GapCI.Low < r.Gap && r.Gap < u.GapCI.High) {
			t.Errorf("%s: gap %g outside its interval %+v", r.Metric, r.Gap, u.GapCI)
		}
		for i, c := range r.Contributions {
			if c.Uncertainty == nil || c.CILow == nil || *c.CILow != c.Uncertainty.CI.Low {
				t.Errorf("%s %s: no influence interval", r.Metric, c.Node)
			}
			d, db := c.EstimatorDifference, b.Contributions[i].EstimatorDifference
			if d == nil || db == nil || d.Robust != c.Value || d.Weighting != w.Contributions[i].Value || d.Difference != db.Difference ||
				d.StdError == nil || db.StdError == nil || *d.StdError != *db.StdError {
				t.Errorf("%s %s: estimator difference %+v (both: %+v), want robust %g, weighting %g", r.Metric, c.Node, d, db, c.Value, w.Contributions[i].Value)
			}
		}
		if r.EstimatorCheck == nil || r.EstimatorCheck.MaxZ == nil || math.Abs(r.EstimatorCheck.WeightingEstimated-w.Estimated) > 1e-12 {
			t.Errorf("%s: estimator check %+v", r.Metric, r.EstimatorCheck)
		}
	}
}

func contributionValues(m MetricResult) []float64 {
	var out []float64
	for _, c := range m.Contributions {
		out = append(out, c.Value)
	}
	return out
}

// TestNodeReads: the label's node, and the score's inputs as the graph
// nodes that hold them when they are known (the score's node, or declared
// model inputs all inside the graph); unknown (nil) otherwise.
func TestNodeReads(t *testing.T) {
	base := strings.Replace(smallSpec, "classifier: linear\n", "", 1)
	for _, tc := range []struct {
		extra      string
		label, fed []int
	}{
		{"", []int{1}, nil},
		{"model_inputs: [x, z]\n", []int{1}, []int{0, 2}},
		{"model_inputs: [z]\n", []int{1}, []int{2}},
		{"model_inputs: [z, w]\n", []int{1}, nil}, // w is in no node
	} {
		spec := writeAudit(t, base+tc.extra, "site,x,dx,z,w,score\na,1,0,1,1,0.2\nb,1,1,2,1,0.7\n")
		got := nodeReads(spec)
		if !reflect.DeepEqual(got, attribution.NodeReads{Label: tc.label, Score: tc.fed}) {
			t.Errorf("%q: reads %+v, want label %v score %v", tc.extra, got, tc.label, tc.fed)
		}
	}
}

// TestRunRobustDeterministic: the robust estimate and its standard errors
// do not depend on the number of workers (fixed blocks summed in order).
func TestRunRobustDeterministic(t *testing.T) {
	spec := writeAudit(t, smallSpec+"estimator: robust\n", smallData(300))
	var out [2][]byte
	for i, w := range []int{1, 2} {
		r, err := Run(spec, RunOptions{Workers: w, Version: "test"})
		if err != nil {
			t.Fatal(err)
		}
		if out[i], err = json.Marshal(r); err != nil {
			t.Fatal(err)
		}
	}
	if !bytes.Equal(out[0], out[1]) {
		t.Error("robust results differ between 1 and 2 workers")
	}
}
