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
	"gonum.org/v1/gonum/mat"
)

// TestTallyCoverage checks the counting by hand: the truth is gap 0.1 and
// contributions 0.04, 0.06; an interval contains the truth when
// Low ≤ truth ≤ High (closed ends), failed draws are excluded and counted;
// the standard error of a pooled share is the SD of the per-draw shares
// over √draws.
func TestTallyCoverage(t *testing.T) {
	truth := []scm.Truth{{Metric: "fnr", Gap: 0.1, Shapley: []float64{0.04, 0.06}}}
	iv := func(lo, hi float64) attribution.Interval { return attribution.Interval{Low: lo, High: hi} }
	forms := []coverageForm{{method: methodRefit, replicates: 40}}
	one := func(ivs ...attribution.Interval) [][][]attribution.Interval {
		return [][][]attribution.Interval{{ivs}}
	}
	draws := []drawIntervals{
		// gap hit, a missed (0.04 < 0.05), b hit at its upper end.
		{ivs: one(iv(0, 0.2), iv(0.05, 0.1), iv(0, 0.06)), failedReps: 2},
		{err: errors.New("draw failed")},
		// gap missed (0.1 > 0.09), a hit at its lower end, b hit.
		{ivs: one(iv(0.01, 0.09), iv(0.04, 0.08), iv(0.02, 0.1)), failedReps: 1},
	}
	c := tallyCoverage("toy", false, groupSizes{100, 100}, []string{"a", "b"}, forms, truth, draws)
	if c.draws != 2 || c.failedDraws != 1 || c.failedReps != 3 {
		t.Errorf("draws %d, failed draws %d, failed replicates %d; want 2, 1, 3", c.draws, c.failedDraws, c.failedReps)
	}
	if want := []int{1, 1, 2}; !equalInts(c.hits[0][0], want) {
		t.Errorf("hits %v, want %v", c.hits[0][0], want)
	}
	for q, want := range []float64{0.2 + 0.08, 0.05 + 0.04, 0.06 + 0.08} {
		if math.Abs(c.widths[0][0][q]-want) > 1e-12 {
			t.Errorf("width sum of quantity %d = %v, want %v", q, c.widths[0][0][q], want)
		}
	}
	// Contributions: 1/2 and 2/2 per draw → 0.75, SE = SD(0.5, 1)/√2 = 0.25.
	if cov, se, w := c.share(0, 1); cov != 0.75 || math.Abs(se-0.25) > 1e-12 || math.Abs(w-0.0575) > 1e-12 {
		t.Errorf("contributions %v ± %v, width %v; want 0.75 ± 0.25, 0.0575", cov, se, w)
	}
	// All: 2/3 and 2/3 → 0.667 ± 0.
	if cov, se, _ := c.share(0, 2); math.Abs(cov-2.0/3) > 1e-12 || se != 0 {
		t.Errorf("all %v ± %v, want 0.667 ± 0", cov, se)
	}
	if low, where, _ := c.lowest(0, []string{"fnr"}); low != 0.5 || where != "fnr gap" {
		t.Errorf("lowest %v (%s), want 0.5 (fnr gap)", low, where)
	}

	var out bytes.Buffer
	opt := options{metrics: []string{"fnr"}, draws: 3, boot: 40, truthN: 1000}
	writeCoverage(&out, opt, "linear", []coverageCell{c})
	text := out.String()
	for _, want := range []string{
		"| toy | 100 | refit percentile, 40 | 2 (1 failed) | 0.500 ± 0.500 | 0.750 ± 0.250 | 0.667 ± 0.000 | 0.500 (fnr gap) | 0.1400 | 0.0575 | 3 |",
		"| case | n | form | fnr gap | fnr contributions |",
		"| toy | 100 | refit percentile, 40 | 1/2 | 0.750 |",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("output lacks %q:\n%s", want, text)
		}
	}
}

// TestCoverageForms: the percentile, normal and normal+score forms of all
// replicates and of every -subs count below -boot, per bootstrap method,
// then delta.
func TestCoverageForms(t *testing.T) {
	opt := options{methods: []string{methodDelta, methodRefit, methodFast}, boot: 200, subs: []int{50, 400}}
	var got []string
	for _, f := range coverageForms(opt) {
		got = append(got, f.String())
	}
	want := "refit percentile, 200|refit normal, 200|refit normal+score, 200|refit percentile, 50|refit normal, 50|refit normal+score, 50|" +
		"fast percentile, 200|fast normal, 200|fast normal+score, 200|fast percentile, 50|fast normal, 50|fast normal+score, 50|delta, ratios fixed"
	if strings.Join(got, "|") != want {
		t.Errorf("forms %q, want %q", strings.Join(got, "|"), want)
	}
}

