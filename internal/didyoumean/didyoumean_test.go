package didyoumean

import "testing"

// TestDistance checks the edit distance on textbook pairs
// (kitten → sitting is 3, the classic example; the others by hand).
func TestDistance(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		d    int
	}{{"kitten", "sitting", 3}, {"", "abc", 3}, {"abc", "abc", 0}, {"flaw", "lawn", 2}, {"treshold", "threshold", 1}} {
		if got := Distance(tc.a, tc.b); got != tc.d {
			t.Errorf("Distance(%q, %q) = %d, want %d", tc.a, tc.b, got, tc.d)
		}
	}
}

// TestNearest: a near name gets the nearest candidate (the earlier one on
// a tie), a far name or the exact name none.
func TestNearest(t *testing.T) {
	known := []string{"max_gap", "min_ratio", "metric", "judge"}
	for _, tc := range []struct {
		in, want string
		ok       bool
	}{
		{"max_gaps", "max_gap", true},
		{"min_ration", "min_ratio", true},
		{"metrics", "metric", true},
		{"colour", "", false},
		{"judge", "", false}, // the name itself is no suggestion
	} {
		got, ok := Nearest(tc.in, known)
		if got != tc.want || ok != tc.ok {
			t.Errorf("Nearest(%q) = %q, %v; want %q, %v", tc.in, got, ok, tc.want, tc.ok)
		}
	}
}
