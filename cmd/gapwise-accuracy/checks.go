package main

import (
	"fmt"
	"io"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/mat"
)

// checkSetup is one row of the checks study: a case, a learner choice and
// optionally a node whose mechanism is left out of the graph.
type checkSetup struct {
	kind     string // clean, broken learner, misspecified learner, input left out
	caseName string
	learner  string // a learnerSet choice or overconfidentName
	drop     string // node left out of the graph, or ""
}

// broken reports whether a working check should flag the setup.
func (c checkSetup) broken() bool {
	return c.kind == "broken learner" || c.kind == "input left out"
}

func (c checkSetup) label() string {
	l := c.caseName + ", " + c.learner
	if c.drop != "" {
		l += ", without " + c.drop
	}
	return l
}

// checkSetups lists the setups: every non-hard case with the expanded
// learner (clean) and the hard one apart; a degenerate learner; the linear
// learner where the log-ratios have an interaction or a quadratic term
// (misspecified); and a model input left out of the graph.
func checkSetups() []checkSetup {
	var out []checkSetup
	for _, c := range scm.Cases() {
		kind := "clean"
		if c.Hard {
			kind = "clean (hard)"
		}
		out = append(out, checkSetup{kind: kind, caseName: c.Name, learner: classify.NameExpanded})
	}
	for _, name := range []string{"prevalence", "case-mix", "interaction", "combined"} {
		out = append(out, checkSetup{kind: "broken learner", caseName: name, learner: overconfidentName})
	}
	for _, name := range []string{"interaction", "spread-narrow", "combined"} {
		out = append(out, checkSetup{kind: "misspecified learner", caseName: name, learner: classify.NameLinear})
	}
	for _, s := range []struct{ c, drop string }{{"spread-narrow", "marker_b"}, {"interaction", "marker_a"}, {"combined", "marker_b"}} {
		out = append(out, checkSetup{kind: "input left out", caseName: s.c, learner: classify.NameExpanded, drop: s.drop})
	}
	return out
}

// checksSize is the records per group of the checks study when -sizes is
// not given.
const checksSize = 2000

// checkDraw is the outcome of one draw of a setup.
type checkDraw struct {
	kinds  []fairness.WarningKind // distinct kinds of warning that fired
	maxZ   float64                // largest SideAgreement.MaxZ over metrics
	estZ   float64                // largest EstimatorCheck.MaxZ over metrics (−Inf without one)
	maxErr float64                // max |φ̂ − φ| over metrics and kept mechanisms
	null   float64                // max |φ̂| over the null mechanisms kept
	resid  float64                // max |residual| over metrics
	err    error
}

// checkKinds are the warning kinds the checks table has a column for, in
// that order; the others are pooled in "other".
var checkKinds = []fairness.WarningKind{fairness.KindSidesDisagree, fairness.KindEstimatorsDisagree, fairness.KindLargeResidual,
	fairness.KindMeanRatioOff, fairness.KindStratumRatioOff, fairness.KindLowEffectiveRecords, fairness.KindHeavyTail, fairness.KindMetricRecords}

// runChecks measures how often each warning fires on clean draws (false
// alarms) and on broken setups (detections), with the estimate's error
// against the simulated ground truth: for every setup and size, opt.draws
// independent draws (independentSample), each decomposed with the default
// side and mix and checked with fairness.WarningsOf. Draws run in
// parallel, one slot each, one goroutine inside each decomposition.
func runChecks(opt options, stdout, stderr io.Writer) error {
	setups := checkSetups()
	if len(opt.cases) > 0 {
		setups = slices.DeleteFunc(setups, func(c checkSetup) bool { return !slices.Contains(opt.cases, c.caseName) })
	}
	truths := map[string][]scm.Truth{}
	var rows []checkRow
	for si, su := range setups {
		cs, err := selectCases([]string{su.caseName})
		if err != nil {
			return err
		}
		c := cs[0]
		if truths[c.Name] == nil {
			if truths[c.Name], err = caseTruth(opt, c); err != nil {
				return err
			}
		}
		learners, err := checkLearners(su.learner)
		if err != nil {
			return err
		}
		for zi, n := range opt.sizes {
			draws := make([]checkDraw, opt.draws)
			workers.For(0, opt.draws, func(_, d int) {
				draws[d] = checkOne(opt, c, su, truths[c.Name], learners, n, drawSeed(opt.seed, si, zi, d))
			})
			row := checkRow{setup: su, size: n, draws: draws}
			fmt.Fprintf(stderr, "%-22s %-40s n=%-6d %s\n", su.kind, su.label(), n, row.summary())
			rows = append(rows, row)
		}
	}
	writeChecks(stdout, opt, rows)
	return nil
}

