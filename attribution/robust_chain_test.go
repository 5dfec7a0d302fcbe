package attribution

import (
	"reflect"
	"testing"
)

// screeningMechs is the graph of the synthetic screening model
// (scm.Screening), with its nodes deliberately listed out of topological
// order: age, site, disease, marker_a | disease, age, marker_b | disease,
// unread | age, disease.
func screeningMechs() []Mechanism {
	return []Mechanism{
		{Node: "marker_b", Parents: []string{"disease"}},
		{Node: "age"},
		{Node: "unread", Parents: []string{"age", "disease"}},
		{Node: "disease", Parents: []string{"age", "site"}},
		{Node: "site"},
		{Node: "marker_a", Parents: []string{"disease", "age"}},
	}
}

// TestRobustChainSkipsUnreadNodes checks the regression steps against
// the graph's Markov property worked out by hand (source: the
// factorisation P(v) = Π P(v_i | pa_i) of DESIGN.md's model of the data):
// for the FNR numerator, which reads the label (disease) and a score of
// age and the two markers, the relevant nodes are those and their
// ancestors (site), in topological order (the lower index first among
// nodes free to go: marker_b before marker_a); unread is no ancestor and
// gets no step. Backwards from F = {disease, age, marker_a, marker_b}:
// marker_a | disease, age leaves D = {age, disease, marker_b}; marker_b |
// disease leaves {age, disease}; disease | age, site leaves {age, site};
// site leaves {age}; age leaves ∅.
func TestRobustChainSkipsUnreadNodes(t *testing.T) {
	const (
		mB, age, unread, dis, site, mA = 0, 1, 2, 3, 4, 5
	)
	g, err := newMechanismGraph(screeningMechs())
	if err != nil {
		t.Fatal(err)
	}
	ch := g.chain([]int{dis, age, mA, mB})
	var order []int
	var regs, weights [][]int
	for _, st := range ch.steps {
		order = append(order, st.mech)
		regs = append(regs, st.regs)
		weights = append(weights, st.weights)
	}
	if want := []int{age, site, dis, mB, mA}; !reflect.DeepEqual(order, want) {
		t.Errorf("steps %v, want %v", order, want)
	}
	wantRegs := [][]int{{}, {age}, {age, site}, {age, dis}, {mB, age, dis}}
	if !reflect.DeepEqual(regs, wantRegs) {
		t.Errorf("regressors %v, want %v", regs, wantRegs)
	}
	// ω_r reweights An(D_{r+1}) ∖ {k_r}: at marker_a's step every other
	// relevant node; at site's step only age.
	wantW := [][]int{{}, {age}, {age, site}, {age, dis, site}, {mB, age, dis, site}}
	for r := range wantW {
		if !reflect.DeepEqual(append([]int{}, weights[r]...), wantW[r]) {
			t.Errorf("step %d weights %v, want %v", r, weights[r], wantW[r])
		}
	}
	// The denominator reads the label only.
	den := g.chain([]int{dis})
	if len(den.steps) != 3 || den.steps[2].mech != dis {
		t.Errorf("label-only chain %+v, want age, site, disease", den.steps)
	}
}

func TestMechanismGraphRejectsCycles(t *testing.T) {
	if _, err := newMechanismGraph([]Mechanism{{Node: "a", Parents: []string{"b"}}, {Node: "b", Parents: []string{"a"}}}); err == nil {
		t.Error("a cycle was accepted")
	}
	if _, err := newMechanismGraph([]Mechanism{{Node: "a", Parents: []string{"zz"}}}); err == nil {
		t.Error("an unknown parent was accepted")
	}
}
