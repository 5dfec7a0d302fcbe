package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/gapwise/gapwise/fairness"
)

// TestAuditDateFlag: --audit-date takes an ISO 8601 calendar date or
// "today" (the local date); anything else is a usage error (exit 2)
// naming the flag.
func TestAuditDateFlag(t *testing.T) {
	if got, err := auditDate("2026-12-03"); got != "2026-12-03" || err != nil {
		t.Errorf("auditDate(2026-12-03) = %q, %v", got, err)
	}
	if got, err := auditDate(""); got != "" || err != nil {
		t.Errorf("auditDate(\"\") = %q, %v", got, err)
	}
	before := time.Now().Format(fairness.AuditDateLayout)
	got, err := auditDate("today")
	after := time.Now().Format(fairness.AuditDateLayout)
	if err != nil || (got != before && got != after) {
		t.Errorf("auditDate(today) = %q, %v; today is %s", got, err, before)
	}
	for _, cmd := range []string{"decompose", "demo"} {
		for _, bad := range []string{"2026-02-30", "3.12.2026", "yesterday"} {
			var so, se bytes.Buffer
			args := []string{cmd, "--audit-date", bad, "--out", filepath.Join(t.TempDir(), "out")}
			if cmd == "decompose" {
				args = append(args, "--spec", "none.yaml")
			}
			if code := execute(args, &so, &se); code != exitInput || !strings.Contains(se.String(), "--audit-date must be a date written YYYY-MM-DD") {
				t.Errorf("%s --audit-date %s: exit %d, want %d (stderr %q)", cmd, bad, code, exitInput, se.String())
			}
		}
	}
}

// TestAuditDateReplacesKey: the flag replaces the spec's audit_date in
// the result (here on the small real PBC cohort, whose spec has none: a
// copy of it gets one).
func TestAuditDateReplacesKey(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "real", "pbc", "spec.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	data, err := filepath.Abs(filepath.Join("..", "..", "testdata", "real", "pbc", "pbc.csv"))
	if err != nil {
		t.Fatal(err)
	}
	spec := filepath.Join(t.TempDir(), "spec.yaml")
	text := strings.Replace(string(src), "data: pbc.csv", "data: "+data, 1) + "audit_date: 2020-01-31\n"
	if err := os.WriteFile(spec, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	out := decompose(t, decomposeOptions{spec: spec, format: formatJSON, date: "2026-12-03"})
	var res fairness.Result
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatal(err)
	}
	if res.AuditDate != "2026-12-03" {
		t.Errorf("audit_date %q, want the flag's 2026-12-03 over the spec's 2020-01-31", res.AuditDate)
	}
}
