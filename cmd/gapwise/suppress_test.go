package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestSuppressBelowFlag: --suppress-below replaces the spec's
// suppress_below (0 turning it off), its JSON holds null at every
// withheld path, and a bad threshold is a usage error naming the flag.
// The demo's own result (no suppression) has no suppression field.
func TestSuppressBelowFlag(t *testing.T) {
	demo := demoDir(t)
	if strings.Contains(readFile(t, filepath.Join(demo, resultFile)), `"suppression"`) {
		t.Error("the demo's result has a suppression field without the flag")
	}
	spec := filepath.Join(t.TempDir(), "spec.yaml")
	src := strings.Replace(readFile(t, filepath.Join(demo, demoSpec)), "data: cohort.csv", "data: "+filepath.Join(demo, demoData), 1)
	if err := os.WriteFile(spec, []byte(src+"suppress_below: 10\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	run := func(flag *int) map[string]any {
		o := decomposeOptions{spec: spec, format: formatJSON}
		if flag != nil {
			o.suppress = suppressOption{below: *flag, set: true}
		}
		var doc map[string]any
		if err := json.Unmarshal([]byte(decompose(t, o)), &doc); err != nil {
			t.Fatal(err)
		}
		return doc
	}
	fromSpec := run(nil)
	s, ok := fromSpec["suppression"].(map[string]any)
	if !ok || s["below"] != 10.0 {
		t.Fatalf("suppress_below 10 in the spec: suppression %v", fromSpec["suppression"])
	}
	cells := s["cells"].([]any)
	if len(cells) == 0 {
		t.Fatal("nothing withheld on the demo at 10")
	}
	conf := fromSpec["details"].(map[string]any)["comparison"].(map[string]any)["confusion"].(map[string]any)
	for _, c := range cells {
		if path := c.(map[string]any)["path"].(string); strings.HasPrefix(path, "details.comparison.confusion.") {
			if v := conf[strings.TrimPrefix(path, "details.comparison.confusion.")]; v != nil {
				t.Errorf("%s is %v in the JSON, want null", path, v)
			}
		}
	}
	zero := 0
	if off := run(&zero); off["suppression"] != nil {
		t.Error("--suppress-below 0 left suppression on")
	}
	for _, bad := range []string{"1", "-2", "1001"} {
		var so, se bytes.Buffer
		if code := execute([]string{"decompose", "--spec", spec, "--suppress-below", bad}, &so, &se); code != exitInput || !strings.Contains(se.String(), "--suppress-below must be 0 (no suppression) or from 2 to 1000") {
			t.Errorf("--suppress-below %s: exit %d, stderr %q", bad, code, se.String())
		}
	}
}
