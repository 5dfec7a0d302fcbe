package fairness

// Known keys at each level of the spec, for suggestions after a misspelt
// key (unknownKey).
var (
	topKeys = []string{"data", "label", "positive", "score", "threshold", "groups", "metrics", "graph", "seed",
		"missing", "categorical", "model_inputs", "probabilities", "folds", "fold_splits", "classifier", "ece_bins", "estimate_from", "combine_sides",
		"clip_ratios", "exact_limit", "intervals", "synthetic", "title", "names", "model", "audit_date"}
	groupKeys     = []string{"column", "reference", "comparison"}
	intervalKeys  = []string{"replicates", "level", "keep_ratios"}
	graphNodeKeys = []string{"node", "columns", "parents"}
)

// unknownKey is the error for key name at path key, suggesting the
// nearest of known when it is close (suggest).
func (p *specParser) unknownKey(line int, key, name string, known []string) error {
	if s, ok := suggest(name, known); ok {
		return specErr(p.file, line, key, ErrUnknownKey, "unknown key %q; did you mean %q?", name, s)
	}
	return specErr(p.file, line, key, ErrUnknownKey, "unknown key %q", name)
}

// suggest returns the candidate nearest to s in Levenshtein distance when
// that distance is at most 2, or at most a third of s's length for longer
// names; ties go to the earlier candidate.
func suggest(s string, candidates []string) (string, bool) {
	best, bestD := "", -1
	for _, c := range candidates {
		if d := levenshtein(s, c); bestD < 0 || d < bestD {
			best, bestD = c, d
		}
	}
	limit := max(2, len(s)/3)
	return best, bestD >= 0 && bestD <= limit && bestD > 0
}

// levenshtein returns the edit distance between a and b (insertions,
// deletions and substitutions of bytes; Levenshtein 1966, the usual
// two-row dynamic programme).
func levenshtein(a, b string) int {
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
