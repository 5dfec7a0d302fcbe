package fairness

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// jsonAt returns the value at a suppression path of a decoded JSON
// document, and whether the path exists.
func jsonAt(doc any, path string) (any, bool) {
	cur := doc
	for _, part := range strings.Split(path, ".") {
		name, rest, _ := strings.Cut(part, "[")
		obj, ok := cur.(map[string]any)
		if !ok {
			return nil, false
		}
		if cur, ok = obj[name]; !ok {
			return nil, false
		}
		for rest != "" {
			idx, after, _ := strings.Cut(rest, "]")
			i, err := strconv.Atoi(idx)
			arr, ok := cur.([]any)
			if err != nil || !ok || i >= len(arr) {
				return nil, false
			}
			cur = arr[i]
			rest = strings.TrimPrefix(after, "[")
		}
	}
	return cur, true
}

// TestRunSuppressBelow runs the same audit with and without
// suppress_below: every metric, contribution and warning kind is the same
// (computed from all records), the JSON without the key is that of the
// plain encoding, and with it every withheld path holds null while the
// Result holds 0; every count from 1 to T−1 of the descriptive tables is
// among them (the confusion counts, read off the unsuppressed run, and
// the level counts), and no shown count is below T except zero.
func TestRunSuppressBelow(t *testing.T) {
	data := smallData(160)
	plain := writeAudit(t, smallSpec, data)
	ref, err := Run(plain, RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if ref.Suppression != nil {
		t.Fatal("suppression without the key")
	}
	type plainResult Result
	want, _ := json.Marshal(plainResult(*ref))
	got, _ := json.Marshal(ref)
	if !bytes.Equal(want, got) {
		t.Error("without suppression the JSON differs from the plain encoding")
	}

	const th = 20 // large for 80 records per group, so that many counts are small
	sup := writeAudit(t, smallSpec+fmt.Sprintf("suppress_below: %d\n", th), data)
	res, err := Run(sup, RunOptions{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	s := res.Suppression
	if s == nil || s.Below != th || len(s.Cells) == 0 {
		t.Fatalf("suppression %+v", s)
	}
	for i := range ref.Metrics {
		a, b := ref.Metrics[i], res.Metrics[i]
		if a.Gap != b.Gap || a.Reference != b.Reference || !reflect.DeepEqual(a.Contributions, b.Contributions) {
			t.Errorf("%s: the estimates changed with suppression", a.Metric)
		}
	}
	if len(ref.Warnings) != len(res.Warnings) {
		t.Errorf("%d warnings without suppression, %d with", len(ref.Warnings), len(res.Warnings))
	}
	js, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	var doc any
	if err := json.Unmarshal(js, &doc); err != nil {
		t.Fatal(err)
	}
	for _, c := range s.Cells {
		v, ok := jsonAt(doc, c.Path)
		if !ok || v != nil {
			t.Errorf("%s (%s): JSON holds %v (present %v), want null", c.Path, c.Reason, v, ok)
		}
		if c.Reason != WithheldBelow && c.Reason != WithheldComplementary {
			t.Errorf("%s: reason %q", c.Path, c.Reason)
		}
	}
	// Every small confusion count of the plain run is withheld (as "<T",
	// or as "withheld" when the table could not keep its range), only small
	// ones are called small, and the Result holds 0 in their place.
	for g, role := range roles {
		pc := [2]ConfusionCounts{ref.Details.Reference.Confusion, ref.Details.Comparison.Confusion}[g]
		sc := [2]ConfusionCounts{res.Details.Reference.Confusion, res.Details.Comparison.Confusion}[g]
		for _, cell := range []struct {
			name       string
			plain, got float64
		}{{"tp", pc.TP, sc.TP}, {"fp", pc.FP, sc.FP}, {"tn", pc.TN, sc.TN}, {"fn", pc.FN, sc.FN}} {
			reason, held := s.Withheld(ConfusionPath(role, cell.name))
			switch {
			case small(int(cell.plain), th) && !held:
				t.Errorf("%s %s = %v is shown", role, cell.name, cell.plain)
			case held && reason == WithheldBelow && !small(int(cell.plain), th):
				t.Errorf("%s %s = %v is shown as small", role, cell.name, cell.plain)
			case held && cell.got != 0:
				t.Errorf("%s %s is withheld but the Result holds %v", role, cell.name, cell.got)
			case !held && cell.got != cell.plain:
				t.Errorf("%s %s changed from %v to %v", role, cell.name, cell.plain, cell.got)
			}
		}
	}
	// The shown counts of the level tables are 0 or at least T.
	for i, c := range res.Details.Columns {
		for g, counts := range [2][]int{c.CountsReference, c.CountsComparison} {
			for j, n := range counts {
				if _, held := s.Withheld(LevelCountPath(i, roles[g], j)); !held && small(n, th) {
					t.Errorf("column %s %s level %d: %d shown", c.Name, roles[g], j, n)
				}
			}
		}
	}
	// The JSON decodes back into a Result with the same suppression.
	var back Result
	if err := json.Unmarshal(js, &back); err != nil {
		t.Fatal(err)
	}
	if len(back.Suppression.Cells) != len(s.Cells) || back.Details.Reference.Confusion != res.Details.Reference.Confusion {
		t.Error("the suppressed JSON does not decode back to the Result")
	}
	if _, held := back.Suppression.Withheld(s.Cells[0].Path); !held {
		t.Error("a decoded Result does not know its withheld paths")
	}
}

// TestSuppressBelowSpecKey: the key takes 0 (none) or 2 to
// MaxSuppressBelow, and bad values are refused with the key and its line.
func TestSuppressBelowSpecKey(t *testing.T) {
	for _, c := range []struct {
		value string
		want  int
		err   string
	}{
		{"10", 10, ""},
		{"0", 0, ""},
		{"2", 2, ""},
		{"1", 0, "suppress_below must be 0 (no suppression) or from 2 to 1000 (10 is common), got 1"},
		{"1001", 0, "got 1001"},
		{"-3", 0, "got -3"},
		{"ten", 0, `suppress_below must be an integer, got "ten"`},
	} {
		spec, err := ParseSpec("spec.yaml", []byte(smallSpec+"suppress_below: "+c.value+"\n"))
		if c.err == "" {
			if err != nil || spec.SuppressBelow != c.want {
				t.Errorf("%s: %v, SuppressBelow %v", c.value, err, spec)
			}
			continue
		}
		var se *SpecError
		if !errors.As(err, &se) || se.Key != "suppress_below" || se.Line != 16 || !strings.Contains(err.Error(), c.err) {
			t.Errorf("%s: error %v, want key suppress_below on line 16 with %q", c.value, err, c.err)
		}
	}
	if _, err := ParseSpec("spec.yaml", []byte(smallSpec+"supress_below: 10\n")); err == nil || !strings.Contains(err.Error(), `did you mean "suppress_below"`) {
		t.Errorf("misspelt key: %v", err)
	}
}
