package main

import (
	"fmt"
	"io"
	"math"
	"strings"
	"time"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/internal/workers"
	"gonum.org/v1/gonum/mat"
)

// coverageCases are the cases of the coverage study when -cases is not
// given: the four non-hard single-shift cases.
var coverageCases = []string{"prevalence", "case-mix", "interaction", "spread-narrow"}

// coverageSize is the records per group of the coverage study when -sizes
// is not given (small, so that draws × bootstrap refits stay fast).
const coverageSize = 800

// coverageLevel is the nominal level of the intervals.
const coverageLevel = 0.95

// Interval methods of the coverage study (-methods).
const (
	methodRefit = "refit" // bootstrap refitting the classifiers in every replicate
	methodFast  = "fast"  // bootstrap keeping the fitted log-ratios
	methodDelta = "delta" // delta-method Wald intervals, fitted log-ratios held fixed
	// methodInfluence: the robust estimator's Wald intervals from its
	// influence function (attribution.EstimatorRobust, Influence).
	methodInfluence = "influence"
	// methodRobustRefit: bootstrap of the robust estimator refitting the
	// classifiers and regressions in every replicate.
	methodRobustRefit = "robust-refit"
	// methodGaps names the bootstrap of the observed gaps alone (-gaps),
	// the same for refit and fast.
	methodGaps = "bootstrap"
)

// groupSizes are the records of the two groups of one row of the study.
type groupSizes struct{ ref, cmp int }

func (g groupSizes) String() string {
	if g.ref == g.cmp {
		return fmt.Sprint(g.ref)
	}
	return fmt.Sprintf("%d:%d", g.ref, g.cmp)
}

// coverageForm is one way of forming intervals from a draw: a method, and
// for the bootstrap methods how the intervals are read off the replicates
// (percentile or normal, see attribution.PercentileInterval and
// attribution.NormalInterval) and from how many of them.
type coverageForm struct {
	method     string
	normal     bool
	replicates int // the first replicates used (0 for delta)
	// score: a rate's observed gap by its score interval
	// (attribution.RateScoreIntervals), the rest as the normal form: what
	// the engine's normal form gives.
	score bool
}

func (f coverageForm) String() string {
	switch f.method {
	case methodDelta:
		return "delta, ratios fixed"
	case methodInfluence:
		return "robust, influence function"
	}
	shape := "percentile"
	switch {
	case f.score:
		shape = "normal+score"
	case f.normal:
		shape = "normal"
	}
	return fmt.Sprintf("%s %s, %d", f.method, shape, f.replicates)
}

// coverageForms lists the forms the options ask for: per bootstrap method
// the percentile and normal intervals of all opt.boot replicates and of
// the first s replicates for every s in opt.subs below opt.boot, then the
// delta intervals.
func coverageForms(opt options) []coverageForm {
	var out []coverageForm
	methods := opt.methods
	if opt.gapsOnly {
		// The observed gaps' intervals are the same in every bootstrap
		// method.
		methods = []string{methodGaps}
	}
	for _, m := range methods {
		if m == methodDelta || m == methodInfluence {
			continue
		}
		counts := []int{opt.boot}
		for _, b := range opt.subs {
			if b < opt.boot {
				counts = append(counts, b)
			}
		}
		for _, b := range counts {
			out = append(out, coverageForm{method: m, replicates: b}, coverageForm{method: m, normal: true, replicates: b},
				coverageForm{method: m, normal: true, score: true, replicates: b})
		}
	}
	for _, m := range opt.methods {
		if (m == methodDelta || m == methodInfluence) && !opt.gapsOnly {
			out = append(out, coverageForm{method: m})
		}
	}
	return out
}

// drawIntervals are one draw's intervals: ivs[f][m][q] for form f, metric
// m and quantity q (0 the gap, 1+i mechanism i's contribution).
type drawIntervals struct {
	ivs        [][][]attribution.Interval
	failedReps int
	err        error
}

