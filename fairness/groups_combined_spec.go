package fairness

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"
)

// MaxGroupColumns caps groups.columns: every further column multiplies
// the combinations, and each audited combination is a full audit.
const MaxGroupColumns = 4

// MaxBandEdges caps the edges of one banded group column.
const MaxBandEdges = 20

// GroupBands cuts a numeric group column into bands at increasing edges
// e_1 < … < e_m (spec key groups.bands). Every band holds its lower edge
// and not its upper one: band 0 is x < e_1, band k (1 ≤ k < m) is
// e_k ≤ x < e_{k+1}, band m is x ≥ e_m; their labels read "<e_1",
// "e_k–e_{k+1}" and "≥e_m".
type GroupBands struct {
	Column string    `json:"column"`
	Edges  []float64 `json:"edges"`
}

// Band returns the band of x: the number of edges at or below x.
func (b GroupBands) Band(x float64) int {
	k, _ := slices.BinarySearchFunc(b.Edges, x, func(e, x float64) int {
		if e <= x {
			return -1
		}
		return 1
	})
	return k
}

// Label is band k's label: "<e_1" for 0, "e_k–e_{k+1}" in between,
// "≥e_m" for m.
func (b GroupBands) Label(k int) string {
	m := len(b.Edges)
	switch {
	case k <= 0:
		return "<" + edgeText(b.Edges[0])
	case k >= m:
		return "≥" + edgeText(b.Edges[m-1])
	}
	return edgeText(b.Edges[k-1]) + "–" + edgeText(b.Edges[k])
}

// labels lists every band's label.
func (b GroupBands) labels() []string {
	out := make([]string, len(b.Edges)+1)
	for k := range out {
		out[k] = b.Label(k)
	}
	return out
}

// parse finds the band written as text: its label ("<40", "40–65",
// "≥65"), optionally after the column's name ("age 40–65"), with "-" or
// " to " for "–" and ">=" for "≥"; the numbers must equal the edges.
func (b GroupBands) parse(text string) (int, bool) {
	t := strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(text), b.Column+" "))
	m := len(b.Edges)
	num := func(s string) (float64, bool) {
		x, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		return x, err == nil
	}
	switch {
	case strings.HasPrefix(t, "<"):
		x, ok := num(t[1:])
		return 0, ok && x == b.Edges[0]
	case strings.HasPrefix(t, "≥"), strings.HasPrefix(t, ">="):
		x, ok := num(strings.TrimLeft(t, "≥>="))
		return m, ok && x == b.Edges[m-1]
	}
	for _, sep := range []string{"–", " to ", "-"} {
		i := strings.Index(t[min(1, len(t)):], sep) // a leading '-' is a sign
		if i < 0 {
			continue
		}
		i += min(1, len(t))
		lo, ok1 := num(t[:i])
		hi, ok2 := num(t[i+len(sep):])
		for k := 1; ok1 && ok2 && k < m; k++ {
			if b.Edges[k-1] == lo && b.Edges[k] == hi {
				return k, true
			}
		}
		return 0, false
	}
	return 0, false
}

// edgeText writes a band edge in the shortest form that reads back as it.
func edgeText(e float64) string { return strconv.FormatFloat(e, 'g', -1, 64) }

// DataColumns lists the columns a record's group is read from: the
// group columns of groups.columns, or the one of groups.column.
func (g GroupSpec) DataColumns() []string {
	if g.Columns != nil {
		return g.Columns
	}
	return []string{g.Column}
}

// Combined reports whether a record's group is a combination of several
// columns or bands of a numeric one rather than a column's value.
func (g GroupSpec) Combined() bool { return len(g.Columns) > 1 || len(g.Bands) > 0 }

// bandsOf returns the bands of group column col, nil when it is not
// banded.
func (g GroupSpec) bandsOf(col string) *GroupBands {
	for i := range g.Bands {
		if g.Bands[i].Column == col {
			return &g.Bands[i]
		}
	}
	return nil
}

