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

// coverageLevel is the nominal level of the bootstrap intervals.
const coverageLevel = 0.95

// coverageCell is the interval coverage of one (case, size) combination.
// Quantity q of a metric is the gap for q = 0 and mechanism q−1's
// contribution otherwise.
type coverageCell struct {
	caseName string
	hard     bool
	size     int
	nodes    []string // mechanism (node) names, in model order
	// hits[m][q] counts the draws whose interval of quantity q of metric
	// m contains the ground truth; widths[m][q] sums High − Low over them.
	hits   [][]int
	widths [][]float64
	draws  int // draws whose decomposition succeeded
	// failedDraws counts draws whose DecomposeWithIntervals failed (they
	// are excluded); failedReps counts bootstrap replicates that failed
	// inside the successful draws.
	failedDraws, failedReps int
	seconds                 float64 // wall time of all draws of the cell
}

// coverageDraw is the outcome of one draw: its decomposition with
// intervals and the bootstrap summary, or the error.
type coverageDraw struct {
	dec *attribution.Decomposition
	sum *attribution.BootstrapSummary
	err error
}

// tallyCoverage aggregates the draws of one (case, size) against the
// ground truth (truth[m] for metric m, in the order of the decompositions'
// metrics): for every metric and quantity it counts the intervals
// Low ≤ truth ≤ High and sums their widths. Failed draws are counted apart.
// It panics if a decomposition's shape does not match the truth.
func tallyCoverage(caseName string, hard bool, size int, nodes []string, truth []scm.Truth, draws []coverageDraw) coverageCell {
	c := coverageCell{caseName: caseName, hard: hard, size: size, nodes: nodes,
		hits: make([][]int, len(truth)), widths: make([][]float64, len(truth))}
	for m := range truth {
		c.hits[m] = make([]int, 1+len(nodes))
		c.widths[m] = make([]float64, 1+len(nodes))
	}
	for _, d := range draws {
		if d.err != nil || d.dec == nil {
			c.failedDraws++
			continue
		}
		c.draws++
		if d.sum != nil {
			c.failedReps += d.sum.Failed
		}
		if len(d.dec.Metrics) != len(truth) {
			panic(fmt.Sprintf("gapwise-accuracy: %d metrics decomposed, %d in the truth", len(d.dec.Metrics), len(truth)))
		}
		for m, md := range d.dec.Metrics {
			if len(md.ContributionCIs) != len(nodes) || md.GapCI == nil {
				panic(fmt.Sprintf("gapwise-accuracy: metric %s has %d contribution intervals for %d mechanisms", md.Metric, len(md.ContributionCIs), len(nodes)))
			}
			ivs := append([]attribution.Interval{*md.GapCI}, md.ContributionCIs...)
			want := append([]float64{truth[m].Gap}, truth[m].Shapley...)
			for q, iv := range ivs {
				if iv.Low <= want[q] && want[q] <= iv.High {
					c.hits[m][q]++
				}
				c.widths[m][q] += iv.High - iv.Low
			}
		}
	}
	return c
}

// share returns hits and total over the metrics in ms (nil = all) and the
// quantities selected by useQ, with the summed widths.
func (c *coverageCell) share(ms []int, useQ func(q int) bool) (hits, total int, width float64) {
	if ms == nil {
		for m := range c.hits {
			ms = append(ms, m)
		}
	}
	for _, m := range ms {
		for q, h := range c.hits[m] {
			if useQ(q) {
				hits += h
				total += c.draws
				width += c.widths[m][q]
			}
		}
	}
	return hits, total, width
}

func isGap(q int) bool          { return q == 0 }
func isContribution(q int) bool { return q > 0 }
func anyQuantity(int) bool      { return true }

// ratio formats hits/total as a share with three decimals, "–" when empty.
func ratio(hits, total int) string {
	if total == 0 {
		return "–"
	}
	return fmt.Sprintf("%.3f", float64(hits)/float64(total))
}

// meanWidth formats a summed width over total intervals.
func meanWidth(width float64, total int) string {
	if total == 0 {
		return "–"
	}
	return fmt.Sprintf("%.4f", width/float64(total))
}

// runCoverage measures the coverage of the percentile-bootstrap intervals
// of attribution.DecomposeWithIntervals (full refit, opt.boot replicates,
// level 0.95, the first -learners choice): for every selected case and
// size it draws opt.draws independent samples (the two groups from
// different seeds, see independentSample), decomposes each with intervals,
// and counts how many intervals of the gap and of every contribution, per
// metric, contain the simulated ground truth. Draws run in parallel, one
// result slot each, with one goroutine inside each decomposition, so the
// table does not depend on the number of cores.
func runCoverage(opt options, stdout, stderr io.Writer) error {
	cases, err := selectCases(opt.cases)
	if err != nil {
		return err
	}
	choice, learners, err := firstLearnerSet(opt)
	if err != nil {
		return err
	}
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
		for zi, n := range opt.sizes {
			start := time.Now()
			draws := make([]coverageDraw, opt.draws)
			workers.For(0, opt.draws, func(_, d int) {
				seed := drawSeed(opt.seed, ci, zi, d)
				s, mechs, err := independentSample(c.Model, n, seed)
				opt.onScale(s)
				if err != nil {
					draws[d].err = err
					return
				}
				dec, sum, err := attribution.DecomposeWithIntervals(s, mechs, opt.metrics,
					attribution.Options{Threshold: scm.ScreeningThreshold, Seed: seed, Learners: learners, Workers: 1},
					attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: opt.boot, Level: coverageLevel}})
				draws[d] = coverageDraw{dec: dec, sum: sum, err: err}
			})
			cl := tallyCoverage(c.Name, c.Hard, n, nodes, truth, draws)
			cl.seconds = time.Since(start).Seconds()
			for _, d := range draws {
				if d.err != nil {
					fmt.Fprintf(stderr, "%s n=%d: draw failed: %v\n", c.Name, n, d.err)
					break
				}
			}
			h, t, _ := cl.share(nil, anyQuantity)
			fmt.Fprintf(stderr, "%-13s n=%-6d coverage %s over %d intervals (%.0fs)\n", c.Name, n, ratio(h, t), t, cl.seconds)
			cells = append(cells, cl)
		}
	}
	writeCoverage(stdout, opt, choice, cells)
	return nil
}

