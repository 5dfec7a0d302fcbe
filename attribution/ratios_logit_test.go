package attribution

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestLearnerFeatures: the probability columns reach the learners as
// log(p/(1−p)) (analytic: logit(0.2) = −log 4, logit(0.5) = 0), other
// columns and the Sample itself are untouched, and a value outside [0, 1]
// is an error naming its record and column.
func TestLearnerFeatures(t *testing.T) {
	x := mat.NewDense(3, 2, []float64{7, 0.2, 8, 0.5, 9, 0.8})
	s := &Sample{X: x, ProbabilityCols: []int{1}}
	got, err := learnerFeatures(s)
	if err != nil {
		t.Fatal(err)
	}
	for r, want := range []float64{-math.Log(4), 0, math.Log(4)} {
		if math.Abs(got.At(r, 1)-want) > 1e-12 || got.At(r, 0) != x.At(r, 0) {
			t.Errorf("row %d: %v, %v; want %v, %v", r, got.At(r, 0), got.At(r, 1), x.At(r, 0), want)
		}
	}
	if x.At(0, 1) != 0.2 {
		t.Error("learnerFeatures changed the Sample's X")
	}
	if same, _ := learnerFeatures(&Sample{X: x}); same != x {
		t.Error("without probability columns the matrix is not X itself")
	}
	x.Set(2, 1, 1.5)
	if _, err := learnerFeatures(s); err == nil || !strings.Contains(err.Error(), "record 2, column 1: 1.5 is not a probability") {
		t.Errorf("error %v, want one naming record 2, column 1", err)
	}
}
