package main

import (
	"bytes"
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestWeightsCommand runs `gapwise weights` on the demo: one row per
// reference record (the demo's male records) with the header line, group,
// weight, clipped; weights of mean 1; the effective sample size printed;
// byte-identical files for 1 and 2 workers (rule of determinism); and exit
// status 2 with a clear message for an unknown node (with its did-you-mean),
// a bad --toward, and an output that is the input.
func TestWeightsCommand(t *testing.T) {
	demo := demoDir(t)
	spec := filepath.Join(demo, demoSpec)
	dir := t.TempDir()
	run := func(args ...string) (int, string, string) {
		var so, se bytes.Buffer
		code := execute(append([]string{"weights", "--spec", spec}, args...), &so, &se)
		return code, so.String(), se.String()
	}
	out1, out2 := filepath.Join(dir, "w1.csv"), filepath.Join(dir, "w2.csv")
	code, stdout, stderr := run("--mechanism", "hb", "--out", out1, "--workers", "1")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stdout, "effective sample size (Kish)") || !strings.Contains(stdout, "hb | anaemia, age") {
		t.Errorf("summary lacks the ESS or the mechanism:\n%s", stdout)
	}
	if code, _, stderr := run("--mechanism", "hb", "--out", out2, "--workers", "2"); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b1, b2 := readFile(t, out1), readFile(t, out2)
	if b1 != b2 {
		t.Error("the weights differ between 1 and 2 workers")
	}
	rows, err := csv.NewReader(strings.NewReader(b1)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(rows[0], ","); got != "line,group,weight,clipped" {
		t.Errorf("header %q", got)
	}
	data := readFile(t, filepath.Join(demo, demoData))
	males := strings.Count(data, "\nmale,") // sex is the demo cohort's first column
	sum := 0.0
	for _, r := range rows[1:] {
		if r[1] != "male" || r[3] != "false" {
			t.Fatalf("row %v: want group male, not clipped", r)
		}
		w, err := strconv.ParseFloat(r[2], 64)
		if err != nil || !(w > 0) {
			t.Fatalf("row %v: weight %v", r, err)
		}
		sum += w
	}
	if n := len(rows) - 1; n != males || math.Abs(sum/float64(n)-1) > 1e-9 {
		t.Errorf("%d rows (want %d male records), mean weight %v (want 1)", n, males, sum/float64(n))
	}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"--mechanism", "hbb", "--out", out1}, "did you mean hb?"},
		{[]string{"--mechanism", "hb", "--toward", "men", "--out", out1}, "--toward must be comparison or reference"},
		{[]string{"--mechanism", "hb", "--out", filepath.Join(demo, demoData)}, "refusing to overwrite an input"},
		{[]string{"--mechanism", "hb"}, "--out FILE.csv"},
	} {
		if code, _, stderr := run(tc.args...); code != exitInput || !strings.Contains(stderr, tc.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", tc.args, code, stderr, tc.want)
		}
	}
	if _, err := os.Stat(filepath.Join(demo, demoData)); err != nil {
		t.Error(err)
	}
}
