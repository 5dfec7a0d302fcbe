package main

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"time"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/internal/workers"
)

// splitsCases and splitsSize are the cases and records per group of the
// -splits study when -cases and -sizes are not given: the strict
// single-shift cases and the combined one, at the size of a small cohort.
var splitsCases = []string{"interaction", "prevalence", "case-mix", "combined"}

const splitsSize = 200

// splitsCell is the seed stability of one (case, size, R): the
// contributions of every seed and the bootstrap half-widths they are
// judged against.
type splitsCell struct {
	caseName string
	nodes    []string // mechanism (node) names, in model order
	size, R  int
	// phi[s][m][i] is the contribution of mechanism i to metric m with
	// seed s (mean over the R splits); med[s][m][i] the median over the
	// splits instead (nil for R = 1).
	phi, med [][][]float64
	// halfWidth[m][i] is half the width of the bootstrap interval with
	// the study's seed.
	halfWidth [][]float64
	truth     []scm.Truth
	seconds   float64 // mean Decompose wall time on one goroutine
}

// runSplits measures how much the contributions depend on the seed (the
// fold split) with R fold splits, for each -fold-splits value (0: the
// default for the size): per case and size it draws one sample, computes
// bootstrap intervals (full refit, -boot replicates, seed -seed), then
// decomposes the same sample with -seeds different seeds. It reports, per
// R, the largest and mean ratio of the seeds' range of a contribution to
// its interval's half-width, the contributions whose range reaches the
// half-width, the RMSE against ground truth over seeds and contributions,
// for R > 1 the same for the median over the splits, and the time per
// Decompose. Seeds run in parallel, one goroutine inside each.
func runSplits(opt options, stdout, stderr io.Writer) error {
	cases, err := selectCases(opt.cases)
	if err != nil {
		return err
	}
	choice, learners, err := firstLearnerSet(opt)
	if err != nil {
		return err
	}
	var cells []splitsCell
	for _, c := range cases {
		truth, err := caseTruth(opt, c)
		if err != nil {
			return err
		}
		for _, n := range opt.sizes {
			s, mechs, err := scm.Pooled(c.Model, n, n, opt.seed)
			if err != nil {
				return err
			}
			opt.onScale(s)
			for _, R := range opt.foldSplits {
				if R == 0 {
					R = attribution.DefaultFoldSplits(n, n)
				}
				aopt := attribution.Options{Threshold: scm.ScreeningThreshold, Seed: opt.seed, Learners: learners, FoldSplits: R}
				cl, err := splitsRun(s, mechs, opt, aopt)
				if err != nil {
					return fmt.Errorf("case %s, n %d, %d splits: %w", c.Name, n, R, err)
				}
				cl.caseName, cl.size, cl.truth, cl.nodes = c.Name, n, truth, nodeNames(c.Model)
				mx, _, _ := cl.spread(cl.phi)
				fmt.Fprintf(stderr, "%-13s n=%-6d R=%-3d max range/half-width %.2f, RMSE %.4f (%.2fs per Decompose)\n", c.Name, n, R, mx, cl.rmse(cl.phi), cl.seconds)
				cells = append(cells, cl)
			}
		}
	}
	writeSplits(stdout, opt, choice, cells)
	return nil
}

// splitsRun computes one cell: the bootstrap half-widths with aopt, then
// the contributions of opt.seeds seeds aopt.Seed, aopt.Seed+1, ….
func splitsRun(s *attribution.Sample, mechs []attribution.Mechanism, opt options, aopt attribution.Options) (splitsCell, error) {
	cl := splitsCell{R: aopt.FoldSplits}
	d, _, err := attribution.DecomposeWithIntervals(s, mechs, opt.metrics, aopt, attribution.BootstrapOptions{Intervals: attribution.Intervals{Replicates: opt.boot}})
	if err != nil {
		return cl, err
	}
	for _, md := range d.Metrics {
		hw := make([]float64, len(md.ContributionCIs))
		for i, iv := range md.ContributionCIs {
			hw[i] = (iv.High - iv.Low) / 2
		}
		cl.halfWidth = append(cl.halfWidth, hw)
	}
	cl.phi = make([][][]float64, opt.seeds)
	cl.med = make([][][]float64, opt.seeds)
	errs := make([]error, opt.seeds)
	secs := make([]float64, opt.seeds)
	workers.For(0, opt.seeds, func(_, k int) {
		o := aopt
		o.Seed, o.Workers = aopt.Seed+uint64(k), 1
		start := time.Now()
		d, err := attribution.Decompose(s, mechs, opt.metrics, o)
		secs[k] = time.Since(start).Seconds()
		if errs[k] = err; err != nil {
			return
		}
		for _, md := range d.Metrics {
			cl.phi[k] = append(cl.phi[k], md.Contributions)
			if md.SplitContributions != nil {
				cl.med[k] = append(cl.med[k], splitMedians(md.SplitContributions))
			}
		}
	})
	for k, err := range errs {
		if err != nil {
			return cl, err
		}
		cl.seconds += secs[k] / float64(opt.seeds)
	}
	if cl.R == 1 {
		cl.med = nil
	}
	return cl, nil
}

