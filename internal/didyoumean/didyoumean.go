// Package didyoumean suggests the known name nearest to a misspelt one, for
// the "did you mean" hint of the spec and policy parsers' errors on an
// unknown key or value.
package didyoumean

// Nearest returns the candidate nearest to s in edit distance (Distance)
// when that distance is at most 2, or at most a third of s's length for
// longer names, and is not 0 (s itself is no suggestion); ties go to the
// earlier candidate. ok is false when no candidate is that near.
func Nearest(s string, candidates []string) (best string, ok bool) {
	bestD := -1
	for _, c := range candidates {
		if d := Distance(s, c); bestD < 0 || d < bestD {
			best, bestD = c, d
		}
	}
	limit := max(2, len(s)/3)
	if bestD >= 0 && bestD <= limit && bestD > 0 {
		return best, true
	}
	return "", false
}

// Distance returns the Levenshtein edit distance between a and b:
// the fewest insertions, deletions and substitutions of bytes that turn
// one into the other (Levenshtein 1966; the usual two-row dynamic
// programme, O(len(a)·len(b)) time, O(len(b)) memory).
func Distance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
