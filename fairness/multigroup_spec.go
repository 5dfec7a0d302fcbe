package fairness

import (
	"fmt"
	"strings"

	"gopkg.in/yaml.v3"
)

// EveryOther is the keyword of groups.comparison that compares every value
// of the group column other than the reference with the reference, one
// audit per value (RunGroups). Written as a plain word; a group value that
// happens to read "every-other" is compared when listed,
// comparison: ["every-other"].
const EveryOther = "every-other"

// MaxComparisons caps the comparison values of one spec (a list or the
// values every-other finds in the data): each is a full audit.
const MaxComparisons = 64

// Several reports whether the spec asks for several comparisons: a list
// under comparison, or every-other.
func (g GroupSpec) Several() bool { return g.Comparisons != nil || g.EveryOther }

// isEveryOther reports whether v is the plain scalar every-other (a quoted
// or listed "every-other" is a group value).
func isEveryOther(v *yaml.Node) bool {
	return v.Kind == yaml.ScalarNode && v.Style == 0 && v.Value == EveryOther
}

// comparisons decodes groups.comparison given as a list of values or as
// the keyword every-other; key is "groups.comparison".
func (p *specParser) comparisons(s *Spec, v *yaml.Node, key string) error {
	s.Groups.comparisonLine = v.Line
	if isEveryOther(v) {
		s.Groups.EveryOther = true
		return nil
	}
	vals, lines, err := p.strs(key, v)
	if err != nil {
		return err
	}
	if len(vals) == 0 {
		return specErr(p.file, v.Line, key, ErrBadValue, "%s must list at least one value, such as [south, east], or be %s", key, EveryOther)
	}
	if len(vals) > MaxComparisons {
		return specErr(p.file, v.Line, key, ErrBadValue, "%s lists %d values; at most %d are audited in one run", key, len(vals), MaxComparisons)
	}
	s.Groups.Comparisons, s.Groups.comparisonLines = vals, lines
	s.Groups.Comparison = vals[0]
	return nil
}

// checkComparisons refuses a listed comparison value that is the
// reference or is listed twice, naming groups.comparison[i].
func (p *specParser) checkComparisons(s *Spec) error {
	g := &s.Groups
	first := map[string]int{}
	for i, c := range g.Comparisons {
		key := fmt.Sprintf("groups.comparison[%d]", i)
		if c == g.Reference {
			return specErr(p.file, g.comparisonLines[i], key, ErrBadValue, "comparison value %q is the reference", c)
		}
		if j, dup := first[c]; dup {
			return specErr(p.file, g.comparisonLines[i], key, ErrBadValue, "comparison value %q is listed twice (also groups.comparison[%d])", c, j)
		}
		first[c] = i
	}
	return nil
}

// comparisonKey names the spec key of comparison value i: groups.comparison[i]
// for a list, groups.comparison otherwise.
func (g GroupSpec) comparisonKey(i int) string {
	if g.Comparisons == nil {
		return "groups.comparison"
	}
	return fmt.Sprintf("groups.comparison[%d]", i)
}

// comparisonLineOf is the spec line of comparison value i.
func (g GroupSpec) comparisonLineOf(i int) int {
	if i < len(g.comparisonLines) {
		return g.comparisonLines[i]
	}
	return g.comparisonLine
}

// ForComparison returns a copy of the spec that audits the reference
// against the one comparison value c, as a spec with comparison: c would.
func (s *Spec) ForComparison(c string) *Spec {
	cp := *s
	cp.Groups.Comparison = c
	cp.Groups.Comparisons, cp.Groups.comparisonLines, cp.Groups.EveryOther = nil, nil, false
	return &cp
}

// comparisonsText lists values as "a", "b" and "c".
func comparisonsText(vals []string) string {
	q := make([]string, len(vals))
	for i, v := range vals {
		q[i] = fmt.Sprintf("%q", v)
	}
	if len(q) <= 1 {
		return strings.Join(q, "")
	}
	return strings.Join(q[:len(q)-1], ", ") + " and " + q[len(q)-1]
}
