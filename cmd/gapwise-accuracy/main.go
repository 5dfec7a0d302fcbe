// Command gapwise-accuracy measures how close the attribution engine's
// Shapley contributions come to the ground truth of synthetic structural
// causal models (package scm), for each classifier choice, case and sample
// size, and prints a Markdown table.
//
//	go run ./cmd/gapwise-accuracy [-sizes 2000,10000,50000] [-reps 3] [-estimators weighting,robust]
//	go run ./cmd/gapwise-accuracy -sides -learners auto
//	go run ./cmd/gapwise-accuracy -coverage -learners expanded [-draws 30] [-boot 40] [-sizes 800,1500:400] [-methods refit,fast,delta] [-subs 50]
//	go run ./cmd/gapwise-accuracy -splits -learners auto [-seeds 10] [-fold-splits 1,0] [-boot 40]
//	go run ./cmd/gapwise-accuracy -cases score-node -scale raw
//
// Ground truth: every hybrid distribution simulated with common random
// numbers and split with the Shapley (1953) formula. All data is synthetic.
package main

import (
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/metrics"
)

// options are the command's flags.
type options struct {
	sizes    []int    // records per group
	reps     int      // replicate samples per cell
	truthN   int      // records per coalition in the ground-truth simulation
	learners []string // learner choices: linear, expanded, boosted, auto
	// estimators are the coalition-value estimators compared
	// (attribution.Estimator names; weighting or robust).
	estimators []valueEstimator
	cases      []string // case names; empty means all
	metrics    []string
	seed       uint64
	detail     bool            // also print per-metric, per-mechanism error and SD
	sides      bool            // compare estimation sides instead of learners (sides.go)
	truth      bool            // also print the ground-truth decompositions
	coverage   bool            // measure bootstrap interval coverage instead (coverage.go)
	checks     bool            // measure how often the warnings fire instead (checks.go)
	mix        attribution.Mix // combination of the sides in the checks study
	draws      int             // independent draws per case and size in the coverage and checks studies
	boot       int             // bootstrap replicates per draw in the coverage study, per row in the splits study
	splits     bool            // measure seed stability by fold splits instead (splits.go)
	seeds      int             // seeds per row in the splits study
	// foldSplits are the fold splits R compared by the splits study (0:
	// attribution.DefaultFoldSplits for the size).
	foldSplits []int
	scale      string // scaleLogit or scaleRaw: how probability-valued columns enter the learners
	// maxFitRows is attribution.Options.MaxFitRows for the main study (0:
	// the library's rule, attribution.FitRowsFor; negative: no cap).
	maxFitRows int
	// pairs are unequal group sizes (reference, comparison) given to
	// -sizes as REF:CMP, coverage study only; nil when every size is one
	// number for both groups.
	pairs   []groupSizes
	methods []string // interval methods of the coverage study (refit, fast, delta)
	// gapsOnly: the coverage study measures only the observed gaps'
	// intervals, which need no fitting, so that many draws are cheap.
	gapsOnly bool
	subs     []int // with -coverage: also the intervals of the first s replicates, for each s
}

// groupSizes returns the coverage study's rows: pairs if given, otherwise
// every size for both groups.
func (opt options) groupSizes() []groupSizes {
	if opt.pairs != nil {
		return opt.pairs
	}
	out := make([]groupSizes, len(opt.sizes))
	for i, n := range opt.sizes {
		out[i] = groupSizes{n, n}
	}
	return out
}

// Values of -scale.
const (
	scaleLogit = "logit"
	scaleRaw   = "raw"
)

func main() {
	opt, err := parseFlags(os.Args[1:], os.Stderr)
	if err != nil {
		os.Exit(2)
	}
	study := run
	if opt.sides {
		study = runSides
	}
	if opt.coverage {
		study = runCoverage
	}
	if opt.checks {
		study = runChecks
	}
	if opt.splits {
		study = runSplits
	}
	if err := study(opt, os.Stdout, os.Stderr); err != nil {
		fmt.Fprintln(os.Stderr, "gapwise-accuracy:", err)
		os.Exit(1)
	}
}

