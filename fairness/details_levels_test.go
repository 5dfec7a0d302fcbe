package fairness

import (
	"encoding/json"
	"math"
	"slices"
	"testing"
)

// TestDescribeBinary: a numeric column of 0s and 1s (the fixture's smoker
// column read as numbers, and the label) is described by its two values
// with each group's shares and counts, not by histogram bins. The shares
// are numpy's (fairness/testdata/details_reference.py, numpy.bincount / n,
// which the categorical smoker column is checked against too); counts are
// shares × n; the mean of a 0/1 column is the share of 1s, its sample
// variance p(1−p)·n/(n−1), and the standardised difference the numeric one
// from those (analytic).
func TestDescribeBinary(t *testing.T) {
	ds, fx := fixtureDataset(t)
	smoker := ds.Columns[2]
	ds.Columns = append(ds.Columns,
		Column{Name: "smoker01", Values: smoker.Values},
		Column{Name: "dx", Values: ds.Labels})
	d := Describe(ds, fx.Threshold, fx.Bins)
	var want struct{ Reference, Comparison []float64 }
	if err := json.Unmarshal(fx.Expected["smoker"], &want); err != nil {
		t.Fatal(err)
	}
	nRef, nCmp := len(fx.Groups["reference"].Labels), len(fx.Groups["comparison"].Labels)
	c := d.Columns[3]
	if !c.Binary || c.Categorical || c.Edges != nil || !slices.Equal(c.Levels, []string{"0", "1"}) {
		t.Fatalf("smoker01: binary %v, categorical %v, edges %v, levels %v", c.Binary, c.Categorical, c.Edges, c.Levels)
	}
	nearSlice(t, "smoker01 reference shares", c.Reference, want.Reference) // numpy.bincount / n
	nearSlice(t, "smoker01 comparison shares", c.Comparison, want.Comparison)
	for _, g := range []struct {
		name   string
		counts []int
		shares []float64
		n      int
	}{{"reference", c.CountsReference, want.Reference, nRef}, {"comparison", c.CountsComparison, want.Comparison, nCmp}} {
		if len(g.counts) != 2 || g.counts[0]+g.counts[1] != g.n {
			t.Fatalf("%s counts %v for %d records", g.name, g.counts, g.n)
		}
		for j := range g.counts {
			if math.Abs(float64(g.counts[j])-g.shares[j]*float64(g.n)) > 1e-9 {
				t.Errorf("%s count[%d] = %d, share × n = %v", g.name, j, g.counts[j], g.shares[j]*float64(g.n))
			}
		}
	}
	pr, pc := want.Reference[1], want.Comparison[1]
	vr, vc := pr*(1-pr)*float64(nRef)/float64(nRef-1), pc*(1-pc)*float64(nCmp)/float64(nCmp-1)
	nearSlice(t, "smoker01 moments", []float64{c.MeanRef, c.MeanCmp, c.SDRef, c.SDCmp}, []float64{pr, pc, math.Sqrt(vr), math.Sqrt(vc)})
	if c.StdDiff == nil || !near(*c.StdDiff, (pc-pr)/math.Sqrt((vr+vc)/2)) {
		t.Errorf("smoker01 std diff %v, want %v", fmtPtr(c.StdDiff), (pc-pr)/math.Sqrt((vr+vc)/2))
	}
	// The label: events per group are the counts of level "1".
	dx := d.Columns[4]
	if !dx.Binary || dx.CountsReference[1] != d.Reference.Events || dx.CountsComparison[1] != d.Comparison.Events {
		t.Errorf("label: binary %v, counts %v / %v, events %d / %d", dx.Binary, dx.CountsReference, dx.CountsComparison, d.Reference.Events, d.Comparison.Events)
	}
	// Categorical columns carry counts too: numpy.bincount.
	clinic := d.Columns[1]
	for j := range clinic.Levels {
		if math.Abs(float64(clinic.CountsReference[j])-clinic.Reference[j]*float64(nRef)) > 1e-9 {
			t.Errorf("clinic count[%d] = %d, share %v of %d", j, clinic.CountsReference[j], clinic.Reference[j], nRef)
		}
	}
}

// TestDescribeLevelsOrNumbers: which numeric columns are described by
// their values. Two distinct values (whatever they are) and one value
// are; three are not (PBC's oedema is 0, 0.5 or 1); missing values are
// left out of the values and counted apart.
func TestDescribeLevelsOrNumbers(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name       string
		values     []float64
		wantLevels []string // nil: numeric bins
		wantCounts []int    // reference counts
	}{
		{"zero one", []float64{0, 1, 1, 0, 1, 1}, []string{"0", "1"}, []int{1, 2}},
		{"two codes", []float64{2, 1, 2, 2, 1, 1}, []string{"1", "2"}, []int{1, 2}},
		{"decimals", []float64{0.25, 7.5, 0.25, 0.25, 7.5, 7.5}, []string{"0.25", "7.5"}, []int{2, 1}},
		{"one value", []float64{5, 5, 5, 5, 5, 5}, []string{"5"}, []int{3}},
		{"missing left out", []float64{0, nan, 1, 1, nan, 0}, []string{"0", "1"}, []int{1, 1}},
		{"three values", []float64{0, 0.5, 1, 0, 0.5, 1}, nil, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ds := &Dataset{Outside: []Column{{Name: "x", Values: tc.values}},
				Labels: []float64{0, 1, 0, 1, 0, 1}, Scores: []float64{0.1, 0.9, 0.2, 0.8, 0.3, 0.7},
				Comparison: []bool{false, false, false, true, true, true}}
			c := Describe(ds, 0.5, 4).Columns[0]
			if tc.wantLevels == nil {
				if c.Binary || c.Levels != nil || len(c.Edges) != 5 || c.CountsReference != nil {
					t.Errorf("binary %v, levels %v, edges %v, counts %v; want 4 numeric bins", c.Binary, c.Levels, c.Edges, c.CountsReference)
				}
				return
			}
			if !c.Binary || !slices.Equal(c.Levels, tc.wantLevels) || !slices.Equal(c.CountsReference, tc.wantCounts) || c.Edges != nil {
				t.Errorf("binary %v, levels %v, counts %v, edges %v; want levels %v, counts %v", c.Binary, c.Levels, c.CountsReference, c.Edges, tc.wantLevels, tc.wantCounts)
			}
		})
	}
}
