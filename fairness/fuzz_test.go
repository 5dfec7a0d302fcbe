package fairness

import (
	"bytes"
	"errors"
	"math"
	"os"
	"slices"
	"strings"
	"testing"
)

// fuzzSpec is the spec the CSV fuzzer loads data for: a categorical
// column, a vector node and the score as a node.
func fuzzSpec(drop bool) *Spec {
	src := `data: d.csv
label: y
score: s
threshold: 0.5
groups: {column: g, reference: a, comparison: b}
metrics: [fpr]
graph:
  - node: c
  - node: y
    parents: [c]
  - node: v
    columns: [v1, v2]
    parents: [y]
  - node: s
    parents: [v]
categorical: [c]
folds: 2
`
	if drop {
		src += "missing: drop\n"
	}
	s, err := ParseSpec("fuzz.yaml", []byte(src))
	if err != nil {
		panic(err)
	}
	return s
}

// FuzzLoadCSV feeds arbitrary bytes to the data loader. It must never
// panic, must return only input errors, and on success must return a
// consistent dataset: equal lengths, 0/1 labels, scores in [0, 1], finite
// values and categorical codes within the levels.
func FuzzLoadCSV(f *testing.F) {
	f.Add([]byte("g,c,y,v1,v2,s\na,x,1,0.5,2,0.9\na,z,0,1,1,0.1\nb,x,true,3,4,0.5\nb,y,FALSE,1e3,-2,1\n"), false)
	f.Add([]byte("g,c,y,v1,v2,s\na,x,1,NA,2,0.9\na,z,0,1,1,0.1\na,x,0,1,1,0.1\nb,x,1,3,4,0.5\nb,y,0,1,1,1\nc,,,,,\n"), true)
	f.Add([]byte("\ufeffg,c,y,v1,v2,s\r\na,\"x\ny\",1,0.5,2,0.9\r\n"), false)
	f.Add([]byte(""), false)
	f.Add([]byte("g,g\n"), false)
	f.Add([]byte("g,c,y,v1,v2,s\na,x,1,0.5\n"), false)
	f.Add([]byte("g,c,y,v1,v2,s\na,x,1,0.5,2,NaN\nb,x,1,0.5,2,Inf\n"), true)
	f.Fuzz(func(t *testing.T, data []byte, drop bool) {
		d, err := ReadData(bytes.NewReader(data), "d.csv", fuzzSpec(drop))
		if err != nil {
			if !IsInputError(err) {
				t.Fatalf("not an input error: %v", err)
			}
			return
		}
		n := len(d.Labels)
		if len(d.Scores) != n || len(d.Comparison) != n || len(d.Lines) != n || len(d.Columns) != 5 {
			t.Fatalf("inconsistent lengths: %d labels, %d scores, %d groups, %d lines, %d columns", n, len(d.Scores), len(d.Comparison), len(d.Lines), len(d.Columns))
		}
		for i := range n {
			if d.Labels[i] != 0 && d.Labels[i] != 1 {
				t.Fatalf("label %v", d.Labels[i])
			}
			if !(d.Scores[i] >= 0 && d.Scores[i] <= 1) {
				t.Fatalf("score %v", d.Scores[i])
			}
			if i > 0 && d.Lines[i] <= d.Lines[i-1] {
				t.Fatalf("lines not increasing: %v", d.Lines)
			}
		}
		for _, c := range d.Columns {
			if len(c.Values) != n {
				t.Fatalf("column %s has %d values for %d rows", c.Name, len(c.Values), n)
			}
			for _, v := range c.Values {
				if math.IsNaN(v) || math.IsInf(v, 0) || (c.Categorical && (v < 0 || int(v) >= len(c.Levels) || v != math.Trunc(v))) {
					t.Fatalf("column %s: value %v (levels %v)", c.Name, v, c.Levels)
				}
			}
		}
		nRef, nCmp := d.Counts()
		if nRef < 2 || nCmp < 2 {
			t.Fatalf("groups of %d and %d rows accepted with 2 folds", nRef, nCmp)
		}
	})
}

// FuzzParseSpec feeds arbitrary bytes to the spec parser. It must never
// panic, must return only *SpecError, and on success must return a spec
// that passed validation: threshold in (0, 1), known metrics, an acyclic
// graph whose parents are nodes, and defaults filled in.
func FuzzParseSpec(f *testing.F) {
	f.Add([]byte(exampleSpec))
	f.Add([]byte(smallSpec))
	f.Add([]byte(exampleSpec + "missing: drop\ncategorical: [m1]\nfolds: 3\nclassifier: linear\nece_bins: 4\nsynthetic: true\ntitle: t\n"))
	f.Add([]byte(namesSpec))
	f.Add([]byte("a: &x [1, 2]\nb: *x\n"))
	f.Add([]byte("graph:\n  - node: a\n    parents: [b]\n  - node: b\n    parents: [a]\n"))
	if src, err := os.ReadFile("../testdata/bad/yaml_syntax/spec.yaml"); err == nil {
		f.Add(src)
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		s, err := ParseSpec("spec.yaml", src)
		if err != nil {
			var se *SpecError
			if !errors.As(err, &se) {
				t.Fatalf("not a *SpecError: %T %v", err, err)
			}
			return
		}
		if !(s.Threshold > 0 && s.Threshold < 1) || len(s.Metrics) == 0 || len(s.Graph) == 0 || s.Folds < 2 || s.ECEBins < 1 {
			t.Fatalf("invalid spec accepted: %+v", s)
		}
		index := map[string]int{}
		for i, n := range s.Graph {
			index[n.Node] = i
		}
		if findCycle(s.Graph, index) != nil {
			t.Fatal("cyclic graph accepted")
		}
		for _, n := range s.Graph {
			for _, p := range n.Parents {
				if _, ok := index[p]; !ok {
					t.Fatalf("unknown parent %q accepted", p)
				}
			}
		}
		// Display names are plain one-line text naming what the spec has.
		nodes, cols := resolveNames(s)
		for id, d := range nodes {
			if _, ok := index[id]; !ok || strings.ContainsAny(d.Label(), "`\n\r") || d.Name == "" {
				t.Fatalf("display name %+v of node %q accepted", d, id)
			}
		}
		for id, d := range cols {
			if !slices.Contains(specColumns(s), id) || strings.ContainsAny(d.Label(), "`\n\r") || d.Name == "" {
				t.Fatalf("display name %+v of column %q accepted", d, id)
			}
		}
		if s.AuditDate != "" && CheckAuditDate(s.AuditDate) != nil {
			t.Fatalf("audit date %q accepted", s.AuditDate)
		}
	})
}
