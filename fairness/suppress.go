package fairness

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/gapwise/gapwise/metrics"
)

// Small-cell suppression (spec key suppress_below, flag --suppress-below):
// health-statistics publishers withhold counts below a small threshold,
// often 10 or 11, from released tables so that no small group of patients
// can be picked out (common practice). With threshold T the Result
// withholds, after every number has been computed from all records:
//
//   - every descriptive count from 1 to T−1 (reason WithheldBelow, shown
//     as "<T"): the confusion counts, the score bins of the reliability
//     curves, each group's records per bin or level of every column and
//     its missing values, the outlying values of a column, the rows of
//     each group value left out of the audit, the rows without a group
//     value and the rows dropped for missing values. Zero is shown: it
//     describes no one, and the rates it underlies show it anyway.
//   - complementary counts (reason WithheldComplementary, shown as
//     "withheld"): where counts add up to a total the outputs show, more
//     of them, smallest first, until no withheld count can be worked out
//     by subtraction and a count shown as "<T" can still be anything from
//     1 to T−1 (lineSafe). Where that cannot be had, the withheld counts of
//     the table are all shown as "withheld" alike, and then the whole
//     table. A confusion table with a small count is withheld whole (its
//     margins, the group's records, events and the records decided
//     positive, are shown elsewhere, so one count would give the others);
//     a score bin of a reliability curve is withheld whole (records, mean
//     score and event rate) when its records, events or non-events are
//     small, with at least one more; the shares of a group's column are
//     all withheld when its missing values are (the shares' denominator
//     would give them).
//
// Not withheld: the metrics, gaps, contributions and intervals, which are
// estimates from all records; the groups' records and events and the
// records each metric rests on, which the audit needs (a small one is
// listed in SmallMargins); and the estimation diagnostics (effective
// sample sizes, clipped records). A rate shown with the records it rests
// on gives its numerator: RevealingRates lists the rates whose numerator
// or its complement is a small count.
//
// In JSON a withheld value is null and its path is listed in Cells; in
// the Result it is 0.
type Suppression struct {
	// Below is the threshold T: counts from 1 to T−1 are withheld.
	Below int `json:"below"`
	// Cells lists every withheld value by its path in the result's JSON
	// (e.g. "details.reference.confusion.fn"), in the order they were
	// decided.
	Cells []SuppressedCell `json:"cells"`
	// SmallMargins lists the counts below T that are shown because the
	// audit rests on them (e.g. "groups.events_comparison",
	// "metrics[0].records_reference").
	SmallMargins []string `json:"small_margins"`
	// RevealingRates lists, per metric and group, the rates whose
	// numerator or its complement in the records the rate rests on is a
	// count from 1 to T−1: shown with those records, they give it.
	RevealingRates []RevealingRate `json:"revealing_rates"`

	index map[string]string // path → reason
	zero  []func()          // set each withheld value of the planned Result to 0 (applySuppression)
}

// SuppressedCell is one withheld value: its JSON path and why.
type SuppressedCell struct {
	Path   string `json:"path"`
	Reason string `json:"reason"`
}

// RevealingRate names a metric's rate in one group ("reference" or
// "comparison") that gives a small count away.
type RevealingRate struct {
	Metric string `json:"metric"`
	Group  string `json:"group"`
}

// Reasons a value is withheld.
const (
	// WithheldBelow: a count from 1 to T−1, or a value resting on one (the
	// mean score and event rate of a small score bin). Reports show "<T".
	WithheldBelow = "below_threshold"
	// WithheldComplementary: withheld so that a count below T cannot be
	// worked out from a total the outputs show. Reports show "withheld".
	WithheldComplementary = "complementary"
)

// Withheld returns the reason the value at path is withheld, if it is. It
// does not change s, so a Result can be read from several goroutines.
func (s *Suppression) Withheld(path string) (reason string, ok bool) {
	if s == nil {
		return "", false
	}
	if s.index != nil {
		reason, ok = s.index[path]
		return reason, ok
	}
	for _, c := range s.Cells { // a copy or a decoded Result has no index
		if c.Path == path {
			return c.Reason, true
		}
	}
	return "", false
}

