package fairness

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestSpecLimits: settings that size work or memory are refused beyond
// their documented limits, naming the key.
func TestSpecLimits(t *testing.T) {
	var graph strings.Builder
	graph.WriteString("graph:\n")
	for i := range MaxNodes + 1 {
		graph.WriteString("  - node: x" + strings.Repeat("a", i) + "\n")
	}
	cases := []struct{ name, extra, want string }{
		{"folds", "folds: 51\n", "key folds: folds must be at most 50, got 51"},
		{"ece_bins", "ece_bins: 1001\n", "key ece_bins: ece_bins must be at most 1000, got 1001"},
		{"replicates", "intervals: {replicates: 10001}\n", "intervals.replicates must be at most 10000, got 10001"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			spec := strings.Replace(smallSpec, "folds: 2\n", "", 1) + c.extra
			_, err := ParseSpec("s.yaml", []byte(spec))
			if err == nil || !strings.Contains(err.Error(), c.want) || !IsInputError(err) {
				t.Errorf("got %v, want an input error containing %q", err, c.want)
			}
		})
	}
	head, _, _ := strings.Cut(smallSpec, "graph:")
	_, err := ParseSpec("s.yaml", []byte(head+graph.String()))
	if err == nil || !strings.Contains(err.Error(), "graph has 64 nodes; at most 63") {
		t.Errorf("64 nodes: got %v", err)
	}
}

// TestSpecFileTooLarge: a spec file beyond MaxSpecBytes is refused without
// reading it all.
func TestSpecFileTooLarge(t *testing.T) {
	path := filepath.Join(t.TempDir(), "big.yaml")
	if err := os.WriteFile(path, []byte("title: x\n"+strings.Repeat("#", MaxSpecBytes)), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := LoadSpec(path)
	if !errors.Is(err, ErrTooLarge) || !IsInputError(err) {
		t.Errorf("got %v, want an input error wrapping ErrTooLarge", err)
	}
}

// TestDataFromDevice: a data file that is an endless device (/dev/zero:
// zero bytes, no line breaks) is refused after MaxLineBytes instead of
// growing memory until the runtime aborts.
func TestDataFromDevice(t *testing.T) {
	if _, err := os.Stat("/dev/zero"); err != nil {
		t.Skip("no /dev/zero on this system")
	}
	spec := writeAudit(t, strings.Replace(smallSpec, "data: cohort.csv", "data: /dev/zero", 1), smallData(10))
	_, err := LoadData(spec)
	if err == nil || !strings.Contains(err.Error(), "longer than") || !IsInputError(err) {
		t.Errorf("got %v, want an input error about an over-long line", err)
	}
}

// TestBoundedReader: the byte and line limits, and that ordinary input
// passes through unchanged.
func TestBoundedReader(t *testing.T) {
	cases := []struct {
		name, in    string
		total, line int64
		tooLarge    bool
	}{
		{"within", "a,b\n1,2\n", 100, 10, false},
		{"line too long", "a,b\n" + strings.Repeat("9", 11) + "\n", 100, 10, true},
		{"total too large", strings.Repeat("1,2\n", 30), 100, 10, true},
		{"exactly at the limits", strings.Repeat("123456789\n", 10), 100, 9, false},
	}
	for _, c := range cases {
		out, err := io.ReadAll(&boundedReader{r: strings.NewReader(c.in), total: c.total, line: c.line})
		if got := errors.Is(err, ErrTooLarge); got != c.tooLarge {
			t.Errorf("%s: error %v, want too large %v", c.name, err, c.tooLarge)
		}
		if !c.tooLarge && string(out) != c.in {
			t.Errorf("%s: read %q", c.name, out)
		}
	}
}