// TestFormIntervals checks the forms against hand computation: replicates
// 1, 2, 3, 4, (failed), 6. The percentile interval of all of them (the
// failed one left out) is [1.1, 5.8] at 95% (Hyndman & Fan definition 7:
// positions 0.025·4 and 0.975·4 of 1, 2, 3, 4, 6), of the first 5 it is
// [1.075, 3.925]; the normal one of the first 5 is 10 ± t(3, 0.975)·SD,
// SD of 1…4 = 1.2910, t(3, 0.975) = 3.1824 (Student's table); the delta
// one 10 ± 1.96·0.5.
func TestFormIntervals(t *testing.T) {
	se := 0.5
	dec := &attribution.Decomposition{Metrics: []attribution.MetricDecomposition{{Gap: 10,
		FixedRatioSE: &attribution.FixedRatioSE{Gap: se, Contributions: []float64{}}}}}
	var reps [][][]float64
	for _, v := range []float64{1, 2, 3, 4, 5, 6} {
		reps = append(reps, [][]float64{{v}})
	}
	reps[4] = nil // a failed replicate
	for _, c := range []struct {
		form   coverageForm
		lo, hi float64
	}{
		{coverageForm{method: methodRefit, replicates: 6}, 1 + 0.1, 4 + 0.9*2}, // of 1, 2, 3, 4, 6
		{coverageForm{method: methodRefit, replicates: 5}, 1 + 0.025*3, 1 + 0.975*3},
		{coverageForm{method: methodRefit, normal: true, replicates: 5}, 10 - 3.1824*1.2910, 10 + 3.1824*1.2910},
		{coverageForm{method: methodDelta}, 10 - 1.96*se, 10 + 1.96*se},
		// A metric that is no rate keeps the normal interval in the score form.
		{coverageForm{method: methodRefit, normal: true, score: true, replicates: 5}, 10 - 3.1824*1.2910, 10 + 3.1824*1.2910},
	} {
		got, err := formIntervals(c.form, dec, [][]float64{{10}}, reps, nil, options{metrics: []string{"brier"}})
		if err != nil {
			t.Fatal(err)
		}
		if iv := got[0][0]; math.Abs(iv.Low-c.lo) > 1e-3 || math.Abs(iv.High-c.hi) > 1e-3 {
			t.Errorf("%s: [%v, %v], want [%v, %v]", c.form, iv.Low, iv.High, c.lo, c.hi)
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

// TestScoreForm: in the score form a rate's gap is Newcombe's interval of
// the sample's counts: FNR 2 misses of 5 positives (comparison) against
// 1 of 4 (reference), by hand from the formula of
// attribution.NewcombeInterval: (0.4 − 0.25) − √((0.4 − 0.1176)² +
// (0.6993 − 0.25)²) = −0.3806 and 0.15 + √((0.7693 − 0.4)² + (0.25 −
// 0.0456)²) = 0.5722 (Wilson 1/4: (0.0456, 0.6993), 2/5: (0.1176,
// 0.7693)).
func TestScoreForm(t *testing.T) {
	s := &attribution.Sample{X: mat.NewDense(9, 1, nil), Comparison: make([]bool, 9), Labels: make([]float64, 9), Scores: make([]float64, 9)}
	// Reference rows 0–3 (one miss), comparison rows 4–8 (two misses); all positives.
	for r := range 9 {
		s.Labels[r], s.Scores[r] = 1, 0.9
		s.Comparison[r] = r >= 4
	}
	s.Scores[0], s.Scores[4], s.Scores[5] = 0.1, 0.1, 0.2
	reps := [][][]float64{{{0.1}}, {{0.2}}, {{0.3}}}
	got, err := formIntervals(coverageForm{method: methodRefit, normal: true, score: true, replicates: 3}, nil, [][]float64{{0.15}}, reps, s, options{metrics: []string{"fnr"}})
	if err != nil {
		t.Fatal(err)
	}
	if iv := got[0][0]; math.Abs(iv.Low+0.3806) > 2e-3 || math.Abs(iv.High-0.5722) > 2e-3 {
		t.Errorf("score interval [%.4f, %.4f], want [-0.3806, 0.5722]", iv.Low, iv.High)
	}
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
	opt, err = parseFlags([]string{"-coverage", "-sizes", "800,1500:400", "-methods", "refit,delta", "-subs", "20,50"}, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	if g := opt.groupSizes(); len(g) != 2 || g[0] != (groupSizes{800, 800}) || g[1] != (groupSizes{1500, 400}) ||
		strings.Join(opt.methods, ",") != "refit,delta" || len(opt.subs) != 2 || opt.subs[1] != 50 {
		t.Errorf("sizes, methods, subs: %+v", opt)
	}
	for _, args := range [][]string{{"-coverage", "-draws", "0"}, {"-coverage", "-boot", "1"}, {"-sizes", "1500:400"},
		{"-coverage", "-methods", "bca"}, {"-coverage", "-subs", "1"}, {"-coverage", "-sizes", "1500:40"}} {
		if _, err := parseFlags(args, io.Discard); err == nil {
			t.Errorf("parseFlags(%q) accepted bad input", args)
		}
	}
}

// TestIndependentSample checks the packing: nRef reference rows then nCmp
// comparison rows, the reference rows those of scm.Pooled with the same
// seed, the comparison rows those of scm.Pooled with seed+1.
func TestIndependentSample(t *testing.T) {
	m := scm.Cases()[0].Model
	const nRef, nCmp = 50, 30
	s, mechs, err := independentSample(m, nRef, nCmp, 8)
	if err != nil {
		t.Fatal(err)
	}
	if len(mechs) != len(m.Nodes) || len(s.Labels) != nRef+nCmp {
		t.Fatalf("%d mechanisms for %d nodes, %d records", len(mechs), len(m.Nodes), len(s.Labels))
	}
	ref, _, _ := scm.Pooled(m, nRef, nCmp, 8)
	cmp, _, _ := scm.Pooled(m, nRef, nCmp, 9)
	for r := 0; r < nRef+nCmp; r++ {
		src := ref
		if r >= nRef {
			src = cmp
		}
		if s.Comparison[r] != (r >= nRef) || s.Labels[r] != src.Labels[r] || s.Scores[r] != src.Scores[r] {
			t.Fatalf("row %d: comparison %v, label %v, score %v differ from scm.Pooled", r, s.Comparison[r], s.Labels[r], s.Scores[r])
		}
	}
	if drawSeed(1, 0, 0, 1) == drawSeed(1, 0, 0, 0)+1 {
		t.Error("draw seeds collide with the comparison group's seed")
	}
}
