package fairness

import (
	"strings"
	"testing"
)

func TestFindCycle(t *testing.T) {
	tests := []struct {
		name  string
		nodes [][]string // node name, then its parents
		want  string
	}{
		{"empty", nil, ""},
		{"chain", [][]string{{"a"}, {"b", "a"}, {"c", "b"}}, ""},
		{"diamond", [][]string{{"a"}, {"b", "a"}, {"c", "a"}, {"d", "b", "c"}}, ""},
		{"two-cycle", [][]string{{"a", "b"}, {"b", "a"}}, "a → b → a"},
		{"three-cycle listed late", [][]string{{"r"}, {"x", "r", "z"}, {"y", "x"}, {"z", "y"}}, "x → y → z → x"},
		{"cycle beside a tree", [][]string{{"a"}, {"b", "a"}, {"c", "d"}, {"d", "c"}}, "c → d → c"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var g []NodeSpec
			index := map[string]int{}
			for i, n := range tc.nodes {
				g = append(g, NodeSpec{Node: n[0], Parents: n[1:]})
				index[n[0]] = i
			}
			if got := strings.Join(findCycle(g, index), " → "); got != tc.want {
				t.Errorf("got %q, want %q", got, tc.want)
			}
		})
	}
}

func TestValidateGraphScoreNode(t *testing.T) {
	src := strings.Replace(exampleSpec, "seed: 1", "  - node: score\n    parents: [labs]\nseed: 1", 1)
	s, err := ParseSpec("spec.yaml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if !s.ScoreIsNode() || len(s.Graph) != 4 {
		t.Errorf("ScoreIsNode() = %v with %d nodes", s.ScoreIsNode(), len(s.Graph))
	}
	// A node named after a column but holding another is fine; the same
	// column under two names is not (checked in TestParseSpecErrors).
	src = strings.Replace(exampleSpec, "  - node: age\n", "  - node: years\n    columns: [age]\n", 1)
	src = strings.ReplaceAll(src, "[age]", "[years]")
	src = strings.Replace(src, "[dx, age]", "[dx, years]", 1)
	if _, err := ParseSpec("spec.yaml", []byte(src)); err != nil {
		t.Error(err)
	}
}
