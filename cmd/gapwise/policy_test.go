package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
)

// fourFifthsCohort writes a small cohort after the worked example of the
// agencies' Questions and Answers on the Uniform Guidelines (1979; its
// question 12 from memory, the figures as quoted from the answer): of 100
// records per group, 60 are flagged positive for "White" (the highest
// rate), 45 for "American Indian" (impact ratio 45/60 = 75 %, adverse
// impact indicated) and 48 for "Hispanic" (48/60 = 80 %, not below
// four-fifths, so none). It returns the folder, with one spec per
// comparison group (spec-<group>.yaml) auditing selection_rate against
// White, and the four-fifths policy in ff.yaml.
func fourFifthsCohort(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("group,x,y,score\n")
	for _, g := range []struct {
		name    string
		flagged int
	}{{"White", 60}, {"American Indian", 45}, {"Hispanic", 48}} {
		for i := range 100 {
			score := 0.2
			if i < g.flagged {
				score = 0.8
			}
			fmt.Fprintf(&b, "%s,%d,%d,%v\n", g.name, i%10, (i/3)%2, score)
		}
	}
	write := func(name, text string) {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("cohort.csv", b.String())
	for _, g := range []string{"American Indian", "Hispanic"} {
		write("spec-"+strings.Fields(g)[0]+".yaml", fmt.Sprintf(`data: cohort.csv
label: y
score: score
threshold: 0.5
groups: {column: group, reference: White, comparison: %s}
metrics: [selection_rate]
fold_splits: 1
graph:
  - node: x
  - node: y
    parents: [x]
`, g))
	}
	write("ff.yaml", "title: four-fifths gate\nrules:\n  - preset: four-fifths\n")
	return dir
}

// TestPolicyFourFifthsExit: on the worked example the comparison at 75 %
// of the highest rate breaches the preset (exit status 3, the breach in
// the text on stdout, in result.json, in report.html and on stderr, and
// the outputs written), the one at exactly 80 % passes (exit status 0);
// the impact ratio beside the gap is 45/60 and 48/60.
func TestPolicyFourFifthsExit(t *testing.T) {
	dir := fourFifthsCohort(t)
	ff := filepath.Join(dir, "ff.yaml")
	for _, tc := range []struct {
		spec  string
		code  int
		ratio float64
		word  string
	}{{"spec-American.yaml", exitPolicy, 0.75, "BREACH"}, {"spec-Hispanic.yaml", exitOK, 0.8, "pass"}} {
		t.Run(tc.spec, func(t *testing.T) {
			out := filepath.Join(t.TempDir(), "out")
			var stdout, stderr bytes.Buffer
			code := execute([]string{"decompose", "--spec", filepath.Join(dir, tc.spec), "--policy", ff, "--out", out}, &stdout, &stderr)
			if code != tc.code {
				t.Fatalf("exit %d, want %d; stderr %s", code, tc.code, stderr.String())
			}
			text := stdout.String()
			if !strings.Contains(text, "Policy gate: ") || !strings.Contains(text, "lower/higher >= 0.8") || !strings.Contains(text, tc.word) || !strings.Contains(text, "analogy") {
				t.Errorf("text output lacks the policy section:\n%s", text)
			}
			if tc.code == exitPolicy && !strings.Contains(stderr.String(), "gapwise: policy "+ff+" breached: 1 of 1 check: rule 1 (line 3) selection_rate for \"American Indian\": lower/higher >= 0.8 breached at 0.750") {
				t.Errorf("stderr %q", stderr.String())
			}
			if tc.code == exitOK && stderr.Len() != 0 {
				t.Errorf("stderr %q on a pass", stderr.String())
			}
			res := loadResult(t, filepath.Join(out, resultFile))
			if res.Policy == nil || res.Policy.Passed != (tc.code == exitOK) || len(res.Policy.Checks) != 1 {
				t.Fatalf("result policy %+v", res.Policy)
			}
			c := res.Policy.Checks[0]
			if c.Preset != policy.PresetFourFifths || c.Value == nil || *c.Value < tc.ratio-1e-12 || *c.Value > tc.ratio+1e-12 {
				t.Errorf("check %+v, want ratio %v", c, tc.ratio)
			}
			if m := res.Metrics[0]; m.ImpactRatio == nil || *m.ImpactRatio < tc.ratio-1e-12 || *m.ImpactRatio > tc.ratio+1e-12 {
				t.Errorf("impact ratio %v, want %v", m.ImpactRatio, tc.ratio)
			}
			page := readFile(t, filepath.Join(out, reportFile))
			if !strings.Contains(page, `<section id="policy">`) || !strings.Contains(page, ">"+tc.word+"<") || !strings.Contains(page, "29 CFR 1607.4(D)") {
				t.Errorf("report.html lacks the policy section or its %s", tc.word)
			}
		})
	}
}

// TestPolicyOutputs: the breach is listed in the Markdown and JSON outputs
// on stdout too.
func TestPolicyOutputs(t *testing.T) {
	dir := fourFifthsCohort(t)
	for _, tc := range []struct{ format, want string }{
		{formatMarkdown, "| 1 (line 3) | `selection_rate` | American Indian | lower ÷ higher ≥ 0.8 | estimate | 0.750 | **BREACH** |"},
		{formatJSON, `"status": "breach"`},
	} {
		var stdout, stderr bytes.Buffer
		code := execute([]string{"decompose", "--spec", filepath.Join(dir, "spec-American.yaml"), "--policy", filepath.Join(dir, "ff.yaml"), "--format", tc.format}, &stdout, &stderr)
		if code != exitPolicy || !strings.Contains(stdout.String(), tc.want) {
			t.Errorf("%s: exit %d, output lacks %q:\n%s", tc.format, code, tc.want, stdout.String())
		}
		if tc.format == formatJSON {
			var res fairness.Result
			if err := json.Unmarshal(stdout.Bytes(), &res); err != nil || res.Policy == nil || res.Policy.Breaches != 1 {
				t.Errorf("JSON policy: %v %+v", err, res.Policy)
			}
		}
	}
}

// TestPolicyInputErrors: a bad policy file, and a rule the run could not
// judge under unjudged: error, exit with status 2 before the run, naming
// the file, line and key; a policy that is the --out folder's file is
// refused like any input.
func TestPolicyInputErrors(t *testing.T) {
	dir := fourFifthsCohort(t)
	spec := filepath.Join(dir, "spec-American.yaml")
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	for _, tc := range []struct{ name, policy, want string }{
		{"misspelt key", write("bad.yaml", "rules:\n  - metric: selection_rate\n    min_ration: 0.8\n"), `bad.yaml:3: key rules[1].min_ration: unknown key "min_ration"; did you mean "min_ratio"?`},
		{"no intervals", write("bound.yaml", "rules:\n  - {metric: selection_rate, min_ratio: 0.8, judge: worst_bound}\n"), "bound.yaml:2: key rules[1]: judge: worst_bound needs bootstrap intervals and the run makes none"},
		{"metric not audited", write("fnr.yaml", "rules:\n  - {metric: fnr, max_gap: 0.1}\n"), "fnr.yaml:2: key rules[1]: the rule is on fnr, which the run does not audit"},
		{"missing file", filepath.Join(dir, "none.yaml"), "none.yaml: policy file not found"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			code := execute([]string{"decompose", "--spec", spec, "--policy", tc.policy, "--intervals", "0"}, &stdout, &stderr)
			if code != exitInput || !strings.Contains(stderr.String(), tc.want) || stdout.Len() != 0 {
				t.Errorf("exit %d, stderr %q, want 2 and %q", code, stderr.String(), tc.want)
			}
		})
	}
	// With unjudged: breach the same rule runs and counts as a breach.
	p := write("lenient.yaml", "unjudged: breach\nrules:\n  - {metric: selection_rate, min_ratio: 0.8, judge: worst_bound}\n")
	var stdout, stderr bytes.Buffer
	if code := execute([]string{"decompose", "--spec", filepath.Join(dir, "spec-Hispanic.yaml"), "--policy", p, "--intervals", "0"}, &stdout, &stderr); code != exitPolicy || !strings.Contains(stdout.String(), "not judged, counted as a breach") {
		t.Errorf("unjudged: breach: exit %d, stdout %s", code, stdout.String())
	}
}
