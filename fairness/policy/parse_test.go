package policy

import (
	"errors"
	"os"
	"strings"
	"testing"
)

const goodPolicy = `title: Release gate
unjudged: breach
rules:
  - metric: fnr
    max_gap: 0.05
  - metric: fpr
    groups: [F]
    max_gap: 0.03
    judge: worst_bound
  - metric: ppv
    min_ratio: 0.9
    max_gap: 0.1
    judge: best_bound
  - preset: four-fifths
`

// TestParseGood: every key lands where it belongs and the preset expands
// into selection_rate with min_ratio 0.8 on the estimate.
func TestParseGood(t *testing.T) {
	p, err := Parse("p.yaml", []byte(goodPolicy))
	if err != nil {
		t.Fatal(err)
	}
	if p.Title != "Release gate" || p.Unjudged != UnjudgedBreach || len(p.Rules) != 4 || len(p.SHA256) != 64 {
		t.Fatalf("policy %+v", p)
	}
	r := p.Rules
	if r[0].Metric != "fnr" || *r[0].MaxGap != 0.05 || r[0].MinRatio != nil || r[0].Judge != JudgeEstimate || r[0].Line != 4 {
		t.Errorf("rule 1 %+v", r[0])
	}
	if r[1].Judge != JudgeWorstBound || !r[1].AppliesTo("F") || r[1].AppliesTo("M") || !r[1].NeedsIntervals() {
		t.Errorf("rule 2 %+v", r[1])
	}
	if *r[2].MinRatio != 0.9 || *r[2].MaxGap != 0.1 || r[2].Judge != JudgeBestBound {
		t.Errorf("rule 3 %+v", r[2])
	}
	if r[3].Preset != PresetFourFifths || r[3].Metric != "selection_rate" || *r[3].MinRatio != 0.8 || r[3].MaxGap != nil || r[3].Judge != JudgeEstimate || r[3].Index != 4 {
		t.Errorf("rule 4 %+v", r[3])
	}
	d, err := Parse("d.yaml", []byte("rules: [{preset: four-fifths}]\n"))
	if err != nil || d.Unjudged != UnjudgedError {
		t.Errorf("default unjudged: %+v, %v", d, err)
	}
}

