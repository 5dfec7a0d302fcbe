package fairness

import (
	"fmt"
	"sort"
	"strings"
	"unicode"
)

// Limits on what is kept of the group values of excluded rows: a file with
// a free-text or identifier column given as the group column must not grow
// memory with one entry per row.
const (
	// maxExcludedValues caps the distinct excluded values counted one by
	// one; rows with further values are counted together.
	maxExcludedValues = 1000
	// maxExcludedValueBytes caps the bytes kept of one value; longer values
	// are cut (at a character boundary) and marked with "…".
	maxExcludedValueBytes = 200
)

// ExcludedValue is a value of the group column that is neither the
// reference nor the comparison value, with the number of rows holding it.
// Such rows are not audited. Resembles names the chosen value it differs
// from only in letter case, white space or invisible characters (a
// near-miss such as "Female" for "female"), and is empty otherwise.
type ExcludedValue struct {
	Value     string `json:"value"`
	Rows      int    `json:"rows"`
	Resembles string `json:"resembles,omitempty"`
}

// excludedCounter counts the rows of other groups per group value.
type excludedCounter struct {
	counts      map[string]int
	overflow    int // rows whose value came after maxExcludedValues others
	missingRows int // rows whose group value is missing (missing: drop)
}

// add counts one row with group value v.
func (c *excludedCounter) add(v string) {
	if c.counts == nil {
		c.counts = map[string]int{}
	}
	v = cutValue(v)
	if _, ok := c.counts[v]; !ok && len(c.counts) >= maxExcludedValues {
		c.overflow++
		return
	}
	c.counts[v]++
}

// list returns the counted values, most rows first and then by value, each
// marked when it resembles ref or cmp. The result is never nil.
func (c *excludedCounter) list(ref, cmp string) []ExcludedValue {
	out := make([]ExcludedValue, 0, len(c.counts))
	for v, n := range c.counts {
		out = append(out, ExcludedValue{Value: v, Rows: n, Resembles: resembles(v, ref, cmp)})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Rows != out[j].Rows {
			return out[i].Rows > out[j].Rows
		}
		return out[i].Value < out[j].Value
	})
	return out
}

// total returns the number of rows with another group value.
func (c *excludedCounter) total() int {
	n := c.overflow
	for _, k := range c.counts {
		n += k
	}
	return n
}

// cutValue shortens v to at most maxExcludedValueBytes bytes, cutting at a
// character boundary and appending "…".
func cutValue(v string) string {
	if len(v) <= maxExcludedValueBytes {
		return v
	}
	cut := maxExcludedValueBytes
	for cut > 0 && !isRuneStart(v[cut]) {
		cut--
	}
	return v[:cut] + "…"
}

func isRuneStart(b byte) bool { return b&0xC0 != 0x80 }

// resembles returns ref or cmp when v equals it once letter case, white
// space, control characters (such as NUL) and invisible format characters
// (Unicode category Cf, e.g. a zero-width space or a stray byte-order
// mark) are ignored, and "" when it
// equals neither that way. (Cells are already trimmed of surrounding white
// space, so " female" is "female" and not excluded at all.)
func resembles(v, ref, cmp string) string {
	key := looseKey(v)
	for _, chosen := range []string{ref, cmp} {
		if key != "" && strings.EqualFold(key, looseKey(chosen)) {
			return chosen
		}
	}
	return ""
}

// looseKey drops white space, control and format characters from s.
func looseKey(s string) string {
	return strings.Map(func(r rune) rune {
		if unicode.IsSpace(r) || unicode.IsControl(r) || unicode.Is(unicode.Cf, r) {
			return -1
		}
		return r
	}, s)
}

// rowsText reads "1 row" or "1,234 rows".
func rowsText(n int) string {
	if n == 1 {
		return "1 row"
	}
	return thousands(n) + " rows"
}

// excludedWarnings reports each excluded value that resembles a chosen
// one: a capitalisation or spacing slip in the data or the spec that
// leaves records out of the audit. Never nil.
func excludedWarnings(g GroupInfo, words countWords) []Warning {
	out := []Warning{}
	for i, e := range g.Excluded {
		if e.Resembles == "" {
			continue
		}
		rows := rowsText(e.Rows)
		if n := words(ExcludedPath(i), e.Rows); n != plainCount("", e.Rows) {
			rows = n + " rows"
		}
		out = append(out, Warning{Kind: KindGroupValueNearMiss, Severity: SeverityCaution, Nodes: []string{},
			Message: fmt.Sprintf("%s with group value %q, which differs from the chosen value %q only in letter case or spacing; they are excluded from the audit (check groups in the spec, or correct the data)",
				rows, e.Value, e.Resembles)})
	}
	return out
}
