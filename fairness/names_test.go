package fairness

import (
	"encoding/json"
	"errors"
	"reflect"
	"slices"
	"strings"
	"testing"
)

// smallNames gives display names to smallSpec's groups, nodes and
// columns, with the model and the audit date.
const smallNames = `names:
  groups: {reference: Site A, comparison: Site B}
  nodes:
    x: {name: exposure, unit: mg}
    dx: disease
  columns:
    z: {name: marker, unit: IU}
    score: risk score
model: {name: Risk model, version: "3"}
audit_date: 2026-12-03
`

// TestNamesAreAdditive: the display keys change no number and no
// identifier of the Result. Apart from the names, the model, the date,
// the spec's hash and the warnings' sentences, an audit with them equals
// the audit without; the sentences name the display names in place of
// the identifiers; and without the keys the JSON holds none of the new
// fields.
func TestNamesAreAdditive(t *testing.T) {
	// Groups that x separates (separatedData), and clipped ratios, so
	// that warnings name nodes and mechanisms as well as the groups.
	spec := smallSpec + "clip_ratios: 0.9\n"
	plain, err := Run(writeAudit(t, spec, separatedData(1000)), RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	named, err := Run(writeAudit(t, spec+smallNames, separatedData(1000)), RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	js, err := json.Marshal(plain)
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{`"names"`, `"model"`, `"audit_date"`} {
		if strings.Contains(string(js), key) {
			t.Errorf("JSON without the display keys holds %s", key)
		}
	}
	if named.Model == nil || *named.Model != (ModelInfo{Name: "Risk model", Version: "3"}) || named.AuditDate != "2026-12-03" {
		t.Errorf("model %+v, audit date %q", named.Model, named.AuditDate)
	}
	wantNames := &Names{
		Groups:  &GroupNames{Reference: "Site A", Comparison: "Site B"},
		Nodes:   map[string]DisplayName{"x": {Name: "exposure", Unit: "mg"}, "dx": {Name: "disease", Unit: ""}, "z": {Name: "marker", Unit: "IU"}},
		Columns: map[string]DisplayName{"x": {Name: "exposure", Unit: "mg"}, "dx": {Name: "disease", Unit: ""}, "z": {Name: "marker", Unit: "IU"}, "score": {Name: "risk score", Unit: ""}},
	}
	if !reflect.DeepEqual(named.Names, wantNames) {
		t.Errorf("names %+v, want %+v", named.Names, wantNames)
	}
	kinds := map[WarningKind]bool{}
	for _, w := range plain.Warnings {
		kinds[w.Kind] = true
	}
	for _, k := range []WarningKind{KindSmallGroup, KindNotEstimable, KindRatiosClipped, KindWorstHybrid} {
		if !kinds[k] {
			t.Errorf("no %s warning to check the names in (warnings %v)", k, plain.Warnings)
		}
	}
	if len(named.Warnings) != len(plain.Warnings) {
		t.Fatalf("%d warnings with names, %d without", len(named.Warnings), len(plain.Warnings))
	}
	for i, w := range named.Warnings {
		p := plain.Warnings[i]
		if w.Kind != p.Kind || w.Severity != p.Severity || w.Metric != p.Metric || !reflect.DeepEqual(w.Nodes, p.Nodes) {
			t.Errorf("warning %d: %+v, without names %+v", i, w, p)
		}
		if want := named1(p.Message); w.Message != want {
			t.Errorf("warning %d:\n  %s\nwant\n  %s", i, w.Message, want)
		}
	}
	for i, m := range named.Mechanisms {
		if want := named1(plain.Mechanisms[i].Reliability.NotEstimable); m.Reliability.NotEstimable != want {
			t.Errorf("%s: reason %q, want %q", m.Node, m.Reliability.NotEstimable, want)
		}
	}
	strip := func(r *Result) Result {
		c := *r
		c.Names, c.Model, c.AuditDate, c.Inputs.SpecSHA256, c.Inputs.SpecFile, c.Inputs.DataFile = nil, nil, "", "", "", ""
		c.Warnings = nil
		c.Mechanisms = append([]MechanismResult{}, c.Mechanisms...)
		for i := range c.Mechanisms {
			c.Mechanisms[i].Reliability.NotEstimable = ""
		}
		return c
	}
	a, b := strip(plain), strip(named)
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	if string(ja) != string(jb) {
		t.Errorf("the display keys changed the result beyond names and sentences")
	}
}

// named1 is a sentence about smallSpec's audit with each identifier
// replaced by its display name in smallNames.
func named1(s string) string {
	return strings.NewReplacer("`x`", "`exposure`", "`dx`", "`disease`", "`z`", "`marker`",
		"`z | dx`", "`marker | disease`", "`dx | x`", "`disease | exposure`",
		`group "a"`, `group "Site A"`, `group "b"`, `group "Site B"`).Replace(s)
}

// TestNamesLookups: identifiers without a display name are their own
// names, and a nil Names (no names key) names everything by identifier.
func TestNamesLookups(t *testing.T) {
	var none *Names
	if none.NodeName("hb") != "hb" || none.ColumnLabel("hb") != "hb" || none.GroupName("f", true) != "f" {
		t.Error("a nil Names renames something")
	}
	n := &Names{Groups: &GroupNames{Comparison: "women"},
		Nodes:   map[string]DisplayName{"hb": {Name: "haemoglobin", Unit: "g/dL"}},
		Columns: map[string]DisplayName{"hb": {Name: "haemoglobin", Unit: "g/dL"}}}
	for _, tc := range []struct{ got, want string }{
		{n.NodeName("hb"), "haemoglobin"}, {n.NodeName("age"), "age"},
		{n.ColumnName("hb"), "haemoglobin"}, {n.ColumnLabel("hb"), "haemoglobin, g/dL"}, {n.ColumnLabel("age"), "age"},
		{n.GroupName("f", true), "women"}, {n.GroupName("m", false), "m"},
		{columnWords(n, "hb"), `"haemoglobin, g/dL" (hb)`}, {columnWords(n, "age"), `"age"`},
	} {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q", tc.got, tc.want)
		}
	}
	r := &Result{Names: n, Groups: GroupInfo{Reference: "m", Comparison: "f"},
		Mechanisms: []MechanismResult{{Node: "age"}, {Node: "hb", Parents: []string{"age", "sex"}}}}
	if got := r.MechanismName("hb"); got != "haemoglobin | age, sex" {
		t.Errorf("MechanismName = %q", got)
	}
	if r.ReferenceName() != "m" || r.ComparisonName() != "women" {
		t.Errorf("groups %q, %q", r.ReferenceName(), r.ComparisonName())
	}
}

// TestLevelNames: level names are checked against the loaded data and
// keyed as the details write the levels, so that a 0/1 column's "1.0"
// names its level "1"; the label's levels may be written as its words.
// A level that does not occur, or levels of a column with no levels, are
// errors naming the key and line.
func TestLevelNames(t *testing.T) {
	data := smallData(200)
	spec := writeAudit(t, smallSpec+"names:\n  columns:\n    dx: {name: disease, levels: {0: healthy, 1.0: diseased}}\n", data)
	plan, err := Plan(spec)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{"0": "healthy", "1": "diseased"}
	if got := plan.Names.Columns["dx"]; got.Name != "disease" || !reflect.DeepEqual(plan.Names.Levels["dx"], want) {
		t.Errorf("dx: %+v, levels %v, want levels %v", got, plan.Names.Levels, want)
	}
	r, err := Run(spec, RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Details.Columns {
		if c.Name == "dx" && !slices.Equal(c.Levels, []string{"0", "1"}) {
			t.Errorf("dx details levels %v: the level names' keys must be these", c.Levels)
		}
	}
	if !reflect.DeepEqual(r.Names.Levels["dx"], want) || r.Names.LevelName("dx", "1") != "diseased" || r.Names.LevelName("dx", "2") != "2" {
		t.Errorf("result levels %v", r.Names.Levels)
	}
	// The label read from words: its levels may be named by the words.
	words := strings.NewReplacer(",1,", ",sick,", ",0,", ",well,").Replace(data)
	spec = writeAudit(t, smallSpec+"positive: sick\nnames:\n  nodes:\n    dx: {levels: {well: healthy, sick: diseased}}\n", words)
	if plan, err = Plan(spec); err != nil {
		t.Fatal(err)
	}
	if got := plan.Names.Levels["dx"]; !reflect.DeepEqual(got, want) {
		t.Errorf("label words: levels %v, want %v", got, want)
	}
	for _, tc := range []struct{ names, want string }{
		{"    dx: {levels: {2: other}}", `spec.yaml:18: key names.columns.dx.levels.2: level "2" does not occur in column "dx" (its levels: 0, 1)`},
		{"    x: {levels: {0: none}}", `key names.columns.x.levels: column "x" is numeric with more than two values`},
		{"    score: {levels: {0: low}}", `key names.columns.score.levels: column "score" is not described by levels`},
		{"    dx: {levels: {0: a, 0.0: b}}", `key names.columns.dx.levels.0.0: level "0" of column "dx" is named twice`},
	} {
		spec := writeAudit(t, smallSpec+"names:\n  columns:\n"+tc.names+"\n", data)
		_, err := Plan(spec)
		var se *SpecError
		if !errors.As(err, &se) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.names, err, tc.want)
		}
	}
}
