package report

import (
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// The reports name the groups, nodes, mechanisms, columns and the model
// through the functions of this file, which read the Result's display
// names (spec key names, fairness.Names): a name without a display name is
// its identifier, so a Result without names reads as before. Identifiers
// stay the keys of everything the page script looks up.

// refName and cmpName are the groups' display names.
func refName(res *fairness.Result) string { return res.ReferenceName() }
func cmpName(res *fairness.Result) string { return res.ComparisonName() }

// nodeName is a node's display name.
func nodeName(res *fairness.Result, node string) string { return res.NodeName(node) }

// mechName is the mechanism of node with display names ("haemoglobin |
// anaemia, age"; fairness.Result.MechanismName).
func mechName(res *fairness.Result, node string) string { return res.MechanismName(node) }

// colLabel is a column's display name with its unit ("haemoglobin,
// g/dL").
func colLabel(res *fairness.Result, col string) string { return res.Names.ColumnLabel(col) }

// withID follows a display name by the identifier it stands for, "men
// (male)", when they differ; the identifier alone otherwise.
func withID(display, id string) string {
	if display == id {
		return id
	}
	return display + " (" + id + ")"
}

// colWithID is a column's label followed by its identifier when its
// display name is another word: "haemoglobin, g/dL (hb)", but "age,
// years" for the column age with a unit alone.
func colWithID(res *fairness.Result, col string) string { return columnWithID(res.Names, col) }

// columnWithID is colWithID for the display names names (nil: none).
func columnWithID(names *fairness.Names, col string) string {
	if names.ColumnName(col) == col {
		return names.ColumnLabel(col)
	}
	return names.ColumnLabel(col) + " (" + col + ")"
}

// colsWithID joins columns as colWithID writes them, by "; " when a label
// holds a comma (a unit) and by ", " otherwise.
func colsWithID(res *fairness.Result, cols []string) string { return columnsWithID(res.Names, cols) }

// columnsWithID is colsWithID for the display names names (nil: none).
func columnsWithID(names *fairness.Names, cols []string) string {
	out := make([]string, len(cols))
	sep := ", "
	for i, c := range cols {
		out[i] = columnWithID(names, c)
		if strings.Contains(out[i], ",") {
			sep = "; "
		}
	}
	return strings.Join(out, sep)
}

// nodeNames lists nodes by their display names, joined by ", ".
func nodeNames(res *fairness.Result, nodes []string) string {
	out := make([]string, len(nodes))
	for i, n := range nodes {
		out[i] = nodeName(res, n)
	}
	return strings.Join(out, ", ")
}

// modelLabel names the audited model, "anaemia risk score (version 2.1)",
// or "" when the Result does not.
func modelLabel(res *fairness.Result) string {
	m := res.Model
	if m == nil || m.Name == "" {
		return ""
	}
	if m.Version == "" {
		return m.Name
	}
	return m.Name + " (version " + m.Version + ")"
}

// subject is what the audit evaluates, in style st: the model by its name
// when the Result names it, else the score column as code.
func subject(res *fairness.Result, st inlineStyle) string {
	if m := modelLabel(res); m != "" {
		return st.text(m)
	}
	return st.code(colLabel(res, res.Score))
}

// quotedWithID quotes a display name for the text report, followed by the
// identifier when they differ: "risk score" (score); the identifier
// quoted alone otherwise.
func quotedWithID(display, id string) string {
	if display == id {
		return strconv.Quote(id)
	}
	return strconv.Quote(display) + " (" + id + ")"
}

// contribMech is the mechanism of a contribution with display names
// (mechName), or the contribution's own mechanism when the Result lists no
// mechanism of its node.
func contribMech(res *fairness.Result, c fairness.Contribution) string {
	for _, m := range res.Mechanisms {
		if m.Node == c.Node {
			return mechName(res, c.Node)
		}
	}
	return c.Mechanism
}
