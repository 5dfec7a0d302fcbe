package main

import (
	"bytes"
	"io"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/fairness"
	"gonum.org/v1/gonum/mat"
)

// TestWriteChecksCounts checks the counting by hand: of three draws, one
// failed, one raised sides_disagree and an unlisted kind, one nothing; the
// z table counts draws strictly above each threshold.
func TestWriteChecksCounts(t *testing.T) {
	row := checkRow{setup: checkSetup{kind: "broken learner", caseName: "toy", learner: "linear"}, size: 100, draws: []checkDraw{
		{kinds: []fairness.WarningKind{fairness.KindSidesDisagree, fairness.KindDominantRecord}, maxZ: 5, maxErr: 0.2, null: 0.1},
		{maxZ: 3, maxErr: 0.01},
		{err: io.EOF},
	}}
	var out bytes.Buffer
	writeChecks(&out, options{metrics: []string{"fnr"}, sizes: []int{100}}, []checkRow{row})
	text := out.String()
	for _, want := range []string{
		"| broken learner | toy, linear | 100 | 2 (1 failed) | 1/2 | 0/2 | 0/2 | 0/2 | 0/2 | 0/2 | 0/2 | 0/2 | 1/2 | 1/2 |",
		"| broken learner | 100 | 2 | 0.500 | 0.500 | 0.500 | 0.000 | 0.000 | 0.000 |",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
}

// The broken learner's log-odds are the base learner's times the factor.
func TestOverconfidentScalesLogOdds(t *testing.T) {
	x := mat.NewDense(6, 1, []float64{-1, -0.5, 0, 0.2, 0.8, 1.5})
	y := []float64{0, 0, 1, 0, 1, 1}
	base, err := classify.NewLinear().Fit(x, y, nil, 1)
	if err != nil {
		t.Fatal(err)
	}
	broken, err := overconfident{base: classify.NewLinear(), factor: 8}.Fit(x, y, nil, 1)
	if err != nil {
		t.Fatal(err)
	}
	a, b := make([]float64, 6), make([]float64, 6)
	base.LogOdds(x, a)
	broken.LogOdds(x, b)
	for i := range a {
		if b[i] != 8*a[i] {
			t.Errorf("row %d: log-odds %v, want 8 × %v", i, b[i], a[i])
		}
	}
}
