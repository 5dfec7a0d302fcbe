package fairness

import (
	"fmt"
	"slices"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"

	"gopkg.in/yaml.v3"
)

// NamesSpec is the spec's names key: how the reports call the groups, the
// graph's nodes and the data's columns. Every part is optional; an
// identifier without an entry is shown as it is written in the spec.
//
//	names:
//	  groups: {reference: men, comparison: women}
//	  nodes:
//	    hb: {name: haemoglobin, unit: g/dL}
//	    panel: red-cell indices         # a name alone
//	  columns:
//	    mcv: {name: mean cell volume, unit: fL}
//	    smoker: {name: smoking, levels: {"0": non-smoker, "1": smoker}}
//
// A node with a single column shares its entry with that column, in both
// directions, unless the other has an entry of its own; a unit or levels
// on a node with several columns are refused (give each column its own).
// Levels name the levels of a column the details describe by levels (a
// categorical column, or a numeric one of at most two values); they are
// checked against the data when it is loaded (levelNames).
type NamesSpec struct {
	Reference, Comparison string // the groups' display names; "" when not given

	Nodes   []NameEntry // names.nodes, in spec order
	Columns []NameEntry // names.columns, in spec order

	groupsLine int
}

// NameEntry is one entry of names.nodes or names.columns: the identifier
// as the graph or the data names it and its display name.
type NameEntry struct {
	ID         string
	Name, Unit string // "" when not given
	Line       int    // line of the entry's key
	// Levels maps levels of the column, as the spec writes them, to their
	// display names (key levels), in spec order; nil when none.
	Levels []LevelName

	unitLine, levelsLine int // lines of its unit and levels keys, 0 when none
}

// LevelName is one entry of an entry's levels: a level of the column as
// the spec writes it, its display name, and the line.
type LevelName struct {
	Level, Name string
	Line        int
}

// DisplayName is how the reports call a node or a column: Name, and the
// Unit its values are measured in ("" when none or not given). The reports
// write a column with a unit as "Name, Unit" (Label).
type DisplayName struct {
	Name string `json:"name"`
	Unit string `json:"unit,omitempty"`
}

// Label is the display name with its unit: "haemoglobin, g/dL", or the
// name alone when there is no unit.
func (d DisplayName) Label() string {
	if d.Unit == "" {
		return d.Name
	}
	return d.Name + ", " + d.Unit
}

// ModelInfo names the audited model (spec key model): its name and, when
// given, its version, as the model's owner writes them.
type ModelInfo struct {
	Name    string `json:"name"`
	Version string `json:"version,omitempty"`
}

// MaxDisplayName caps the length of a display name, unit, model name or
// version, in characters: the reports put them in table cells and chart
// labels.
const MaxDisplayName = 120

// AuditDateLayout is the form of an audit date (spec key audit_date, flag
// --audit-date): an ISO 8601 calendar date.
const AuditDateLayout = "2006-01-02"

// Keys of the names, model and entry mappings, for did-you-mean
// suggestions (unknownKey).
var (
	nameKeys       = []string{"groups", "nodes", "columns"}
	nameGroupKeys  = []string{"reference", "comparison"}
	nameEntryKeys  = []string{"name", "unit", "levels"}
	modelKeys      = []string{"name", "version"}
	auditDateShape = "a date written YYYY-MM-DD, such as 2026-12-03"
)

// CheckAuditDate returns nil when s is an ISO 8601 calendar date
// (YYYY-MM-DD) that exists, or an error saying what is wrong with it.
func CheckAuditDate(s string) error {
	if len(s) != len(AuditDateLayout) {
		return fmt.Errorf("must be %s, got %q", auditDateShape, s)
	}
	t, err := time.Parse(AuditDateLayout, s)
	if err != nil || t.Format(AuditDateLayout) != s {
		return fmt.Errorf("must be %s (a day that exists), got %q", auditDateShape, s)
	}
	return nil
}