// drawSeed gives draw d of case ci at size index zi its own seed; the
// comparison group uses drawSeed+1 (independentSample), so the low bit is
// kept free.
func drawSeed(base uint64, ci, zi, d int) uint64 {
	return base + uint64(ci)<<40 + uint64(zi)<<32 + uint64(d)<<1
}

// independentSample draws n reference records with seed and n comparison
// records with seed+1 and packs them like scm.Pooled (reference rows
// first). scm.Pooled alone uses common random numbers across the groups,
// which makes them dependent, while the bootstrap resamples them
// independently.
func independentSample(m *scm.Model, n int, seed uint64) (*attribution.Sample, []attribution.Mechanism, error) {
	a, mechs, err := scm.Pooled(m, n, 1, seed)
	if err != nil {
		return nil, nil, err
	}
	b, _, err := scm.Pooled(m, 1, n, seed+1)
	if err != nil {
		return nil, nil, err
	}
	_, p := a.X.Dims()
	s := &attribution.Sample{X: mat.NewDense(2*n, p, nil), Comparison: make([]bool, 2*n), Labels: make([]float64, 2*n), Scores: make([]float64, 2*n),
		ProbabilityCols: a.ProbabilityCols}
	for r := 0; r < n; r++ {
		// Reference rows 0…n−1 of a; comparison rows 1…n of b (row 0 of
		// b is its single reference record).
		s.X.SetRow(r, a.X.RawRowView(r))
		s.Labels[r], s.Scores[r] = a.Labels[r], a.Scores[r]
		s.X.SetRow(n+r, b.X.RawRowView(r+1))
		s.Labels[n+r], s.Scores[n+r] = b.Labels[r+1], b.Scores[r+1]
		s.Comparison[n+r] = true
	}
	return s, mechs, nil
}

// writeCoverage prints the coverage tables: one row per (case, size)
// pooled over metrics, then one row per (case, size, metric) with the
// coverage of the gap and of every mechanism's contribution.
func writeCoverage(w io.Writer, opt options, choice string, cells []coverageCell) {
	fmt.Fprintf(w, "Coverage of %.0f%% percentile-bootstrap intervals (full refit, %d replicates; learner %s; metrics %s) against simulated ground truth (synthetic screening SCM; %d independent draws per row; ground truth from %d records per hybrid distribution).\n",
		100*coverageLevel, opt.boot, choice, strings.Join(opt.metrics, ", "), opt.draws, opt.truthN)
	fmt.Fprintf(w, "Coverage is the share of intervals containing the truth; n is records per group, the groups drawn independently. A single quantity's coverage over %d draws has a binomial standard error of about %.3f at the nominal level.\n\n",
		opt.draws, math.Sqrt(coverageLevel*(1-coverageLevel)/float64(opt.draws)))
	fmt.Fprint(w, "| case | n | draws | gap | contributions | all | mean width gap | mean width contributions | failed replicates |\n")
	fmt.Fprint(w, "|---|---|---|---|---|---|---|---|---|\n")
	for _, c := range cells {
		gh, gt, gw := c.share(nil, isGap)
		ch, ct, cw := c.share(nil, isContribution)
		ah, at, _ := c.share(nil, anyQuantity)
		draws := fmt.Sprint(c.draws)
		if c.failedDraws > 0 {
			draws += fmt.Sprintf(" (%d failed)", c.failedDraws)
		}
		fmt.Fprintf(w, "| %s | %d | %s | %s | %s | %s | %s | %s | %d |\n", caseLabel(c), c.size, draws,
			ratio(gh, gt), ratio(ch, ct), ratio(ah, at), meanWidth(gw, gt), meanWidth(cw, ct), c.failedReps)
	}
	if len(cells) == 0 {
		return
	}
	fmt.Fprint(w, "\nPer metric: intervals containing the truth out of the draws, for the gap and each mechanism's contribution.\n\n")
	fmt.Fprint(w, "| case | n | metric | gap |")
	for _, node := range cells[0].nodes {
		fmt.Fprintf(w, " %s |", node)
	}
	fmt.Fprint(w, " mean width gap | mean width contributions |\n|---|---|---|---|")
	for range cells[0].nodes {
		fmt.Fprint(w, "---|")
	}
	fmt.Fprint(w, "---|---|\n")
	for _, c := range cells {
		for m, name := range opt.metrics {
			fmt.Fprintf(w, "| %s | %d | %s |", caseLabel(c), c.size, name)
			for _, h := range c.hits[m] {
				fmt.Fprintf(w, " %d/%d |", h, c.draws)
			}
			_, gt, gw := c.share([]int{m}, isGap)
			_, ct, cw := c.share([]int{m}, isContribution)
			fmt.Fprintf(w, " %s | %s |\n", meanWidth(gw, gt), meanWidth(cw, ct))
		}
	}
}

// caseLabel is the case name, marked when the case is hard.
func caseLabel(c coverageCell) string {
	if c.hard {
		return c.caseName + " (hard)"
	}
	return c.caseName
}
