package scm

// RareCases returns cases kept out of Cases (and so out of the accuracy
// and ground-truth tables), for the interval coverage study's rate metrics
// with few events:
//
//	rare-prevalence  the disease rare (baseline log-odds −2: 4.5% of the
//	                 reference group, 8.7% of the comparison group after
//	                 its log-odds +0.7; FNR 0.24 in both), so FNR and TPR
//	                 rest on a few dozen positives, and about ten false
//	                 negatives, at 800 records per group
//
// Nulls are those of the prevalence case.
func RareCases() []Case {
	c := Case{Name: "rare-prevalence", Shift: Shift{Prevalence: 0.7, Unread: 1, Baseline: -2},
		Null: []int{NodeAge, NodeSite, NodeMarkerA, NodeMarkerB, NodeUnread}}
	c.Model = Screening(c.Name, c.Shift)
	return []Case{c}
}
