package fairness

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

// TestReadDataIndicator: with missing: indicator a missing numeric value
// is filled with the column's observed mean and marked, a missing
// categorical value becomes the level MissingLevel, and a row whose label
// or score is missing is dropped and counted.
func TestReadDataIndicator(t *testing.T) {
	csv := "clinic,sex,dx,hb,mcv,score\n" +
		"north,F,1,10,80,0.7\n" +
		"north,,0,NA,90,0.2\n" +
		"south,M,1,14,,0.6\n" +
		"south,F,0,12,85,0.1\n" +
		"south,F,NA,12,85,0.1\n"
	d, err := ReadData(strings.NewReader(csv), "cohort.csv", dataSpec(t, "missing: indicator\n"))
	if err != nil {
		t.Fatal(err)
	}
	hb, mcv, sex := d.Columns[2], d.Columns[3], d.Columns[0]
	if !reflect.DeepEqual(hb.Values, []float64{10, 12, 14, 12}) || !reflect.DeepEqual(hb.Missing, []bool{false, true, false, false}) {
		t.Errorf("hb %v %v; want the mean 12 filled in row 2", hb.Values, hb.Missing)
	}
	if want := (80 + 90 + 85) / 3.0; mcv.Values[2] != want || !mcv.Missing[2] {
		t.Errorf("mcv %v %v", mcv.Values, mcv.Missing)
	}
	if !reflect.DeepEqual(sex.Levels, []string{MissingLevel, "F", "M"}) || sex.Values[1] != 0 || sex.Missing != nil {
		t.Errorf("sex levels %v values %v", sex.Levels, sex.Values)
	}
	if d.DroppedComparison != 1 || d.DroppedReference != 0 || len(d.Labels) != 4 {
		t.Errorf("dropped %d/%d, kept %d", d.DroppedReference, d.DroppedComparison, len(d.Labels))
	}
	s, mechs := encode(dataSpec(t, "missing: indicator\n"), d)
	// sex: 3 levels; dx; hb and its indicator; mcv and its indicator.
	if s.X.RawMatrix().Cols != 8 || !reflect.DeepEqual(mechs[2].NodeCols, []int{4, 5, 6, 7}) || s.X.At(1, 5) != 1 || s.X.At(0, 5) != 0 {
		t.Errorf("features %d, labs node columns %v", s.X.RawMatrix().Cols, mechs[2].NodeCols)
	}
}

// missingData has identical distributions in both sites except that z is
// missing completely at random in 40% of site b's rows and never at site a.
func missingData(n int) string {
	rng := rand.New(rand.NewPCG(5, 6))
	var b strings.Builder
	b.WriteString("site,x,dx,z,score\n")
	for i := range n {
		site := "a"
		if i%2 == 1 {
			site = "b"
		}
		x := rng.NormFloat64()
		dx := 0
		if rng.Float64() < 1/(1+math.Exp(-x)) {
			dx = 1
		}
		z := float64(dx) + rng.NormFloat64()
		score := 1 / (1 + math.Exp(-(x + z - 0.5)))
		cell := fmt.Sprintf("%.4f", z)
		if site == "b" && rng.Float64() < 0.4 {
			cell = "NA"
		}
		fmt.Fprintf(&b, "%s,%.4f,%d,%s,%.4f\n", site, x, dx, cell, score)
	}
	return b.String()
}

// TestMissingIndicatorMechanism: the missingness becomes part of z's
// mechanism. A classifier that spots the missing rows ranks those 40% of
// site b above every site-a row and the rest at chance, so z's group
// classifier has AUC 0.4·1 + 0.6·0.5 = 0.7 (analytic); with missing: drop
// the sites are alike (AUC 0.5) and the rows dropped unequally (0% and
// 40%) raise a caution, with the gap on all records reported.
func TestMissingIndicatorMechanism(t *testing.T) {
	if testing.Short() {
		t.Skip("fits group classifiers on 6,000 records")
	}
	spec := smallSpec
	aucOf := func(r *Result) float64 {
		for _, m := range r.Mechanisms {
			if m.Node == "z" {
				return m.AUC
			}
		}
		t.Fatal("no mechanism z")
		return 0
	}
	ind, err := Run(writeAudit(t, spec+"missing: indicator\n", missingData(6000)), RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if a := aucOf(ind); math.Abs(a-0.7) > 0.03 {
		t.Errorf("indicator: AUC of z's classifier %.3f, want 0.7 ± 0.03", a)
	}
	drop, err := Run(writeAudit(t, spec+"missing: drop\n", missingData(6000)), RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("AUC of z's classifier: indicator %.3f, drop %.3f", aucOf(ind), aucOf(drop))
	if a := aucOf(drop); math.Abs(a-0.5) > 0.04 {
		t.Errorf("drop: AUC of z's classifier %.3f, want 0.5 ± 0.04", a)
	}
	if drop.Warnings[0].Kind != KindRowsDropped || drop.Warnings[0].Severity != SeverityCaution {
		t.Errorf("first warning %+v, want a rows_dropped caution", drop.Warnings[0])
	}
	for _, m := range drop.Metrics {
		if m.AllRecords == nil || m.AllRecords.NReference != 3000 || m.AllRecords.NComparison != 3000 {
			t.Errorf("%s: all records %+v, want 3000 per group", m.Metric, m.AllRecords)
		}
	}
	for _, m := range ind.Metrics {
		if m.AllRecords != nil {
			t.Errorf("%s: all_records without dropped rows", m.Metric)
		}
	}
}

// TestAllRecordsCounts: the all-records FPR is FP/(FP+TN) over every row
// with label and score, dropped or not (counted by hand: rows 1–4 of site
// a have FP = 1 of 2 negatives; site b 1 of 2).
func TestAllRecordsCounts(t *testing.T) {
	csv := "site,x,dx,z,score\n" +
		"a,1,0,NA,0.9\na,1,0,1,0.1\na,1,1,1,0.8\na,2,1,2,0.7\n" +
		"b,1,0,1,0.6\nb,1,0,NA,0.2\nb,2,1,1,0.3\nb,1,1,2,0.9\n"
	spec := writeAudit(t, strings.Replace(smallSpec, "metrics: [fpr, fnr, brier]", "metrics: [fpr]", 1)+"missing: drop\n", csv)
	d, err := LoadData(spec)
	if err != nil {
		t.Fatal(err)
	}
	got := allRecords(spec, d.Complete, "fpr")
	want := &AllRecords{Reference: 0.5, Comparison: 0.5, Gap: 0, NReference: 4, NComparison: 4}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("all records %+v, want %+v", got, want)
	}
}
