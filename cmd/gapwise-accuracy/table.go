package main

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/gapwise/gapwise/internal/scm"
)

// writeSummary prints one row per (case, learner) with max and mean
// absolute error of the contributions at each size, pooled over metrics,
// mechanisms and replicates.
func writeSummary(w io.Writer, opt options, cells []cell) {
	fmt.Fprintf(w, "Accuracy of Shapley contributions against simulated ground truth (synthetic screening SCM; metrics %s; %d replicate(s); ground truth from %d records per hybrid distribution).\n",
		strings.Join(opt.metrics, ", "), opt.reps, opt.truthN)
	fmt.Fprintf(w, "Each entry is max / mean |φ̂ − φ| over metrics, mechanisms and replicates; n is records per group.\n\n")
	writeSizeHeader(w, "learner", opt.sizes, "mean \\|residual\\| at largest n", "truth MC SE")
	for i := 0; i < len(cells); i += len(opt.sizes) {
		row := cells[i : i+len(opt.sizes)]
		name := row[0].caseName
		if row[0].hard {
			name += " (hard)"
		}
		fmt.Fprintf(w, "| %s | %s |", name, row[0].label(opt))
		for _, c := range row {
			fmt.Fprintf(w, " %.4f / %.4f |", c.maxAbs(), c.meanAbs())
		}
		last := row[len(row)-1]
		fmt.Fprintf(w, " %.4f | %.5f |\n", last.meanAbsResidual(), last.truthSE)
	}
}

// writeDetail prints, per cell, metric and mechanism, the mean error (bias),
// root mean square error and standard deviation over replicates.
func writeDetail(w io.Writer, opt options, cases []scm.Case, cells []cell) {
	fmt.Fprint(w, "\n| case | learner | n | metric | mechanism | mean err | RMSE | SD |\n|---|---|---|---|---|---|---|---|\n")
	nodes := map[string][]scm.Node{}
	for _, c := range cases {
		nodes[c.Name] = c.Model.Nodes
	}
	for _, c := range cells {
		for m, byMech := range c.errs {
			for i, e := range byMech {
				mean, rms, sd := moments(e)
				fmt.Fprintf(w, "| %s | %s | %d | %s | %s | %+.4f | %.4f | %.4f |\n", c.caseName, c.label(opt), c.size, opt.metrics[m], nodes[c.caseName][i].Name, mean, rms, sd)
			}
			mean, rms, sd := moments(c.residual[m])
			fmt.Fprintf(w, "| %s | %s | %d | %s | (residual) | %+.4f | %.4f | %.4f |\n", c.caseName, c.label(opt), c.size, opt.metrics[m], mean, rms, sd)
		}
	}
}

// moments returns the mean, root mean square and sample standard deviation
// (n−1; NaN for a single value) of e.
func moments(e []float64) (mean, rms, sd float64) {
	var ms float64
	for _, x := range e {
		mean += x / float64(len(e))
		ms += x * x / float64(len(e))
	}
	sd = math.NaN()
	if len(e) > 1 {
		sd = math.Sqrt(math.Max(0, ms-mean*mean) * float64(len(e)) / float64(len(e)-1))
	}
	return mean, math.Sqrt(ms), sd
}

// writeTruth prints each case's simulated gap and Shapley values with their
// largest Monte Carlo standard error.
// A new table starts wherever a case's nodes differ from the previous
// case's.
func writeTruth(w io.Writer, opt options, cases []scm.Case, truths [][]scm.Truth) {
	fmt.Fprint(w, "\nGround truth (simulated, common random numbers; φ per mechanism):\n")
	var header string
	for ci, c := range cases {
		if h := truthHeader(c.Model.Nodes); h != header {
			header = h
			fmt.Fprint(w, "\n"+h)
		}
		for _, t := range truths[ci] {
			fmt.Fprintf(w, "| %s | %s | %+.4f |", c.Name, t.Metric, t.Gap)
			se := t.GapSE
			for i, phi := range t.Shapley {
				fmt.Fprintf(w, " %+.4f |", phi)
				se = math.Max(se, t.SE[i])
			}
			fmt.Fprintf(w, " %.5f |\n", se)
		}
	}
}

