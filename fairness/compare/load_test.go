package compare

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// minimal is the smallest result a comparison accepts: one metric of two
// mechanisms.
const minimal = `{
  "tool": {"name": "gapwise", "version": "test"},
  "groups": {"column": "sex", "reference": "male", "comparison": "female", "n_reference": 100, "n_comparison": 90},
  "label": "y", "score": "s", "threshold": 0.5,
  "metrics": [{"metric": "fnr", "reference": 0.2, "comparison": 0.1, "gap": -0.1,
    "contributions": [{"node": "a", "mechanism": "a", "value": -0.04}, {"node": "y", "mechanism": "y | a", "value": -0.05}]}],
  "mechanisms": [{"node": "a", "parents": []}, {"node": "y", "parents": ["a"]}]
}`

func TestParseErrors(t *testing.T) {
	tests := []struct {
		name, text string
		want       error
		msg        string // a part of the message
	}{
		{"empty", "  \n", ErrNotResult, "r.json: the file is empty"},
		{"syntax", "{\n  \"tool\": {\"name\": \"gapwise\",}\n}", ErrSyntax, "r.json:2:"},
		{"array", "[1, 2]", ErrNotResult, "holds an array"},
		{"type", strings.Replace(minimal, `"gap": -0.1`, `"gap": "-0.1"`, 1), ErrType, "key metrics.gap: want a number, got a JSON string"},
		{"not gapwise", strings.Replace(minimal, `"gapwise"`, `"other"`, 1), ErrNotResult, `key tool.name: is "other"`},
		{"no groups", strings.Replace(minimal, `"reference": "male", `, "", 1), ErrBadValue, "key groups.reference: is missing"},
		{"wrong node", strings.Replace(minimal, `{"node": "y", "mechanism"`, `{"node": "z", "mechanism"`, 1), ErrBadValue, `key metrics[0].contributions[1].node: is "z", want "y"`},
		{"one bound", strings.Replace(minimal, `"value": -0.04}`, `"value": -0.04, "ci_low": -0.1}`, 1), ErrBadValue, "key metrics[0].contributions[0]: has only one of"},
		{"reversed", strings.Replace(minimal, `"gap": -0.1,`, `"gap": -0.1, "gap_ci": {"ci_low": 0.1, "ci_high": -0.2},`, 1), ErrBadValue, "key metrics[0].gap_ci: ci_low 0.1 is above"},
		{"duplicate metric", dupMetric(), ErrBadValue, `key metrics[1].metric: "fnr" is also metrics[0]`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse("r.json", []byte(tc.text))
			var e *Error
			if !errors.As(err, &e) || !errors.Is(err, tc.want) {
				t.Fatalf("error %v, want an *Error wrapping %v", err, tc.want)
			}
			if !strings.Contains(err.Error(), tc.msg) || !strings.HasPrefix(err.Error(), "r.json") {
				t.Errorf("message %q, want it to start with the file and hold %q", err, tc.msg)
			}
		})
	}
	if _, err := Parse("r.json", []byte(minimal)); err != nil {
		t.Fatalf("minimal result refused: %v", err)
	}
}

func dupMetric() string {
	var m map[string]any
	if err := json.Unmarshal([]byte(minimal), &m); err != nil {
		panic(err)
	}
	ms := m["metrics"].([]any)
	m["metrics"] = append(ms, ms[0])
	b, _ := json.Marshal(m)
	return string(b)
}

func TestLoadMissingFile(t *testing.T) {
	p := filepath.Join(t.TempDir(), "none.json")
	_, err := Load(p)
	if !errors.Is(err, ErrNotFound) || !strings.HasPrefix(err.Error(), p+": ") {
		t.Fatalf("error %v, want %s: result file not found", err, p)
	}
}

func TestSyntaxPosition(t *testing.T) {
	// After the comma a key must follow; the closing brace, the byte at
	// which the input became invalid, is the 26th of line 2 (counted by
	// hand).
	text := "{\n  \"tool\": {\"name\": \"x\",  }\n}"
	_, err := Parse("r.json", []byte(text))
	var e *Error
	if !errors.As(err, &e) || e.Line != 2 || e.Column != 26 {
		t.Fatalf("error %v at %d:%d, want line 2 column 26", err, e.Line, e.Column)
	}
}

// writeResult writes r as JSON into dir and returns the path.
func writeResult(t *testing.T, dir, name string, r *fairness.Result) string {
	t.Helper()
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}
