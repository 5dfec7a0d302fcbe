package fairness

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// altGraphSrc is an alternative to exampleSpec's graph: labs read as
// depending on the label alone, age as a child of dx.
const altGraphSrc = `# labs hang on dx alone
graph:
  - node: dx
  - node: age
    parents: [dx]
  - node: labs
    columns: [m1, m2]
    parents: [dx]
`

func exampleBase(t *testing.T) *Spec {
	t.Helper()
	s, err := ParseSpec("spec.yaml", []byte(exampleSpec))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestParseAltGraph(t *testing.T) {
	g, err := ParseAltGraph(exampleBase(t), "alt.yaml", []byte(altGraphSrc))
	if err != nil {
		t.Fatal(err)
	}
	if g.Reading != ReadingFile || g.File != "alt.yaml" || len(g.SHA256) != 64 {
		t.Errorf("reading %q file %q sha %q", g.Reading, g.File, g.SHA256)
	}
	var got [][]string
	for _, n := range g.Graph {
		got = append(got, append([]string{n.Node}, n.Parents...))
	}
	want := [][]string{{"dx"}, {"age", "dx"}, {"labs", "dx"}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("graph %v, want %v", got, want)
	}
}

func TestParseAltGraphErrors(t *testing.T) {
	edit := func(old, new string) string { return strings.Replace(altGraphSrc, old, new, 1) }
	tests := []struct {
		name, src string
		sentinel  error
		line      int
		key, msg  string
	}{
		{"other key", altGraphSrc + "label: dx\n", ErrUnknownKey, 9, "label", `unknown key "label"`},
		{"misspelt key", strings.Replace(altGraphSrc, "graph:", "grahp:", 1), ErrUnknownKey, 2, "grahp", `did you mean "graph"`},
		{"no graph", "# nothing\n", ErrMissingKey, 0, "graph", "empty"},
		{"not a mapping", "- node: dx\n", ErrBadValue, 1, "", "mapping"},
		{"missing column", edit("columns: [m1, m2]", "columns: [m1]"), ErrBadValue, 2, "graph", `columns "m2" are in no node`},
		{"extra column", edit("columns: [m1, m2]", "columns: [m1, m2, m3]"), ErrBadValue, 2, "graph", `columns "m3" are not in the spec's graph`},
		{"unknown parent", edit("parents: [dx]\n", "parents: [dxx]\n"), ErrUnknownNode, 5, "graph[1].parents", `unknown node "dxx"`},
		{"cycle", edit("  - node: dx\n", "  - node: dx\n    parents: [labs]\n"), ErrCycle, 3, "graph", "dx → labs → dx"},
		{"unknown node key", edit("  - node: dx\n", "  - node: dx\n    parent: [age]\n"), ErrUnknownKey, 4, "graph[0].parent", `unknown key "parent"`},
		{"syntax", "graph: [\n", ErrSyntax, 2, "", "invalid YAML"},
	}
	base := exampleBase(t)
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseAltGraph(base, "alt.yaml", []byte(tc.src))
			var se *SpecError
			if !errors.As(err, &se) {
				t.Fatalf("error %v is not a *SpecError", err)
			}
			if !errors.Is(err, tc.sentinel) || se.File != "alt.yaml" || se.Line != tc.line || se.Key != tc.key || !strings.Contains(err.Error(), tc.msg) {
				t.Errorf("got %q (line %d, key %q), want %v on line %d, key %q, containing %q", err, se.Line, se.Key, tc.sentinel, tc.line, tc.key, tc.msg)
			}
			if !IsInputError(err) {
				t.Errorf("%v is not an input error", err)
			}
		})
	}
}

func TestLoadAltGraphNotFound(t *testing.T) {
	_, err := LoadAltGraph(exampleBase(t), filepath.Join(t.TempDir(), "none.yaml"))
	if !errors.Is(err, ErrSpecNotFound) || !strings.Contains(err.Error(), "none.yaml") {
		t.Errorf("got %v, want a not-found error naming the file", err)
	}
}

func TestLoadAltGraphReadsFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "alt.yaml")
	if err := os.WriteFile(path, []byte(altGraphSrc), 0o644); err != nil {
		t.Fatal(err)
	}
	g, err := LoadAltGraph(exampleBase(t), path)
	if err != nil || g.File != path {
		t.Fatalf("LoadAltGraph = %+v, %v", g, err)
	}
}