func parseFlags(args []string, stderr io.Writer) (options, error) {
	fs := flag.NewFlagSet("gapwise-accuracy", flag.ContinueOnError)
	fs.SetOutput(stderr)
	sizes := fs.String("sizes", "2000,10000,50000", "comma-separated records per group")
	reps := fs.Int("reps", 3, "replicate samples per case, learner and size")
	truthN := fs.Int("truth-n", 1<<20, "records per hybrid distribution in the ground-truth simulation")
	learners := fs.String("learners", "linear,expanded,boosted,auto", "comma-separated classifier choices (auto = all three, picked per mechanism by out-of-fold log loss)")
	estimators := fs.String("estimators", "weighting", "comma-separated estimators of the coalition values: weighting, robust, robust-pooled (both groups' records at every step; a study option)")
	cases := fs.String("cases", "", "comma-separated case names (default all)")
	metricList := fs.String("metrics", strings.Join([]string{metrics.NameFNR, metrics.NameFPR, metrics.NameCalibrationInTheLarge, metrics.NameBrier}, ","), "comma-separated metrics")
	seed := fs.Uint64("seed", 1, "seed of the samples and the ground-truth simulation")
	detail := fs.Bool("detail", false, "also print mean error, RMSE and SD per metric and mechanism")
	sides := fs.Bool("sides", false, "compare estimation sides (reference, comparison, both) with the first -learners choice instead of comparing learners")
	truth := fs.Bool("truth", false, "also print the ground-truth gap and contributions of every case")
	coverage := fs.Bool("coverage", false, "measure the coverage of 95% bootstrap intervals over independent draws (default sizes 800, cases "+strings.Join(coverageCases, ",")+"; first -learners choice)")
	checks := fs.Bool("checks", false, "measure how often each warning fires on clean and broken setups (default sizes "+strconv.Itoa(checksSize)+")")
	mixName := fs.String("mix", "", "with -checks: how both sides are combined (coalition, metric-ess, metric-variance, pick, mechanism; default the library's)")
	draws := fs.Int("draws", 30, "independent draws per case and size with -coverage and -checks")
	boot := fs.Int("boot", 40, "bootstrap replicates (full refit) per draw with -coverage, per row with -splits")
	splits := fs.Bool("splits", false, "measure how much the contributions move with the seed for each -fold-splits value (default sizes "+strconv.Itoa(splitsSize)+", cases "+strings.Join(splitsCases, ",")+"; first -learners choice)")
	seeds := fs.Int("seeds", 10, "seeds per row with -splits")
	foldSplits := fs.String("fold-splits", "1,0", "comma-separated fold splits R compared with -splits (0: the default for the size)")
	methods := fs.String("methods", strings.Join([]string{methodRefit, methodFast, methodDelta}, ","), "with -coverage: interval methods compared (refit: bootstrap refitting the classifiers, fast: bootstrap keeping the fitted ratios, delta: Wald intervals with the ratios held fixed; influence: the robust estimator's influence-function Wald intervals, robust-refit: bootstrap of the robust estimator refitting everything)")
	gaps := fs.Bool("gaps", false, "with -coverage: only the observed gaps' bootstrap intervals (no fitting: the same numbers as the full bootstrap's), for many cheap draws")
	subs := fs.String("subs", "50", "with -coverage: also form each bootstrap method's intervals from its first S replicates, for each comma-separated S below -boot")
	maxFitRows := fs.Int("max-fit-rows", 0, "training records per fit in the main study (0: the library's rule, max(50000, records/10); -1: no cap)")
	scale := fs.String("scale", scaleLogit, "how probability-valued columns (the score-node case's score) enter the learners: logit (clipped, the engine's way) or raw")
	if err := fs.Parse(args); err != nil {
		return options{}, err
	}
	opt := options{reps: *reps, truthN: *truthN, seed: *seed, detail: *detail, sides: *sides, truth: *truth, coverage: *coverage, checks: *checks, draws: *draws, boot: *boot, splits: *splits, seeds: *seeds, scale: *scale, gapsOnly: *gaps, maxFitRows: *maxFitRows}
	set := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { set[f.Name] = true })
	if opt.checks && !set["sizes"] {
		*sizes = strconv.Itoa(checksSize)
	}
	if opt.coverage {
		defaultSizesCases(set, sizes, cases, coverageSize, coverageCases)
	}
	if opt.splits {
		defaultSizesCases(set, sizes, cases, splitsSize, splitsCases)
	}
	opt.learners = split(*learners)
	opt.cases = split(*cases)
	opt.metrics = split(*metricList)
	err := opt.parseLists(*foldSplits, *sizes, *methods, *subs, *mixName, *estimators)
	if err == nil {
		err = opt.check()
	}
	if err != nil {
		fmt.Fprintln(stderr, err)
		return options{}, err
	}
	return opt, nil
}

