package fairness

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/internal/scm"
)

// TestGroupBands checks the half-open bands (each holds its lower edge),
// their labels and the forms a spec may write them in.
func TestGroupBands(t *testing.T) {
	b := GroupBands{Column: "age", Edges: []float64{40, 65}}
	for _, c := range []struct {
		x    float64
		band int
	}{{-1, 0}, {39.999, 0}, {40, 1}, {64.9, 1}, {65, 2}, {120, 2}} {
		if got := b.Band(c.x); got != c.band {
			t.Errorf("Band(%g) = %d, want %d", c.x, got, c.band)
		}
	}
	if got := strings.Join(b.labels(), " | "); got != "<40 | 40–65 | ≥65" {
		t.Errorf("labels %q", got)
	}
	for _, c := range []struct {
		text string
		band int
		ok   bool
	}{
		{"<40", 0, true}, {"< 40", 0, true}, {"age <40", 0, true}, {"40–65", 1, true}, {"40-65", 1, true},
		{"40 to 65", 1, true}, {"40.0-65", 1, true}, {">=65", 2, true}, {"≥65", 2, true}, {"age ≥65", 2, true},
		{"<65", 0, false}, {"40-60", 0, false}, {"≥40", 0, false}, {"40", 0, false}, {"young", 0, false},
	} {
		k, ok := b.parse(c.text)
		if ok != c.ok || (ok && k != c.band) {
			t.Errorf("parse(%q) = %d, %v; want %d, %v", c.text, k, ok, c.band, c.ok)
		}
	}
	neg := GroupBands{Column: "z", Edges: []float64{-2, -1}}
	if k, ok := neg.parse("-2--1"); !ok || k != 1 {
		t.Errorf("parse(-2--1) = %d, %v; want band 1", k, ok)
	}
}

