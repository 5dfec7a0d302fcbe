package main

import (
	"bytes"
	"errors"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/internal/scm"
)

// coverageDecomposition builds a one-metric decomposition whose gap interval
// is ivs[0] and whose contribution intervals are ivs[1:].
func coverageDecomposition(metric string, ivs ...attribution.Interval) *attribution.Decomposition {
	gap := ivs[0]
	return &attribution.Decomposition{Metrics: []attribution.MetricDecomposition{{
		Metric: metric, GapCI: &gap, ContributionCIs: append([]attribution.Interval(nil), ivs[1:]...),
	}}}
}

// TestTallyCoverage checks the counting by hand: the truth is gap 0.1 and
// contributions 0.04, 0.06; an interval contains the truth when
// Low ≤ truth ≤ High (closed ends), failed draws are excluded and counted.
func TestTallyCoverage(t *testing.T) {
	truth := []scm.Truth{{Metric: "fnr", Gap: 0.1, Shapley: []float64{0.04, 0.06}}}
	iv := func(lo, hi float64) attribution.Interval { return attribution.Interval{Low: lo, High: hi} }
	draws := []coverageDraw{
		// gap hit, a missed (0.04 < 0.05), b hit at its upper end.
		{dec: coverageDecomposition("fnr", iv(0, 0.2), iv(0.05, 0.1), iv(0, 0.06)), sum: &attribution.BootstrapSummary{Failed: 2}},
		{err: errors.New("draw failed")},
		// gap missed (0.1 > 0.09), a hit at its lower end, b hit.
		{dec: coverageDecomposition("fnr", iv(0.01, 0.09), iv(0.04, 0.08), iv(0.02, 0.1)), sum: &attribution.BootstrapSummary{Failed: 1}},
	}
	c := tallyCoverage("toy", false, 100, []string{"a", "b"}, truth, draws)
	if c.draws != 2 || c.failedDraws != 1 || c.failedReps != 3 {
		t.Errorf("draws %d, failed draws %d, failed replicates %d; want 2, 1, 3", c.draws, c.failedDraws, c.failedReps)
	}
	if want := []int{1, 1, 2}; !equalInts(c.hits[0], want) {
		t.Errorf("hits %v, want %v", c.hits[0], want)
	}
	for q, want := range []float64{0.2 + 0.08, 0.05 + 0.04, 0.06 + 0.08} {
		if math.Abs(c.widths[0][q]-want) > 1e-12 {
			t.Errorf("width sum of quantity %d = %v, want %v", q, c.widths[0][q], want)
		}
	}
	if h, tot, _ := c.share(nil, isContribution); h != 3 || tot != 4 {
		t.Errorf("contributions %d/%d, want 3/4", h, tot)
	}
	if h, tot, _ := c.share(nil, anyQuantity); h != 4 || tot != 6 {
		t.Errorf("all %d/%d, want 4/6", h, tot)
	}

	var out bytes.Buffer
	opt := options{metrics: []string{"fnr"}, draws: 3, boot: 40, truthN: 1000}
	writeCoverage(&out, opt, "linear", []coverageCell{c})
	text := out.String()
	for _, want := range []string{
		"| toy | 100 | 2 (1 failed) | 0.500 | 0.750 | 0.667 | 0.1400 | 0.0575 | 3 |",
		"| case | n | metric | gap | a | b | mean width gap | mean width contributions |",
		"| toy | 100 | fnr | 1/2 | 1/2 | 2/2 | 0.1400 | 0.0575 |",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// TestCoverageFlags checks the coverage mode's defaults and that explicit
// -sizes and -cases win over them.
func TestCoverageFlags(t *testing.T) {
	opt, err := parseFlags([]string{"-coverage"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if !opt.coverage || opt.draws != 30 || opt.boot != 40 || len(opt.sizes) != 1 || opt.sizes[0] != 800 || strings.Join(opt.cases, ",") != "prevalence,case-mix,interaction,spread-narrow" {
		t.Errorf("coverage defaults: %+v", opt)
	}
	opt, err = parseFlags([]string{"-coverage", "-sizes", "400,1600", "-cases", "combined", "-draws", "5"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if len(opt.sizes) != 2 || opt.sizes[1] != 1600 || strings.Join(opt.cases, ",") != "combined" || opt.draws != 5 {
		t.Errorf("explicit flags: %+v", opt)
	}
	for _, args := range [][]string{{"-coverage", "-draws", "0"}, {"-coverage", "-boot", "1"}} {
		if _, err := parseFlags(args, io.Discard); err == nil {
			t.Errorf("parseFlags(%q) accepted bad input", args)
		}
	}
}

// TestIndependentSample checks the packing: n reference rows then n
// comparison rows, the reference rows those of scm.Pooled with the same
// seed, the comparison rows those of scm.Pooled with seed+1.
func TestIndependentSample(t *testing.T) {
	m := scm.Cases()[0].Model
	const n = 50
	s, mechs, err := independentSample(m, n, 8)
	if err != nil {
		t.Fatal(err)
	}
	if len(mechs) != len(m.Nodes) {
		t.Fatalf("%d mechanisms for %d nodes", len(mechs), len(m.Nodes))
	}
	ref, _, _ := scm.Pooled(m, n, n, 8)
	cmp, _, _ := scm.Pooled(m, n, n, 9)
	for r := 0; r < 2*n; r++ {
		src, sr := ref, r
		if r >= n {
			src, sr = cmp, r
		}
		if s.Comparison[r] != (r >= n) || s.Labels[r] != src.Labels[sr] || s.Scores[r] != src.Scores[sr] {
			t.Fatalf("row %d: comparison %v, label %v, score %v differ from scm.Pooled", r, s.Comparison[r], s.Labels[r], s.Scores[r])
		}
	}
	if drawSeed(1, 0, 0, 1) == drawSeed(1, 0, 0, 0)+1 {
		t.Error("draw seeds collide with the comparison group's seed")
	}
}
