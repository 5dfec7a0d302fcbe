package fairness

import "github.com/gapwise/gapwise/internal/didyoumean"

// Known keys at each level of the spec, for suggestions after a misspelt
// key (unknownKey).
var (
	topKeys = []string{"data", "label", "positive", "score", "threshold", "groups", "metrics", "graph", "seed",
		"missing", "categorical", "model_inputs", "probabilities", "folds", "fold_splits", "classifier", "ece_bins", "estimator", "estimate_from", "combine_sides",
		"clip_ratios", "exact_limit", "intervals", "synthetic", "title", "names", "model", "audit_date", "suppress_below", "hidden_factor"}
	groupKeys     = []string{"column", "columns", "bands", "reference", "comparison"}
	intervalKeys  = []string{"replicates", "level", "keep_ratios", "form"}
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

// suggest returns the candidate nearest to s (didyoumean.Nearest).
func suggest(s string, candidates []string) (string, bool) {
	return didyoumean.Nearest(s, candidates)
}
