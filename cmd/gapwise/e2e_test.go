package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestBinary builds gapwise with a version stamped in by -ldflags and runs
// it as a user would: --version, demo, and a usage error's exit status.
func TestBinary(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "gapwise")
	build := exec.Command("go", "build", "-ldflags", "-X main.version=v9.9.9-test", "-o", bin, ".")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	runEnv := func(env []string, args ...string) (stdout, stderr string, code int) {
		var o, e bytes.Buffer
		cmd := exec.Command(bin, args...)
		cmd.Env = append(os.Environ(), env...)
		cmd.Stdout, cmd.Stderr = &o, &e
		err := cmd.Run()
		var ee *exec.ExitError
		switch {
		case err == nil:
		case errors.As(err, &ee):
			code = ee.ExitCode()
		default:
			t.Fatalf("%v: %v", args, err)
		}
		return o.String(), e.String(), code
	}
	run := func(args ...string) (stdout, stderr string, code int) { return runEnv(nil, args...) }

	if out, _, code := run("--version"); code != 0 || out != "gapwise v9.9.9-test\n" {
		t.Errorf("--version: exit %d, printed %q", code, out)
	}
	if _, errOut, code := run("decompose", "--nope"); code != exitInput || !strings.Contains(errOut, "--nope") {
		t.Errorf("unknown flag: exit %d, stderr %q", code, errOut)
	}

	demo := filepath.Join(dir, "demo")
	// The demo's default bootstrap (demoIntervals refits), on a small cohort.
	out, errOut, code := run("demo", "--out", demo, "--rows", "1000")
	if code != 0 {
		t.Fatalf("demo: exit %d, stderr %q", code, errOut)
	}
	if errOut != "" {
		t.Errorf("demo wrote to stderr (not a terminal): %q", errOut)
	}
	if !strings.Contains(out, "SYNTHETIC") || !strings.Contains(out, demo) {
		t.Errorf("demo summary: %q", out)
	}
	if want := "or run next:\n  " + bin + " decompose --spec " + filepath.Join(demo, demoSpec) + " --alt-graph " + filepath.Join(demo, demoAltGraph) + "\n"; !strings.Contains(out, want) {
		t.Errorf("demo summary lacks the hint %q:\n%s", want, out)
	}
	for _, f := range []string{demoData, demoSpec, demoAltGraph, resultFile, reportFile} {
		if _, err := os.Stat(filepath.Join(demo, f)); err != nil {
			t.Error(err)
		}
	}
	res := loadResult(t, filepath.Join(demo, resultFile))
	if res.Tool.Version != "v9.9.9-test" {
		t.Errorf("result records version %q", res.Tool.Version)
	}
	// The demo's default bootstrap: demoIntervals replicates at 0.95 that
	// refit the classifiers.
	if iv := res.Settings.Intervals; iv == nil || *iv != (fairness.IntervalSettings{Intervals: fairness.Intervals{Replicates: demoIntervals, Level: 0.95, KeepRatios: false, Form: fairness.FormPercentile}, Method: "bootstrap-refit"}) {
		t.Errorf("demo settings.intervals %+v", iv)
	}

	// The spec's intervals key is read, and a flag overrides one setting.
	specPath := filepath.Join(demo, demoSpec)
	src := readFile(t, specPath) + "intervals: {replicates: 4, level: 0.8, keep_ratios: true}\n"
	if err := os.WriteFile(specPath, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code = run("decompose", "--spec", specPath, "--level", "0.9", "--format", "json")
	if code != 0 || errOut != "" {
		t.Fatalf("decompose: exit %d, stderr %q", code, errOut)
	}
	var got fairness.Result
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	if iv := got.Settings.Intervals; iv == nil || *iv != (fairness.IntervalSettings{Intervals: fairness.Intervals{Replicates: 4, Level: 0.9, KeepRatios: true, Form: fairness.FormNormal}, Method: "bootstrap-fast"}) {
		t.Errorf("spec intervals with --level 0.9: settings.intervals %+v", iv)
	}

	// Same seed and data give byte-identical JSON whatever GOMAXPROCS, with
	// a full (refitting) bootstrap, the most parallel path (product
	// requirement).
	var outs []string
	for _, procs := range []string{"1", "2"} {
		out, errOut, code := runEnv([]string{"GOMAXPROCS=" + procs}, "decompose", "--spec", specPath, "--intervals", "6", "--fast-intervals=false", "--format", "json")
		if code != 0 {
			t.Fatalf("GOMAXPROCS=%s: exit %d, stderr %q", procs, code, errOut)
		}
		outs = append(outs, out)
	}
	if outs[0] != outs[1] {
		t.Error("JSON differs between GOMAXPROCS=1 and GOMAXPROCS=2")
	}
	var refit fairness.Result
	if err := json.Unmarshal([]byte(outs[0]), &refit); err != nil {
		t.Fatal(err)
	}
	if iv := refit.Settings.Intervals; iv == nil || iv.KeepRatios || iv.Replicates != 6 {
		t.Errorf("--intervals 6 --fast-intervals=false: settings.intervals %+v", iv)
	}
}

// TestDemoHintRunsAfterGoRun: after `go run . demo` (from this package's
// folder, as `go run ./cmd/gapwise demo` runs from the module's root), the
// summary's "run next" hint is a go run command, and running it as printed
// (by sh, from the same folder) audits the demo's spec.
func TestDemoHintRunsAfterGoRun(t *testing.T) {
	if testing.Short() {
		t.Skip("builds with go run")
	}
	dir := filepath.Join(t.TempDir(), "demo out") // a space, which the hint must quote
	demo := exec.Command("go", "run", ".", "demo", "--out", dir, "--rows", "300", "--intervals", "0")
	out, err := demo.Output()
	if err != nil {
		t.Fatalf("go run . demo: %v\n%s", err, out)
	}
	const lead = "or run next:\n  "
	i := strings.Index(string(out), lead)
	if i < 0 {
		t.Fatalf("no hint in:\n%s", out)
	}
	hint := strings.TrimSpace(strings.SplitN(string(out[i+len(lead):]), "\n", 2)[0])
	if want := "go run . decompose --spec '" + filepath.Join(dir, demoSpec) + "' --alt-graph '" + filepath.Join(dir, demoAltGraph) + "'"; hint != want {
		t.Errorf("hint %q, want %q", hint, want)
	}
	next := exec.Command("sh", "-c", hint+" --format markdown")
	got, err := next.CombinedOutput()
	if err != nil || !strings.Contains(string(got), "### Overview") {
		t.Errorf("running the hint %q: %v\n%s", hint, err, got)
	}
}
