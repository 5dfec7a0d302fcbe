package fairness

import (
	"encoding/json"
	"reflect"
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
		Nodes:   map[string]DisplayName{"x": {"exposure", "mg"}, "dx": {"disease", ""}, "z": {"marker", "IU"}},
		Columns: map[string]DisplayName{"x": {"exposure", "mg"}, "dx": {"disease", ""}, "z": {"marker", "IU"}, "score": {"risk score", ""}},
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
		Nodes:   map[string]DisplayName{"hb": {"haemoglobin", "g/dL"}},
		Columns: map[string]DisplayName{"hb": {"haemoglobin", "g/dL"}}}
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