// combination is the group value of one combination, parts[j] being the
// value (or band label) of group column j: the value itself for one
// column without bands, else "column part" for every column joined by
// ", " ("sex F, age 40–65").
func (g GroupSpec) combination(parts []string) string {
	if !g.Combined() {
		return parts[0]
	}
	var b strings.Builder
	for j, p := range parts {
		if j > 0 {
			b.WriteString(", ")
		}
		b.WriteString(g.Columns[j])
		b.WriteByte(' ')
		b.WriteString(p)
	}
	return b.String()
}

// combinedGroups decodes a groups mapping that uses columns or bands:
// the group columns, their bands, the reference and comparison as
// combinations (groupValue), and Column set to the columns joined by
// " × " (the one column itself when there is one).
func (p *specParser) combinedGroups(s *Spec, v *yaml.Node) error {
	nodes := map[string]*yaml.Node{}
	if _, err := p.eachKey(v, "groups", func(k, val *yaml.Node, key string) error {
		if !slices.Contains(groupKeys, k.Value) {
			return p.unknownKey(k.Line, key, k.Value, groupKeys)
		}
		nodes[k.Value] = val
		return nil
	}); err != nil {
		return err
	}
	if err := p.groupColumns(s, v, nodes); err != nil {
		return err
	}
	if err := p.groupBands(s, nodes["bands"]); err != nil {
		return err
	}
	g := &s.Groups
	g.Column = strings.Join(g.Columns, " × ")
	for _, k := range []string{"reference", "comparison"} {
		if nodes[k] == nil {
			return specErr(p.file, v.Line, "groups."+k, ErrMissingKey, "missing required key %q", "groups."+k)
		}
	}
	var err error
	if g.Reference, err = p.groupValue(g, nodes["reference"], "groups.reference"); err != nil {
		return err
	}
	return p.combinedComparisons(s, nodes["comparison"])
}

// combinedComparisons decodes groups.comparison of the combination form:
// every-other, one combination, or a list of them.
func (p *specParser) combinedComparisons(s *Spec, c *yaml.Node) error {
	g := &s.Groups
	g.comparisonLine = c.Line
	switch {
	case isEveryOther(c):
		g.EveryOther = true
		return nil
	case c.Kind != yaml.SequenceNode:
		v, err := p.groupValue(g, c, "groups.comparison")
		if err == nil && v == g.Reference {
			err = specErr(p.file, c.Line, "groups.comparison", ErrBadValue, "reference and comparison are both %q", v)
		}
		g.Comparison = v
		return err
	case len(c.Content) == 0:
		return specErr(p.file, c.Line, "groups.comparison", ErrBadValue, "groups.comparison must list at least one combination or be %s", EveryOther)
	case len(c.Content) > MaxComparisons:
		return specErr(p.file, c.Line, "groups.comparison", ErrBadValue, "groups.comparison lists %d combinations; at most %d are audited in one run", len(c.Content), MaxComparisons)
	}
	for i, item := range c.Content {
		v, err := p.groupValue(g, resolve(item), fmt.Sprintf("groups.comparison[%d]", i))
		if err != nil {
			return err
		}
		g.Comparisons = append(g.Comparisons, v)
		g.comparisonLines = append(g.comparisonLines, resolve(item).Line)
	}
	g.Comparison = g.Comparisons[0]
	return p.checkComparisons(s)
}

