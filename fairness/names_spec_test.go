package fairness

import (
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
)

// namesSpec is exampleSpec (nodes age, dx and labs with the columns m1
// and m2; score score; groups by clinic) with the display keys.
const namesSpec = exampleSpec + `names:
  groups: {reference: North clinic, comparison: South clinic}
  nodes:
    age: {name: age at screening, unit: years}
    labs: laboratory panel
  columns:
    m1: {name: haemoglobin, unit: g/dL}
    m2: {unit: fL}
    dx: diagnosis
    score: risk score
model: {name: Anaemia risk, version: 2.10}
audit_date: 2026-12-03
`

func TestParseSpecNames(t *testing.T) {
	s, err := ParseSpec("spec.yaml", []byte(namesSpec))
	if err != nil {
		t.Fatal(err)
	}
	if s.Names.Reference != "North clinic" || s.Names.Comparison != "South clinic" {
		t.Errorf("group names %q, %q", s.Names.Reference, s.Names.Comparison)
	}
	// YAML would read 2.10 as the number 2.1; the version is kept as written.
	if *s.Model != (ModelInfo{Name: "Anaemia risk", Version: "2.10"}) || s.AuditDate != "2026-12-03" {
		t.Errorf("model %+v, audit date %q", *s.Model, s.AuditDate)
	}
	nodes, cols := resolveNames(s)
	wantNodes := map[string]DisplayName{
		"age":  {Name: "age at screening", Unit: "years"},
		"labs": {Name: "laboratory panel"},
		"dx":   {Name: "diagnosis"}, // from the column of the one-column node dx
	}
	wantCols := map[string]DisplayName{
		"age":   {Name: "age at screening", Unit: "years"}, // from the node age
		"m1":    {Name: "haemoglobin", Unit: "g/dL"},
		"m2":    {Name: "m2", Unit: "fL"}, // a unit alone keeps the identifier as name
		"dx":    {Name: "diagnosis"},
		"score": {Name: "risk score"},
	}
	if !reflect.DeepEqual(nodes, wantNodes) {
		t.Errorf("nodes %v, want %v", nodes, wantNodes)
	}
	if !reflect.DeepEqual(cols, wantCols) {
		t.Errorf("columns %v, want %v", cols, wantCols)
	}
}

// TestParseSpecNamesForms: the short forms (a model by its name alone, a
// quoted date) and a spec without the keys, which has none of them.
func TestParseSpecNamesForms(t *testing.T) {
	s, err := ParseSpec("spec.yaml", []byte(exampleSpec+"model: screening model\naudit_date: \"2024-02-29\"\n"))
	if err != nil {
		t.Fatal(err)
	}
	if *s.Model != (ModelInfo{Name: "screening model"}) || s.AuditDate != "2024-02-29" || s.Names != nil {
		t.Errorf("model %+v, date %q, names %+v", s.Model, s.AuditDate, s.Names)
	}
	s, err = ParseSpec("spec.yaml", []byte(exampleSpec))
	if err != nil {
		t.Fatal(err)
	}
	if s.Model != nil || s.AuditDate != "" || s.Names != nil || resultNames(s, nil) != nil {
		t.Errorf("keys absent, yet model %+v, date %q, names %+v", s.Model, s.AuditDate, s.Names)
	}
}