// coverageCell is the coverage of every form at one (case, sizes).
type coverageCell struct {
	caseName string
	hard     bool
	size     groupSizes
	nodes    []string // mechanism (node) names, in model order
	forms    []coverageForm
	// hits[f][m][q] counts the draws whose interval of form f for
	// quantity q of metric m contains the ground truth; widths[f][m][q]
	// sums High − Low over them. perDraw[f][d] holds draw d's hits over
	// the gaps (of all metrics) and over the contributions, for the
	// Monte Carlo standard errors clustered by draw.
	hits    [][][]int
	widths  [][][]float64
	perDraw [][][2]int
	draws   int // draws whose decomposition succeeded
	// failedDraws counts draws whose decomposition failed (they are
	// excluded); failedReps counts bootstrap replicates that failed inside
	// the successful draws.
	failedDraws, failedReps int
	seconds                 float64 // wall time of all draws of the cell
}

// tallyCoverage aggregates the draws of one (case, sizes) against the
// ground truth (truth[m] for metric m, in the order of the draws'
// metrics): per form, metric and quantity it counts the intervals with
// Low ≤ truth ≤ High and sums their widths. Failed draws are counted
// apart. It panics if a draw's shape does not match the truth.
func tallyCoverage(caseName string, hard bool, size groupSizes, nodes []string, forms []coverageForm, truth []scm.Truth, draws []drawIntervals) coverageCell {
	c := coverageCell{caseName: caseName, hard: hard, size: size, nodes: nodes, forms: forms,
		hits: make([][][]int, len(forms)), widths: make([][][]float64, len(forms)), perDraw: make([][][2]int, len(forms))}
	for f := range forms {
		c.hits[f] = make([][]int, len(truth))
		c.widths[f] = make([][]float64, len(truth))
		for m := range truth {
			c.hits[f][m] = make([]int, 1+len(nodes))
			c.widths[f][m] = make([]float64, 1+len(nodes))
		}
	}
	for _, d := range draws {
		if d.err != nil || d.ivs == nil {
			c.failedDraws++
			continue
		}
		c.draws++
		c.failedReps += d.failedReps
		if len(d.ivs) != len(forms) {
			panic(fmt.Sprintf("gapwise-accuracy: %d interval forms in a draw, %d asked for", len(d.ivs), len(forms)))
		}
		for f, byMetric := range d.ivs {
			if len(byMetric) != len(truth) {
				panic(fmt.Sprintf("gapwise-accuracy: %d metrics in a draw, %d in the truth", len(byMetric), len(truth)))
			}
			var per [2]int
			for m, ivs := range byMetric {
				if len(ivs) != 1+len(nodes) {
					panic(fmt.Sprintf("gapwise-accuracy: %d intervals for %d mechanisms", len(ivs), len(nodes)))
				}
				want := append([]float64{truth[m].Gap}, truth[m].Shapley...)
				for q, iv := range ivs {
					if iv.Low <= want[q] && want[q] <= iv.High {
						c.hits[f][m][q]++
						per[min(q, 1)]++
					}
					c.widths[f][m][q] += iv.High - iv.Low
				}
			}
			c.perDraw[f] = append(c.perDraw[f], per)
		}
	}
	return c
}

// share returns form f's coverage pooled over all metrics and the
// quantities of kind (0: gaps, 1: contributions, 2: both), its Monte
// Carlo standard error clustered by draw (the standard deviation of the
// per-draw shares over √draws, as the intervals of one draw are
// correlated) and the mean width; NaN when there are none.
func (c *coverageCell) share(f, kind int) (cov, se, width float64) {
	M, k := len(c.hits[f]), len(c.nodes)
	per := [3]int{M, M * k, M * (1 + k)}[kind]
	if c.draws == 0 || per == 0 {
		return math.NaN(), math.NaN(), math.NaN()
	}
	x := make([]float64, len(c.perDraw[f]))
	for d, h := range c.perDraw[f] {
		switch kind {
		case 0, 1:
			x[d] = float64(h[kind]) / float64(per)
		default:
			x[d] = float64(h[0]+h[1]) / float64(per)
		}
	}
	var mean float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var ss float64
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	if len(x) > 1 {
		se = math.Sqrt(ss/float64(len(x)-1)) / math.Sqrt(float64(len(x)))
	}
	for m := range c.widths[f] {
		for q, w := range c.widths[f][m] {
			if kind == 2 || (kind == 0) == (q == 0) {
				width += w
			}
		}
	}
	return mean, se, width / float64(c.draws*per)
}