// Paths of the values suppression can withhold; role is "reference" or
// "comparison", i a position in the result's slices.

// ConfusionPath is the path of a group's confusion count ("tp", "fp",
// "tn" or "fn").
func ConfusionPath(role, cell string) string { return "details." + role + ".confusion." + cell }

// ReliabilityPath is the path of a field ("count", "mean_score",
// "event_rate") of score bin i of a group's reliability curve.
func ReliabilityPath(role string, i int, field string) string {
	return fmt.Sprintf("details.%s.reliability[%d].%s", role, i, field)
}

// SharePath is the path of a group's share of bin or level j of column i.
func SharePath(col int, role string, j int) string {
	return fmt.Sprintf("details.columns[%d].%s[%d]", col, role, j)
}

// LevelCountPath is the path of a group's records at level j of column i.
func LevelCountPath(col int, role string, j int) string {
	return fmt.Sprintf("details.columns[%d].counts_%s[%d]", col, role, j)
}

// MissingPath is the path of a group's missing values in column i.
func MissingPath(col int, role string) string {
	return fmt.Sprintf("details.columns[%d].missing_%s", col, role)
}

// OutlyingPath is the path of column i's count of outlying values.
func OutlyingPath(col int) string { return fmt.Sprintf("details.columns[%d].outlying_values", col) }

// ExcludedPath is the path of the rows of excluded group value i.
func ExcludedPath(i int) string { return fmt.Sprintf("groups.excluded_values[%d].rows", i) }

// Paths of single counts.
const (
	PathExcludedRows      = "groups.excluded_rows"
	PathMissingGroupRows  = "groups.missing_group_rows"
	PathDroppedReference  = "groups.dropped_reference"
	PathDroppedComparison = "groups.dropped_comparison"
)

// AllRecordsPath is the path of a group's records ("n_reference" or
// "n_comparison") behind metric i's all_records gap.
func AllRecordsPath(metric int, field string) string {
	return fmt.Sprintf("metrics[%d].all_records.%s", metric, field)
}

// roles are the two groups' names in paths.
var roles = [2]string{"reference", "comparison"}

// planSuppression decides, from the exact counts of r, which values
// threshold t withholds (see Suppression); r is not changed until
// applySuppression. It needs r.Details for the descriptive counts
// (without it only the group-level counts are planned).
func planSuppression(r *Result, t int) *Suppression {
	s := &Suppression{Below: t, Cells: []SuppressedCell{}, SmallMargins: []string{}, RevealingRates: []RevealingRate{}, index: map[string]string{}}
	add := func(path string, m mark, zero func()) {
		if _, ok := s.Withheld(path); ok || !m.hidden() {
			return
		}
		s.Cells = append(s.Cells, SuppressedCell{Path: path, Reason: m.reason()})
		s.index[path] = m.reason()
		s.zero = append(s.zero, zero)
	}
	planGroups(r, t, add)
	if d := r.Details; d != nil {
		for g, gd := range [2]*GroupDetails{&d.Reference, &d.Comparison} {
			planConfusion(roles[g], &gd.Confusion, t, add)
			planReliability(roles[g], gd.Curve, t, add)
		}
		for i := range d.Columns {
			planColumn(i, &d.Columns[i], [2]int{d.Reference.N, d.Comparison.N}, t, add)
		}
		s.RevealingRates = revealingRates(r, t)
	}
	s.SmallMargins = smallMargins(r, t)
	return s
}

