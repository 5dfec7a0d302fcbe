package fairness

import (
	"strings"
	"testing"
)

func TestAssumptions(t *testing.T) {
	tests := []struct {
		scoreIsNode, synthetic bool
		n                      int
		has, lacks             string
	}{
		{false, false, 7, "fixed function of the recorded columns", "synthetic"},
		{true, false, 7, "its mechanism absorbs", "fixed function"},
		{false, true, 8, "synthetic", "its mechanism absorbs"},
	}
	for _, tc := range tests {
		got := Assumptions(tc.scoreIsNode, tc.synthetic)
		all := strings.Join(got, "\n")
		if len(got) != tc.n || !strings.Contains(all, tc.has) || strings.Contains(all, tc.lacks) {
			t.Errorf("Assumptions(%v, %v) = %q", tc.scoreIsNode, tc.synthetic, got)
		}
		for _, want := range []string{"graph is right", "no hidden confounding", "independently", "Overlap", "not clinical or legal findings", "local regulation and institutional review"} {
			if !strings.Contains(all, want) {
				t.Errorf("Assumptions(%v, %v) lacks %q", tc.scoreIsNode, tc.synthetic, want)
			}
		}
	}
}