// displayText decodes a display name, unit, model name or version at key:
// a scalar of at most MaxDisplayName characters, not blank, on one line,
// without control or invisible formatting characters (which could hide
// or reorder the text around them) and without a backtick, which the
// reports' sentences use to quote names.
func (p *specParser) displayText(key string, v *yaml.Node) (string, error) {
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" || strings.TrimSpace(v.Value) == "" {
		return "", specErr(p.file, v.Line, key, ErrBadValue, "%s needs a single non-empty value", key)
	}
	s := strings.TrimSpace(v.Value)
	if n := utf8.RuneCountInString(s); n > MaxDisplayName {
		return "", specErr(p.file, v.Line, key, ErrBadValue, "%s is %d characters long; at most %d are allowed", key, n, MaxDisplayName)
	}
	for _, r := range s {
		switch {
		case r == utf8.RuneError:
			return "", specErr(p.file, v.Line, key, ErrBadValue, "%s is not valid UTF-8", key)
		case unicode.IsControl(r) || unicode.Is(unicode.Cf, r):
			return "", specErr(p.file, v.Line, key, ErrBadValue, "%s holds the invisible character %U; write it on one line as plain text", key, r)
		case r == '`':
			return "", specErr(p.file, v.Line, key, ErrBadValue, "%s holds a backtick (`), which the reports use to quote names", key)
		}
	}
	return s, nil
}

// names decodes the names mapping (NamesSpec); validateNames checks its
// identifiers against the graph once the graph is known.
func (p *specParser) names(s *Spec, v *yaml.Node) error {
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, "names", ErrBadValue, "names must be a mapping with groups, nodes and columns, such as {nodes: {hb: {name: haemoglobin, unit: g/dL}}}")
	}
	ns := &NamesSpec{}
	_, err := p.eachKey(v, "names", func(k, val *yaml.Node, key string) error {
		switch k.Value {
		case "groups":
			ns.groupsLine = k.Line
			return p.groupNames(ns, val, key)
		case "nodes":
			var err error
			ns.Nodes, err = p.nameEntries(val, key, "node")
			return err
		case "columns":
			var err error
			ns.Columns, err = p.nameEntries(val, key, "column")
			return err
		}
		return p.unknownKey(k.Line, key, k.Value, nameKeys)
	})
	s.Names = ns
	return err
}

// groupNames decodes names.groups: {reference: …, comparison: …}.
func (p *specParser) groupNames(ns *NamesSpec, v *yaml.Node, prefix string) error {
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, prefix, ErrBadValue, "%s must be a mapping such as {reference: men, comparison: women}", prefix)
	}
	_, err := p.eachKey(v, prefix, func(k, val *yaml.Node, key string) error {
		var dst *string
		switch k.Value {
		case "reference":
			dst = &ns.Reference
		case "comparison":
			dst = &ns.Comparison
		default:
			return p.unknownKey(k.Line, key, k.Value, nameGroupKeys)
		}
		var err error
		*dst, err = p.displayText(key, val)
		return err
	})
	if err == nil && ns.Reference != "" && ns.Reference == ns.Comparison {
		return specErr(p.file, v.Line, prefix, ErrBadValue, "the reference and comparison groups are both called %q", ns.Reference)
	}
	return err
}

// nameEntries decodes names.nodes or names.columns: a mapping from
// identifier to a display name, written as the name alone or as a
// mapping {name, unit}. what is "node" or "column", for messages.
func (p *specParser) nameEntries(v *yaml.Node, prefix, what string) ([]NameEntry, error) {
	if v.Kind != yaml.MappingNode {
		return nil, specErr(p.file, v.Line, prefix, ErrBadValue, "%s must be a mapping from %s to its name, such as {hb: {name: haemoglobin, unit: g/dL}}", prefix, what)
	}
	var out []NameEntry
	_, err := p.eachKey(v, prefix, func(k, val *yaml.Node, key string) error {
		e := NameEntry{ID: k.Value, Line: k.Line}
		if val.Kind == yaml.ScalarNode {
			var err error
			e.Name, err = p.displayText(key, val)
			out = append(out, e)
			return err
		}
		if val.Kind != yaml.MappingNode {
			return specErr(p.file, val.Line, key, ErrBadValue, "%s must be a name or a mapping {name, unit}", key)
		}
		seen, err := p.eachKey(val, key, func(k2, val2 *yaml.Node, key2 string) error {
			var err error
			switch k2.Value {
			case "name":
				e.Name, err = p.displayText(key2, val2)
			case "unit":
				e.Unit, err = p.displayText(key2, val2)
				e.unitLine = k2.Line
			case "levels":
				e.Levels, err = p.levelNames(val2, key2)
				e.levelsLine = k2.Line
			default:
				err = p.unknownKey(k2.Line, key2, k2.Value, nameEntryKeys)
			}
			return err
		})
		if err != nil {
			return err
		}
		if !seen["name"] && !seen["unit"] && !seen["levels"] {
			return specErr(p.file, val.Line, key, ErrMissingKey, "%s needs a name, a unit or levels", key)
		}
		out = append(out, e)
		return nil
	})
	return out, err
}

