package scm

import (
	"reflect"
	"testing"
)

func TestPooledLayout(t *testing.T) {
	m := caseNamed(t, "case-mix").Model
	s, mechs, err := Pooled(m, 300, 200, 4)
	if err != nil {
		t.Fatal(err)
	}
	if r, c := s.X.Dims(); r != 500 || c != 7 {
		t.Fatalf("X is %d×%d, want 500×7 (site has 2 indicator columns)", r, c)
	}
	if nRef, nCmp := s.Counts(); nRef != 300 || nCmp != 200 {
		t.Errorf("counts %d/%d, want 300/200", nRef, nCmp)
	}
	want := []string{"age", "site=1", "site=2", "disease", "marker_a", "marker_b", "unread"}
	if got := m.ColumnNames(); !reflect.DeepEqual(got, want) {
		t.Errorf("ColumnNames = %v, want %v", got, want)
	}
	if got := mechs[NodeDisease]; got.Node != "disease" || !reflect.DeepEqual(got.ParentCols, []int{0, 1, 2}) || !reflect.DeepEqual(got.NodeCols, []int{3}) {
		t.Errorf("disease mechanism = %+v", got)
	}
	ref, _ := Sample(m, Reference, 300, 4)
	cmp, _ := Sample(m, Comparison, 200, 4)
	for j := 0; j < 500; j++ {
		v := ref.Values
		jj := j
		if j >= 300 {
			v, jj = cmp.Values, j-300
		}
		if s.Labels[j] != s.X.At(j, 3) || s.Labels[j] != v[jj][NodeDisease] {
			t.Fatalf("row %d: label column disagrees", j)
		}
		site := int(v[jj][NodeSite])
		if s.X.At(j, 1) != b2f(site == 1) || s.X.At(j, 2) != b2f(site == 2) {
			t.Fatalf("row %d: site %d encoded as %v, %v", j, site, s.X.At(j, 1), s.X.At(j, 2))
		}
	}
	if _, _, err := Pooled(m, 0, 5, 1); err == nil {
		t.Error("Pooled accepted an empty reference group")
	}
}

func b2f(b bool) float64 {
	if b {
		return 1
	}
	return 0
}