// planGroups withholds the group-level counts: rows dropped for missing
// values (with the all-records counts that would give them), rows without
// a group value, and the rows of the other group values, a line whose
// total (excluded_rows) is shown unless it is small itself; the rows of
// values beyond the listed ones count as one more, unlisted, count of it.
func planGroups(r *Result, t int, add adder) {
	g := &r.Groups
	dropped := [2]*int{&g.DroppedReference, &g.DroppedComparison}
	for k, n := range dropped {
		if !small(*n, t) {
			continue
		}
		add([]string{PathDroppedReference, PathDroppedComparison}[k], markBelow, func() { *n = 0 })
		for m := range r.Metrics {
			if a := r.Metrics[m].AllRecords; a != nil {
				field := [2]*int{&a.NReference, &a.NComparison}[k]
				add(AllRecordsPath(m, "n_"+roles[k]), markComplementary, func() { *field = 0 })
			}
		}
	}
	if small(g.MissingGroupRows, t) {
		add(PathMissingGroupRows, markBelow, func() { g.MissingGroupRows = 0 })
	}
	zeroRows := func(i int) func() { return func() { g.Excluded[i].Rows = 0 } }
	if small(g.ExcludedRows, t) {
		add(PathExcludedRows, markBelow, func() { g.ExcludedRows = 0 })
		for i := range g.Excluded {
			add(ExcludedPath(i), markBelow, zeroRows(i)) // each is at most the small total
		}
		return
	}
	n := make([]int, 0, len(g.Excluded)+1)
	listed := 0
	for _, e := range g.Excluded {
		n = append(n, e.Rows)
		listed += e.Rows
	}
	if unlisted := g.ExcludedRows - listed; unlisted > 0 {
		n = append(n, unlisted)
	}
	marks := protectLine(n, t, func(i int) bool { return i < len(g.Excluded) })
	for i := range g.Excluded {
		add(ExcludedPath(i), marks[i], zeroRows(i))
	}
}

// adder records a withheld value: its path, its mark and how to set it
// to 0 in the Result.
type adder func(path string, m mark, zero func())

// planConfusion withholds a group's confusion table whole when one of its
// counts is small: its row totals (events, non-events) and column totals
// (records decided positive, negative) are shown or follow from what is,
// so the four counts are TP = x, FN = E − x, FP = P − x, TN = N − E − P + x
// for one unknown x, and a single shown count would fix x. The small
// counts are shown as "<T" and the rest as "withheld" when every value x
// can still take keeps each small count free over [1, T−1]; otherwise all
// four are "withheld".
func planConfusion(role string, cc *ConfusionCounts, t int, add adder) {
	c := *cc
	cells := [4]struct {
		name string
		n    int
		sign int // the count is base + sign·x
		ptr  *float64
	}{{"tp", int(c.TP), 1, &cc.TP}, {"fn", int(c.FN), -1, &cc.FN}, {"fp", int(c.FP), -1, &cc.FP}, {"tn", int(c.TN), 1, &cc.TN}}
	any := false
	for _, cl := range cells {
		any = any || small(cl.n, t)
	}
	if !any {
		return
	}
	marks := [4]mark{}
	for i, cl := range cells {
		switch {
		case small(cl.n, t):
			marks[i] = markBelow
		case cl.n == 0:
			marks[i] = markMaskedAny
		default:
			marks[i] = markComplementary
		}
	}
	// x = TP; each count is n_i + sign_i·(x − TP), so its bounds give an
	// interval for x.
	free := func(ms [4]mark) bool {
		lo, hi := math.Inf(-1), math.Inf(1)
		for i, cl := range cells {
			l, h := ms[i].bounds(t)
			// l ≤ n + sign·(x − TP) ≤ h
			a, b := (l-float64(cl.n))*float64(cl.sign), (h-float64(cl.n))*float64(cl.sign)
			if a > b {
				a, b = b, a
			}
			lo, hi = math.Max(lo, c.TP+a), math.Min(hi, c.TP+b)
		}
		for i, cl := range cells {
			if ms[i] != markBelow {
				continue
			}
			// the small count's range over x ∈ [lo, hi]
			from := float64(cl.n) + float64(cl.sign)*(lo-c.TP)
			to := float64(cl.n) + float64(cl.sign)*(hi-c.TP)
			if from > to {
				from, to = to, from
			}
			if from > 1 || to < float64(t-1) {
				return false
			}
		}
		return hi > lo
	}
	if !free(marks) {
		marks = [4]mark{markMaskedAny, markMaskedAny, markMaskedAny, markMaskedAny}
	}
	for i, cl := range cells {
		add(ConfusionPath(role, cl.name), marks[i], func() { *cl.ptr = 0 })
	}
}