// checkLearners is learnerSet with the study's broken learner.
func checkLearners(choice string) ([]classify.Learner, error) {
	if choice == overconfidentName {
		return []classify.Learner{overconfident{base: classify.NewLinear(), factor: overconfidence}}, nil
	}
	return learnerSet(choice)
}

// checkOne decomposes one draw of a setup and runs the checks.
func checkOne(opt options, c scm.Case, su checkSetup, truth []scm.Truth, learners []classify.Learner, n int, seed uint64) checkDraw {
	s, mechs, err := independentSample(c.Model, n, n, seed)
	if err != nil {
		return checkDraw{err: err}
	}
	opt.onScale(s)
	keep := make([]int, 0, len(mechs))
	for i, m := range mechs {
		if m.Node != su.drop {
			keep = append(keep, i)
		}
	}
	kept := make([]attribution.Mechanism, len(keep))
	for a, i := range keep {
		kept[a] = mechs[i]
	}
	aopt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: seed, Learners: learners, Workers: 1, Mix: opt.mix, Reads: keptReads(c.Model.Reads(), keep)}
	d, err := attribution.Decompose(s, kept, opt.metrics, opt.firstEstimator().apply(aopt))
	if err != nil {
		return checkDraw{err: err}
	}
	out := checkDraw{maxZ: math.Inf(-1), estZ: math.Inf(-1)}
	for _, w := range fairness.WarningsOf(d, n, n) {
		if !slices.Contains(out.kinds, w.Kind) {
			out.kinds = append(out.kinds, w.Kind)
		}
	}
	for m, md := range d.Metrics {
		if a := md.Agreement; a != nil && !math.IsNaN(a.MaxZ) {
			out.maxZ = math.Max(out.maxZ, a.MaxZ)
		}
		if ck := md.CrossCheck; ck != nil && !math.IsNaN(ck.MaxZ) {
			out.estZ = math.Max(out.estZ, ck.MaxZ)
		}
		out.resid = math.Max(out.resid, math.Abs(md.Residual))
		for a, i := range keep {
			out.maxErr = math.Max(out.maxErr, math.Abs(md.Contributions[a]-truth[m].Shapley[i]))
			if slices.Contains(c.Null, i) {
				out.null = math.Max(out.null, math.Abs(md.Contributions[a]))
			}
		}
	}
	return out
}

// checkRow holds the draws of one (setup, size).
type checkRow struct {
	setup checkSetup
	size  int
	draws []checkDraw
}

// ok returns the draws that succeeded and the number that failed.
func (r checkRow) ok() ([]checkDraw, int) {
	var out []checkDraw
	for _, d := range r.draws {
		if d.err == nil {
			out = append(out, d)
		}
	}
	return out, len(r.draws) - len(out)
}

// fired returns the share of successful draws where kind fired ("" means
// any kind, "other" any kind without a column).
func (r checkRow) fired(kind fairness.WarningKind) string {
	ds, _ := r.ok()
	if len(ds) == 0 {
		return "–"
	}
	var hits int
	for _, d := range ds {
		switch kind {
		case "":
			hits += pick(len(d.kinds) > 0)
		case "other":
			hits += pick(slices.ContainsFunc(d.kinds, func(k fairness.WarningKind) bool { return !slices.Contains(checkKinds, k) }))
		default:
			hits += pick(slices.Contains(d.kinds, kind))
		}
	}
	return fmt.Sprintf("%d/%d", hits, len(ds))
}