// truthHeader is the header of a ground-truth table over nodes.
func truthHeader(nodes []scm.Node) string {
	var b strings.Builder
	b.WriteString("| case | metric | gap |")
	for _, n := range nodes {
		fmt.Fprintf(&b, " %s |", n.Name)
	}
	b.WriteString(" max MC SE |\n|---|---|---|")
	for range nodes {
		b.WriteString("---|")
	}
	b.WriteString("---|\n")
	return b.String()
}

// writeSizeHeader writes a Markdown table header: case, the second column,
// one column per size, then the extra columns, and the separator line.
func writeSizeHeader(w io.Writer, second string, sizes []int, extra ...string) {
	fmt.Fprintf(w, "| case | %s |", second)
	for _, n := range sizes {
		fmt.Fprintf(w, " n = %d |", n)
	}
	for _, e := range extra {
		fmt.Fprintf(w, " %s |", e)
	}
	fmt.Fprint(w, "\n|---|---|")
	for range len(sizes) + len(extra) {
		fmt.Fprint(w, "---|")
	}
	fmt.Fprint(w, "\n")
}

// label names a cell's learner, and its estimator when the study compares
// several.
func (c *cell) label(opt options) string {
	if len(opt.estimators) > 1 {
		return c.learner + ", " + c.estimator.String()
	}
	return c.learner
}

// writeEstimators prints, per learner and size, a column per estimator:
// max / mean / null-mechanism |φ̂ − φ| pooled over the cases that are not
// hard, and in how many cases each estimator had the smaller max and the
// smaller mean error.
func writeEstimators(w io.Writer, opt options, cells []cell) {
	fmt.Fprintf(w, "\nEstimators compared, pooled over the cases that are not hard: max / mean / null-mechanism |φ̂ − φ|, and the cases (of those) where the estimator has the smaller max / mean error.\n\n| learner | n |")
	for _, e := range opt.estimators {
		fmt.Fprintf(w, " %s | %s wins (max / mean) |", e, e)
	}
	fmt.Fprint(w, "\n|---|---|")
	for range opt.estimators {
		fmt.Fprint(w, "---|---|")
	}
	fmt.Fprint(w, "\n")
	for _, choice := range opt.learners {
		for _, n := range opt.sizes {
			byCase := map[string]map[valueEstimator]*cell{}
			var order []string
			pooled := map[valueEstimator][]cell{}
			for i := range cells {
				c := &cells[i]
				if c.learner != choice || c.size != n || c.hard {
					continue
				}
				if byCase[c.caseName] == nil {
					byCase[c.caseName] = map[valueEstimator]*cell{}
					order = append(order, c.caseName)
				}
				byCase[c.caseName][c.estimator] = c
				pooled[c.estimator] = append(pooled[c.estimator], *c)
			}
			fmt.Fprintf(w, "| %s | %d |", choice, n)
			for _, e := range opt.estimators {
				if len(pooled[e]) == 0 {
					fmt.Fprint(w, " – | – |")
					continue
				}
				mx, mean, null := poolCells(pooled[e])
				winsMax, winsMean := 0, 0
				for _, name := range order {
					mine := byCase[name][e]
					bestMax, bestMean := true, true
					for _, o := range opt.estimators {
						other := byCase[name][o]
						if o == e || other == nil {
							continue
						}
						bestMax = bestMax && mine.maxAbs() < other.maxAbs()
						bestMean = bestMean && mine.meanAbs() < other.meanAbs()
					}
					if bestMax {
						winsMax++
					}
					if bestMean {
						winsMean++
					}
				}
				fmt.Fprintf(w, " %.4f / %.4f / %.4f | %d / %d of %d |", mx, mean, null, winsMax, winsMean, len(order))
			}
			fmt.Fprint(w, "\n")
		}
	}
}
