package fairness

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// separatedData is smallSpec's model with x ~ N(0, 1) at site a and
// N(5, 1) at site b: the group classifier of x has population AUC
// Φ(5/√2) ≈ 0.9998 (binormal AUC, analytic), so the sites' x mechanisms
// barely overlap, while dx | x and z | dx are the same at both sites.
func separatedData(n int) string {
	rng := rand.New(rand.NewPCG(7, 8))
	var b strings.Builder
	b.WriteString("site,x,dx,z,score\n")
	for i := range n {
		site, shift := "a", 0.0
		if i%2 == 1 {
			site, shift = "b", 5
		}
		x := shift + rng.NormFloat64()
		dx := 0
		if rng.Float64() < 1/(1+math.Exp(-(x-2.5))) {
			dx = 1
		}
		z := float64(dx) + rng.NormFloat64()
		score := 1 / (1 + math.Exp(-(z - 0.5)))
		fmt.Fprintf(&b, "%s,%.4f,%d,%.4f,%.4f\n", site, x, dx, z, score)
	}
	return b.String()
}

// TestNotEstimableSeparated: on the separated table the contribution of x
// is marked not estimable (reason: separation) in the mechanism's
// reliability, its contributions and one warning, which replaces the
// overlap warning of the same cause. So is dx | x: its comparison form is
// never observed at the reference sites' x values (estimability), and its
// reason names x. z | dx, whose parent does not separate the sites,
// stays estimable.
func TestNotEstimableSeparated(t *testing.T) {
	r, err := Run(writeAudit(t, smallSpec, separatedData(2000)), RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range r.Mechanisms {
		want := m.Node == "z"
		if m.Node == "x" && m.AUC < NotEstimableAUC {
			t.Fatalf("x: AUC %.4f below %v (population 0.9998)", m.AUC, NotEstimableAUC)
		}
		if m.Reliability.Estimable != want {
			t.Errorf("%s (AUC %.3f): estimable %v, want %v", m.Node, m.AUC, m.Reliability.Estimable, want)
		}
	}
	for _, mr := range r.Metrics {
		for _, c := range mr.Contributions {
			if c.NotEstimable != (c.Node != "z") {
				t.Errorf("%s %s: not estimable %v", mr.Metric, c.Node, c.NotEstimable)
			}
		}
	}
	kinds := map[WarningKind]int{}
	for _, w := range r.Warnings {
		if len(w.Nodes) == 1 && w.Nodes[0] == "x" {
			kinds[w.Kind]++
		}
	}
	if kinds[KindNotEstimable] != 1 || kinds[KindPoorOverlap] != 0 {
		t.Errorf("warnings on x by kind: %v; want one not_estimable and no poor_overlap", kinds)
	}
	for _, w := range r.Warnings {
		if w.Kind == KindNotEstimable && w.Nodes[0] == "dx" && !strings.Contains(w.Message, "its parents `x` already separate the groups") {
			t.Errorf("dx's reason does not name x: %s", w.Message)
		}
	}
}