func pick(b bool) int {
	if b {
		return 1
	}
	return 0
}

// quantiles returns the q-quantiles (nearest rank) of f over the
// successful draws.
func (r checkRow) quantiles(f func(checkDraw) float64, qs ...float64) []float64 {
	ds, _ := r.ok()
	var x []float64
	for _, d := range ds {
		x = append(x, f(d))
	}
	sort.Float64s(x)
	out := make([]float64, len(qs))
	for i, q := range qs {
		out[i] = math.NaN()
		if len(x) > 0 {
			out[i] = x[min(len(x)-1, int(math.Ceil(q*float64(len(x))))-1+pick(q == 0))]
		}
	}
	return out
}

func (r checkRow) summary() string {
	z := r.quantiles(func(d checkDraw) float64 { return d.maxZ }, 0.5, 0.95)
	_, failed := r.ok()
	ez := r.quantiles(func(d checkDraw) float64 { return d.estZ }, 0.5, 0.95)
	return fmt.Sprintf("sides_disagree %s, estimators_disagree %s, large_residual %s, median max z %.2f, 95%% %.2f, estimators z %.2f / %.2f, failed %d", r.fired(fairness.KindSidesDisagree), r.fired(fairness.KindEstimatorsDisagree), r.fired(fairness.KindLargeResidual), z[0], z[1], ez[0], ez[1], failed)
}

// writeChecks prints the checks table and the distribution of the largest
// disagreement z per draw.
func writeChecks(w io.Writer, opt options, rows []checkRow) {
	fmt.Fprintf(w, "How often each warning fires (draws with the warning / draws) on clean and broken setups of the synthetic screening SCM (independent draws per row; side %s, mix %s; metrics %s; warning thresholds of package fairness: sides_disagree above %g standard errors).\n",
		attribution.DefaultSide, opt.mix.String(), strings.Join(opt.metrics, ", "), fairness.WarnSidesZ)
	fmt.Fprint(w, "On clean setups a warning is a false alarm; on broken learners and inputs left out it is a detection. max err is the largest |φ̂ − φ| over metrics and mechanisms kept, null err the largest |φ̂| of a mechanism whose true contribution is 0 (medians over draws); z is the largest |difference|/SE between the sides over metrics.\n\n")
	fmt.Fprint(w, "| setup | case, learner | n | draws |")
	for _, k := range checkKinds {
		fmt.Fprintf(w, " %s |", k)
	}
	fmt.Fprint(w, " other | any | median max err | median null err | median \\|residual\\| | z median / 95% / max |\n|---|---|---|---|")
	for range len(checkKinds) + 6 {
		fmt.Fprint(w, "---|")
	}
	fmt.Fprint(w, "\n")
	for _, r := range rows {
		ds, failed := r.ok()
		draws := fmt.Sprint(len(ds))
		if failed > 0 {
			draws += fmt.Sprintf(" (%d failed)", failed)
		}
		fmt.Fprintf(w, "| %s | %s | %d | %s |", r.setup.kind, r.setup.label(), r.size, draws)
		for _, k := range checkKinds {
			fmt.Fprintf(w, " %s |", r.fired(k))
		}
		errs := r.quantiles(func(d checkDraw) float64 { return d.maxErr }, 0.5)
		nulls := r.quantiles(func(d checkDraw) float64 { return d.null }, 0.5)
		res := r.quantiles(func(d checkDraw) float64 { return d.resid }, 0.5)
		z := r.quantiles(func(d checkDraw) float64 { return d.maxZ }, 0.5, 0.95, 1)
		fmt.Fprintf(w, " %s | %s | %.4f | %.4f | %.4f | %.1f / %.1f / %.1f |\n", r.fired("other"), r.fired(""), errs[0], nulls[0], res[0], z[0], z[1], z[2])
	}
	writeZCalibration(w, opt, rows, "the sides", func(d checkDraw) float64 { return d.maxZ })
	if opt.firstEstimator().est != attribution.EstimatorWeighting {
		writeZCalibration(w, opt, rows, "the robust and the weighting estimates", func(d checkDraw) float64 { return d.estZ })
	}
}

