package classify

import (
	"math"
	"reflect"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func TestTermString(t *testing.T) {
	for _, tc := range []struct {
		t    Term
		want string
	}{
		{Term{3, -1}, "x3"},
		{Term{3, 3}, "x3^2"},
		{Term{3, 5}, "x3*x5"},
	} {
		if got := tc.t.String(); got != tc.want {
			t.Errorf("%v: %q, want %q", tc.t, got, tc.want)
		}
	}
}

// TestStandardiseInPlace: weighted mean and population sd by hand
// (analytic): values 1, 2, 4 with weights 1, 1, 2 have mean 11/4 and
// variance (1.75² + 0.75² + 2·1.25²)/4 = 1.6875.
func TestStandardiseInPlace(t *testing.T) {
	for _, tc := range []struct {
		name     string
		v, w     []float64
		mean, sd float64
		constant bool
		binary   bool
	}{
		{"weighted", []float64{1, 2, 4}, []float64{1, 1, 2}, 2.75, math.Sqrt(1.6875), false, false},
		{"binary", []float64{0, 1, 1, 0}, nil, 0.5, 0.5, false, true},
		{"binary on weighted rows", []float64{0, 1, 7, 0}, []float64{1, 1, 0, 1}, 1.0 / 3, math.Sqrt(2.0 / 9), false, true},
		{"constant on weighted rows", []float64{3, 3, 9}, []float64{1, 2, 0}, 3, 1, true, true},
	} {
		var sw float64
		for i := range tc.v {
			if tc.w == nil {
				sw++
			} else {
				sw += tc.w[i]
			}
		}
		v := append([]float64(nil), tc.v...)
		binary := twoValued(v, tc.w)
		s := standardiseInPlace(v, tc.w, sw)
		if math.Abs(s.mean-tc.mean) > 1e-15 || math.Abs(s.sd-tc.sd) > 1e-15 || s.constant != tc.constant || binary != tc.binary {
			t.Errorf("%s: got %+v binary %v, want mean %v sd %v constant %v binary %v", tc.name, s, binary, tc.mean, tc.sd, tc.constant, tc.binary)
		}
		if s.constant {
			continue
		}
		for i, x := range v {
			if want := (tc.v[i] - tc.mean) / tc.sd; math.Abs(x-want) > 1e-14 {
				t.Errorf("%s: row %d standardised to %v, want %v", tc.name, i, x, want)
			}
		}
	}
}

func TestAllFourCells(t *testing.T) {
	a := []float64{0, 1, 0, 1}
	b := []float64{0, 0, 1, 1}
	if !allFourCells(a, b, nil) {
		t.Error("all four cells present, reported missing")
	}
	if allFourCells(a, b, []float64{1, 1, 1, 0}) {
		t.Error("cell (1,1) has zero weight, reported present")
	}
}

// TestExpandTermsOneHot: one-hot codes of one three-level variable (x1,
// x2) are binary and never both 1, so neither squares nor their product
// enter; the continuous x0 gets its square and products with both.
func TestExpandTermsOneHot(t *testing.T) {
	x := mat.NewDense(6, 3, []float64{
		0.5, 0, 0,
		-1, 1, 0,
		2, 0, 1,
		0.1, 0, 0,
		-0.3, 1, 0,
		1.2, 0, 1,
	})
	y := []float64{0, 1, 0, 1, 0, 1}
	lin, raw, active := rawDesign(x, nil, 6, 0)
	inter := interactionSet(lin, active, y, nil, 8)
	_, terms, _ := expandDesign(lin, raw, active, expandTerms(raw, active, inter), nil, 6, 0)
	want := []Term{{0, -1}, {1, -1}, {2, -1}, {0, 0}, {0, 1}, {0, 2}}
	if !reflect.DeepEqual(terms, want) {
		t.Errorf("terms %v, want %v", terms, want)
	}
}

// TestInteractionSetRanking: with more active columns than the cap, the
// columns most correlated with y are kept, in column order.
func TestInteractionSetRanking(t *testing.T) {
	x := mat.NewDense(4, 3, []float64{
		0, 1, 0.1,
		1, 0, 0.3,
		0, 1, 0.2,
		1, 0, 0.5,
	})
	y := []float64{0, 1, 0, 1} // equals column 0; column 1 = 1 − y; column 2 weaker
	lin, _, active := rawDesign(x, nil, 4, 0)
	if got := interactionSet(lin, active, y, nil, 2); !reflect.DeepEqual(got, []int{0, 1}) {
		t.Errorf("interaction set %v, want [0 1]", got)
	}
	if got := interactionSet(lin, active, y, nil, 1); !reflect.DeepEqual(got, []int{0}) {
		t.Errorf("interaction set %v, want [0] (tie to the lower index)", got)
	}
}