// planReliability withholds score bins of a group's reliability curve:
// a bin whose records, events or non-events number 1 to T−1 is withheld
// whole (records, mean score, event rate; its records shown as "<T" when
// they are the small count). The bins' records add up to the group's
// records, their events to its events, so bins are withheld until the
// records pass lineSafe and, if any bin is withheld, at least two are
// (one withheld bin's events would be the group's events minus the
// others'), smallest first.
func planReliability(role string, curve []ReliabilityBin, t int, add adder) {
	k := len(curve)
	if k == 0 {
		return
	}
	n := make([]int, k)
	marks := make([]mark, k)
	any := false
	for j, b := range curve {
		n[j] = b.Count
		events := int(math.Round(b.EventRate * float64(b.Count)))
		switch {
		case small(b.Count, t):
			marks[j] = markBelow
		case small(events, t) || small(b.Count-events, t):
			marks[j] = markComplementary
		default:
			continue
		}
		any = true
	}
	if !any {
		return
	}
	hiddenBins := func() int {
		h := 0
		for _, m := range marks {
			if m.hidden() {
				h++
			}
		}
		return h
	}
	for !lineSafe(n, marks, t) || hiddenBins() < 2 {
		pick := -1
		for j := range n {
			if marks[j] == markShown && (pick < 0 || n[j] <= n[pick]) {
				pick = j
			}
		}
		if pick < 0 {
			break
		}
		marks[pick] = markComplementary
	}
	if !lineSafe(n, marks, t) {
		for j := range marks {
			marks[j] = markMasked
		}
	}
	for j, m := range marks {
		if !m.hidden() {
			continue
		}
		b := &curve[j]
		add(ReliabilityPath(role, j, "count"), m, func() { b.Count = 0 })
		rest := m
		if rest != markBelow {
			rest = markComplementary
		}
		add(ReliabilityPath(role, j, "mean_score"), rest, func() { b.MeanScore = 0 })
		add(ReliabilityPath(role, j, "event_rate"), rest, func() { b.EventRate = 0 })
	}
}

// planColumn withholds, per group, the records of a column's bins or
// levels (their shares and, for levels, their counts: a line whose total,
// the group's records with a value, the shares' denominator gives away),
// its missing values (and then all its shares, which would give them),
// and the column's outlying values.
func planColumn(i int, c *ColumnDetails, groupN [2]int, t int, add adder) {
	if small(c.Outlying, t) {
		add(OutlyingPath(i), markBelow, func() { c.Outlying = 0 })
	}
	for g, role := range roles {
		shares, counts, missing := c.Reference, c.CountsReference, &c.MissingReference
		if g == 1 {
			shares, counts, missing = c.Comparison, c.CountsComparison, &c.MissingComparison
		}
		withhold := func(j int, m mark) {
			add(SharePath(i, role, j), m, func() { shares[j] = 0 })
			if counts != nil {
				add(LevelCountPath(i, role, j), m, func() { counts[j] = 0 })
			}
		}
		if small(*missing, t) {
			add(MissingPath(i, role), markBelow, func() { *missing = 0 })
			for j := range shares {
				withhold(j, markMaskedAny)
			}
			continue
		}
		for j, m := range protectLine(binCounts(shares, counts, groupN[g]-*missing), t, nil) {
			withhold(j, m)
		}
	}
}

// binCounts returns a group's records per bin or level of a column: the
// level counts when the column has them, else each share times the
// group's records with a value, withValue (shares are counts over it, so
// the product rounds to the count).
func binCounts(shares []float64, counts []int, withValue int) []int {
	if counts != nil {
		return slices.Clone(counts)
	}
	out := make([]int, len(shares))
	for j, p := range shares {
		out[j] = int(math.Round(p * float64(withValue)))
	}
	return out
}

