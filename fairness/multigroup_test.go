package fairness

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/internal/scm"
)

// scmGroup is one group value of a multi-group cohort: records drawn from
// model's group g (scm.Sample).
type scmGroup struct {
	value string
	model *scm.Model
	g     scm.Group
	n     int
	seed  uint64
}

// writeSCMCohort writes the groups' records of the six-node Screening
// model (internal/scm) as CSV with a group column and its spec, and
// returns the spec's path. site is written as the words s0, s1, s2.
func writeSCMCohort(t testing.TB, groups []scmGroup, extra string) string {
	t.Helper()
	dir := t.TempDir()
	var b bytes.Buffer
	b.WriteString("group,age,site,disease,marker_a,marker_b,unread,score\n")
	for _, gr := range groups {
		recs, err := scm.Sample(gr.model, gr.g, gr.n, gr.seed)
		if err != nil {
			t.Fatal(err)
		}
		for j, v := range recs.Values {
			fmt.Fprintf(&b, "%s,%.6g,s%d,%g,%.6g,%.6g,%.6g,%.6g\n", gr.value, v[scm.NodeAge], int(v[scm.NodeSite]),
				v[scm.NodeDisease], v[scm.NodeMarkerA], v[scm.NodeMarkerB], v[scm.NodeUnread], recs.Scores[j])
		}
	}
	if err := os.WriteFile(filepath.Join(dir, "cohort.csv"), b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	spec := `data: cohort.csv
label: disease
score: score
threshold: 0.5
metrics: [fnr, fpr]
categorical: [site]
graph:
  - node: age
  - node: site
  - node: disease
    parents: [age, site]
  - node: marker_a
    parents: [disease, age]
  - node: marker_b
    parents: [disease]
  - node: unread
    parents: [age, disease]
` + extra
	path := filepath.Join(dir, "spec.yaml")
	if err := os.WriteFile(path, []byte(spec), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestRunGroupsAgainstGroundTruth audits one reference and two comparison
// groups that differ from it in different mechanisms, in one RunGroups
// call, and compares each comparison's contributions with the Shapley
// values of the mechanisms that generated it (internal/scm: scm.GroundTruth
// simulates every hybrid distribution; analytic ground truth of the
// simulated model, nothing of gapwise's estimator is used). The reference
// mechanisms of scm.Screening do not depend on the shift, so the
// reference group is shared. Tolerances: the attribution package's
// ground-truth bounds (attribution/groundtruth_test.go, gtTolerance: 5 ×
// the largest RMSE measured over 10 replicates at 20,000 records per
// group: FNR 0.0047, FPR 0.0023, the unread covariate's FNR 0.0067),
// scaled by √(20,000/n) for n records per group (root-n consistency,
// common practice), plus 4 × the ground truth's own Monte Carlo error. A
// group of 40 rows must be listed as skipped with its reason.
func TestRunGroupsAgainstGroundTruth(t *testing.T) {
	n := 3000
	if testing.Short() {
		n = 1500
	}
	prev := scm.Screening("prevalence", scm.Shift{Prevalence: 0.7})
	mix := scm.Screening("case-mix", scm.Shift{Age: 0.5, Site: true})
	path := writeSCMCohort(t, []scmGroup{
		{"ref", prev, scm.Reference, n, 11},
		{"prev", prev, scm.Comparison, n, 12},
		{"mix", mix, scm.Comparison, n, 13},
		{"tiny", mix, scm.Comparison, 40, 14},
	}, "groups: {column: group, reference: ref, comparison: every-other}\nclassifier: expanded\n")
	spec, err := LoadSpec(path)
	if err != nil {
		t.Fatal(err)
	}
	g, err := RunGroups(spec, RunOptions{Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	if len(g.Summary.Skipped) != 1 || g.Summary.Skipped[0].Value != "tiny" || !strings.Contains(g.Summary.Skipped[0].Reason, "40 rows") {
		t.Fatalf("skipped = %+v, want tiny with 40 rows", g.Summary.Skipped)
	}
	if got := len(g.Results); got != 2 {
		t.Fatalf("%d results, want prev and mix", got)
	}
	bound := map[string][2]float64{"fnr": {5 * 0.0047, 5 * 0.0067}, "fpr": {5 * 0.0023, 5 * 0.0023}}
	scale := math.Sqrt(20000 / float64(n))
	worst := 0.0 // largest |error| / tolerance, logged to show the margin
	for _, r := range g.Results {
		m := map[string]*scm.Model{"prev": prev, "mix": mix}[r.Groups.Comparison]
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
	if c := g.Summary.Matrix; len(c) != 4 || c[0].Comparison != g.Results[0].Groups.Comparison || c[0].Metric != "fnr" {
		t.Errorf("matrix = %+v, want 2 comparisons × 2 metrics in order", c)
	}
}

// TestRunGroupsSameAsSeparateRuns checks that each comparison of RunGroups
// is byte for byte the Result of Run on the spec naming that value alone,
// and that neither depends on the number of workers.
func TestRunGroupsSameAsSeparateRuns(t *testing.T) {
	a := scm.Screening("a", scm.Shift{Prevalence: 0.7})
	b := scm.Screening("b", scm.Shift{Age: 0.5})
	path := writeSCMCohort(t, []scmGroup{
		{"north", a, scm.Reference, 400, 1}, {"south", a, scm.Comparison, 300, 2}, {"east", b, scm.Comparison, 350, 3},
	}, "groups: {column: group, reference: north, comparison: [east, south]}\nfold_splits: 1\nclassifier: linear\n")
	spec, err := LoadSpec(path)
	if err != nil {
		t.Fatal(err)
	}
	encode := func(g *GroupsResult) string {
		js, err := json.Marshal(g.Summary)
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range g.Results {
			b, err := json.Marshal(r)
			if err != nil {
				t.Fatal(err)
			}
			js = append(js, b...)
		}
		return string(js)
	}
	g1, err := RunGroups(spec, RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	g3, err := RunGroups(spec, RunOptions{Workers: 3})
	if err != nil {
		t.Fatal(err)
	}
	if encode(g1) != encode(g3) {
		t.Error("results differ between 1 and 3 workers")
	}
	for i, want := range []string{"east", "south"} {
		r := g1.Results[i]
		if r.Groups.Comparison != want || g1.Summary.Comparisons[i].Value != want {
			t.Fatalf("comparison %d is %q, want %q in the listed order", i, r.Groups.Comparison, want)
		}
		single, err := Run(spec.ForComparison(want), RunOptions{Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		x, _ := json.Marshal(r)
		y, _ := json.Marshal(single)
		if !bytes.Equal(x, y) {
			t.Errorf("%s: RunGroups result differs from Run with comparison: %s", want, want)
		}
	}
}

// TestParseComparisons covers the forms of groups.comparison and the
// errors that name the key.
func TestParseComparisons(t *testing.T) {
	const head = "data: d.csv\nlabel: y\nscore: s\nthreshold: 0.5\nmetrics: [fpr]\ngraph: [{node: x}, {node: y, parents: [x]}]\n"
	cases := []struct {
		name, groups string
		want         []string
		every        bool
		key, msg     string
	}{
		{"single", "{column: g, reference: a, comparison: b}", nil, false, "", ""},
		{"list", "{column: g, reference: a, comparison: [b, c]}", []string{"b", "c"}, false, "", ""},
		{"one listed", "{column: g, reference: a, comparison: [b]}", []string{"b"}, false, "", ""},
		{"every other", "{column: g, reference: a, comparison: every-other}", nil, true, "", ""},
		{"quoted keyword is a value", "{column: g, reference: a, comparison: \"every-other\"}", nil, false, "", ""},
		{"listed keyword is a value", "{column: g, reference: a, comparison: [every-other]}", []string{"every-other"}, false, "", ""},
		{"reference listed", "{column: g, reference: a, comparison: [b, a]}", nil, false, "groups.comparison[1]", "is the reference"},
		{"listed twice", "{column: g, reference: a, comparison: [b, c, b]}", nil, false, "groups.comparison[2]", "listed twice"},
		{"empty list", "{column: g, reference: a, comparison: []}", nil, false, "groups.comparison", "at least one value"},
		{"blank item", "{column: g, reference: a, comparison: [b, \"\"]}", nil, false, "groups.comparison", "non-empty"},
		{"mapping item", "{column: g, reference: a, comparison: [b, {c: d}]}", nil, false, "groups.comparison", "non-empty"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := ParseSpec("spec.yaml", []byte(head+"groups: "+c.groups+"\n"))
			if c.key != "" {
				var se *SpecError
				if !errors.As(err, &se) || se.Key != c.key || !strings.Contains(err.Error(), c.msg) {
					t.Fatalf("error %v, want key %s with %q", err, c.key, c.msg)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			g := s.Groups
			if fmt.Sprint(g.Comparisons) != fmt.Sprint(c.want) || g.EveryOther != c.every || g.Several() != (c.want != nil || c.every) {
				t.Errorf("groups = %+v, want comparisons %v, every-other %v", g, c.want, c.every)
			}
		})
	}
	_, err := ParseSpec("spec.yaml", []byte(head+"groups: {column: g, reference: a, comparison: [b, c]}\nnames: {groups: {comparison: women}}\n"))
	var se *SpecError
	if !errors.As(err, &se) || se.Key != "names.groups.comparison" {
		t.Errorf("names.groups.comparison with several comparisons: %v, want an error naming the key", err)
	}
}

// TestRunGroupsInputErrors checks the errors found against the data: a
// listed value absent from the column (with the nearest value present
// suggested), every comparison too small, and a file that is missing.
func TestRunGroupsInputErrors(t *testing.T) {
	a := scm.Screening("a", scm.Shift{Prevalence: 0.7})
	groups := []scmGroup{{"north", a, scm.Reference, 200, 1}, {"south", a, scm.Comparison, 150, 2}, {"east", a, scm.Comparison, 30, 3}}
	cases := []struct {
		name, groups, key, msg string
		sentinel               error
	}{
		{"misspelt", "[south, sout]", "groups.comparison[1]", `did you mean "south"?`, ErrGroupAbsent},
		{"misspelt reference", "[south]", "groups.reference", `did you mean "north"?`, ErrGroupAbsent},
		{"all too small", "[east]", "groups.comparison", `"east": 30 rows; the group classifiers need at least 100`, ErrTooFewRecords},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			ref := "north"
			if c.name == "misspelt reference" {
				ref = "nroth"
			}
			path := writeSCMCohort(t, groups, "groups: {column: group, reference: "+ref+", comparison: "+c.groups+"}\n")
			spec, err := LoadSpec(path)
			if err != nil {
				t.Fatal(err)
			}
			_, err = RunGroups(spec, RunOptions{})
			var se *SpecError
			if !errors.As(err, &se) || se.Key != c.key || !strings.Contains(err.Error(), c.msg) || !errors.Is(err, c.sentinel) || !IsInputError(err) {
				t.Fatalf("error %v, want key %s with %q", err, c.key, c.msg)
			}
			if se.Line == 0 {
				t.Errorf("error %v names no line", err)
			}
		})
	}
}