// groupColumns decodes groups.columns (a list of distinct columns, at
// most MaxGroupColumns) or groups.column, exactly one of them.
func (p *specParser) groupColumns(s *Spec, v *yaml.Node, nodes map[string]*yaml.Node) error {
	one, list := nodes["column"], nodes["columns"]
	switch {
	case one != nil && list != nil:
		return specErr(p.file, list.Line, "groups.columns", ErrBadValue, "give groups.column (one column) or groups.columns (a list), not both")
	case one == nil && list == nil:
		return specErr(p.file, v.Line, "groups.columns", ErrMissingKey, "missing required key %q (or groups.column)", "groups.columns")
	case one != nil:
		c, err := p.str("groups.column", one)
		s.Groups.Columns = []string{c}
		return err
	}
	cols, lines, err := p.strs("groups.columns", list)
	if err != nil {
		return err
	}
	switch {
	case len(cols) == 0:
		return specErr(p.file, list.Line, "groups.columns", ErrBadValue, "groups.columns must list at least one column, such as [sex, age]")
	case len(cols) > MaxGroupColumns:
		return specErr(p.file, list.Line, "groups.columns", ErrBadValue, "groups.columns lists %d columns; at most %d are combined", len(cols), MaxGroupColumns)
	}
	for i, c := range cols {
		if j := slices.Index(cols, c); j < i {
			return specErr(p.file, lines[i], fmt.Sprintf("groups.columns[%d]", i), ErrBadValue, "column %q is listed twice (also groups.columns[%d])", c, j)
		}
	}
	s.Groups.Columns = cols
	return nil
}

// groupBands decodes groups.bands (nil: none): a mapping from group
// columns to their band edges, finite and strictly increasing, kept in
// the order of the group columns.
func (p *specParser) groupBands(s *Spec, v *yaml.Node) error {
	if v == nil {
		return nil
	}
	g := &s.Groups
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, "groups.bands", ErrBadValue, "groups.bands must be a mapping from a numeric group column to its band edges, such as {age: [40, 65]}")
	}
	byCol := map[string]GroupBands{}
	_, err := p.eachKey(v, "groups.bands", func(k, val *yaml.Node, key string) error {
		if !slices.Contains(g.Columns, k.Value) {
			return p.unknownKey(k.Line, key, k.Value, g.Columns)
		}
		edges, err := p.bandEdges(key, val)
		byCol[k.Value] = GroupBands{Column: k.Value, Edges: edges}
		return err
	})
	if err != nil {
		return err
	}
	for _, c := range g.Columns {
		if b, ok := byCol[c]; ok {
			g.Bands = append(g.Bands, b)
		}
	}
	g.bandsLine = v.Line
	return nil
}

// bandEdges decodes one column's band edges: 1 to MaxBandEdges finite
// numbers, each larger than the one before.
func (p *specParser) bandEdges(key string, v *yaml.Node) ([]float64, error) {
	if v.Kind != yaml.SequenceNode || len(v.Content) == 0 || len(v.Content) > MaxBandEdges {
		return nil, specErr(p.file, v.Line, key, ErrBadValue, "%s must list 1 to %d increasing band edges, such as [40, 65]", key, MaxBandEdges)
	}
	edges := make([]float64, len(v.Content))
	for i, item := range v.Content {
		item = resolve(item)
		ik := fmt.Sprintf("%s[%d]", key, i)
		e, err := p.float(ik, item)
		if err != nil {
			return nil, err
		}
		if math.IsInf(e, 0) || math.IsNaN(e) {
			return nil, specErr(p.file, item.Line, ik, ErrBadValue, "%s must be a finite number, got %q", ik, item.Value)
		}
		if i > 0 && e <= edges[i-1] {
			return nil, specErr(p.file, item.Line, ik, ErrBadValue, "band edges must increase: %s follows %s", edgeText(e), edgeText(edges[i-1]))
		}
		edges[i] = e
	}
	return edges, nil
}

// groupValue decodes one group (the reference or a comparison) at key: a
// mapping from every group column to its value, a banded column's value
// being one of its bands ("<40", "40-65", ">=65"; GroupBands.parse); a
// single group column's value may be given alone. It returns the
// combination's group value (GroupSpec.combination).
func (p *specParser) groupValue(g *GroupSpec, v *yaml.Node, key string) (string, error) {
	cols := g.Columns
	if v.Kind == yaml.ScalarNode && len(cols) == 1 {
		part, err := p.groupPart(g, 0, v, key)
		return g.combination([]string{part}), err
	}
	if v.Kind != yaml.MappingNode {
		return "", specErr(p.file, v.Line, key, ErrBadValue, "%s must map each group column to its value, such as %s", key, g.example())
	}
	parts := make([]string, len(cols))
	if _, err := p.eachKey(v, key, func(k, val *yaml.Node, kk string) error {
		j := slices.Index(cols, k.Value)
		if j < 0 {
			return p.unknownKey(k.Line, kk, k.Value, cols)
		}
		var err error
		parts[j], err = p.groupPart(g, j, val, kk)
		return err
	}); err != nil {
		return "", err
	}
	for j, part := range parts {
		if part == "" {
			return "", specErr(p.file, v.Line, key+"."+cols[j], ErrMissingKey, "%s gives no value of group column %q", key, cols[j])
		}
	}
	return g.combination(parts), nil
}