func TestAutomaticReadings(t *testing.T) {
	base := exampleBase(t)
	parents := func(g AltGraph) map[string][]string {
		out := map[string][]string{}
		for _, n := range g.Graph {
			out[n.Node] = n.Parents
		}
		return out
	}
	ind := parents(IndependentGraph(base))
	for node, pa := range ind {
		if len(pa) != 0 {
			t.Errorf("independent roots: %s has parents %v", node, pa)
		}
	}
	lp := parents(LabelParentGraph(base))
	want := map[string][]string{"age": nil, "dx": {"age"}, "labs": {"dx"}}
	if !reflect.DeepEqual(lp, want) {
		t.Errorf("label as only parent: %v, want %v", lp, want)
	}
	for _, g := range []AltGraph{IndependentGraph(base), LabelParentGraph(base)} {
		if err := validateAltGraph(base, "auto", g.Graph); err != nil {
			t.Errorf("%s: %v", g.Reading, err)
		}
	}
	if !reflect.DeepEqual(base.Graph[2].Parents, []string{"dx", "age"}) {
		t.Errorf("the readings changed the spec's graph: %v", base.Graph[2].Parents)
	}
}

func TestClearSign(t *testing.T) {
	f := func(x float64) *float64 { return &x }
	tests := []struct {
		name string
		c    Contribution
		gap  float64
		want int
	}{
		{"interval above 0", Contribution{Value: 0.01, CILow: f(0.001), CIHigh: f(0.02)}, 0.1, 1},
		{"interval below 0", Contribution{Value: -0.01, CILow: f(-0.02), CIHigh: f(-0.001)}, 0.1, -1},
		{"interval across 0", Contribution{Value: 0.08, CILow: f(-0.01), CIHigh: f(0.2)}, 0.1, 0},
		{"no interval, large", Contribution{Value: -0.02}, 0.1, -1},
		{"no interval, at the share", Contribution{Value: 0.05}, -0.5, 1},
		{"no interval, small", Contribution{Value: 0.0099}, 0.1, 0},
		{"no gap", Contribution{Value: 0.05}, 0, 0},
		{"not estimable", Contribution{Value: 0.5, NotEstimable: true}, 0.1, 0},
	}
	for _, tc := range tests {
		if got := clearSign(tc.c, tc.gap); got != tc.want {
			t.Errorf("%s: clearSign = %d, want %d", tc.name, got, tc.want)
		}
	}
}

func TestSignStatus(t *testing.T) {
	tests := []struct {
		signs []int
		want  string
	}{
		{[]int{1, 1, 1}, SignHolds},
		{[]int{-1, -1}, SignHolds},
		{[]int{1, -1, 1}, SignReverses},
		{[]int{1, 0, -1}, SignReverses},
		{[]int{0, 1}, SignVaries},
		{[]int{-1, 0}, SignVaries},
		{[]int{0, 0, 0}, SignUnclear},
	}
	for _, tc := range tests {
		if got := signStatus(tc.signs); got != tc.want {
			t.Errorf("signStatus(%v) = %s, want %s", tc.signs, got, tc.want)
		}
	}
}

func TestCompareRunsLead(t *testing.T) {
	run := func(lead string, signs ...int) GraphRun {
		rm := GraphRunMetric{Metric: "fnr", Lead: lead}
		for i, s := range signs {
			rm.Contributions = append(rm.Contributions, GraphContribution{Node: []string{"a", "b"}[i], Sign: s})
		}
		return GraphRun{Metrics: []GraphRunMetric{rm}}
	}
	graph := []NodeSpec{{Node: "a"}, {Node: "b"}}
	same := compareRuns([]GraphRun{run("a", 1, 0), run("a", 1, 0)}, 0, "fnr", graph)
	if !same.LeadHolds || same.Dependent {
		t.Errorf("same runs: %+v", same)
	}
	moved := compareRuns([]GraphRun{run("a", 1, 0), run("b", 1, 0)}, 0, "fnr", graph)
	if moved.LeadHolds || !moved.Dependent {
		t.Errorf("lead moved: %+v", moved)
	}
	w, ok := graphWarning(moved, []GraphRun{{Reading: ReadingSpec}, {Reading: ReadingIndependent}}, nil)
	if !ok || w.Kind != KindGraphDependent || !reflect.DeepEqual(w.Nodes, []string{"a", "b"}) ||
		!strings.Contains(w.Message, "`a` under the spec's graph, `b` under the independent-roots reading") {
		t.Errorf("warning %+v", w)
	}
	flip := compareRuns([]GraphRun{run("a", 1, 1), run("a", 1, -1)}, 0, "fnr", graph)
	if !flip.Dependent || flip.Nodes[1].Status != SignReverses {
		t.Errorf("sign flip: %+v", flip)
	}
}