// lowest returns form f's lowest coverage of a single quantity, which
// metric and quantity it is, and its binomial standard error at the
// nominal level.
func (c *coverageCell) lowest(f int, metricNames []string) (cov float64, where string, se float64) {
	cov = math.Inf(1)
	for m, byQ := range c.hits[f] {
		for q, h := range byQ {
			if v := float64(h) / float64(c.draws); v < cov {
				cov = v
				where = metricNames[m] + " gap"
				if q > 0 {
					where = metricNames[m] + " " + c.nodes[q-1]
				}
			}
		}
	}
	return cov, where, math.Sqrt(coverageLevel * (1 - coverageLevel) / float64(c.draws))
}

// runCoverage measures the coverage of the intervals of every form of
// coverageForms (level 0.95, the first -learners choice): for every
// selected case and pair of group sizes it draws opt.draws independent
// samples (the two groups from different seeds, see independentSample),
// decomposes each with the bootstrap of every method asked for (each
// replicate is kept, so the percentile and normal intervals of all and of
// the first replicates come from the same resamples), and counts how many
// intervals of the gap and of every contribution, per metric, contain the
// simulated ground truth. Draws run in parallel, one result slot each,
// with one goroutine inside each decomposition, so the tables do not
// depend on the number of cores.
func runCoverage(opt options, stdout, stderr io.Writer) error {
	cases, err := selectCases(opt.cases)
	if err != nil {
		return err
	}
	choice, learners, err := firstLearnerSet(opt)
	if err != nil {
		return err
	}
	forms := coverageForms(opt)
	var cells []coverageCell
	for ci, c := range cases {
		truth, err := caseTruth(opt, c)
		if err != nil {
			return err
		}
		nodes := make([]string, len(c.Model.Nodes))
		for i, n := range c.Model.Nodes {
			nodes[i] = n.Name
		}
		if opt.gapsOnly {
			nodes = nil
		}
		for zi, size := range opt.groupSizes() {
			start := time.Now()
			draws := make([]drawIntervals, opt.draws)
			workers.For(0, opt.draws, func(_, d int) {
				seed := drawSeed(opt.seed, ci, zi, d)
				s, mechs, err := independentSample(c.Model, size.ref, size.cmp, seed)
				if err != nil {
					draws[d].err = err
					return
				}
				opt.onScale(s)
				aopt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: seed, Learners: learners, Workers: 1, Reads: c.Model.Reads()}
				if opt.gapsOnly {
					draws[d] = gapIntervals(s, opt, aopt, forms)
					return
				}
				draws[d] = coverageIntervals(s, mechs, opt, aopt, forms)
			})
			cl := tallyCoverage(c.Name, c.Hard, size, nodes, forms, truth, draws)
			cl.seconds = time.Since(start).Seconds()
			for _, d := range draws {
				if d.err != nil {
					fmt.Fprintf(stderr, "%s n=%s: draw failed: %v\n", c.Name, size, d.err)
					break
				}
			}
			for f, form := range forms {
				cov, se, _ := cl.share(f, 2)
				fmt.Fprintf(stderr, "%-15s n=%-9s %-24s coverage %.3f ± %.3f (%.0fs)\n", c.Name, size, form, cov, se, cl.seconds)
			}
			cells = append(cells, cl)
		}
	}
	writeCoverage(stdout, opt, choice, cells)
	return nil
}