// parseLists reads the comma-separated flags into opt, stopping at the
// first bad value.
func (opt *options) parseLists(foldSplits, sizes, methods, subs, mix, estimators string) error {
	var err error
	if opt.foldSplits, err = parseCounts(foldSplits, 0, "-fold-splits: %q is not a number of splits (0 for the default)"); err != nil {
		return err
	}
	if err = opt.parseSizes(sizes); err != nil {
		return err
	}
	for _, m := range split(methods) {
		if m != methodRefit && m != methodFast && m != methodDelta && m != methodInfluence && m != methodRobustRefit {
			return fmt.Errorf("-methods: %q is not refit, fast, delta, influence or robust-refit", m)
		}
		opt.methods = append(opt.methods, m)
	}
	if opt.subs, err = parseCounts(subs, 2, "-subs: %q is not a replicate count of at least 2"); err != nil {
		return err
	}
	if mix != "" {
		if opt.mix, err = attribution.ParseMix(mix); err != nil {
			return fmt.Errorf("-mix: %w", err)
		}
	}
	for _, name := range split(estimators) {
		e, err := parseValueEstimator(name)
		if err != nil {
			return err
		}
		opt.estimators = append(opt.estimators, e)
	}
	return nil
}

// parseCounts reads a comma-separated list of integers of at least min;
// msg formats the error for a bad entry.
func parseCounts(list string, min int, msg string) ([]int, error) {
	var out []int
	for _, f := range split(list) {
		r, err := strconv.Atoi(f)
		if err != nil || r < min {
			return nil, fmt.Errorf(msg, f)
		}
		out = append(out, r)
	}
	return out, nil
}

// parseSizes reads -sizes: records per group, or REF:CMP pairs with
// -coverage (pairs are kept only then).
func (opt *options) parseSizes(list string) error {
	for _, f := range split(list) {
		ref, cmp, found := strings.Cut(f, ":")
		if found && !opt.coverage {
			return fmt.Errorf("-sizes: %q: two group sizes REF:CMP only with -coverage", f)
		}
		if !found {
			cmp = ref
		}
		n, err1 := strconv.Atoi(ref)
		m, err2 := strconv.Atoi(cmp)
		if err1 != nil || err2 != nil || n < 100 || m < 100 {
			return fmt.Errorf("-sizes: %q is not a record count of at least 100 (or, with -coverage, REF:CMP)", f)
		}
		opt.sizes = append(opt.sizes, n)
		opt.pairs = append(opt.pairs, groupSizes{n, m})
	}
	if !opt.coverage {
		opt.pairs = nil
	}
	return nil
}

// check refuses option values no study can run with.
func (opt *options) check() error {
	if opt.scale != scaleLogit && opt.scale != scaleRaw {
		return fmt.Errorf("-scale: %q is neither %s nor %s", opt.scale, scaleLogit, scaleRaw)
	}
	if len(opt.estimators) == 0 {
		return fmt.Errorf("-estimators: none given")
	}
	for _, m := range opt.metrics {
		if !metrics.Known(m) || m == metrics.NameAUC {
			return fmt.Errorf("-metrics: %q is not a supported metric here", m)
		}
	}
	if opt.reps < 1 || opt.truthN < 1 || opt.draws < 1 || opt.boot < 2 || opt.seeds < 2 {
		return fmt.Errorf("-reps, -truth-n and -draws must be positive, -boot and -seeds at least 2")
	}
	return nil
}

// defaultSizesCases sets -sizes and -cases to a study's own defaults where
// they were not given (set holds the flags given).
func defaultSizesCases(set map[string]bool, sizes, cases *string, size int, names []string) {
	if !set["sizes"] {
		*sizes = strconv.Itoa(size)
	}
	if !set["cases"] {
		*cases = strings.Join(names, ",")
	}
}

func split(s string) []string {
	var out []string
	for _, f := range strings.Split(s, ",") {
		if f = strings.TrimSpace(f); f != "" {
			out = append(out, f)
		}
	}
	return out
}