// levelNames decodes an entry's levels: a mapping from level to display
// name, no two levels called alike.
func (p *specParser) levelNames(v *yaml.Node, prefix string) ([]LevelName, error) {
	if v.Kind != yaml.MappingNode || len(v.Content) == 0 {
		return nil, specErr(p.file, v.Line, prefix, ErrBadValue, "%s must be a mapping from level to name, such as {\"0\": non-smoker, \"1\": smoker}", prefix)
	}
	var out []LevelName
	called := map[string]string{}
	_, err := p.eachKey(v, prefix, func(k, val *yaml.Node, key string) error {
		if k.Kind != yaml.ScalarNode || k.Value == "" {
			return specErr(p.file, k.Line, key, ErrBadValue, "a level under %s must be a value of the column", prefix)
		}
		name, err := p.displayText(key, val)
		if err != nil {
			return err
		}
		if other, dup := called[strings.ToLower(name)]; dup {
			return specErr(p.file, val.Line, key, ErrBadValue, "levels %q and %q would both be shown as %q", other, k.Value, name)
		}
		called[strings.ToLower(name)] = k.Value
		out = append(out, LevelName{Level: k.Value, Name: name, Line: k.Line})
		return nil
	})
	return out, err
}

// model decodes the model key: a name alone, or {name, version}.
func (p *specParser) model(s *Spec, v *yaml.Node) error {
	m := &ModelInfo{}
	if v.Kind == yaml.ScalarNode {
		var err error
		m.Name, err = p.displayText("model", v)
		s.Model = m
		return err
	}
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, "model", ErrBadValue, "model must be a name or a mapping such as {name: anaemia risk score, version: \"2.1\"}")
	}
	seen, err := p.eachKey(v, "model", func(k, val *yaml.Node, key string) error {
		var err error
		switch k.Value {
		case "name":
			m.Name, err = p.displayText(key, val)
		case "version":
			m.Version, err = p.displayText(key, val)
		default:
			err = p.unknownKey(k.Line, key, k.Value, modelKeys)
		}
		return err
	})
	if err != nil {
		return err
	}
	if !seen["name"] {
		return specErr(p.file, v.Line, "model.name", ErrMissingKey, "missing required key %q", "model.name")
	}
	s.Model = m
	return nil
}

// auditDate decodes audit_date (CheckAuditDate). YAML reads an unquoted
// date as a timestamp; its text is what counts.
func (p *specParser) auditDate(s *Spec, v *yaml.Node) error {
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" {
		return specErr(p.file, v.Line, "audit_date", ErrBadValue, "audit_date must be %s", auditDateShape)
	}
	if err := CheckAuditDate(v.Value); err != nil {
		return specErr(p.file, v.Line, "audit_date", ErrBadValue, "audit_date %v", err)
	}
	s.AuditDate = v.Value
	return nil
}