// coverageIntervals decomposes one draw with every method the forms use
// and returns the intervals of every form.
func coverageIntervals(s *attribution.Sample, mechs []attribution.Mechanism, opt options, aopt attribution.Options, forms []coverageForm) drawIntervals {
	var out drawIntervals
	point := map[string]*attribution.Decomposition{}
	reps := map[string][][][]float64{} // method → replicate → metric → [gap, contributions...]
	var pointDec *attribution.Decomposition
	for _, method := range opt.methods {
		if method == methodDelta {
			continue
		}
		if method == methodInfluence {
			o := aopt
			o.Estimator = attribution.EstimatorRobust
			dec, err := attribution.Decompose(s, mechs, opt.metrics, o)
			if err != nil {
				return drawIntervals{err: err}
			}
			point[method] = dec
			continue
		}
		bopt := aopt
		if method == methodRobustRefit {
			bopt.Estimator = attribution.EstimatorRobust
		}
		r := make([][][]float64, opt.boot)
		dec, sum, err := attribution.DecomposeWithIntervals(s, mechs, opt.metrics, bopt, attribution.BootstrapOptions{
			Intervals: attribution.Intervals{Replicates: opt.boot, Level: coverageLevel, KeepRatios: method == methodFast},
			Replicate: func(b int, md []attribution.MetricDecomposition) { r[b] = quantities(md) },
		})
		if err != nil {
			return drawIntervals{err: err}
		}
		out.failedReps += sum.Failed
		point[method], reps[method], pointDec = dec, r, dec
	}
	if pointDec == nil {
		dec, err := attribution.Decompose(s, mechs, opt.metrics, aopt)
		if err != nil {
			return drawIntervals{err: err}
		}
		pointDec = dec
	}
	for _, f := range forms {
		if f.method == methodInfluence {
			ivs, err := influenceIntervals(point[f.method])
			if err != nil {
				return drawIntervals{err: err}
			}
			out.ivs = append(out.ivs, ivs)
			continue
		}
		var est [][]float64
		if d := point[f.method]; d != nil {
			est = quantities(d.Metrics)
		}
		ivs, err := formIntervals(f, pointDec, est, reps[f.method], s, opt)
		if err != nil {
			return drawIntervals{err: err}
		}
		out.ivs = append(out.ivs, ivs)
	}
	return out
}

// gapIntervals returns one draw's intervals of the observed gaps alone
// (-gaps), read off attribution.ObservedIntervals' replicates, the same
// resamples the full bootstrap draws for the gap, which needs no
// fitting; the score forms take a rate's gap from
// attribution.RateScoreIntervals.
func gapIntervals(s *attribution.Sample, opt options, aopt attribution.Options, forms []coverageForm) drawIntervals {
	var out drawIntervals
	reps := map[int][][][]float64{} // replicates used → replicate → metric → [gap]
	var point [][]float64
	for _, f := range forms {
		if _, done := reps[f.replicates]; done {
			continue
		}
		r := make([][][]float64, f.replicates)
		md, err := attribution.ObservedIntervals(s, opt.metrics, aopt, attribution.BootstrapOptions{
			Intervals: attribution.Intervals{Replicates: f.replicates, Level: coverageLevel, Form: attribution.FormPercentile},
			Replicate: func(b int, md []attribution.MetricDecomposition) { r[b] = gapsOf(md) },
		})
		if err != nil {
			return drawIntervals{err: err}
		}
		reps[f.replicates], point = r, gapsOf(md)
	}
	for _, f := range forms {
		ivs, err := formIntervals(f, nil, point, reps[f.replicates], s, opt)
		if err != nil {
			return drawIntervals{err: err}
		}
		out.ivs = append(out.ivs, ivs)
	}
	return out
}

// gapsOf returns, per metric, the one-element list of its observed gap.
func gapsOf(md []attribution.MetricDecomposition) [][]float64 {
	out := make([][]float64, len(md))
	for m, d := range md {
		out[m] = []float64{d.Gap}
	}
	return out
}

// quantities returns, per metric, the gap and then the contributions.
func quantities(md []attribution.MetricDecomposition) [][]float64 {
	out := make([][]float64, len(md))
	for m, d := range md {
		out[m] = append([]float64{d.Gap}, d.Contributions...)
	}
	return out
}

