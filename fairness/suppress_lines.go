package fairness

import "math"

// Complementary suppression of one line of counts: counts that add up to
// a total the outputs show (a group's records over the bins of a column,
// the rows of the other group values). Statistical disclosure control
// calls the withheld small counts primary and the counts withheld with
// them complementary (or secondary) suppressions; the guard below is the
// feasibility check of such a table: given the total and every count that
// is shown, the values a withheld count can still take form an interval,
// and that interval must not shrink to one value.

// mark says how a count of a line is shown.
type mark int

const (
	markShown         mark = iota
	markBelow              // a count from 1 to T−1, shown as "<T"
	markComplementary      // a count of T or more withheld with a small one, shown as "withheld"
	markMasked             // withheld, shown as "withheld", and known to be at least 1 (a small or complementary count)
	markMaskedAny          // withheld, shown as "withheld", any count from 0
)

// hidden reports whether a count with mark m is withheld.
func (m mark) hidden() bool { return m != markShown }

// reason is the Suppression reason of a withheld count with mark m: only
// a count shown as "<T" is WithheldBelow.
func (m mark) reason() string {
	if m == markBelow {
		return WithheldBelow
	}
	return WithheldComplementary
}

// bounds are the values a reader who knows the rule can tell a withheld
// count with mark m lies in: [1, T−1] for one shown as "<T", [T, ∞) for a
// complementary one (chosen among shown counts, which are 0 or at least
// T, and never 0), [1, ∞) and [0, ∞) for masked ones.
func (m mark) bounds(t int) (lo, hi float64) {
	switch m {
	case markBelow:
		return 1, float64(t - 1)
	case markComplementary:
		return float64(t), math.Inf(1)
	case markMasked:
		return 1, math.Inf(1)
	}
	return 0, math.Inf(1)
}

// small reports whether n is a count that threshold t withholds: 1 ≤ n < t.
func small(n, t int) bool { return n >= 1 && n < t }

// lineSafe reports whether no withheld count of a line can be narrowed
// down too far from the line's total and its shown counts: with S the sum
// of the withheld counts and [L_j, U_j] their bounds, count i can take the
// values [max(L_i, S − Σ_{j≠i} U_j), min(U_i, S − Σ_{j≠i} L_j)]; a count
// shown as "<T" must keep the whole of [1, T−1] (the reader learns no more
// than the label says), any other withheld count at least two values.
func lineSafe(n []int, marks []mark, t int) bool {
	var s, sumLo, sumHiFinite float64
	k, nInf := 0, 0
	for i, m := range marks {
		if !m.hidden() {
			continue
		}
		lo, hi := m.bounds(t)
		s += float64(n[i])
		sumLo += lo
		if math.IsInf(hi, 1) {
			nInf++
		} else {
			sumHiFinite += hi
		}
		k++
	}
	if k == 0 {
		return true
	}
	for _, m := range marks {
		if !m.hidden() {
			continue
		}
		lo, hi := m.bounds(t)
		otherHi := math.Inf(1)
		switch {
		case math.IsInf(hi, 1) && nInf == 1, !math.IsInf(hi, 1) && nInf == 0:
			otherHi = sumHiFinite
			if !math.IsInf(hi, 1) {
				otherHi -= hi
			}
		}
		from := math.Max(lo, s-otherHi)
		to := math.Min(hi, s-(sumLo-lo))
		if m == markBelow {
			if from > 1 || to < float64(t-1) {
				return false
			}
		} else if to <= from {
			return false
		}
	}
	return true
}

// protectLine withholds the small counts of a line whose total is shown
// and as few more as lineSafe needs, and returns their marks: the counts
// from 1 to t−1 first (markBelow); then, while the line is not safe, the
// smallest shown count above zero (the last of equal ones) as a
// complementary one; if the shown counts run out first, every withheld
// count is masked (no longer told apart), and if that is not safe either,
// every count of the line, zeros too. eligible, if non-nil, says which
// counts may be chosen as complementary ones. The result is safe unless
// even masking all counts leaves one pinned, which only a line of a single
// count, or of ones summing to a small total, can do.
func protectLine(n []int, t int, eligible func(i int) bool) []mark {
	marks := make([]mark, len(n))
	any := false
	for i, v := range n {
		if small(v, t) {
			marks[i] = markBelow
			any = true
		}
	}
	if !any {
		return marks
	}
	for !lineSafe(n, marks, t) {
		pick := -1
		for i, v := range n {
			if marks[i] == markShown && v > 0 && (eligible == nil || eligible(i)) && (pick < 0 || v <= n[pick]) {
				pick = i
			}
		}
		if pick < 0 {
			break
		}
		marks[pick] = markComplementary
	}
	if lineSafe(n, marks, t) {
		return marks
	}
	for i := range marks {
		if marks[i].hidden() {
			marks[i] = markMasked
		}
	}
	if lineSafe(n, marks, t) {
		return marks
	}
	for i := range marks {
		marks[i] = markMaskedAny
	}
	return marks
}