// keptReads maps the nodes the label and score read (mechanism indices of
// the full model) to those of the mechanisms kept (keep[a] = full index):
// the score's reads become unknown (nil) when a node it reads was left
// out, as fairness does for a model input outside the graph.
func keptReads(r attribution.NodeReads, keep []int) attribution.NodeReads {
	at := map[int]int{}
	for a, i := range keep {
		at[i] = a
	}
	mapAll := func(xs []int) ([]int, bool) {
		if xs == nil {
			return nil, true
		}
		var out []int
		for _, i := range xs {
			a, ok := at[i]
			if !ok {
				return nil, false
			}
			out = append(out, a)
		}
		return out, true
	}
	var out attribution.NodeReads
	out.Label, _ = mapAll(r.Label)
	if s, ok := mapAll(r.Score); ok {
		out.Score = s
	}
	return out
}

// zThresholds are the candidate thresholds of the sides_disagree check
// whose firing rates writeZCalibration prints.
var zThresholds = []float64{3, 3.5, 4, 5, 6, 8}

// writeZCalibration prints, per kind of setup and size, the share of draws
// whose largest disagreement z exceeds each candidate threshold: the false
// alarm rate on clean setups, the detection rate on broken ones.
func writeZCalibration(w io.Writer, opt options, rows []checkRow, between string, zOf func(checkDraw) float64) {
	fmt.Fprintf(w, "\nShare of draws whose largest |difference|/SE between %s exceeds a threshold, pooled over the setups of a kind.\n\n| setup | n | draws |", between)
	for _, t := range zThresholds {
		fmt.Fprintf(w, " z > %g |", t)
	}
	fmt.Fprint(w, "\n|---|---|---|")
	for range zThresholds {
		fmt.Fprint(w, "---|")
	}
	fmt.Fprint(w, "\n")
	var kinds []string
	for _, r := range rows {
		if !slices.Contains(kinds, r.setup.kind) {
			kinds = append(kinds, r.setup.kind)
		}
	}
	for _, kind := range kinds {
		for _, n := range opt.sizes {
			var z []float64
			for _, r := range rows {
				if r.setup.kind == kind && r.size == n {
					ds, _ := r.ok()
					for _, d := range ds {
						z = append(z, zOf(d))
					}
				}
			}
			fmt.Fprintf(w, "| %s | %d | %d |", kind, n, len(z))
			for _, t := range zThresholds {
				var hits int
				for _, x := range z {
					hits += pick(x > t)
				}
				fmt.Fprintf(w, " %s |", ratio(hits, len(z)))
			}
			fmt.Fprint(w, "\n")
		}
	}
}

// overconfidentName names the checks study's broken learner.
const overconfidentName = "overconfident"

// overconfidence is the factor the broken learner multiplies the linear
// learner's log-odds by.
const overconfidence = 8

// overconfident is a deliberately broken learner for the checks study:
// the base learner's log-odds times factor, as a badly overfitted or
// miscalibrated classifier gives. Its density ratios are r^factor, far
// too extreme, and the weights collapse onto a few records.
type overconfident struct {
	base   classify.Learner
	factor float64
}

func (o overconfident) Name() string { return overconfidentName }

func (o overconfident) Fit(x *mat.Dense, y, w []float64, seed uint64) (classify.Model, error) {
	m, err := o.base.Fit(x, y, w, seed)
	if err != nil {
		return nil, err
	}
	return scaledModel{m, o.factor}, nil
}

// scaledModel multiplies a fitted model's log-odds by f.
type scaledModel struct {
	m classify.Model
	f float64
}

func (s scaledModel) LogOdds(x *mat.Dense, dst []float64) {
	s.m.LogOdds(x, dst)
	for i := range dst {
		dst[i] *= s.f
	}
}