// formIntervals returns form f's intervals, per metric and quantity: for
// delta the Wald intervals of the point estimate dec with its
// FixedRatioSE; for the bootstrap methods those read off the first
// f.replicates replicates reps (failed ones left out) around the point
// estimates est (per metric, in the order of reps' quantities), a rate's
// gap (quantity 0) by its score interval on s for the score forms.
func formIntervals(f coverageForm, dec *attribution.Decomposition, est [][]float64, reps [][][]float64, s *attribution.Sample, opt options) ([][]attribution.Interval, error) {
	if f.method == methodDelta {
		out := make([][]attribution.Interval, len(dec.Metrics))
		for m, md := range dec.Metrics {
			se := md.FixedRatioSE
			if se == nil || se.Contributions == nil {
				return nil, fmt.Errorf("metric %s: no delta-method standard errors", md.Metric)
			}
			est := append([]float64{md.Gap}, md.Contributions...)
			sds := append([]float64{se.Gap}, se.Contributions...)
			for q := range est {
				out[m] = append(out[m], attribution.WaldInterval(est[q], sds[q], coverageLevel))
			}
		}
		return out, nil
	}
	var ok [][][]float64
	for _, r := range reps[:f.replicates] {
		if r != nil {
			ok = append(ok, r)
		}
	}
	if len(ok) < 2 {
		return nil, fmt.Errorf("%s: %d replicates computed", f, len(ok))
	}
	out := make([][]attribution.Interval, len(est))
	for m := range est {
		for q := range est[m] {
			if q == 0 && f.score {
				if _, _, gap, isRate := attribution.RateScoreIntervals(s, opt.metrics[m], scm.ScreeningThreshold, coverageLevel); isRate {
					out[m] = append(out[m], gap)
					continue
				}
			}
			x := make([]float64, len(ok))
			for b, r := range ok {
				x[b] = r[m][q]
			}
			if f.normal {
				out[m] = append(out[m], attribution.NormalInterval(est[m][q], x, coverageLevel))
			} else {
				out[m] = append(out[m], attribution.PercentileInterval(x, coverageLevel))
			}
		}
	}
	return out, nil
}

// drawSeed gives draw d of case ci at size index zi its own seed; the
// comparison group uses drawSeed+1 (independentSample), so the low bit is
// kept free.
func drawSeed(base uint64, ci, zi, d int) uint64 {
	return base + uint64(ci)<<40 + uint64(zi)<<32 + uint64(d)<<1
}

// independentSample draws nRef reference records with seed and nCmp
// comparison records with seed+1 and packs them like scm.Pooled
// (reference rows first). scm.Pooled alone uses common random numbers
// across the groups, which makes them dependent, while the bootstrap
// resamples them independently.
func independentSample(m *scm.Model, nRef, nCmp int, seed uint64) (*attribution.Sample, []attribution.Mechanism, error) {
	a, mechs, err := scm.Pooled(m, nRef, 1, seed)
	if err != nil {
		return nil, nil, err
	}
	b, _, err := scm.Pooled(m, 1, nCmp, seed+1)
	if err != nil {
		return nil, nil, err
	}
	_, p := a.X.Dims()
	n := nRef + nCmp
	s := &attribution.Sample{X: mat.NewDense(n, p, nil), Comparison: make([]bool, n), Labels: make([]float64, n), Scores: make([]float64, n),
		ProbabilityCols: a.ProbabilityCols}
	for r := 0; r < nRef; r++ {
		s.X.SetRow(r, a.X.RawRowView(r))
		s.Labels[r], s.Scores[r] = a.Labels[r], a.Scores[r]
	}
	for r := 0; r < nCmp; r++ {
		// Comparison rows 1…nCmp of b (row 0 of b is its single
		// reference record).
		s.X.SetRow(nRef+r, b.X.RawRowView(r+1))
		s.Labels[nRef+r], s.Scores[nRef+r] = b.Labels[r+1], b.Scores[r+1]
		s.Comparison[nRef+r] = true
	}
	return s, mechs, nil
}

