package main

import (
	"fmt"
	"io"
	"math"
	"strings"
	"time"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/internal/scm"
)

// estimator is one way of estimating the hybrid metrics: a side and, for
// both sides, how their games are combined.
type estimator struct {
	side attribution.Side
	mix  attribution.Mix // for SideBoth
}

func (e estimator) String() string {
	if e.side == attribution.SideBoth {
		return "both/" + e.mix.String()
	}
	return e.side.String()
}

// studyEstimators lists the estimators compared by runSides: each side
// alone, then both sides under every Mix.
func studyEstimators() []estimator {
	out := []estimator{{side: attribution.SideReference}, {side: attribution.SideComparison}}
	for _, x := range attribution.Mixes() {
		out = append(out, estimator{side: attribution.SideBoth, mix: x})
	}
	return out
}

// runSides compares the estimators (attribution.Options.Side and Mix)
// against the simulated ground truth: for every case, learner choice, size
// and replicate it draws one sample and decomposes it once per estimator
// with the same seed (so the fitted ratios are identical and only the
// estimator differs). It writes one row per (case, learner, estimator)
// with max / mean |φ̂ − φ| and the null-mechanism error (largest |φ̂| of a
// mechanism whose true contribution is 0, scm.Case.Null) per size, and an
// overall row per (learner, estimator) pooled over cases.
func runSides(opt options, stdout, stderr io.Writer) error {
	cases, err := selectCases(opt.cases)
	if err != nil {
		return err
	}
	ests := studyEstimators()
	// cells[c][l][e][z]: case c, learner l, estimator e, size z.
	cells := make([][][][]cell, len(cases))
	for ci, c := range cases {
		truth, err := caseTruth(opt, c)
		if err != nil {
			return err
		}
		cells[ci] = make([][][]cell, len(opt.learners))
		for li, choice := range opt.learners {
			if cells[ci][li], err = sidesCase(opt, ci, c, truth, choice, ests, stderr); err != nil {
				return err
			}
		}
	}
	writeSides(stdout, opt, ests, cells)
	return nil
}

// sidesCase runs one case and learner choice for runSides:
// out[e][z] for estimator e and size z.
func sidesCase(opt options, ci int, c scm.Case, truth []scm.Truth, choice string, ests []estimator, stderr io.Writer) ([][]cell, error) {
	learners, err := learnerSet(choice)
	if err != nil {
		return nil, err
	}
	out := make([][]cell, len(ests))
	for ei, est := range ests {
		for _, n := range opt.sizes {
			cl := cell{caseName: c.Name, learner: choice + " " + est.String(), size: n, hard: c.Hard, null: c.Null,
				errs: make([][][]float64, len(opt.metrics)), residual: make([][]float64, len(opt.metrics))}
			for m := range cl.errs {
				cl.errs[m] = make([][]float64, len(c.Model.Nodes))
			}
			out[ei] = append(out[ei], cl)
		}
	}
	for zi, n := range opt.sizes {
		for r := 0; r < opt.reps; r++ {
			seed := opt.seed + uint64(1000*ci+r)
			s, mechs, err := scm.Pooled(c.Model, n, n, seed)
			if err != nil {
				return nil, err
			}
			opt.onScale(s)
			for ei, est := range ests {
				start := time.Now()
				d, err := attribution.Decompose(s, mechs, opt.metrics, attribution.Options{Threshold: scm.ScreeningThreshold, Seed: seed, Learners: learners, Side: est.side, Mix: est.mix})
				if err != nil {
					return nil, fmt.Errorf("case %s, learner %s, estimator %s, n %d: %w", c.Name, choice, est, n, err)
				}
				cl := &out[ei][zi]
				cl.seconds += time.Since(start).Seconds() / float64(opt.reps)
				cl.add(d, truth)
			}
		}
		for ei := range ests {
			cl := &out[ei][zi]
			fmt.Fprintf(stderr, "%-13s %-28s n=%-6d max |err| %.4f mean %.4f null %.4f (%.1fs per fit)\n", c.Name, cl.learner, n, cl.maxAbs(), cl.meanAbs(), cl.nullAbs(), cl.seconds)
		}
	}
	return out, nil
}

// writeSides prints the comparison table of runSides.
func writeSides(w io.Writer, opt options, ests []estimator, cells [][][][]cell) {
	fmt.Fprintf(w, "Accuracy of Shapley contributions by estimator against simulated ground truth (synthetic screening SCM; learners %s; metrics %s; %d replicate(s); ground truth from %d records per hybrid distribution).\n",
		strings.Join(opt.learners, ", "), strings.Join(opt.metrics, ", "), opt.reps, opt.truthN)
	fmt.Fprint(w, "Each entry is max / mean |φ̂ − φ| over metrics, mechanisms and replicates, then the null-mechanism error: the largest |φ̂| of a mechanism whose true contribution is 0; n is records per group. reference: reference records weighted by Π_{i∈S} r_i; comparison: comparison records weighted by Π_{i∉S} 1/r_i; both/coalition: the two combined per coalition by effective sample size; both/metric-ess: one weight per metric from the far hybrids' effective sample sizes; both/metric-variance: one weight per metric, inverse delta-method variance of each side's estimated gap; both/pick: per metric the side with the smaller variance; both/mechanism: per mechanism, inverse delta-method variance of each side's Shapley value (attribution.Mix).\n\n")
	writeSizeHeader(w, "learner, estimator", opt.sizes, "mean \\|residual\\| at largest n")
	for _, byCase := range cells {
		for _, byLearner := range byCase {
			for _, row := range byLearner {
				fmt.Fprintf(w, "| %s | %s |", caseLabel(coverageCell{caseName: row[0].caseName, hard: row[0].hard}), row[0].learner)
				for _, c := range row {
					fmt.Fprintf(w, " %.4f / %.4f / %.4f |", c.maxAbs(), c.meanAbs(), c.nullAbs())
				}
				fmt.Fprintf(w, " %.4f |\n", row[len(row)-1].meanAbsResidual())
			}
		}
	}
	for li, choice := range opt.learners {
		for ei, est := range ests {
			fmt.Fprintf(w, "| **all cases** | %s %s |", choice, est)
			for zi := range opt.sizes {
				var pooled []cell
				for _, byCase := range cells {
					pooled = append(pooled, byCase[li][ei][zi])
				}
				mx, mean, null := poolCells(pooled)
				fmt.Fprintf(w, " %.4f / %.4f / %.4f |", mx, mean, null)
			}
			var res float64
			for _, byCase := range cells {
				res += byCase[li][ei][len(opt.sizes)-1].meanAbsResidual() / float64(len(cells))
			}
			fmt.Fprintf(w, " %.4f |\n", res)
		}
	}
}

// poolCells returns the max and mean |error| and the null-mechanism error
// over several cells.
func poolCells(cs []cell) (mx, mean, null float64) {
	var sum float64
	var cnt int
	for _, c := range cs {
		mx = math.Max(mx, c.maxAbs())
		null = math.Max(null, c.nullAbs())
		for _, byMech := range c.errs {
			for _, e := range byMech {
				for _, x := range e {
					sum += math.Abs(x)
					cnt++
				}
			}
		}
	}
	return mx, sum / float64(cnt), null
}
