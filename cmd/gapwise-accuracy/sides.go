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

// studySides lists the estimation sides compared by runSides.
var studySides = []attribution.Side{attribution.SideReference, attribution.SideComparison, attribution.SideBoth}

// runSides compares the estimation sides (attribution.Options.Side) against
// the simulated ground truth: for every case, size and replicate it draws
// one sample and decomposes it once per side with the same seed (so the
// fitted ratios are identical and only the side differs), using the first
// learner choice of opt.learners. It writes one row per (case, side) with
// max / mean |φ̂ − φ| per size, and an overall row per side pooled over
// cases.
func runSides(opt options, stdout, stderr io.Writer) error {
	cases, err := selectCases(opt.cases)
	if err != nil {
		return err
	}
	choice, learners, err := firstLearnerSet(opt)
	if err != nil {
		return err
	}
	// cells[c][s][z]: case c, side s, size z.
	cells := make([][][]cell, len(cases))
	for ci, c := range cases {
		truth, err := caseTruth(opt, c)
		if err != nil {
			return err
		}
		cells[ci] = make([][]cell, len(studySides))
		for si, side := range studySides {
			for _, n := range opt.sizes {
				cl := cell{caseName: c.Name, learner: side.String(), size: n, hard: c.Hard, errs: make([][][]float64, len(opt.metrics)), residual: make([][]float64, len(opt.metrics))}
				for m := range cl.errs {
					cl.errs[m] = make([][]float64, len(c.Model.Nodes))
				}
				cells[ci][si] = append(cells[ci][si], cl)
			}
		}
		for zi, n := range opt.sizes {
			for r := 0; r < opt.reps; r++ {
				seed := opt.seed + uint64(1000*ci+r)
				s, mechs, err := scm.Pooled(c.Model, n, n, seed)
				if err != nil {
					return err
				}
				for si, side := range studySides {
					start := time.Now()
					d, err := attribution.Decompose(s, mechs, opt.metrics, attribution.Options{Threshold: scm.ScreeningThreshold, Seed: seed, Learners: learners, Side: side})
					if err != nil {
						return fmt.Errorf("case %s, side %s, n %d: %w", c.Name, side, n, err)
					}
					cl := &cells[ci][si][zi]
					cl.seconds += time.Since(start).Seconds() / float64(opt.reps)
					for m, md := range d.Metrics {
						for i, phi := range md.Contributions {
							cl.errs[m][i] = append(cl.errs[m][i], phi-truth[m].Shapley[i])
						}
						cl.residual[m] = append(cl.residual[m], md.Residual)
					}
				}
			}
			for si := range studySides {
				cl := &cells[ci][si][zi]
				fmt.Fprintf(stderr, "%-13s %-10s n=%-6d max |err| %.4f mean %.4f (%.1fs per fit)\n", c.Name, cl.learner, n, cl.maxAbs(), cl.meanAbs(), cl.seconds)
			}
		}
	}
	writeSides(stdout, opt, choice, cells)
	return nil
}

// writeSides prints the comparison table of runSides.
func writeSides(w io.Writer, opt options, choice string, cells [][][]cell) {
	fmt.Fprintf(w, "Accuracy of Shapley contributions by estimation side against simulated ground truth (synthetic screening SCM; learner %s; metrics %s; %d replicate(s); ground truth from %d records per hybrid distribution).\n",
		choice, strings.Join(opt.metrics, ", "), opt.reps, opt.truthN)
	fmt.Fprint(w, "Each entry is max / mean |φ̂ − φ| over metrics, mechanisms and replicates; n is records per group. reference: reference records weighted by Π_{i∈S} r_i; comparison: comparison records weighted by Π_{i∉S} 1/r_i; both: the two combined per coalition by effective sample size.\n\n")
	writeSizeHeader(w, "side", opt.sizes, "mean \\|residual\\| at largest n")
	for _, byCase := range cells {
		for _, row := range byCase {
			name := row[0].caseName
			if row[0].hard {
				name += " (hard)"
			}
			fmt.Fprintf(w, "| %s | %s |", name, row[0].learner)
			for _, c := range row {
				fmt.Fprintf(w, " %.4f / %.4f |", c.maxAbs(), c.meanAbs())
			}
			fmt.Fprintf(w, " %.4f |\n", row[len(row)-1].meanAbsResidual())
		}
	}
	for si, side := range studySides {
		fmt.Fprintf(w, "| **all cases** | %s |", side)
		for zi := range opt.sizes {
			var mx, sum float64
			var cnt int
			for _, byCase := range cells {
				c := byCase[si][zi]
				mx = math.Max(mx, c.maxAbs())
				for _, byMech := range c.errs {
					for _, e := range byMech {
						for _, x := range e {
							sum += math.Abs(x)
							cnt++
						}
					}
				}
			}
			fmt.Fprintf(w, " %.4f / %.4f |", mx, sum/float64(cnt))
		}
		var res float64
		for _, byCase := range cells {
			res += byCase[si][len(opt.sizes)-1].meanAbsResidual() / float64(len(cells))
		}
		fmt.Fprintf(w, " %.4f |\n", res)
	}
}