// TestParseSpecNamesErrors: every mistake in the display keys is a
// *SpecError naming the key, with the line of the entry at fault.
func TestParseSpecNamesErrors(t *testing.T) {
	long := strings.Repeat("x", MaxDisplayName+1)
	for _, tc := range []struct {
		name, extra string
		sentinel    error
		want        string // substring of the message, from the line on
	}{
		{"names not a mapping", "names: [a]", ErrBadValue, ":18: key names: names must be a mapping"},
		{"misspelt section", "names:\n  nodez: {age: Age}", ErrUnknownKey, `:19: key names.nodez: unknown key "nodez"; did you mean "nodes"?`},
		{"misspelt node", "names:\n  nodes:\n    agee: Age", ErrUnknownKey, `:20: key names.nodes.agee: "agee" is not a node of the spec; did you mean "age"?`},
		{"unknown node", "names:\n  nodes: {weight: Weight}", ErrUnknownKey, `:19: key names.nodes.weight: "weight" is not a node of the spec (nodes: age, dx, labs)`},
		{"misspelt column", "names:\n  columns: {m3: marker}", ErrUnknownKey, `key names.columns.m3: "m3" is not a column of the spec; did you mean "m1"?`},
		{"group column named is fine, other is not", "names:\n  columns: {clinc: site}", ErrUnknownKey, `did you mean "clinic"?`},
		{"unit on a node of two columns", "names:\n  nodes:\n    labs:\n      name: labs\n      unit: mg/L", ErrBadValue, `:22: key names.nodes.labs.unit: node "labs" has the columns m1, m2; give each its unit under names.columns`},
		{"misspelt entry key", "names:\n  nodes: {age: {nmae: Age}}", ErrUnknownKey, `key names.nodes.age.nmae: unknown key "nmae"; did you mean "name"?`},
		{"empty entry", "names:\n  nodes: {age: {}}", ErrMissingKey, `key names.nodes.age: names.nodes.age needs a name, a unit or levels`},
		{"blank name", "names:\n  nodes: {age: \"  \"}", ErrBadValue, `key names.nodes.age: names.nodes.age needs a single non-empty value`},
		{"list as entry", "names:\n  nodes: {age: [a, b]}", ErrBadValue, `key names.nodes.age: names.nodes.age must be a name or a mapping {name, unit}`},
		{"backtick", "names:\n  nodes: {age: \"a`b\"}", ErrBadValue, "holds a backtick"},
		{"bidi override", "names:\n  nodes: {age: \"a\\u202eb\"}", ErrBadValue, "holds the invisible character U+202E"},
		{"line break", "names:\n  nodes: {age: \"a\\nb\"}", ErrBadValue, "holds the invisible character U+000A"},
		{"too long", "names:\n  columns: {m1: " + long + "}", ErrBadValue, "is 121 characters long; at most 120 are allowed"},
		{"same group names", "names:\n  groups: {reference: Clinic, comparison: Clinic}", ErrBadValue, `key names.groups: the reference and comparison groups are both called "Clinic"`},
		{"misspelt group key", "names:\n  groups: {refrence: North}", ErrUnknownKey, `key names.groups.refrence: unknown key "refrence"; did you mean "reference"?`},
		{"two nodes one name", "names:\n  nodes:\n    age: Age\n    dx: age", ErrBadValue, `:21: key names.nodes.dx: nodes "age" and "dx" would both be shown as "age"`},
		{"a name taken by an identifier", "names:\n  nodes: {labs: dx}", ErrBadValue, `key names.nodes.labs: nodes "dx" and "labs" would both be shown as "dx"`},
		{"two columns one name", "names:\n  columns: {m1: marker, m2: Marker}", ErrBadValue, `key names.columns.m2: columns "m1" and "m2" would both be shown as "Marker"`},
		{"entry given twice", "names:\n  nodes:\n    age: A\n    age: B", ErrDuplicateKey, `:21: key names.nodes.age: key given twice`},
		{"model without name", "model: {version: 2}", ErrMissingKey, `:18: key model.name: missing required key "model.name"`},
		{"misspelt model key", "model: {name: m, versoin: 2}", ErrUnknownKey, `key model.versoin: unknown key "versoin"; did you mean "version"?`},
		{"model as list", "model: [a]", ErrBadValue, "key model: model must be a name or a mapping"},
		{"no such day", "audit_date: 2026-02-30", ErrBadValue, `:18: key audit_date: audit_date must be a date written YYYY-MM-DD, such as 2026-12-03 (a day that exists), got "2026-02-30"`},
		{"day first", "audit_date: 03/12/2026", ErrBadValue, `key audit_date: audit_date must be a date written YYYY-MM-DD, such as 2026-12-03 (a day that exists), got "03/12/2026"`},
		{"date and time", "audit_date: 2026-12-03T10:00:00Z", ErrBadValue, `got "2026-12-03T10:00:00Z"`},
		{"short month", "audit_date: 2026-1-03", ErrBadValue, `got "2026-1-03"`},
		{"empty date", "audit_date:", ErrBadValue, "key audit_date: audit_date must be a date"},
		{"misspelt top key", "name:\n  nodes: {age: Age}", ErrUnknownKey, `unknown key "name"; did you mean "names"?`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseSpec("spec.yaml", []byte(exampleSpec+tc.extra+"\n"))
			var se *SpecError
			if !errors.As(err, &se) || !errors.Is(err, tc.sentinel) || !IsInputError(err) {
				t.Fatalf("error %v (%T), want a *SpecError wrapping %v", err, err, tc.sentinel)
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error\n  %v\nwant it to contain\n  %s", err, tc.want)
			}
		})
	}
}

func TestCheckAuditDate(t *testing.T) {
	for _, tc := range []struct {
		s  string
		ok bool
	}{
		{"2026-12-03", true}, {"2024-02-29", true}, {"2023-02-29", false}, // 2024 is a leap year, 2023 is not
		{"2026-13-01", false}, {"2026-12-3", false}, {"20261203", false}, {"", false}, {"2026-12-03 ", false},
	} {
		if err := CheckAuditDate(tc.s); (err == nil) != tc.ok {
			t.Errorf("CheckAuditDate(%q) = %v, want ok %v", tc.s, err, tc.ok)
		}
	}
}

// TestParseSpecLevelErrors: the levels of an entry are a mapping from
// level to a display name, no two called alike, and belong to a column.
func TestParseSpecLevelErrors(t *testing.T) {
	for _, tc := range []struct{ name, extra, want string }{
		{"not a mapping", "names:\n  columns: {dx: {levels: [no, yes]}}", "key names.columns.dx.levels: names.columns.dx.levels must be a mapping from level to name"},
		{"empty", "names:\n  columns: {dx: {levels: {}}}", "names.columns.dx.levels must be a mapping"},
		{"two levels one name", "names:\n  columns: {dx: {levels: {0: healthy, 1: Healthy}}}", `key names.columns.dx.levels.1: levels "0" and "1" would both be shown as "Healthy"`},
		{"node of two columns", "names:\n  nodes: {labs: {levels: {0: no}}}", `key names.nodes.labs.levels: node "labs" has the columns m1, m2; give each its levels under names.columns`},
		{"misspelt", "names:\n  columns: {dx: {levles: {0: no}}}", `unknown key "levles"; did you mean "levels"?`},
	} {
		_, err := ParseSpec("spec.yaml", []byte(exampleSpec+tc.extra+"\n"))
		if !IsInputError(err) || !strings.Contains(fmt.Sprint(err), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
	}
}