// TestParseCombinedGroups covers the combination form of groups and the
// errors naming its keys.
func TestParseCombinedGroups(t *testing.T) {
	const head = "data: d.csv\nlabel: y\nscore: s\nthreshold: 0.5\nmetrics: [fpr]\ngraph: [{node: x}, {node: y, parents: [x]}]\n"
	cases := []struct {
		name, groups  string
		ref, cmp, col string
		key, msg      string
	}{
		{"two columns", "{columns: [sex, age], bands: {age: [40, 65]}, reference: {sex: M, age: \"<40\"}, comparison: {age: 40-65, sex: F}}",
			"sex M, age <40", "sex F, age 40–65", "sex × age", "", ""},
		{"no bands", "{columns: [sex, site], reference: {sex: M, site: a}, comparison: [{sex: F, site: a}, {sex: M, site: b}]}",
			"sex M, site a", "sex F, site a", "sex × site", "", ""},
		{"one banded column", "{column: age, bands: {age: [50]}, reference: \"<50\", comparison: \">=50\"}", "age <50", "age ≥50", "age", "", ""},
		{"one column listed", "{columns: [sex], reference: M, comparison: every-other}", "M", "", "sex", "", ""},
		{"both column keys", "{column: sex, columns: [sex], reference: M, comparison: F}", "", "", "", "groups.columns", "not both"},
		{"no columns", "{bands: {age: [1]}, reference: M, comparison: F}", "", "", "", "groups.columns", "missing required key"},
		{"column twice", "{columns: [sex, sex], reference: M, comparison: F}", "", "", "", "groups.columns[1]", "listed twice"},
		{"band of another column", "{columns: [sex, age], bands: {ages: [40]}, reference: {sex: M, age: \"<40\"}, comparison: every-other}", "", "", "", "groups.bands.ages", `did you mean "age"?`},
		{"edges not increasing", "{columns: [sex, age], bands: {age: [40, 40]}, reference: {sex: M, age: \"<40\"}, comparison: every-other}", "", "", "", "groups.bands.age[1]", "band edges must increase: 40 follows 40"},
		{"edge not a number", "{columns: [sex, age], bands: {age: [forty]}, reference: {sex: M, age: \"<40\"}, comparison: every-other}", "", "", "", "groups.bands.age[0]", "must be a number"},
		{"no edges", "{columns: [sex, age], bands: {age: []}, reference: {sex: M, age: \"<40\"}, comparison: every-other}", "", "", "", "groups.bands.age", "1 to 20 increasing band edges"},
		{"not a band", "{columns: [sex, age], bands: {age: [40, 65]}, reference: {sex: M, age: \"<50\"}, comparison: every-other}", "", "", "", "groups.reference.age", `its bands are "<40", "40–65" and "≥65"`},
		{"column left out", "{columns: [sex, age], bands: {age: [40]}, reference: {sex: M}, comparison: every-other}", "", "", "", "groups.reference.age", "no value of group column \"age\""},
		{"unknown column in value", "{columns: [sex, age], bands: {age: [40]}, reference: {sex: M, agee: \"<40\"}, comparison: every-other}", "", "", "", "groups.reference.agee", `did you mean "age"?`},
		{"scalar for two columns", "{columns: [sex, age], bands: {age: [40]}, reference: M, comparison: every-other}", "", "", "", "groups.reference", `such as {sex: VALUE, age: "<40"}`},
		{"comparison is reference", "{columns: [sex, age], bands: {age: [40]}, reference: {sex: M, age: \"<40\"}, comparison: [{sex: F, age: \"<40\"}, {sex: M, age: \"age <40\"}]}", "", "", "", "groups.comparison[1]", "is the reference"},
		{"unknown key", "{columns: [sex], band: {}, reference: M, comparison: F}", "", "", "", "groups.band", `did you mean "bands"?`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := ParseSpec("spec.yaml", []byte(head+"groups: "+c.groups+"\n"))
			if c.key != "" {
				var se *SpecError
				if !errors.As(err, &se) || se.Key != c.key || !strings.Contains(err.Error(), c.msg) || se.Line == 0 {
					t.Fatalf("error %v, want key %s with %q and a line", err, c.key, c.msg)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if g := s.Groups; g.Reference != c.ref || g.Comparison != c.cmp || g.Column != c.col {
				t.Errorf("groups %+v, want reference %q, comparison %q, column %q", g, c.ref, c.cmp, c.col)
			}
		})
	}
	_, err := ParseSpec("spec.yaml", []byte(head+"groups: {columns: [sex, x], reference: {sex: M, x: \"1\"}, comparison: every-other}\n"))
	if !errors.Is(err, ErrGroupInGraph) {
		t.Errorf("group column in the graph: %v, want ErrGroupInGraph", err)
	}
	_, err = ParseSpec("spec.yaml", []byte(head+"groups: {columns: [sex, x], bands: {x: [1]}, reference: {sex: M, x: \"<1\"}, comparison: every-other}\n"))
	var se *SpecError
	if !errors.As(err, &se) || se.Key != "groups.bands.x" || !strings.Contains(err.Error(), "no overlap") {
		t.Errorf("banded column in the graph: %v, want an error naming groups.bands.x", err)
	}
}

// scmCell is one combination of sex and a years band of an intersection
// cohort: n records of model's group g, with years drawn uniformly from
// the whole numbers in [lo, hi).
type scmCell struct {
	sex    string
	lo, hi int
	model  *scm.Model
	g      scm.Group
	n      int
	seed   uint64
}

// writeCellCohort writes the cells' records of the Screening model
// (internal/scm) as CSV with the group columns sex and years (neither a
// graph node) and the spec of writeSCMCohort with the given groups key.
func writeCellCohort(t testing.TB, cells []scmCell, groups string) string {
	t.Helper()
	var b bytes.Buffer
	b.WriteString("sex,years,age,site,disease,marker_a,marker_b,unread,score\n")
	for _, c := range cells {
		recs, err := scm.Sample(c.model, c.g, c.n, c.seed)
		if err != nil {
			t.Fatal(err)
		}
		rng := rand.New(rand.NewPCG(c.seed, 7))
		for j, v := range recs.Values {
			fmt.Fprintf(&b, "%s,%d,%.6g,s%d,%g,%.6g,%.6g,%.6g,%.6g\n", c.sex, c.lo+rng.IntN(c.hi-c.lo), v[scm.NodeAge], int(v[scm.NodeSite]),
				v[scm.NodeDisease], v[scm.NodeMarkerA], v[scm.NodeMarkerB], v[scm.NodeUnread], recs.Scores[j])
		}
	}
	path := writeSCMCohort(t, nil, "groups: "+groups+"\nclassifier: expanded\n")
	if err := os.WriteFile(filepath.Join(filepath.Dir(path), "cohort.csv"), b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestRunGroupsIntersections audits every combination of sex and a band
// of years against one reference combination and compares each
// combination's contributions with the Shapley values of the mechanisms
// that generated its records (internal/scm.GroundTruth simulates every
// hybrid distribution: analytic ground truth of the simulated model).
// Each combination is drawn from its own shift of the Screening model (a
// diseased-only marker shift, a case-mix shift of age, and both), whose
// contributions to the FNR gap (about 0.13 to 0.17, from GroundTruth)
// exceed the tolerance, so a result filed under the wrong combination
// fails; years, which is not a node, only places records in their band. Tolerances as in
// TestRunGroupsAgainstGroundTruth (attribution/groundtruth_test.go's
// bounds scaled by √(20,000/n), plus 4 × the truth's Monte Carlo error).
// The combination of 40 rows is skipped with its reason.
func TestRunGroupsIntersections(t *testing.T) {
	n := 1200
	if testing.Short() {
		n = 800
	}
	marker := scm.Screening("marker", scm.Shift{DiseasedMarker: 1})
	mix := scm.Screening("case-mix", scm.Shift{Age: 1})
	both := scm.Screening("both", scm.Shift{DiseasedMarker: 1, Age: 1})
	path := writeCellCohort(t, []scmCell{
		{"M", 20, 50, marker, scm.Reference, n, 21},
		{"F", 20, 50, marker, scm.Comparison, n, 22},
		{"M", 50, 80, mix, scm.Comparison, n, 23},
		{"F", 50, 80, both, scm.Comparison, n, 24},
		{"F", 80, 95, both, scm.Comparison, 40, 25},
	}, "{columns: [sex, years], bands: {years: [50, 80]}, reference: {sex: M, years: \"<50\"}, comparison: every-other}")
	spec, err := LoadSpec(path)
	if err != nil {
		t.Fatal(err)
	}
	g, err := RunGroups(spec, RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if sk := g.Summary.Skipped; len(sk) != 1 || sk[0].Value != "sex F, years ≥80" || !strings.Contains(sk[0].Reason, "40 rows") {
		t.Fatalf("skipped = %+v, want sex F, years ≥80 with 40 rows", sk)
	}
	models := map[string]*scm.Model{"sex F, years <50": marker, "sex M, years 50–80": mix, "sex F, years 50–80": both}
	if len(g.Results) != len(models) {
		t.Fatalf("%d results, want %d", len(g.Results), len(models))
	}
	bound := map[string][2]float64{"fnr": {5 * 0.0047, 5 * 0.0067}, "fpr": {5 * 0.0023, 5 * 0.0023}}
	scale := math.Sqrt(20000 / float64(n))
	worst := 0.0
	for _, r := range g.Results {
		m := models[r.Groups.Comparison]
		if m == nil || r.Groups.Reference != "sex M, years <50" || r.Groups.NComparison != n || r.Groups.Column != "sex × years" {
			t.Fatalf("groups %+v, want a combination of %d records against sex M, years <50", r.Groups, n)
		}
		truth, err := scm.GroundTruth(m, []string{"fnr", "fpr"}, 1<<18, 2026, scm.ScreeningThreshold, 1)
		if err != nil {
			t.Fatal(err)
		}
		for q, mr := range r.Metrics {
			for i, c := range mr.Contributions {
				b := bound[mr.Metric][0]
				if i == scm.NodeUnread {
					b = bound[mr.Metric][1]
				}
				tol := scale*b + 4*truth[q].SE[i]
				worst = math.Max(worst, math.Abs(c.Value-truth[q].Shapley[i])/tol)
				if want := truth[q].Shapley[i]; math.Abs(c.Value-want) > tol {
					t.Errorf("%s %s φ(%s) = %+.4f, truth %+.4f ± %.4f", r.Groups.Comparison, mr.Metric, c.Node, c.Value, want, tol)
				}
			}
		}
	}
	t.Logf("largest |error| / tolerance: %.2f", worst)
}

// TestCombinedGroupDataErrors checks the errors found in the data of
// combined groups: a group column absent from the header, a banded cell
// that is not a number, a missing group cell, and a reference
// combination the data does not hold.
func TestCombinedGroupDataErrors(t *testing.T) {
	a := scm.Screening("a", scm.Shift{Prevalence: 0.7})
	cells := []scmCell{{"M", 20, 50, a, scm.Reference, 60, 1}, {"F", 20, 50, a, scm.Comparison, 60, 2}}
	cases := []struct {
		name, groups, edit, col, msg string
		sentinel                     error
	}{
		{"unknown column", "{columns: [sex, yeras], bands: {yeras: [50]}, reference: {sex: M, yeras: \"<50\"}, comparison: {sex: F, yeras: \"<50\"}}", "",
			"yeras", "groups.columns on line", ErrMissingColumn},
		{"not a number", "{columns: [sex, years], bands: {years: [50]}, reference: {sex: M, years: \"<50\"}, comparison: {sex: F, years: \"<50\"}}", "M,twenty,",
			"years", `"twenty" is not a number; groups.bands.years (line`, ErrNotNumeric},
		{"missing cell", "{columns: [sex, years], bands: {years: [50]}, reference: {sex: M, years: \"<50\"}, comparison: {sex: F, years: \"<50\"}}", ",30,",
			"sex", "missing group value", ErrMissingValue},
		{"absent reference", "{columns: [sex, years], bands: {years: [50]}, reference: {sex: M, years: \">=50\"}, comparison: {sex: F, years: \"<50\"}}", "",
			"sex × years", `"sex M, years ≥50" does not appear in the combinations of sex × years`, ErrGroupAbsent},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path := writeCellCohort(t, cells, c.groups)
			if c.edit != "" {
				data := filepath.Join(filepath.Dir(path), "cohort.csv")
				b, _ := os.ReadFile(data)
				lines := strings.SplitN(string(b), "\n", 4)
				i1 := strings.Index(lines[2], ",")
				i2 := i1 + 1 + strings.Index(lines[2][i1+1:], ",")
				lines[2] = c.edit + lines[2][i2+1:] // the row's sex and years replaced
				if err := os.WriteFile(data, []byte(strings.Join(lines, "\n")), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			spec, err := LoadSpec(path)
			if err != nil {
				t.Fatal(err)
			}
			_, err = Run(spec, RunOptions{})
			var de *DataError
			if !errors.As(err, &de) || de.Column != c.col || !strings.Contains(err.Error(), c.msg) || !errors.Is(err, c.sentinel) || !IsInputError(err) {
				t.Fatalf("error %v, want column %s with %q", err, c.col, c.msg)
			}
			if c.edit != "" && de.Line != 3 {
				t.Errorf("error %v names line %d, want 3", err, de.Line)
			}
		})
	}
}
