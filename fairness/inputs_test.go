package fairness

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// inputsData is a two-site table whose score reads w, a column in no graph
// node that is N(0, 1) at site a and N(0.6, 1) at site b, so its
// standardised difference is 0.6 in the population (analytic); c is a
// categorical input with some missing cells.
func inputsData(n int) string {
	rng := rand.New(rand.NewPCG(3, 4))
	var b strings.Builder
	b.WriteString("site,x,dx,z,w,c,score\n")
	for i := range n {
		site, shift := "a", 0.0
		if i%2 == 1 {
			site, shift = "b", 0.6
		}
		x := rng.NormFloat64()
		dx := 0
		if rng.Float64() < 1/(1+math.Exp(-x)) {
			dx = 1
		}
		z := float64(dx) + rng.NormFloat64()
		w := shift + rng.NormFloat64()
		c := []string{"p", "q", ""}[i%3]
		score := 1 / (1 + math.Exp(-(x+z+w)/2))
		fmt.Fprintf(&b, "%s,%.4f,%d,%.4f,%.4f,%s,%.4f\n", site, x, dx, z, w, c, score)
	}
	return b.String()
}

// TestModelInputsOutsideGraph: the declared inputs w and c are in no graph
// node, so each gets a warning, w's with its standardised difference
// (0.6 in the population; 4,000 records per site give a standard error of
// about 0.02), the missing cells of c drop no row, and both are described
// and marked outside the graph.
func TestModelInputsOutsideGraph(t *testing.T) {
	spec := writeAudit(t, smallSpec+"model_inputs: [x, z, w, c]\ncategorical: [c]\n", inputsData(8000))
	r, err := Run(spec, RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if r.Groups.NReference+r.Groups.NComparison != 8000 {
		t.Errorf("kept %d rows, want all 8000", r.Groups.NReference+r.Groups.NComparison)
	}
	mi := r.ModelInputs
	if mi == nil || strings.Join(mi.OutsideGraph, ",") != "w,c" || mi.ReadsGroup {
		t.Fatalf("model inputs %+v", mi)
	}
	var found []string
	for _, w := range r.Warnings {
		if w.Kind == KindModelInputOutside {
			found = append(found, w.Message)
			if w.Severity != SeverityCaution {
				t.Errorf("severity %s, want caution (the score is no node)", w.Severity)
			}
		}
	}
	if len(found) != 2 || !strings.Contains(found[0], `the model reads "w", which is in no graph node (its groups differ by a standardised difference of `) {
		t.Errorf("warnings %q", found)
	}
	outside := 0
	for _, c := range r.Details.Columns {
		if c.OutsideGraph {
			outside++
			if c.Name == "w" && (c.StdDiff == nil || math.Abs(*c.StdDiff-0.6) > 0.08) {
				t.Errorf("w: standardised difference %v, want 0.6 ± 0.08", c.StdDiff)
			}
			if c.Name == "c" && strings.Join(c.Levels, ",") != "p,q" {
				t.Errorf("c levels %v, want p,q (missing is no level)", c.Levels)
			}
		}
	}
	if outside != 2 {
		t.Errorf("%d columns described outside the graph, want 2", outside)
	}
}

// TestModelInputsChecks: declared inputs are checked against the spec, a
// model reading the group column is warned about, and with the score as a
// node the outside input gets a note instead.
func TestModelInputsChecks(t *testing.T) {
	for _, tc := range []struct{ extra, msg string }{
		{"model_inputs: [x, x]\n", `key model_inputs[1]: column "x" is listed twice`},
		{"model_inputs: [dx]\n", `column "dx" is the label`},
		{"model_inputs: [score]\n", `column "score" is the score`},
	} {
		_, err := ParseSpec("s.yaml", []byte(smallSpec+tc.extra))
		if err == nil || !strings.Contains(err.Error(), tc.msg) || !IsInputError(err) {
			t.Errorf("%q: error %v, want %q", tc.extra, err, tc.msg)
		}
	}
	mi := &ModelInputs{Declared: []string{"w", "site"}, OutsideGraph: []string{"w"}, ReadsGroup: true}
	ws := modelInputWarnings(mi, "site", "score", false, nil, nil)
	if len(ws) != 2 || ws[1].Kind != KindModelReadsGroup || !strings.Contains(ws[1].Message, `reads the group column "site"`) {
		t.Errorf("warnings %+v", ws)
	}
	ws = modelInputWarnings(mi, "site", "score", true, nil, nil)
	if len(ws) != 1 || ws[0].Severity != SeverityNote || !strings.Contains(ws[0].Message, `the mechanism of the score node "score" carries it`) {
		t.Errorf("score as node: %+v", ws)
	}
	if len(modelInputWarnings(nil, "site", "score", false, nil, nil)) != 0 {
		t.Error("warnings without model_inputs")
	}
}
