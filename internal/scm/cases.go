package scm

// Case is a named model (a Screening variant, or ScoreNode) with the
// mechanisms whose ground-truth contribution is exactly zero by
// construction.
type Case struct {
	Name  string
	Shift Shift
	Model *Model
	// Null lists node indices whose Shapley value is exactly 0 for every
	// metric: their equations agree between groups, or nothing the model or
	// the label reads depends on them.
	Null []int
	// Hard marks a case outside the estimator's comfort zone (infinite-variance
	// weights); accuracy there is reported, not asserted.
	Hard bool
}

// Cases returns the accuracy cases, each isolating one kind of shift. In
// the Screening ones the unread covariate differs between groups (ground
// truth 0 because nothing reads it); in all, every unshifted mechanism is a
// null too.
//
//	interaction   marker_a's mean drops by 0.8 among the diseased only
//	spread-narrow marker_b's spread is 0.7 in the comparison group (safe)
//	spread-wide   marker_b's spread is 1.6 (infinite-variance weights)
//	prevalence    disease log-odds +0.7
//	case-mix      age mean +0.5 and site mix shifted
//	combined      every shift at once, the spread narrower
//	score-node    the score is a node (ScoreNode): age mean +0.3, and the
//	              unrecorded input weaker by 0.8 among the diseased
//
// The first six are Screening variants (node indices NodeAge…); the last
// has its own nodes (ScoreNodeAge…).
func Cases() []Case {
	const unread = 1.0
	cases := []Case{
		{Name: "interaction", Shift: Shift{DiseasedMarker: -0.8, Unread: unread},
			Null: []int{NodeAge, NodeSite, NodeDisease, NodeMarkerB, NodeUnread}},
		{Name: "spread-narrow", Shift: Shift{Spread: 0.7, Unread: unread},
			Null: []int{NodeAge, NodeSite, NodeDisease, NodeMarkerA, NodeUnread}},
		{Name: "spread-wide", Shift: Shift{Spread: 1.6, Unread: unread},
			Null: []int{NodeAge, NodeSite, NodeDisease, NodeMarkerA, NodeUnread}, Hard: true},
		{Name: "prevalence", Shift: Shift{Prevalence: 0.7, Unread: unread},
			Null: []int{NodeAge, NodeSite, NodeMarkerA, NodeMarkerB, NodeUnread}},
		{Name: "case-mix", Shift: Shift{Age: 0.5, Site: true, Unread: unread},
			Null: []int{NodeDisease, NodeMarkerA, NodeMarkerB, NodeUnread}},
		{Name: "combined", Shift: Shift{Age: 0.3, Site: true, Prevalence: 0.5, DiseasedMarker: -0.6, Spread: 0.75, Unread: unread},
			Null: []int{NodeUnread}},
	}
	for i := range cases {
		cases[i].Model = Screening(cases[i].Name, cases[i].Shift)
	}
	return append(cases, Case{Name: "score-node", Model: ScoreNode("score-node", 0.3, -0.8),
		Null: []int{ScoreNodeDisease, ScoreNodeMarker}})
}
