package report

import (
	"go/ast"
	"go/parser"
	"go/token"
	"strconv"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// TestWarningReasons: every kind of warning that fairness/warning.go
// declares has its own clause for the overview's verdict.
func TestWarningReasons(t *testing.T) {
	f, err := parser.ParseFile(token.NewFileSet(), "../fairness/warning.go", nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	ast.Inspect(f, func(node ast.Node) bool {
		vs, ok := node.(*ast.ValueSpec)
		if !ok || len(vs.Values) != 1 || !strings.HasPrefix(vs.Names[0].Name, "Kind") {
			return true
		}
		lit, ok := vs.Values[0].(*ast.BasicLit)
		if !ok {
			return true
		}
		kind, _ := strconv.Unquote(lit.Value)
		n++
		if warningReasons[fairness.WarningKind(kind)] == "" {
			t.Errorf("warning kind %s (%s) has no reason in warningReasons", kind, vs.Names[0].Name)
		}
		return true
	})
	if n < 20 {
		t.Errorf("found %d warning kinds in fairness/warning.go, expected every Kind constant", n)
	}
}

// TestWarningOrder: warnings are listed most serious first, in their own
// order within a severity, and numbered so.
func TestWarningOrder(t *testing.T) {
	ws := []fairness.Warning{
		{Severity: fairness.SeverityNote}, {Severity: fairness.SeverityCaution}, {Severity: fairness.SeverityUnreliable},
		{Severity: fairness.SeverityCaution}, {Severity: fairness.SeverityNote},
	}
	got := warningOrder(ws)
	want := []int{2, 1, 3, 0, 4}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("order %v, want %v", got, want)
		}
	}
	if n := warningNumbers(ws); n[2] != 1 || n[0] != 4 || n[4] != 5 {
		t.Errorf("numbers %v", n)
	}
}
