package fairness

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"testing"
)

type detailsFixture struct {
	Bins      int     `json:"bins"`
	Threshold float64 `json:"threshold"`
	Groups    map[string]struct {
		Labels []float64 `json:"labels"`
		Scores []float64 `json:"scores"`
		Hb     []float64 `json:"hb"`
		Clinic []float64 `json:"clinic"`
		Smoker []float64 `json:"smoker"`
	} `json:"groups"`
	Expected map[string]json.RawMessage `json:"expected"`
}

// fixtureDataset pools the fixture's two groups into a Dataset, reference
// records first.
func fixtureDataset(t *testing.T) (*Dataset, *detailsFixture) {
	t.Helper()
	raw, err := os.ReadFile("testdata/details_reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var fx detailsFixture
	if err := json.Unmarshal(raw, &fx); err != nil {
		t.Fatal(err)
	}
	ds := &Dataset{Columns: []Column{
		{Name: "hb"},
		{Name: "clinic", Categorical: true, Levels: []string{"north", "east", "south"}},
		{Name: "smoker", Categorical: true, Levels: []string{"no", "yes"}},
	}}
	for _, name := range []string{"reference", "comparison"} {
		g := fx.Groups[name]
		ds.Labels = append(ds.Labels, g.Labels...)
		ds.Scores = append(ds.Scores, g.Scores...)
		for range g.Labels {
			ds.Comparison = append(ds.Comparison, name == "comparison")
		}
		ds.Columns[0].Values = append(ds.Columns[0].Values, g.Hb...)
		ds.Columns[1].Values = append(ds.Columns[1].Values, g.Clinic...)
		ds.Columns[2].Values = append(ds.Columns[2].Values, g.Smoker...)
	}
	return ds, &fx
}

func near(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(1, math.Abs(b)) }

func nearSlice(t *testing.T, what string, got, want []float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: got %d values %v, want %d %v", what, len(got), got, len(want), want)
		return
	}
	for i := range got {
		if !near(got[i], want[i]) {
			t.Errorf("%s[%d] = %.15g, want %.15g", what, i, got[i], want[i])
		}
	}
}

// TestDescribeReference checks Describe against numpy 1.24.2 and
// scikit-learn 1.2.1 (fairness/testdata/details_reference.py):
// confusion_matrix, calibration_curve(strategy="uniform"), numpy.histogram,
// numpy mean/var(ddof=1), and the Yang & Dalton multinomial standardised
// difference evaluated with numpy.linalg.solve.
func TestDescribeReference(t *testing.T) {
	ds, fx := fixtureDataset(t)
	d := Describe(ds, fx.Threshold, fx.Bins)

	for name, got := range map[string]GroupDetails{"reference": d.Reference, "comparison": d.Comparison} {
		var want struct {
			Confusion ConfusionCounts `json:"confusion"`
			EventRate []float64       `json:"event_rate"`
			MeanScore []float64       `json:"mean_score"`
			Count     []float64       `json:"count"`
		}
		if err := json.Unmarshal(fx.Expected[name], &want); err != nil {
			t.Fatal(err)
		}
		if got.Confusion != want.Confusion { // sklearn.metrics.confusion_matrix
			t.Errorf("%s confusion = %+v, want %+v", name, got.Confusion, want.Confusion)
		}
		if got.N != len(fx.Groups[name].Labels) || float64(got.Events) != want.Confusion.TP+want.Confusion.FN {
			t.Errorf("%s n = %d, events = %d", name, got.N, got.Events)
		}
		var er, ms, cnt []float64
		for _, b := range got.Curve {
			er = append(er, b.EventRate)
			ms = append(ms, b.MeanScore)
			cnt = append(cnt, float64(b.Count))
		}
		nearSlice(t, name+" event rate", er, want.EventRate) // sklearn calibration_curve prob_true
		nearSlice(t, name+" mean score", ms, want.MeanScore) // sklearn calibration_curve prob_pred
		nearSlice(t, name+" bin count", cnt, want.Count)     // numpy.bincount
	}

	var hb struct {
		Edges      []float64 `json:"edges"`
		Reference  []float64 `json:"reference"`
		Comparison []float64 `json:"comparison"`
		MeanRef    float64   `json:"mean_reference"`
		MeanCmp    float64   `json:"mean_comparison"`
		SDRef      float64   `json:"sd_reference"`
		SDCmp      float64   `json:"sd_comparison"`
		StdDiff    float64   `json:"std_diff"`
	}
	if err := json.Unmarshal(fx.Expected["hb"], &hb); err != nil {
		t.Fatal(err)
	}
	col := d.Columns[0]
	nearSlice(t, "hb edges", col.Edges, hb.Edges)                    // numpy.histogram bin edges
	nearSlice(t, "hb reference shares", col.Reference, hb.Reference) // numpy.histogram / n
	nearSlice(t, "hb comparison shares", col.Comparison, hb.Comparison)
	nearSlice(t, "hb moments", []float64{col.MeanRef, col.MeanCmp, col.SDRef, col.SDCmp},
		[]float64{hb.MeanRef, hb.MeanCmp, hb.SDRef, hb.SDCmp}) // numpy mean, sqrt(var(ddof=1))
	if col.StdDiff == nil || !near(*col.StdDiff, hb.StdDiff) {
		t.Errorf("hb std diff = %v, want %v (numpy)", fmtPtr(col.StdDiff), hb.StdDiff)
	}

	for i, name := range []string{"clinic", "smoker"} {
		var want struct {
			Reference, Comparison []float64
			StdDiff               float64 `json:"std_diff"`
		}
		if err := json.Unmarshal(fx.Expected[name], &want); err != nil {
			t.Fatal(err)
		}
		col := d.Columns[i+1]
		nearSlice(t, name+" reference shares", col.Reference, want.Reference) // numpy.bincount / n
		nearSlice(t, name+" comparison shares", col.Comparison, want.Comparison)
		if col.StdDiff == nil || math.Abs(*col.StdDiff-want.StdDiff) > 1e-10 {
			t.Errorf("%s std diff = %v, want %v (numpy.linalg.solve)", name, fmtPtr(col.StdDiff), want.StdDiff)
		}
	}

	// Analytic: for two levels the multinomial form equals the binary
	// proportion form |p_c − p_r| / sqrt((p_r(1−p_r) + p_c(1−p_c))/2)
	// (Austin 2009, from memory).
	pr, pc := d.Columns[2].Reference[1], d.Columns[2].Comparison[1]
	binary := math.Abs(pc-pr) / math.Sqrt((pr*(1-pr)+pc*(1-pc))/2)
	if !near(*d.Columns[2].StdDiff, binary) {
		t.Errorf("smoker std diff %v, binary form %v", *d.Columns[2].StdDiff, binary)
	}

	if _, err := json.Marshal(d); err != nil {
		t.Errorf("Details does not encode as JSON: %v", err)
	}
}

