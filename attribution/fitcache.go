package attribution

import (
	"fmt"
	"slices"
	"strings"
	"sync"
)

// FitCache shares group classifiers between decompositions of the same
// records under different causal graphs. A density ratio's classifier
// P(cmp | columns) depends only on the column set it reads, not on the
// graph that asked for it: when two graphs both need the set {hb, anaemia,
// age} (one as a node with its parents, the other as some node's parents)
// it is fitted once, by the first decomposition that needs it, and the
// later ones take its out-of-fold log-odds, learner choice and refit
// learner as they are (in every bootstrap replicate too, when asked).
//
// Only the column sets named when the cache is made are kept (the sets two
// or more graphs share; see FitColumnSets), so its memory is known in
// advance: one float64 per record per kept set and fit (point estimate and
// each replicate). A cache must only be shared between decompositions of
// the same Sample rows with the same Options apart from the mechanisms; its
// key holds the seed, records, folds and fitting cap as a guard. A set's
// fit taken from the cache may differ in its last bits from the one the
// later graph would have fitted itself (a learner's seed depends on the
// set's position in its graph), never in what it estimates. Safe for
// concurrent use.
type FitCache struct {
	replicates bool
	share      map[string]bool // by namesKey
	mu         sync.Mutex
	fits       map[string]groupFit
	hits       int
}

// NewFitCache returns a cache that keeps the fits of the column sets in
// share (each a list of Sample.Features names, in any order); with
// replicates it keeps those of bootstrap replicates as well, otherwise only
// the point estimate's.
func NewFitCache(share [][]string, replicates bool) *FitCache {
	c := &FitCache{replicates: replicates, share: map[string]bool{}, fits: map[string]groupFit{}}
	for _, s := range share {
		c.share[namesKey(s)] = true
	}
	return c
}

// Len returns the number of fits the cache holds.
func (c *FitCache) Len() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return len(c.fits)
}

// Hits returns the number of fits taken from the cache instead of being
// fitted again.
func (c *FitCache) Hits() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.hits
}

// FitColumnSets returns the distinct column sets the group classifiers
// of mechs fit on s, each as the sorted Features names of its columns, in
// order of first use: every mechanism's (node, parents) and, for a node
// with parents, its parents. It returns nil when s has no Features.
func FitColumnSets(s *Sample, mechs []Mechanism) [][]string {
	if s.Features == nil {
		return nil
	}
	var out [][]string
	seen := map[string]bool{}
	add := func(cols []int) {
		if len(cols) == 0 {
			return
		}
		names := featureNames(s, cols)
		if k := namesKey(names); !seen[k] {
			seen[k] = true
			out = append(out, names)
		}
	}
	for _, m := range mechs {
		add(unionCols(m.NodeCols, m.ParentCols))
		add(m.ParentCols)
	}
	return out
}

// featureNames returns the sorted names of columns cols of s.
func featureNames(s *Sample, cols []int) []string {
	names := make([]string, len(cols))
	for i, c := range cols {
		names[i] = s.Features[c]
	}
	slices.Sort(names)
	return names
}

// namesKey joins sorted-or-not names into a set key.
func namesKey(names []string) string {
	s := slices.Clone(names)
	slices.Sort(s)
	return strings.Join(s, "\x00")
}

// fitScope is the part of a cache key that guards against sharing between
// different records or settings: the seed (which differs per fold split
// and bootstrap replicate), the records, folds, fitting cap and whether
// the learner is fixed (a replicate).
func fitScope(s *Sample, opt RatioOptions, k int, replicate bool) string {
	nRef, nCmp := s.Counts()
	return fmt.Sprintf("%d/%d/%d/%d/%d/%t\x01", opt.Seed, nRef, nCmp, k, opt.MaxFitRows, replicate)
}

// take fills, from the cache, every set of fs whose fit it holds and
// returns the sets still to fit with, per set, its cache key ("" when the
// set is not shared).
func (c *FitCache) take(s *Sample, fs *fitSets, scope string, replicate bool) (todo []*groupFit, keys []string) {
	if c == nil || s.Features == nil || (replicate && !c.replicates) {
		return fs.sets, make([]string, len(fs.sets))
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	for _, f := range fs.sets {
		names := namesKey(featureNames(s, f.cols))
		if !c.share[names] {
			todo, keys = append(todo, f), append(keys, "")
			continue
		}
		key := scope + names
		if got, ok := c.fits[key]; ok {
			cols := f.cols
			*f = got
			f.cols = cols
			c.hits++
			continue
		}
		todo, keys = append(todo, f), append(keys, key)
	}
	return todo, keys
}

// put keeps the finished fits of sets whose key is not "".
func (c *FitCache) put(sets []*groupFit, keys []string) {
	if c == nil {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	for i, f := range sets {
		if keys[i] != "" {
			c.fits[keys[i]] = *f
		}
	}
}