// groupPart decodes the value of group column j at key: the text, or for
// a banded column the label of the band it names.
func (p *specParser) groupPart(g *GroupSpec, j int, v *yaml.Node, key string) (string, error) {
	text, err := p.str(key, v)
	if err != nil {
		return "", err
	}
	b := g.bandsOf(g.Columns[j])
	if b == nil {
		return text, nil
	}
	k, ok := b.parse(text)
	if !ok {
		return "", specErr(p.file, v.Line, key, ErrBadValue, "%q is not a band of %s; its bands are %s (quote them; - for – and >= for ≥ are accepted)", text, b.Column, comparisonsText(b.labels()))
	}
	return b.Label(k), nil
}

// example shows a combination of the group columns for messages.
func (g GroupSpec) example() string {
	parts := make([]string, len(g.Columns))
	for j, c := range g.Columns {
		val := "VALUE"
		if b := g.bandsOf(c); b != nil {
			val = strconv.Quote(b.Label(0))
		}
		parts[j] = c + ": " + val
	}
	return "{" + strings.Join(parts, ", ") + "}"
}

// usesCombinedForm reports whether a groups mapping uses a key of the
// combination form (columns or bands).
func usesCombinedForm(v *yaml.Node) bool {
	for i := 0; i+1 < len(v.Content); i += 2 {
		if k := resolve(v.Content[i]).Value; k == "columns" || k == "bands" {
			return true
		}
	}
	return false
}

// checkGroupColumns refuses a group column that is a graph node (owner
// maps graph columns to their nodes) or the score. The group indexes the
// distributions being compared, so it cannot be one of them; a banded
// column could not be either: records of different bands share none of
// its values, so its mechanism would have no overlap between the groups
// (the bands stand for it, and differences within a band are not
// audited).
func checkGroupColumns(s *Spec, owner map[string]string) error {
	g := s.Groups
	key := "groups.column"
	if g.Columns != nil {
		key = "groups.columns"
	}
	for _, c := range g.DataColumns() {
		node, inGraph := owner[c]
		switch {
		case inGraph && g.bandsOf(c) != nil:
			return specErr(s.File, g.bandsLine, "groups.bands."+c, ErrGroupInGraph, "banded group column %q is in the graph (node %q); groups of different bands share none of its values, so its mechanism would have no overlap: leave it out of the graph (the bands stand for it)", c, node)
		case inGraph:
			return specErr(s.File, s.lines["groups"], key, ErrGroupInGraph, "group column %q is in the graph (node %q); the group indexes the two distributions and must not be a node", c, node)
		case c == s.Score:
			return specErr(s.File, s.lines["groups"], key, ErrBadValue, "group column and score name the same column %q", s.Score)
		}
	}
	return nil
}

// readsGroup reports whether the declared model inputs hold a group
// column.
func readsGroup(s *Spec) bool {
	for _, c := range s.Groups.DataColumns() {
		if slices.Contains(s.ModelInputs, c) {
			return true
		}
	}
	return false
}

// where names the group's source in messages: column ("the column" or
// `column "clinic"`), or for combined groups "the combinations of
// sex × age".
func (g GroupSpec) where(column string) string {
	if g.Combined() {
		return "the combinations of " + g.Column
	}
	return column
}

// combinedColumns is GroupInfo.Columns: the group columns of combined
// groups, nil otherwise.
func combinedColumns(g GroupSpec) []string {
	if !g.Combined() {
		return nil
	}
	return append([]string{}, g.Columns...)
}