// TestDescribeEdgeCases checks hand-worked degenerate inputs.
func TestDescribeEdgeCases(t *testing.T) {
	tests := []struct {
		name       string
		col        Column
		comparison []bool
		want       *float64 // nil: undefined
		wantRef    []float64
	}{
		// One value, then two: described per value (binary), shares of the
		// levels ["2"] and ["1", "3"].
		{"constant equal", Column{Name: "x", Values: []float64{2, 2, 2, 2}}, []bool{false, false, true, true}, ptrTo(0), []float64{1}},
		{"constant different", Column{Name: "x", Values: []float64{1, 1, 3, 3}}, []bool{false, false, true, true}, nil, []float64{1, 0}},
		// means 1.5 and 3.5, variances 0.5 and 0.5: d = 2/sqrt(0.5) = 2√2.
		{"hand numeric", Column{Name: "x", Values: []float64{1, 2, 3, 4}}, []bool{false, false, true, true}, ptrTo(2 * math.Sqrt2), []float64{1, 0}},
		// each group has one level only: pooled covariance is 0.
		{"disjoint levels", Column{Name: "c", Categorical: true, Levels: []string{"a", "b"}, Values: []float64{0, 0, 1, 1}}, []bool{false, false, true, true}, nil, []float64{1, 0}},
		{"one level", Column{Name: "c", Categorical: true, Levels: []string{"a"}, Values: []float64{0, 0, 0, 0}}, []bool{false, false, true, true}, ptrTo(0), []float64{1}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			ds := &Dataset{Columns: []Column{tt.col}, Labels: []float64{0, 1, 0, 1}, Scores: []float64{0.1, 0.9, 0.2, 0.8}, Comparison: tt.comparison}
			d := Describe(ds, 0.5, 2)
			got := d.Columns[0].StdDiff
			switch {
			case tt.want == nil && got != nil:
				t.Errorf("std diff = %v, want undefined", *got)
			case tt.want != nil && (got == nil || !near(*got, *tt.want)):
				t.Errorf("std diff = %v, want %v", fmtPtr(got), *tt.want)
			}
			nearSlice(t, "reference shares", d.Columns[0].Reference, tt.wantRef)
			if _, err := json.Marshal(d); err != nil {
				t.Errorf("not JSON-encodable: %v", err)
			}
		})
	}
}

func TestDescribePanics(t *testing.T) {
	defer func() {
		if r := recover(); r == nil {
			t.Fatal("Describe with mismatched lengths did not panic")
		}
	}()
	Describe(&Dataset{Labels: []float64{1}, Scores: []float64{0.5}, Comparison: []bool{true, false}}, 0.5, 2)
}

func ExampleDescribe() {
	ds := &Dataset{
		Columns:    []Column{{Name: "age", Values: []float64{30, 40, 50, 60}}},
		Labels:     []float64{1, 0, 1, 0},
		Scores:     []float64{0.8, 0.3, 0.4, 0.6},
		Comparison: []bool{false, false, true, true},
	}
	d := Describe(ds, 0.5, 2)
	fmt.Printf("reference %+v\n", d.Reference.Confusion)
	fmt.Printf("comparison %+v\n", d.Comparison.Confusion)
	c := d.Columns[0]
	fmt.Printf("edges %v, shares %v vs %v, d = %.3f\n", c.Edges, c.Reference, c.Comparison, *c.StdDiff)
	// Output:
	// reference {TP:1 FP:0 TN:1 FN:0}
	// comparison {TP:0 FP:1 TN:0 FN:1}
	// edges [30 45 60], shares [1 0] vs [0 1], d = 2.828
}

func fmtPtr(p *float64) string {
	if p == nil {
		return "undefined"
	}
	return fmt.Sprint(*p)
}
