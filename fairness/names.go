package fairness

import (
	"strconv"
	"strings"
)

// Names holds the display names of a Result (spec key names): the
// identifiers stay the keys, as everywhere else in the Result, and each
// node or column that has a display name has an entry. A node with a
// single column and that column share an entry when only one of them has
// one (NamesSpec), so a reader needs no rule to find a name: a node or
// column without an entry is called by its identifier.
type Names struct {
	Groups  *GroupNames            `json:"groups,omitempty"`
	Nodes   map[string]DisplayName `json:"nodes,omitempty"`
	Columns map[string]DisplayName `json:"columns,omitempty"`
	// Levels maps a column to the display names of its levels, keyed as
	// its details write them (ColumnDetails.Levels: "0" and "1" for a 0/1
	// column); a level without one is shown as it is.
	Levels map[string]map[string]string `json:"levels,omitempty"`
}

// GroupNames are the display names of the reference and comparison
// groups; "" when not given.
type GroupNames struct {
	Reference  string `json:"reference,omitempty"`
	Comparison string `json:"comparison,omitempty"`
}

// resultNames returns the Names of spec with the level names of its
// columns (levelNames), nil when it has no names key or the key names
// nothing.
func resultNames(spec *Spec, levels map[string]map[string]string) *Names {
	if spec.Names == nil {
		return nil
	}
	nodes, columns := resolveNames(spec)
	n := &Names{}
	if spec.Names.Reference != "" || spec.Names.Comparison != "" {
		n.Groups = &GroupNames{Reference: spec.Names.Reference, Comparison: spec.Names.Comparison}
	}
	if len(nodes) > 0 {
		n.Nodes = nodes
	}
	if len(columns) > 0 {
		n.Columns = columns
	}
	if len(levels) > 0 {
		n.Levels = levels
	}
	if n.Groups == nil && n.Nodes == nil && n.Columns == nil && n.Levels == nil {
		return nil
	}
	return n
}

// NodeName is how the reports call a node: its display name, or the node
// itself when it has none.
func (n *Names) NodeName(node string) string {
	if n != nil {
		if d, ok := n.Nodes[node]; ok {
			return d.Name
		}
	}
	return node
}

// ColumnName is a column's display name without its unit, or the column
// itself when it has none.
func (n *Names) ColumnName(col string) string {
	if n != nil {
		if d, ok := n.Columns[col]; ok {
			return d.Name
		}
	}
	return col
}

// ColumnLabel is a column's display name with its unit ("haemoglobin,
// g/dL", DisplayName.Label), or the column itself when it has none.
func (n *Names) ColumnLabel(col string) string {
	if n != nil {
		if d, ok := n.Columns[col]; ok {
			return d.Label()
		}
	}
	return col
}

// LevelName is the display name of level of column col, or level itself
// when it has none.
func (n *Names) LevelName(col, level string) string {
	if n != nil {
		if name, ok := n.Levels[col][level]; ok {
			return name
		}
	}
	return level
}

// Named reports whether node has a display name other than itself.
func (n *Names) Named(node string) bool { return n.NodeName(node) != node }

// GroupName is the display name of the comparison group (comparison) or
// the reference group, or value, its value in the group column, when it
// has none.
func (n *Names) GroupName(value string, comparison bool) string {
	if n == nil || n.Groups == nil {
		return value
	}
	name := n.Groups.Reference
	if comparison {
		name = n.Groups.Comparison
	}
	if name == "" {
		return value
	}
	return name
}

// ReferenceName is the reference group's display name, or its value in
// the group column (GroupInfo.Reference) when it has none.
func (r *Result) ReferenceName() string { return r.Names.GroupName(r.Groups.Reference, false) }

// ComparisonName is the comparison group's display name, or its value in
// the group column when it has none.
func (r *Result) ComparisonName() string { return r.Names.GroupName(r.Groups.Comparison, true) }

// NodeName is the display name of node (Names.NodeName).
func (r *Result) NodeName(node string) string { return r.Names.NodeName(node) }

// MechanismName is the mechanism of node as the reports show it: the
// display names of the node and its parents, "haemoglobin | anaemia,
// age" (the form of MechanismResult.Mechanism); the mechanism as the
// Result writes it when neither has a display name, and the node's name
// for a node not in r.Mechanisms.
func (r *Result) MechanismName(node string) string {
	for _, m := range r.Mechanisms {
		if m.Node != node {
			continue
		}
		named := r.Names.Named(node)
		for _, p := range m.Parents {
			named = named || r.Names.Named(p)
		}
		if !named {
			return m.Mechanism
		}
		return r.Names.Mechanism(node, m.Parents)
	}
	return r.NodeName(node)
}

// Mechanism writes the mechanism of node given parents with display
// names: the node's, then its parents' after " | " (the form of
// MechanismResult.Mechanism, which it equals when none has a display
// name).
func (n *Names) Mechanism(node string, parents []string) string {
	if len(parents) == 0 {
		return n.NodeName(node)
	}
	ps := make([]string, len(parents))
	for i, p := range parents {
		ps[i] = n.NodeName(p)
	}
	return n.NodeName(node) + " | " + strings.Join(ps, ", ")
}

// columnWords names column c in a sentence: quoted, by its display name
// followed by the identifier when it has one ("haemoglobin, g/dL" (hb)),
// else by the identifier alone ("hb").
func columnWords(names *Names, c string) string {
	if label := names.ColumnLabel(c); label != c {
		return strconv.Quote(label) + " (" + c + ")"
	}
	return strconv.Quote(c)
}
