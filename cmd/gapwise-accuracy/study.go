package main

import (
	"fmt"
	"io"
	"math"
	"time"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/internal/scm"
	"github.com/gapwise/gapwise/metrics"
)

// cell is the accuracy of one (case, learner, size) combination: the
// absolute errors |φ̂ − φ| of every metric, mechanism and replicate.
type cell struct {
	caseName, learner string
	estimator         valueEstimator
	size              int
	hard              bool
	// errs[m][i][r] = φ̂ − φ for metric m, mechanism i, replicate r.
	errs [][][]float64
	// residual[m][r] = observed gap − Σφ̂.
	residual [][]float64
	// null lists the mechanisms whose true contribution is 0
	// (scm.Case.Null), for nullAbs.
	null    []int
	truthSE float64 // largest Monte Carlo SE of the ground truth
	seconds float64 // mean Decompose wall time
}

// run computes the ground truth of every case, then decomposes reps fresh
// samples per learner choice and size, and writes the tables.
func run(opt options, stdout, stderr io.Writer) error {
	cases, err := selectCases(opt.cases)
	if err != nil {
		return err
	}
	var cells []cell
	truths := make([][]scm.Truth, len(cases))
	for ci, c := range cases {
		truth, err := caseTruth(opt, c)
		if err != nil {
			return err
		}
		truths[ci] = truth
		for _, choice := range opt.learners {
			learners, err := learnerSet(choice)
			if err != nil {
				return err
			}
			for _, est := range opt.estimators {
				for _, n := range opt.sizes {
					cl := cell{caseName: c.Name, learner: choice, estimator: est, size: n, hard: c.Hard, null: c.Null}
					for _, t := range truth {
						for _, se := range t.SE {
							cl.truthSE = math.Max(cl.truthSE, se)
						}
					}
					cl.errs = make([][][]float64, len(opt.metrics))
					cl.residual = make([][]float64, len(opt.metrics))
					for m := range cl.errs {
						cl.errs[m] = make([][]float64, len(c.Model.Nodes))
					}
					for r := 0; r < opt.reps; r++ {
						seed := opt.seed + uint64(1000*ci+r)
						s, mechs, err := scm.Pooled(c.Model, n, n, seed)
						if err != nil {
							return err
						}
						opt.onScale(s)
						start := time.Now()
						d, err := attribution.Decompose(s, mechs, opt.metrics, est.apply(attribution.Options{Threshold: scm.ScreeningThreshold, Seed: seed, Learners: learners, Reads: c.Model.Reads(), MaxFitRows: opt.maxFitRows}))
						if err != nil {
							return fmt.Errorf("case %s, learner %s, n %d: %w", c.Name, choice, n, err)
						}
						cl.seconds += time.Since(start).Seconds() / float64(opt.reps)
						for m, md := range d.Metrics {
							for i, phi := range md.Contributions {
								cl.errs[m][i] = append(cl.errs[m][i], phi-truth[m].Shapley[i])
							}
							cl.residual[m] = append(cl.residual[m], md.Residual)
						}
					}
					fmt.Fprintf(stderr, "%-13s %-8s %-9s n=%-6d max |err| %.4f (%.1fs per fit)\n", c.Name, choice, est, n, cl.maxAbs(), cl.seconds)
					cells = append(cells, cl)
				}
			}
		}
	}
	writeSummary(stdout, opt, cells)
	if len(opt.estimators) > 1 {
		writeEstimators(stdout, opt, cells)
	}
	if opt.truth {
		writeTruth(stdout, opt, cases, truths)
	}
	if opt.detail {
		writeDetail(stdout, opt, cases, cells)
	}
	return nil
}

func selectCases(names []string) ([]scm.Case, error) {
	if len(names) == 0 {
		return scm.Cases(), nil
	}
	// The extra cases (scm.RareCases) are chosen by name only.
	all := append(scm.Cases(), scm.RareCases()...)
	var out []scm.Case
	for _, n := range names {
		found := false
		for _, c := range all {
			if c.Name == n {
				out = append(out, c)
				found = true
			}
		}
		if !found {
			return nil, fmt.Errorf("-cases: unknown case %q", n)
		}
	}
	return out, nil
}

func (c *cell) maxAbs() float64 {
	var mx float64
	for _, byMech := range c.errs {
		for _, e := range byMech {
			for _, x := range e {
				mx = math.Max(mx, math.Abs(x))
			}
		}
	}
	return mx
}

// add records the errors and residuals of one decomposition.
func (c *cell) add(d *attribution.Decomposition, truth []scm.Truth) {
	for m, md := range d.Metrics {
		for i, phi := range md.Contributions {
			c.errs[m][i] = append(c.errs[m][i], phi-truth[m].Shapley[i])
		}
		c.residual[m] = append(c.residual[m], md.Residual)
	}
}

// nullAbs is the null-mechanism error: the largest |φ̂| (= |φ̂ − φ|, since
// φ = 0) over the null mechanisms, metrics and replicates.
func (c *cell) nullAbs() float64 {
	var mx float64
	for _, byMech := range c.errs {
		for _, i := range c.null {
			for _, x := range byMech[i] {
				mx = math.Max(mx, math.Abs(x))
			}
		}
	}
	return mx
}

func (c *cell) meanAbs() float64 {
	var sum float64
	var cnt int
	for _, byMech := range c.errs {
		for _, e := range byMech {
			for _, x := range e {
				sum += math.Abs(x)
				cnt++
			}
		}
	}
	return sum / float64(cnt)
}

func (c *cell) meanAbsResidual() float64 {
	var sum float64
	var cnt int
	for _, r := range c.residual {
		for _, x := range r {
			sum += math.Abs(x)
			cnt++
		}
	}
	return sum / float64(cnt)
}

// onScale applies -scale to a drawn sample: with raw, the
// probability-valued columns (a score node's) enter the learners as they
// are instead of as their logits.
func (opt options) onScale(s *attribution.Sample) {
	if opt.scale == scaleRaw {
		s.ProbabilityCols = nil
	}
}

// caseTruth simulates the ground-truth decomposition of case c with the
// study's truth settings (shared by every mode so their tables agree).
func caseTruth(opt options, c scm.Case) ([]scm.Truth, error) {
	return scm.GroundTruth(c.Model, opt.metrics, opt.truthN, opt.seed^0x7275746800000000, scm.ScreeningThreshold, metrics.DefaultECEBins)
}

// firstLearnerSet returns the first -learners choice and its learners, the
// single choice the -sides and -coverage modes use.
func firstLearnerSet(opt options) (string, []classify.Learner, error) {
	choice := opt.learners[0]
	learners, err := learnerSet(choice)
	return choice, learners, err
}
