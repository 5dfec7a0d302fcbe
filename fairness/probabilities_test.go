package fairness

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
)

// probSpec audits a table whose score is a node with parents x and dx, and
// declares the column risk (a probability) under probabilities.
const probSpec = `data: cohort.csv
label: dx
score: score
threshold: 0.5
groups: {column: site, reference: a, comparison: b}
metrics: [fnr]
graph:
  - node: x
  - node: dx
    parents: [x]
  - node: risk
    parents: [x]
  - node: score
    parents: [x, dx]
probabilities: [risk]
folds: 2
seed: 7
classifier: linear
`

// probData is smallData with a probability column risk = σ(x).
func probData(n int, risk func(i int, x float64) string) string {
	lines := strings.Split(strings.TrimSpace(smallData(n)), "\n")
	var b strings.Builder
	b.WriteString(lines[0] + ",risk\n")
	for i, l := range lines[1:] {
		var x float64
		fmt.Sscanf(strings.Split(l, ",")[1], "%g", &x)
		b.WriteString(l + "," + risk(i, x) + "\n")
	}
	return b.String()
}

func sigmoidRisk(_ int, x float64) string { return fmt.Sprintf("%.4f", 1/(1+math.Exp(-x))) }

// TestProbabilityColumns: the declared column and the score node are the
// probability columns, in graph order; encode lists their feature columns
// as the sample's ProbabilityCols, leaving X's values as they are; the
// result's settings name them.
func TestProbabilityColumns(t *testing.T) {
	spec := writeAudit(t, probSpec, probData(400, sigmoidRisk))
	if got := spec.ProbabilityColumns(); !slices.Equal(got, []string{"risk", "score"}) {
		t.Fatalf("ProbabilityColumns = %v, want [risk score]", got)
	}
	d, s, _, err := prepare(spec)
	if err != nil {
		t.Fatal(err)
	}
	// Columns x, dx, risk, score: one feature column each, in graph order.
	if !slices.Equal(s.ProbabilityCols, []int{2, 3}) {
		t.Fatalf("ProbabilityCols = %v, want [2 3]", s.ProbabilityCols)
	}
	for i := range d.Scores {
		if s.X.At(i, 3) != d.Scores[i] || s.X.At(i, 2) != d.Columns[2].Values[i] {
			t.Fatalf("row %d: X holds %v, %v; want the probabilities %v, %v", i, s.X.At(i, 2), s.X.At(i, 3), d.Columns[2].Values[i], d.Scores[i])
		}
	}
	r, err := Run(spec, RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(r.Settings.ProbabilityColumns, []string{"risk", "score"}) {
		t.Errorf("settings.probability_columns = %v", r.Settings.ProbabilityColumns)
	}
	plain, err := Run(writeAudit(t, smallSpec, smallData(400)), RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if plain.Settings.ProbabilityColumns == nil || len(plain.Settings.ProbabilityColumns) != 0 {
		t.Errorf("without probability columns: %#v, want an empty list", plain.Settings.ProbabilityColumns)
	}
}

// TestProbabilitiesSpecChecks: each entry once, a graph column, not the
// label, not categorical; a misspelt key gets a suggestion.
func TestProbabilitiesSpecChecks(t *testing.T) {
	base := strings.Replace(probSpec, "probabilities: [risk]\n", "", 1)
	for _, tc := range []struct{ extra, msg string }{
		{"probabilities: [risk, risk]\n", `key probabilities[1]: column "risk" is listed twice`},
		{"probabilities: [w]\n", `key probabilities[0]: column "w" is not a column of any graph node`},
		{"probabilities: [dx]\n", `column "dx" is the label`},
		{"probabilities: [risk]\ncategorical: [risk]\n", `column "risk" is categorical`},
		{"probabilites: [risk]\n", `unknown key "probabilites"; did you mean "probabilities"?`},
	} {
		_, err := ParseSpec("s.yaml", []byte(base+tc.extra))
		if err == nil || !strings.Contains(err.Error(), tc.msg) || !IsInputError(err) {
			t.Errorf("%q: error %v, want %q", tc.extra, err, tc.msg)
		}
	}
}

// TestProbabilityOutOfRange: a value outside [0, 1] in a declared
// probability column is a data error naming the line and column.
func TestProbabilityOutOfRange(t *testing.T) {
	data := probData(40, func(i int, x float64) string {
		if i == 6 {
			return "1.2"
		}
		return sigmoidRisk(i, x)
	})
	_, err := Run(writeAudit(t, probSpec, data), RunOptions{Workers: 2})
	var de *DataError
	if !errors.As(err, &de) || !errors.Is(err, ErrProbabilityRange) || !IsInputError(err) {
		t.Fatalf("error %v, want a *DataError wrapping ErrProbabilityRange", err)
	}
	// Data row 6 is line 8 (the header is line 1).
	if de.Line != 8 || de.Column != "risk" || !strings.Contains(err.Error(), `"1.2" is outside [0, 1] (the column is listed under probabilities)`) {
		t.Errorf("error %q (line %d, column %q), want line 8, column risk", err, de.Line, de.Column)
	}
}