// writeCoverage prints the coverage tables: one row per (case, sizes,
// form) pooled over metrics, with Monte Carlo standard errors and the
// lowest coverage of a single quantity; then, per (case, sizes, form),
// the coverage of each metric's gap and of its contributions.
func writeCoverage(w io.Writer, opt options, choice string, cells []coverageCell) {
	fmt.Fprintf(w, "Coverage of %.0f%% intervals (learner %s; metrics %s; %d bootstrap replicates) against simulated ground truth (synthetic screening SCM; %d independent draws per row; ground truth from %d records per hybrid distribution).\n",
		100*coverageLevel, choice, strings.Join(opt.metrics, ", "), opt.boot, opt.draws, opt.truthN)
	fmt.Fprint(w, "Forms: refit = bootstrap refitting the classifiers in every replicate, fast = bootstrap keeping the fitted log-ratios (bootstrap = the observed gaps alone, the same in both), percentile = the 2.5% and 97.5% quantiles of the replicates, normal = estimate ± t(B−1) × bootstrap SE, normal+score = normal but a rate's gap by Newcombe's score interval (the engine's normal form), the number the replicates used; delta = Wald intervals from delta-method SEs with the ratios held fixed. ")
	fmt.Fprintf(w, "n is records per group (reference:comparison when they differ), the groups drawn independently. ± is the Monte Carlo SE of the pooled share, clustered by draw; a single quantity's coverage over %d draws has a binomial SE of about %.3f at the nominal level.\n\n",
		opt.draws, math.Sqrt(coverageLevel*(1-coverageLevel)/float64(opt.draws)))
	fmt.Fprint(w, "| case | n | form | draws | gap | contributions | all | lowest quantity | mean width gap | mean width contributions | failed replicates |\n")
	fmt.Fprint(w, "|---|---|---|---|---|---|---|---|---|---|---|\n")
	for _, c := range cells {
		draws := fmt.Sprint(c.draws)
		if c.failedDraws > 0 {
			draws += fmt.Sprintf(" (%d failed)", c.failedDraws)
		}
		for f, form := range c.forms {
			g, gse, gw := c.share(f, 0)
			k, kse, kw := c.share(f, 1)
			a, ase, _ := c.share(f, 2)
			low, where, _ := c.lowest(f, opt.metrics)
			fmt.Fprintf(w, "| %s | %s | %s | %s | %s | %s | %s | %.3f (%s) | %s | %s | %d |\n", caseLabel(c), c.size, form, draws,
				withSE(g, gse), withSE(k, kse), withSE(a, ase), low, where, fixed4(gw), fixed4(kw), c.failedReps)
		}
	}
	if len(cells) == 0 {
		return
	}
	fmt.Fprint(w, "\nPer metric: the gap's intervals containing the truth out of the draws, and the share of the contributions' intervals that do.\n\n")
	fmt.Fprint(w, "| case | n | form |")
	for _, m := range opt.metrics {
		fmt.Fprintf(w, " %s gap | %s contributions |", m, m)
	}
	fmt.Fprint(w, "\n|---|---|---|")
	for range opt.metrics {
		fmt.Fprint(w, "---|---|")
	}
	fmt.Fprintln(w)
	for _, c := range cells {
		for f, form := range c.forms {
			fmt.Fprintf(w, "| %s | %s | %s |", caseLabel(c), c.size, form)
			for m := range opt.metrics {
				var h int
				for _, x := range c.hits[f][m][1:] {
					h += x
				}
				fmt.Fprintf(w, " %d/%d | %s |", c.hits[f][m][0], c.draws, ratio(h, c.draws*len(c.nodes)))
			}
			fmt.Fprintln(w)
		}
	}
}

// withSE formats a share with its standard error, "–" when undefined.
func withSE(p, se float64) string {
	if math.IsNaN(p) {
		return "–"
	}
	return fmt.Sprintf("%.3f ± %.3f", p, se)
}

// fixed4 formats a width with four decimals, "–" when undefined.
func fixed4(x float64) string {
	if math.IsNaN(x) {
		return "–"
	}
	return fmt.Sprintf("%.4f", x)
}

// ratio formats hits/total as a share with three decimals, "–" when empty.
func ratio(hits, total int) string {
	if total == 0 {
		return "–"
	}
	return fmt.Sprintf("%.3f", float64(hits)/float64(total))
}

// caseLabel is the case name, marked when the case is hard.
func caseLabel(c coverageCell) string {
	if c.hard {
		return c.caseName + " (hard)"
	}
	return c.caseName
}

// influenceIntervals returns, per metric and quantity (the gap, then the
// contributions), the Wald intervals of the robust estimate dec with its
// influence-function standard errors.
func influenceIntervals(dec *attribution.Decomposition) ([][]attribution.Interval, error) {
	out := make([][]attribution.Interval, len(dec.Metrics))
	for m, md := range dec.Metrics {
		se := md.Influence
		if se == nil || md.Estimator != attribution.EstimatorRobust {
			return nil, fmt.Errorf("metric %s: no robust influence-function standard errors", md.Metric)
		}
		est := append([]float64{md.Gap}, md.Contributions...)
		sds := append([]float64{se.Gap}, se.Contributions...)
		for q := range est {
			out[m] = append(out[m], attribution.WaldInterval(est[q], sds[q], coverageLevel))
		}
	}
	return out, nil
}
