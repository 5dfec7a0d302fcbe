package report

import (
	"math"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

func mechs(spec ...[]string) []fairness.MechanismResult {
	var out []fairness.MechanismResult
	for _, s := range spec {
		out = append(out, fairness.MechanismResult{Node: s[0], Parents: s[1:]})
	}
	return out
}

// TestLayoutDAG checks layers against the longest-path depth worked out by
// hand for each graph, that every arrow points to a later layer, and that
// slots within a layer are a permutation.
func TestLayoutDAG(t *testing.T) {
	tests := []struct {
		name   string
		graph  []fairness.MechanismResult
		layers map[string]int
	}{
		{"chain with a skip", mechs([]string{"age"}, []string{"anaemia", "age"}, []string{"hb", "anaemia"}, []string{"ferritin", "anaemia", "hb"}),
			map[string]int{"age": 0, "anaemia": 1, "hb": 2, "ferritin": 3}},
		{"two roots", mechs([]string{"y", "a", "b"}, []string{"a"}, []string{"b"}),
			map[string]int{"a": 0, "b": 0, "y": 1}},
		{"parent without mechanism", mechs([]string{"x", "site"}),
			map[string]int{"site": 0, "x": 1}},
		{"cycle is tolerated", mechs([]string{"a", "b"}, []string{"b", "a"}),
			nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			nodes, edges := layoutDAG(tt.graph)
			layer := map[string]int{}
			slots := map[[2]int]bool{}
			for _, n := range nodes {
				layer[n.Name] = n.Layer
				if slots[[2]int{n.Layer, n.Slot}] {
					t.Errorf("two nodes share layer %d slot %d", n.Layer, n.Slot)
				}
				slots[[2]int{n.Layer, n.Slot}] = true
				if n.X <= 0 || n.Y <= 0 {
					t.Errorf("node %s at (%v, %v): coordinates must be positive", n.Name, n.X, n.Y)
				}
			}
			if tt.layers == nil {
				return
			}
			for name, want := range tt.layers {
				if layer[name] != want {
					t.Errorf("layer of %s = %d, want %d", name, layer[name], want)
				}
			}
			for _, e := range edges {
				if layer[e.From] >= layer[e.To] {
					t.Errorf("arrow %s → %s does not point to a later layer", e.From, e.To)
				}
			}
		})
	}
}

// TestLayoutDAGBarycentre checks the crossing reduction on a graph worked
// by hand: in graph order, children c1 (of p2) and c2 (of p1) cross the
// arrows of parents p1 and p2; the barycentre sweep uncrosses them.
func TestLayoutDAGBarycentre(t *testing.T) {
	nodes, _ := layoutDAG(mechs([]string{"c1", "p2"}, []string{"c2", "p1"}, []string{"p1"}, []string{"p2"}))
	slot := map[string]int{}
	for _, n := range nodes {
		slot[n.Name] = n.Slot
	}
	if (slot["p1"] < slot["p2"]) != (slot["c2"] < slot["c1"]) {
		t.Errorf("arrows cross: slots %v", slot)
	}
}

func BenchmarkWriteHTML(b *testing.B) {
	res := handResult()
	res.Details = handDetails()
	for b.Loop() {
		if err := WriteHTML(discard{}, res); err != nil {
			b.Fatal(err)
		}
	}
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }

// TestLayoutDAGBends checks that an arrow skipping layers gets one bend
// point per layer it crosses, each in that layer's column and away from
// every node box of that layer, and that adjacent-layer arrows get none.
func TestLayoutDAGBends(t *testing.T) {
	nodes, edges := layoutDAG(mechs([]string{"age"}, []string{"anaemia", "age"}, []string{"bmi", "age"}, []string{"hb", "anaemia", "age"}, []string{"ferritin", "hb", "age"}))
	byName := map[string]dagNode{}
	for _, n := range nodes {
		byName[n.Name] = n
	}
	for _, e := range edges {
		from, to := byName[e.From], byName[e.To]
		if got, want := len(e.Bends), to.Layer-from.Layer-1; got != want {
			t.Errorf("%s → %s: %d bends, want %d", e.From, e.To, got, want)
		}
		for j, b := range e.Bends {
			if want := from.X + float64(j+1)*layerGap; b[0] != want {
				t.Errorf("%s → %s bend %d at x %v, want %v", e.From, e.To, j, b[0], want)
			}
			for _, n := range nodes {
				if n.X == b[0] && math.Abs(n.Y-b[1]) < slotGap/2 {
					t.Errorf("%s → %s bend %d at %v lies on node %s", e.From, e.To, j, b, n.Name)
				}
			}
		}
	}
}