// TestParseBad: each mistake is refused with the file, line and key and
// the sentinel, and a misspelt name gets the nearest known one.
func TestParseBad(t *testing.T) {
	for _, tc := range []struct {
		name, src string
		sentinel  error
		want      string
	}{
		{"empty", "", ErrMissingKey, "p.yaml: key rules: the policy is empty"},
		{"not a mapping", "- a\n", ErrBadValue, "p.yaml:1: the policy must be a mapping"},
		{"syntax", "rules:\n  - metric: fnr\n   max_gap: 1\n", ErrSyntax, "p.yaml:2: invalid YAML: did not find expected '-' indicator (in the block that starts on this line)"},
		{"unknown top key", "rule:\n  - {metric: fnr, max_gap: 0.1}\n", ErrUnknownKey, `p.yaml:1: key rule: unknown key "rule"; did you mean "rules"?`},
		{"far top key", "colour: red\nrules: [{metric: fnr, max_gap: 0.1}]\n", ErrUnknownKey, `unknown key "colour" (known here: title, unjudged, rules)`},
		{"no rules", "title: x\n", ErrMissingKey, `p.yaml: key rules: missing required key "rules"`},
		{"rules empty", "rules: []\n", ErrBadValue, "p.yaml:1: key rules: rules must be a non-empty list"},
		{"rule not a mapping", "rules:\n  - fnr\n", ErrBadValue, "p.yaml:2: key rules[1]: each rule must be a mapping"},
		{"unknown rule key", "rules:\n  - metric: fnr\n    max_gaps: 0.1\n", ErrUnknownKey, `p.yaml:3: key rules[1].max_gaps: unknown key "max_gaps"; did you mean "max_gap"?`},
		{"duplicate key", "rules:\n  - metric: fnr\n    max_gap: 0.1\n    max_gap: 0.2\n", ErrDuplicateKey, "p.yaml:4: key rules[1].max_gap: key given twice (first on line 3)"},
		{"unknown metric", "rules:\n  - metric: fnrr\n    max_gap: 0.1\n", ErrUnknownName, `p.yaml:2: key rules[1].metric: unknown metric "fnrr"; did you mean "fnr"?`},
		{"no metric", "rules:\n  - max_gap: 0.1\n", ErrMissingKey, `p.yaml:2: key rules[1].metric: missing required key "rules[1].metric" (or a preset: four-fifths)`},
		{"no limit", "rules:\n  - metric: fnr\n", ErrMissingKey, "p.yaml:2: key rules[1]: the rule sets no limit"},
		{"gap as percent", "rules:\n  - metric: fnr\n    max_gap: 5\n", ErrBadValue, "p.yaml:3: key rules[1].max_gap: max_gap 5 is outside [0, 1], the range of fnr's gaps; fnr is a share, so 0.05 is 5 percentage points"},
		{"negative gap", "rules:\n  - metric: brier\n    max_gap: -0.1\n", ErrBadValue, "max_gap -0.1 is outside [0, 1], the range of brier's gaps"},
		{"gap not a number", "rules:\n  - metric: fnr\n    max_gap: 5%\n", ErrBadValue, `p.yaml:3: key rules[1].max_gap: rules[1].max_gap must be a finite number, got "5%"`},
		{"gap nan", "rules:\n  - metric: fnr\n    max_gap: .nan\n", ErrBadValue, "must be a finite number"},
		{"ratio on a score", "rules:\n  - metric: brier\n    min_ratio: 0.8\n", ErrBadValue, "p.yaml:3: key rules[1].min_ratio: min_ratio applies to rates"},
		{"ratio above 1", "rules:\n  - metric: tpr\n    min_ratio: 1.25\n", ErrBadValue, "min_ratio 1.25 is outside (0, 1]"},
		{"ratio zero", "rules:\n  - metric: tpr\n    min_ratio: 0\n", ErrBadValue, "min_ratio 0 is outside (0, 1]"},
		{"unknown judge", "rules:\n  - metric: fnr\n    max_gap: 0.1\n    judge: worst\n", ErrUnknownName, `p.yaml:4: key rules[1].judge: rules[1].judge must be one of estimate, worst_bound, best_bound, got "worst"`},
		{"near judge", "rules:\n  - metric: fnr\n    max_gap: 0.1\n    judge: worst_bund\n", ErrUnknownName, `did you mean "worst_bound"?`},
		{"unknown preset", "rules:\n  - preset: four_fifth\n", ErrUnknownName, `p.yaml:2: key rules[1].preset: unknown preset "four_fifth"; did you mean "four-fifths"?`},
		{"preset with metric", "rules:\n  - preset: four-fifths\n    metric: fnr\n", ErrBadValue, "p.yaml:3: key rules[1].metric: preset four-fifths fixes metric: selection_rate, min_ratio: 0.8"},
		{"preset with limit", "rules:\n  - min_ratio: 0.9\n    preset: four-fifths\n", ErrBadValue, "p.yaml:2: key rules[1].min_ratio: preset four-fifths fixes"},
		{"unjudged value", "unjudged: pass\nrules: [{preset: four-fifths}]\n", ErrUnknownName, `p.yaml:1: key unjudged: unjudged must be one of error, breach, got "pass"`},
		{"empty group", "rules:\n  - metric: fnr\n    max_gap: 0.1\n    groups: [F, '']\n", ErrBadValue, "p.yaml:4: key rules[1].groups[2]: rules[1].groups[2] needs a single non-empty value"},
		{"second rule", "rules:\n  - preset: four-fifths\n  - metric: fnr\n    judge: estimate\n", ErrMissingKey, "p.yaml:3: key rules[2]: the rule sets no limit"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse("p.yaml", []byte(tc.src))
			var pe *Error
			if !errors.As(err, &pe) || !errors.Is(err, tc.sentinel) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want %v containing %q", err, tc.sentinel, tc.want)
			}
		})
	}
}

// TestLoad: a missing file and a file over the size limit are refused
// naming the file.
func TestLoad(t *testing.T) {
	dir := t.TempDir()
	if _, err := Load(dir + "/none.yaml"); !errors.Is(err, ErrNotFound) || !strings.Contains(err.Error(), "none.yaml: policy file not found") {
		t.Errorf("missing file: %v", err)
	}
	big := dir + "/big.yaml"
	if err := os.WriteFile(big, []byte("# "+strings.Repeat("x", MaxBytes)+"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	if _, err := Load(big); !errors.Is(err, ErrTooLarge) || !strings.Contains(err.Error(), "big.yaml: the policy file is larger than the limit") {
		t.Errorf("large file: %v", err)
	}
	good := dir + "/good.yaml"
	if err := os.WriteFile(good, []byte(goodPolicy), 0o600); err != nil {
		t.Fatal(err)
	}
	if p, err := Load(good); err != nil || p.File != good || len(p.Rules) != 4 {
		t.Errorf("good file: %+v, %v", p, err)
	}
}
