package fairness

import (
	"reflect"
	"strings"
	"testing"
)

func TestPlanAndEncode(t *testing.T) {
	spec := writeAudit(t, `data: cohort.csv
label: dx
score: score
threshold: 0.5
groups: {column: clinic, reference: north, comparison: south}
metrics: [fnr, ppv]
graph:
  - node: sex
  - node: dx
    parents: [sex]
  - node: labs
    columns: [hb, mcv]
    parents: [dx, sex]
categorical: [sex]
missing: drop
folds: 2
synthetic: true
title: test
`, "clinic,sex,dx,hb,mcv,score\n"+
		"north,F,1,11.5,80,0.7\n"+
		"north,M,0,14,90,0.2\n"+
		"north,X,0,NA,90,0.2\n"+
		"south,X,1,12,85,0.6\n"+
		"south,M,0,13,88,0.55\n")
	info, err := Plan(spec)
	if err != nil {
		t.Fatal(err)
	}
	if info.Features != 6 || info.Groups.NReference != 2 || info.Groups.NComparison != 2 || info.Groups.DroppedReference != 1 ||
		!info.Synthetic || info.Title != "test" || len(info.Warnings) != 1 || !strings.Contains(info.Warnings[0].Message, "dropped") ||
		info.Warnings[0].Kind != KindRowsDropped {
		t.Errorf("plan %+v", info)
	}
	wantNodes := []PlanNode{
		{Node: "sex", Mechanism: "sex", Parents: []string{}, Columns: []string{"sex"}, Features: 3},
		{Node: "dx", Mechanism: "dx | sex", Parents: []string{"sex"}, Columns: []string{"dx"}, Features: 1},
		{Node: "labs", Mechanism: "labs | dx, sex", Parents: []string{"dx", "sex"}, Columns: []string{"hb", "mcv"}, Features: 2},
	}
	if !reflect.DeepEqual(info.Nodes, wantNodes) {
		t.Errorf("nodes %+v", info.Nodes)
	}

	// The encoding by hand: sex has levels F, M, X (one-hot in columns
	// 0–2), then dx, hb, mcv.
	d, err := LoadData(spec)
	if err != nil {
		t.Fatal(err)
	}
	sample, mechs := encode(spec, d)
	wantX := [][]float64{
		{1, 0, 0, 1, 11.5, 80},
		{0, 1, 0, 0, 14, 90},
		{0, 0, 1, 1, 12, 85},
		{0, 1, 0, 0, 13, 88},
	}
	for i, row := range wantX {
		if got := sample.X.RawRowView(i); !reflect.DeepEqual(got, row) {
			t.Errorf("row %d = %v, want %v", i, got, row)
		}
	}
	if !reflect.DeepEqual(mechs[2].NodeCols, []int{4, 5}) || !reflect.DeepEqual(mechs[2].ParentCols, []int{3, 0, 1, 2}) ||
		!reflect.DeepEqual(mechs[0].NodeCols, []int{0, 1, 2}) || len(mechs[0].ParentCols) != 0 {
		t.Errorf("mechanisms %+v", mechs)
	}
	if !reflect.DeepEqual(sample.Comparison, []bool{false, false, true, true}) || !reflect.DeepEqual(sample.Labels, []float64{1, 0, 1, 0}) {
		t.Errorf("sample %+v", sample)
	}
}

func TestPlanMetricUndefined(t *testing.T) {
	// At threshold 0.9 no south record is decided positive, so PPV has no
	// denominator there.
	spec := writeAudit(t, strings.Replace(smallSpec, "metrics: [fpr, fnr, brier]", "metrics: [fnr, ppv]", 1),
		"site,x,dx,z,score\na,1,1,1,0.95\na,2,0,1,0.1\nb,1,1,1,0.3\nb,2,0,2,0.2\n")
	spec.Threshold = 0.9
	_, err := Plan(spec)
	if err == nil || err.Error() != `metric ppv is undefined in group "b" (site): no record is decided positive at this threshold` || !IsInputError(err) {
		t.Errorf("got %v", err)
	}
}