// smallMargins lists the group-level counts below t that stay shown: the
// groups' records and events and the records each metric rests on.
func smallMargins(r *Result, t int) []string {
	out := []string{}
	g := r.Groups
	for _, f := range []struct {
		path string
		n    int
	}{
		{"groups.n_reference", g.NReference}, {"groups.n_comparison", g.NComparison},
		{"groups.events_reference", g.EventsReference}, {"groups.events_comparison", g.EventsComparison},
		{"groups.non_events_reference", g.NReference - g.EventsReference}, {"groups.non_events_comparison", g.NComparison - g.EventsComparison},
	} {
		if small(f.n, t) {
			out = append(out, f.path)
		}
	}
	for i, m := range r.Metrics {
		if small(m.RecordsReference, t) {
			out = append(out, fmt.Sprintf("metrics[%d].records_reference", i))
		}
		if small(m.RecordsComparison, t) {
			out = append(out, fmt.Sprintf("metrics[%d].records_comparison", i))
		}
	}
	return out
}

// revealingRates lists the threshold rates of r whose numerator, or the
// rest of the records they rest on, is a count from 1 to t−1 in a group,
// from the groups' exact confusion counts.
func revealingRates(r *Result, t int) []RevealingRate {
	out := []RevealingRate{}
	for _, m := range r.Metrics {
		for g, gd := range [2]GroupDetails{r.Details.Reference, r.Details.Comparison} {
			c := gd.Confusion
			num, basis, ok := rateCounts(m.Metric, c)
			if ok && (small(int(num), t) || small(int(basis-num), t)) {
				out = append(out, RevealingRate{Metric: m.Metric, Group: roles[g]})
			}
		}
	}
	return out
}

// rateCounts returns the numerator and the records a threshold rate
// rests on, from the confusion counts; ok is false for a metric that is
// not a rate of them.
func rateCounts(metric string, c ConfusionCounts) (num, basis float64, ok bool) {
	switch metric {
	case metrics.NameFPR:
		return c.FP, c.FP + c.TN, true
	case metrics.NameTPR:
		return c.TP, c.TP + c.FN, true
	case metrics.NameFNR:
		return c.FN, c.TP + c.FN, true
	case metrics.NamePPV:
		return c.TP, c.TP + c.FP, true
	case metrics.NameNPV:
		return c.TN, c.TN + c.FN, true
	case metrics.NameSelectionRate:
		return c.TP + c.FP, c.TP + c.FP + c.TN + c.FN, true
	case metrics.NameAccuracy:
		return c.TP + c.TN, c.TP + c.FP + c.TN + c.FN, true
	}
	return 0, 0, false
}

// Suppress applies small-cell suppression with threshold t to a Result
// made without it (by Run without suppress_below, or read from JSON): it
// plans what to withhold from r's counts (see Suppression), words the
// warnings again so that they quote no withheld count (and with them the
// mechanisms' reliability and the headlines), and sets the withheld values
// to 0. t must pass CheckSuppressBelow; 0 leaves r as it is. A Result
// that is already suppressed is refused: its withheld counts are gone.
func Suppress(r *Result, t int) error {
	if err := CheckSuppressBelow(t); err != nil {
		return fmt.Errorf("fairness: suppression threshold %w", err)
	}
	if r.Suppression != nil {
		return errors.New("fairness: the result is already suppressed")
	}
	if t == 0 {
		return nil
	}
	r.Suppression = planSuppression(r, t)
	r.Warnings = Warnings(r)
	setReliability(r)
	setHeadlines(r)
	applySuppression(r)
	return nil
}

// applySuppression sets every value r.Suppression withholds to 0: the
// metrics and the warnings are computed before, from all records.
func applySuppression(r *Result) {
	if r.Suppression == nil {
		return
	}
	for _, zero := range r.Suppression.zero {
		zero()
	}
	r.Suppression.zero = nil
}

// countWords words the count n at a JSON path for a warning's sentence.
type countWords func(path string, n int) string

// plainCount is countWords without suppression: n with thousands
// separators.
func plainCount(_ string, n int) string { return thousands(n) }

// words is countWords under s: "fewer than T" for a count withheld as
// small, "a withheld number of" for a complementary one, else the digits;
// a nil s withholds nothing.
func (s *Suppression) words(path string, n int) string {
	reason, ok := s.Withheld(path)
	switch {
	case !ok:
		return thousands(n)
	case reason == WithheldBelow:
		return fmt.Sprintf("fewer than %d", s.Below)
	}
	return "a withheld number of"
}
