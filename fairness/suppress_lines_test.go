package fairness

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// display is what the outputs show of a line under marks: the count, or
// -1 for "<T", or -2 for "withheld".
func display(n []int, marks []mark) []int {
	out := make([]int, len(n))
	for i, m := range marks {
		switch {
		case m == markBelow:
			out[i] = -1
		case m.hidden():
			out[i] = -2
		default:
			out[i] = n[i]
		}
	}
	return out
}

// compositions calls f with every way of writing total as len(n) counts
// ≥ 0 that agree with the shown counts of shown (≥ 0 entries).
func compositions(shown []int, total int, f func([]int)) {
	cur := make([]int, len(shown))
	var rec func(i, left int)
	rec = func(i, left int) {
		if i == len(shown)-1 {
			if shown[i] >= 0 && shown[i] != left {
				return
			}
			cur[i] = left
			f(cur)
			return
		}
		if shown[i] >= 0 {
			if shown[i] <= left {
				cur[i] = shown[i]
				rec(i+1, left-shown[i])
			}
			return
		}
		for v := 0; v <= left; v++ {
			cur[i] = v
			rec(i+1, left-v)
		}
	}
	rec(0, total)
}

// labelBounds are the values a reader can give a count from what the
// outputs show of its line (display): a shown count is itself; "<T" is 1
// to T−1; "withheld" is at least T beside a "<T" of the same line (it was
// withheld with it), at least 1 when no "<T" is shown but some count is
// (counts shown as "<T" or "withheld" before, masked alike), and at least
// 0 when every count of the line is withheld.
func labelBounds(shown []int, t int) (lo, hi []int) {
	anyBelow, allHidden := false, true
	for _, v := range shown {
		anyBelow = anyBelow || v == -1
		allHidden = allHidden && v < 0
	}
	lo, hi = make([]int, len(shown)), make([]int, len(shown))
	for i, v := range shown {
		switch {
		case v >= 0:
			lo[i], hi[i] = v, v
		case v == -1:
			lo[i], hi[i] = 1, t-1
		case anyBelow:
			lo[i], hi[i] = t, 1<<30
		case allHidden:
			lo[i], hi[i] = 0, 1<<30
		default:
			lo[i], hi[i] = 1, 1<<30
		}
	}
	return lo, hi
}

// TestProtectLineNoCountRecoverable checks complementary suppression as
// disclosure control judges a published table (common practice: a
// withheld cell must not be derivable from the margins and the other
// cells): a reader who knows the line's total, every shown count and
// what each label means (labelBounds) and tries every line that fits
// finds each count shown as "<T" free over all of 1 to T−1, and every
// other withheld count free over at least two values. Lines are drawn at
// random (seeded) with 1–4 counts of 0–30, thresholds 3, 5 and 10, and
// every candidate line is enumerated. A line of one count is its total
// and cannot be protected.
//
// The choice of complementary counts (the smallest shown) depends on the
// values, as in common practice; a reader who also re-runs the rule on
// every candidate can sometimes narrow a count further. The test logs how
// often.
func TestProtectLineNoCountRecoverable(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	lines := [][]int{{3, 500}, {1, 10}, {4, 2, 50}, {1, 1}, {0, 3, 0}, {9, 9, 9}, {2, 11}, {5, 5}}
	for range 400 {
		k := 1 + rng.IntN(4)
		n := make([]int, k)
		for i := range n {
			n[i] = rng.IntN(31)
			if rng.IntN(3) == 0 {
				n[i] = rng.IntN(10)
			}
		}
		lines = append(lines, n)
	}
	protected, ruleAware := 0, 0
	for _, th := range []int{3, 5, 10} {
		for _, n := range lines {
			marks := protectLine(n, th, nil)
			for i, v := range n {
				if small(v, th) && !marks[i].hidden() {
					t.Fatalf("T=%d %v: small count %d shown", th, n, v)
				}
			}
			shown := display(n, marks)
			if len(n) == 1 || slices.Equal(shown, n) {
				continue
			}
			protected++
			total := 0
			for _, v := range n {
				total += v
			}
			lo, hi := labelBounds(shown, th)
			fits := make([]map[int]bool, len(n))
			again := make([]map[int]bool, len(n)) // also re-running the rule
			for i := range fits {
				fits[i], again[i] = map[int]bool{}, map[int]bool{}
			}
			compositions(shown, total, func(c []int) {
				for i, v := range c {
					if v < lo[i] || v > hi[i] {
						return
					}
				}
				rerun := slices.Equal(display(c, protectLine(c, th, nil)), shown)
				for i, v := range c {
					fits[i][v] = true
					if rerun {
						again[i][v] = true
					}
				}
			})
			narrowed := false
			for i, v := range shown {
				switch {
				case v == -1:
					for x := 1; x < th; x++ {
						if !fits[i][x] {
							t.Errorf("T=%d line %v shown as %v: the count at %d cannot be %d", th, n, shown, i, x)
							break
						}
					}
				case v == -2 && len(fits[i]) < 2:
					t.Errorf("T=%d line %v shown as %v: the withheld count at %d is %v", th, n, shown, i, fits[i])
				}
				if v < 0 && len(again[i]) < 2 {
					narrowed = true
				}
			}
			if narrowed {
				ruleAware++
			}
		}
	}
	t.Logf("%d protected lines; a reader who re-runs the rule pins a withheld count in %d of them", protected, ruleAware)
}

// TestLineSafeByHand: lineSafe against intervals worked out by hand for
// T = 10. A "<10" count beside one withheld count of at least 10 keeps
// the whole range 1–9 only when their sum S ≥ 19 (then the other is
// S − x ≥ 10 for every x ≤ 9); two "<10" counts summing to S keep it when
// S − 9 ≤ 1 and S − 1 ≥ 9, i.e. S = 10.
func TestLineSafeByHand(t *testing.T) {
	cases := []struct {
		n     []int
		marks []mark
		safe  bool
	}{
		{[]int{3, 500}, []mark{markBelow, markComplementary}, true},
		{[]int{3, 16}, []mark{markBelow, markComplementary}, true},  // S = 19
		{[]int{3, 15}, []mark{markBelow, markComplementary}, false}, // S = 18: x ≤ 8
		{[]int{5, 5}, []mark{markBelow, markBelow}, true},           // S = 10
		{[]int{4, 5}, []mark{markBelow, markBelow}, false},          // S = 9: x ≤ 8
		{[]int{3, 2}, []mark{markMasked, markMasked}, true},         // x ∈ [1, 4]
		{[]int{1, 1}, []mark{markMasked, markMasked}, false},        // both 1
		{[]int{0, 0}, []mark{markMaskedAny, markMaskedAny}, false},  // both 0
		{[]int{7}, []mark{markBelow}, false},                        // the total
		{[]int{7, 100}, []mark{markBelow, markShown}, false},        // subtraction
	}
	for _, c := range cases {
		if got := lineSafe(c.n, c.marks, 10); got != c.safe {
			t.Errorf("lineSafe(%v, %v) = %v, want %v", c.n, c.marks, got, c.safe)
		}
	}
}