// nodeNames lists the model's node names in order.
func nodeNames(m *scm.Model) []string {
	out := make([]string, len(m.Nodes))
	for i, n := range m.Nodes {
		out[i] = n.Name
	}
	return out
}

// splitMedians returns, per mechanism, the median over the splits of
// x[r][i].
func splitMedians(x [][]float64) []float64 {
	out := make([]float64, len(x[0]))
	col := make([]float64, len(x))
	for i := range out {
		for r := range x {
			col[r] = x[r][i]
		}
		sort.Float64s(col)
		h := len(col) / 2
		out[i] = col[h]
		if len(col)%2 == 0 {
			out[i] = (col[h-1] + col[h]) / 2
		}
	}
	return out
}

// spread returns the largest and the mean over metrics and mechanisms of
// (max_s φ − min_s φ) / half-width, and how many reach 1.
func (c *splitsCell) spread(phi [][][]float64) (mx, mean float64, atLeastOne int) {
	mx, mean, atLeastOne, _, _ = c.spreadAt(phi)
	return
}

// spreadAt is spread that also returns the metric m and mechanism i of the
// largest ratio.
func (c *splitsCell) spreadAt(phi [][][]float64) (mx, mean float64, atLeastOne, worstM, worstI int) {
	var cnt int
	for m, hw := range c.halfWidth {
		for i := range hw {
			lo, hi := math.Inf(1), math.Inf(-1)
			for _, p := range phi {
				lo, hi = math.Min(lo, p[m][i]), math.Max(hi, p[m][i])
			}
			r := (hi - lo) / hw[i]
			if r > mx {
				mx, worstM, worstI = r, m, i
			}
			mean += r
			cnt++
			if r >= 1 {
				atLeastOne++
			}
		}
	}
	return mx, mean / float64(cnt), atLeastOne, worstM, worstI
}

// rmse is the root-mean-square error of phi against the ground truth over
// seeds, metrics and mechanisms.
func (c *splitsCell) rmse(phi [][][]float64) float64 {
	var ss float64
	var cnt int
	for _, p := range phi {
		for m, byMech := range p {
			for i, x := range byMech {
				e := x - c.truth[m].Shapley[i]
				ss += e * e
				cnt++
			}
		}
	}
	return math.Sqrt(ss / float64(cnt))
}

// writeSplits prints the seed-stability table of runSplits.
func writeSplits(w io.Writer, opt options, choice string, cells []splitsCell) {
	fmt.Fprintf(w, "Seed stability of Shapley contributions with R fold splits (synthetic screening SCM; learner %s; metrics %s; %d seeds per row; intervals: 95%% percentile bootstrap, full refit, %d replicates; ground truth from %d records per hybrid distribution).\n",
		choice, strings.Join(opt.metrics, ", "), opt.seeds, opt.boot, opt.truthN)
	fmt.Fprint(w, "range/hw is a contribution's range over the seeds divided by half the width of its interval (max and mean over metrics and mechanisms; ≥ 1 counts those reaching 1); RMSE is against ground truth over seeds, metrics and mechanisms; mean aggregates the splits by their mean (what Decompose reports), median by their median.\n\n")
	fmt.Fprint(w, "| case | n | R | range/hw max | at (metric, node) | range/hw mean | ≥ 1 | RMSE | median: range/hw max | median: RMSE | s per Decompose |\n")
	fmt.Fprint(w, "|---|---|---|---|---|---|---|---|---|---|---|\n")
	for _, c := range cells {
		mx, mean, n1, wm, wi := c.spreadAt(c.phi)
		medMax, medRMSE := "–", "–"
		if c.med != nil {
			m, _, _ := c.spread(c.med)
			medMax, medRMSE = fmt.Sprintf("%.2f", m), fmt.Sprintf("%.4f", c.rmse(c.med))
		}
		fmt.Fprintf(w, "| %s | %d | %d | %.2f | %s, %s | %.2f | %d | %.4f | %s | %s | %.2f |\n", c.caseName, c.size, c.R, mx, opt.metrics[wm], c.nodes[wi], mean, n1, c.rmse(c.phi), medMax, medRMSE, c.seconds)
	}
}