// validateNames checks the names key against the graph: every entry of
// names.nodes names a node and every entry of names.columns a column of
// the spec (a graph column, the score, the group column or a model
// input); a unit belongs to a node only when it has a single column; and
// no two nodes, and no two columns, share a display name (resolveNames).
func validateNames(s *Spec) error {
	ns := s.Names
	if ns == nil {
		return nil
	}
	nodes := map[string]NodeSpec{}
	var nodeNames []string
	for _, n := range s.Graph {
		nodes[n.Node] = n
		nodeNames = append(nodeNames, n.Node)
	}
	for _, e := range ns.Nodes {
		key := "names.nodes." + e.ID
		n, ok := nodes[e.ID]
		if !ok {
			return unknownName(s.File, e.Line, key, "node", e.ID, nodeNames)
		}
		if e.Unit != "" && len(n.Columns) != 1 {
			return specErr(s.File, e.unitLine, key+".unit", ErrBadValue, "node %q has the columns %s; give each its unit under names.columns", e.ID, strings.Join(n.Columns, ", "))
		}
		if e.Levels != nil && len(n.Columns) != 1 {
			return specErr(s.File, e.levelsLine, key+".levels", ErrBadValue, "node %q has the columns %s; give each its levels under names.columns", e.ID, strings.Join(n.Columns, ", "))
		}
	}
	cols := specColumns(s)
	for _, e := range ns.Columns {
		if !slices.Contains(cols, e.ID) {
			return unknownName(s.File, e.Line, "names.columns."+e.ID, "column", e.ID, cols)
		}
	}
	nodeNamesOf, colNamesOf := resolveNames(s)
	if err := distinctNames(s.File, ns.Nodes, "names.nodes.", nodeNamesOf, nodeNames, "node"); err != nil {
		return err
	}
	return distinctNames(s.File, ns.Columns, "names.columns.", colNamesOf, cols, "column")
}

// unknownName is the error for a names entry whose identifier is not a
// node or column of the spec, suggesting the nearest when it is close.
func unknownName(file string, line int, key, what, id string, known []string) error {
	if sug, ok := suggest(id, known); ok {
		return specErr(file, line, key, ErrUnknownKey, "%q is not a %s of the spec; did you mean %q?", id, what, sug)
	}
	return specErr(file, line, key, ErrUnknownKey, "%q is not a %s of the spec (%ss: %s)", id, what, what, strings.Join(known, ", "))
}

// distinctNames refuses two identifiers (in order) that resolve to the same
// display name: the reports could not tell them apart. The error is at the
// entry of the later one, or of the earlier when the later has its name
// from a shared entry.
func distinctNames(file string, entries []NameEntry, prefix string, resolved map[string]DisplayName, ids []string, what string) error {
	line := map[string]int{}
	for _, e := range entries {
		line[e.ID] = e.Line
	}
	owner := map[string]string{}
	for _, id := range ids {
		d, ok := resolved[id]
		if !ok {
			d = DisplayName{Name: id}
		}
		key := strings.ToLower(d.Label())
		if first, dup := owner[key]; dup {
			at := id
			if line[at] == 0 {
				at = first
			}
			return specErr(file, line[at], prefix+at, ErrBadValue, "%ss %q and %q would both be shown as %q", what, first, id, d.Label())
		}
		owner[key] = id
	}
	return nil
}

// specColumns lists the columns the spec names, each once: the graph
// columns, the score, the group column and the model inputs.
func specColumns(s *Spec) []string {
	var out []string
	add := func(c string) {
		if !slices.Contains(out, c) {
			out = append(out, c)
		}
	}
	for _, c := range s.Columns() {
		add(c)
	}
	add(s.Score)
	for _, c := range s.Groups.DataColumns() {
		add(c)
	}
	for _, c := range s.ModelInputs {
		add(c)
	}
	return out
}

// resolveNames returns the display name of every node and column that has
// one: its own entry, else the entry it shares (a node with a single
// column and that column). An entry that gives only a unit is named by
// its identifier; one that gives only levels names nothing here.
func resolveNames(s *Spec) (nodes, columns map[string]DisplayName) {
	nodes, columns = map[string]DisplayName{}, map[string]DisplayName{}
	if s.Names == nil {
		return nodes, columns
	}
	named := func(e NameEntry) DisplayName {
		d := DisplayName{Name: e.Name, Unit: e.Unit}
		if d.Name == "" {
			d.Name = e.ID
		}
		return d
	}
	for _, e := range s.Names.Nodes {
		if e.Name != "" || e.Unit != "" { // not levels alone
			nodes[e.ID] = named(e)
		}
	}
	for _, e := range s.Names.Columns {
		if e.Name != "" || e.Unit != "" {
			columns[e.ID] = named(e)
		}
	}
	for _, n := range s.Graph {
		if len(n.Columns) != 1 {
			continue
		}
		c := n.Columns[0]
		nd, hasNode := nodes[n.Node]
		cd, hasCol := columns[c]
		switch {
		case hasNode && !hasCol:
			columns[c] = nd
		case hasCol && !hasNode:
			nodes[n.Node] = DisplayName{Name: cd.Name, Unit: cd.Unit}
		}
	}
	return nodes, columns
}
