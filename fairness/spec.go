package fairness

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
	"github.com/gapwise/gapwise/metrics"
)

// Spec is a parsed and validated audit specification. Build it with
// LoadSpec or ParseSpec; both check every key, the graph and the settings,
// and fill in defaults.
//
// Keys (YAML):
//
//	data: cohort.csv     # CSV with a header row; relative to the spec's folder
//	label: dx            # 0/1 outcome column; must be a column of a graph node
//	positive: died       # the label value that is the outcome, when the label column holds words
//	score: score         # the model's probability in [0, 1]
//	threshold: 0.4       # positive decision when score >= threshold, in (0, 1)
//	groups: {column: clinic, reference: north, comparison: south}
//	                     # or comparison: [south, east] or comparison: every-other for one audit per value (RunGroups)
//	                     # or {columns: [sex, age], bands: {age: [40, 65]}, reference: {sex: M, age: "<40"}, comparison: every-other}
//	                     # for combinations of columns and half-open bands (groups_combined_spec.go)
//	metrics: [fpr, fnr]  # names from metrics.Names()
//	graph:               # every node once; columns default to [node]
//	  - node: labs
//	    columns: [m1, m2]
//	    parents: [dx]
//	seed: 1              # default 1
//	missing: error       # or drop: drop rows with a missing value; or indicator: keep them, with a missingness indicator per column
//	categorical: [sex]   # columns one-hot encoded, levels sorted
//	model_inputs: [age, hb, bmi]  # the columns the model reads (checked against the graph)
//	probabilities: [risk] # graph columns holding probabilities in [0, 1]; the classifiers read their logit (the score is read so when it is a node)
//	folds: 5             # cross-fitting folds, >= 2
//	fold_splits: 10      # independent fold splits averaged, 1 to MaxFoldSplits; omit for the default by group size
//	classifier: auto     # auto, linear, expanded or boosted
//	ece_bins: 10         # >= 1
//	estimator: weighting # coalition values by weighting (default), robust (regressions corrected by the weights; AUC weighted) or both (weighting, checked against robust)
//	estimate_from: both       # records that estimate the hybrids: reference, comparison or both
//	combine_sides: metric-variance  # with both: one weight per metric (default) or coalition
//	clip_ratios: 0.99    # clip log-ratios to their central 99% interval; omit for none
//	exact_limit: 16      # exact Shapley values up to this many mechanisms, sampled above
//	intervals:           # bootstrap intervals; decompose adds them by default, the library only when replicates is given
//	  replicates: 50     # resamples, 0 (none) or at least 2; default 50 (normal form) or 200 (percentile)
//	  level: 0.95        # interval level, in (0, 1); default 0.95
//	  keep_ratios: false # true: reuse the fitted ratios (fast mode)
//	  form: normal       # normal (estimate ± t × bootstrap SE, the default) or percentile
//	synthetic: false     # the data is invented
//	title: free text
//	names:               # display names for the reports (NamesSpec); omit for the identifiers
//	  groups: {reference: men, comparison: women}
//	  nodes: {hb: {name: haemoglobin, unit: g/dL}}
//	  columns: {mcv: {name: mean cell volume, unit: fL}}
//	model: {name: anaemia risk score, version: "2.1"}  # the audited model
//	audit_date: 2026-12-03  # shown in the reports and the result; omit for none
//	hidden_factor: {factors: [1.1, 1.25, 1.5, 2]}  # sensitivity to an unrecorded factor; off for none
//	suppress_below: 10   # withhold counts from 1 to 9 in the outputs (Suppression); omit or 0 for none
type Spec struct {
	File     string // spec path as given ("" when parsed from bytes without a name)
	SHA256   string // hex SHA-256 of the spec file's bytes
	Data     string // data path as written in the spec
	DataPath string // data path resolved against the spec's folder

	Label string
	// Positive, when set, is the label value counted as the outcome (1);
	// the column must then hold it and at most one other value (0).
	Positive  string
	Score     string
	Threshold float64
	Groups    GroupSpec
	Metrics   []string
	Graph     []NodeSpec

	Seed        uint64
	Missing     string // MissingError, MissingDrop or MissingIndicator
	Categorical []string
	// ModelInputs lists the columns the audited model reads, when the
	// spec declares them; one in no graph node is warned about and
	// described (Dataset.Outside).
	ModelInputs []string
	// Probabilities lists graph columns declared as holding probabilities
	// in [0, 1] (spec key probabilities); with the score when it is a node
	// they are ProbabilityColumns.
	Probabilities []string
	Folds         int
	// FoldSplits is attribution.Options.FoldSplits: the independent fold
	// splits whose estimates are averaged; 0 (key omitted) means
	// attribution.DefaultFoldSplits for the group sizes.
	FoldSplits int
	Classifier string
	ECEBins    int
	// Estimator is attribution.Estimator's name: weighting, robust or
	// both (default attribution.DefaultEstimator).
	Estimator string
	// EstimateFrom is attribution.Side's name: reference, comparison or
	// both (default attribution.DefaultSide).
	EstimateFrom string
	// CombineSides is attribution.Mix's name: how both sides' estimates
	// are combined (default attribution.DefaultMix).
	CombineSides string
	// ClipRatios, if > 0, is the central probability kept when clipping
	// each mechanism's log-ratios (attribution.ClipAtQuantiles).
	ClipRatios float64
	// ExactLimit is attribution.Options.ExactLimit (default
	// attribution.DefaultExactLimit).
	ExactLimit int
	// Intervals holds the intervals key (Replicates 0: no intervals). Run
	// reads it unless RunOptions.Intervals overrides it (the CLI's flags
	// do).
	Intervals Intervals
	// IntervalReplicatesGiven reports whether the spec gave
	// intervals.replicates. Without it Run computes no intervals, while
	// `gapwise decompose` uses DefaultIntervals.
	IntervalReplicatesGiven bool
	// HiddenFactor holds the hidden_factor key (sensitivity_spec.go).
	HiddenFactor HiddenFactorSpec
	Synthetic    bool
	Title        string
	// Names holds the names key; nil when absent.
	Names *NamesSpec
	// Model names the audited model (key model); nil when absent.
	Model *ModelInfo
	// AuditDate is the audit_date key (YYYY-MM-DD, CheckAuditDate), ""
	// when absent; the CLI's --audit-date replaces it.
	AuditDate string
	// SuppressBelow is the suppress_below key: the threshold of small-cell
	// suppression (Suppression), 0 for none; the CLI's --suppress-below
	// replaces it.
	SuppressBelow int

	lines      map[string]int // line of each top-level key
	catLines   []int          // line of each categorical entry
	inputLines []int          // line of each model_inputs entry
	probLines  []int          // line of each probabilities entry
}

// GroupSpec names the group column and the values compared. With a
// single comparison value (comparison: south) Comparison holds it and the
// audit is Run's; with a list (comparison: [south, east]) or the keyword
// EveryOther (comparison: every-other) the spec asks for several audits,
// one per comparison value against the reference (RunGroups), and
// Comparison holds the first listed value ("" for every-other).
type GroupSpec struct {
	Column     string
	Reference  string
	Comparison string
	// Comparisons lists the values of comparison: [a, b, ...]; nil for
	// a single value or every-other.
	Comparisons []string
	// EveryOther is set by comparison: every-other: every value of the
	// column other than the reference, found in the data.
	EveryOther bool
	// Columns lists the group columns of groups.columns, whose
	// combination of values forms a record's group (groups_combined_spec.go);
	// nil for the one-column form, where Column is the column. With
	// Columns, Column is them joined by " × ", and Reference and the
	// comparison values are combinations ("sex F, age 40–65").
	Columns []string
	// Bands cuts numeric group columns into bands (groups.bands), in the
	// order of Columns.
	Bands []GroupBands

	comparisonLines []int // line of each Comparisons entry
	bandsLine       int   // line of groups.bands
	comparisonLine  int   // line of the comparison value
}

// Intervals are the bootstrap interval settings, the one shape shared by
// the spec, the engine (attribution.Intervals) and the result.
type Intervals = attribution.Intervals

// IntervalForm is how intervals are read off the bootstrap replicates
// (attribution.IntervalForm): FormNormal or FormPercentile.
type IntervalForm = attribution.IntervalForm

// Interval forms (intervals.form).
const (
	FormNormal     = attribution.FormNormal
	FormPercentile = attribution.FormPercentile
)

// DefaultReplicates is the number of replicates of form f when
// intervals.replicates is not given (attribution.DefaultReplicates).
func DefaultReplicates(f IntervalForm) int { return attribution.DefaultReplicates(f) }

// DefaultIntervalLevel is the interval level when intervals.level is not
// given.
const DefaultIntervalLevel = 0.95

// IntervalsByDefault returns the interval settings of a run that adds
// intervals unless told not to (`gapwise decompose` without its interval
// flags): the spec's intervals key, with the DefaultIntervals form where
// intervals.form is not given and ReplicatesByDefault of the form where
// intervals.replicates is not given. Replicates 0 (intervals.replicates:
// 0) stays: no intervals.
func (s *Spec) IntervalsByDefault() Intervals {
	iv := s.Intervals
	if iv.Form == "" {
		iv.Form = DefaultIntervals.Form
	}
	if !s.IntervalReplicatesGiven {
		iv.Replicates = s.ReplicatesByDefault(iv.Form)
	}
	if iv.Level == 0 {
		iv.Level = DefaultIntervalLevel
	}
	return iv
}

// ReplicatesByDefault is the number of bootstrap replicates of form f for
// a run that adds intervals unless told not to, when intervals.replicates
// is not given: DefaultReplicates(f), but 0 with estimator robust, whose
// influence-function Wald intervals need no refits and become the
// intervals when no bootstrap runs (UncertaintyInfluence).
func (s *Spec) ReplicatesByDefault(f IntervalForm) int {
	if s.Estimator == attribution.EstimatorRobust.String() {
		return 0
	}
	return DefaultReplicates(f)
}

// DefaultIntervals are the interval settings of `gapwise decompose` when
// neither the spec's intervals.replicates nor --intervals says otherwise:
// the normal form from bootstrap replicates that refit the classifiers
// (attribution.DefaultReplicates of it), at DefaultIntervalLevel. The
// choice rests on the coverage study (README, Accuracy).
var DefaultIntervals = Intervals{
	Replicates: attribution.DefaultReplicates(attribution.DefaultIntervalForm),
	Level:      DefaultIntervalLevel,
	Form:       attribution.DefaultIntervalForm,
}

// NodeSpec is one node of the causal graph.
type NodeSpec struct {
	Node    string
	Columns []string // data columns of the node; [Node] by default
	Parents []string // names of parent nodes
	Line    int      // line of the entry in the spec

	columnLines, parentLines []int // line of each column and parent
}

// Values of Spec.Missing.
const (
	MissingError     = "error"
	MissingDrop      = "drop"
	MissingIndicator = "indicator"
)

// Values of Spec.Classifier: the learner names of package classify.
const (
	ClassifierAuto     = classify.Auto
	ClassifierLinear   = classify.NameLinear
	ClassifierExpanded = classify.NameExpanded
	ClassifierBoosted  = classify.NameBoosted
)

// Defaults for optional keys.
const (
	DefaultSeed  = 1
	DefaultFolds = 5
)

// LoadSpec reads and parses the spec file at path. A missing file gives a
// *SpecError wrapping ErrSpecNotFound.
func LoadSpec(path string) (*Spec, error) {
	f, err := os.Open(path)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, &SpecError{File: path, Err: wrapf(ErrSpecNotFound, "spec file not found")}
		}
		return nil, &SpecError{File: path, Err: wrapf(ErrSpecNotFound, "cannot read spec file: %v", err)}
	}
	defer f.Close()
	src, err := readSpecFile(f)
	if errors.Is(err, ErrTooLarge) {
		return nil, &SpecError{File: path, Err: err}
	}
	if err != nil {
		return nil, &SpecError{File: path, Err: wrapf(ErrSpecNotFound, "cannot read spec file: %v", err)}
	}
	return ParseSpec(path, src)
}

// ParseSpec parses the spec src; file names it in errors and anchors the
// relative data path. Every problem is a *SpecError carrying the line and
// key involved.
func ParseSpec(file string, src []byte) (*Spec, error) {
	sum := sha256.Sum256(src)
	s := &Spec{File: file, SHA256: hex.EncodeToString(sum[:]), lines: map[string]int{}}
	p := &specParser{file: file}

	var doc yaml.Node
	if err := yaml.Unmarshal(src, &doc); err != nil {
		return nil, p.syntax(err)
	}
	if len(doc.Content) == 0 {
		return nil, specErr(file, 0, "data", ErrMissingKey, "the spec is empty")
	}
	root := resolve(doc.Content[0])
	if root.Kind != yaml.MappingNode {
		return nil, specErr(file, root.Line, "", ErrBadValue, "the spec must be a mapping of keys to values")
	}
	for i := 0; i+1 < len(root.Content); i += 2 {
		k, v := resolve(root.Content[i]), resolve(root.Content[i+1])
		if _, dup := s.lines[k.Value]; dup {
			return nil, specErr(file, k.Line, k.Value, ErrDuplicateKey, "key given twice (first on line %d)", s.lines[k.Value])
		}
		s.lines[k.Value] = k.Line
		if err := p.key(s, k, v); err != nil {
			return nil, err
		}
	}
	if err := s.finish(p); err != nil {
		return nil, err
	}
	if err := validateGraph(s); err != nil {
		return nil, err
	}
	if err := validateNames(s); err != nil {
		return nil, err
	}
	if err := checkSeveralNames(s); err != nil {
		return nil, err
	}
	return s, nil
}

// KeyLine returns the line of a top-level key, or 0 if it was not given.
func (s *Spec) KeyLine(key string) int { return s.lines[key] }

// DropMissing reports whether rows with missing values are dropped.
func (s *Spec) DropMissing() bool { return s.Missing == MissingDrop }

// IndicateMissing reports whether missing values of graph columns are
// kept with a missingness indicator (missing: indicator).
func (s *Spec) IndicateMissing() bool { return s.Missing == MissingIndicator }

// ToleratesMissing reports whether a missing value is not an error.
func (s *Spec) ToleratesMissing() bool { return s.Missing != MissingError }

// Columns lists every graph column in order of first appearance.
func (s *Spec) Columns() []string {
	var cols []string
	for _, n := range s.Graph {
		cols = append(cols, n.Columns...)
	}
	return cols
}

// OutsideInputs lists the declared model inputs that are in no graph node
// and are not the group column, in the order declared.
func (s *Spec) OutsideInputs() []string {
	inGraph := map[string]bool{}
	for _, c := range s.Groups.DataColumns() {
		inGraph[c] = true
	}
	for _, c := range s.Columns() {
		inGraph[c] = true
	}
	var out []string
	for _, c := range s.ModelInputs {
		if !inGraph[c] {
			out = append(out, c)
		}
	}
	return out
}

// ScoreIsNode reports whether the score column is a node of the graph.
func (s *Spec) ScoreIsNode() bool {
	for _, c := range s.Columns() {
		if c == s.Score {
			return true
		}
	}
	return false
}

// ProbabilityColumns lists the graph columns that hold probabilities, in
// graph order: those declared under probabilities, and the score when it
// is a node. The group classifiers read each as its clipped logit
// (attribution.Sample.ProbabilityCols, classify.Logit).
func (s *Spec) ProbabilityColumns() []string {
	var out []string
	for _, c := range s.Columns() {
		if c == s.Score || slices.Contains(s.Probabilities, c) {
			out = append(out, c)
		}
	}
	return out
}

var yamlLine = regexp.MustCompile(`^yaml: line (\d+): (.*)$`)

// specParser decodes values of the YAML tree into a Spec.
type specParser struct{ file string }

// yamlParserProblems are the problems yaml.v3's parser (as opposed to its
// scanner) reports. For these it prints a 0-based line number, the line
// where the enclosing block starts, and omits the line when it is 0
// (gopkg.in/yaml.v3 v3.0.1, decode.go, parser.fail); syntax corrects that.
var yamlParserProblems = map[string]bool{
	"did not find expected ',' or ']'":       true,
	"did not find expected ',' or '}'":       true,
	"did not find expected '-' indicator":    true,
	"did not find expected <document start>": true,
	"did not find expected key":              true,
	"did not find expected node content":     true,
	"found duplicate %TAG directive":         true,
	"found duplicate %YAML directive":        true,
	"found incompatible YAML document":       true,
	"found undefined tag handle":             true,
}

// syntax turns a yaml.v3 parse error into a *SpecError with a 1-based line.
func (p *specParser) syntax(err error) error {
	msg := strings.TrimPrefix(err.Error(), "yaml: ")
	line := 0
	if m := yamlLine.FindStringSubmatch(err.Error()); m != nil {
		line, _ = strconv.Atoi(m[1])
		msg = m[2]
	}
	if yamlParserProblems[msg] {
		line++
		return specErr(p.file, line, "", ErrSyntax, "invalid YAML: %s (in the block that starts on this line)", msg)
	}
	return specErr(p.file, line, "", ErrSyntax, "invalid YAML: %s", msg)
}

func (p *specParser) key(s *Spec, k, v *yaml.Node) error {
	var err error
	switch k.Value {
	case "data":
		s.Data, err = p.str(k.Value, v)
	case "label":
		s.Label, err = p.str(k.Value, v)
	case "positive":
		s.Positive, err = p.str(k.Value, v)
		s.Positive = strings.TrimSpace(s.Positive)
	case "score":
		s.Score, err = p.str(k.Value, v)
	case "threshold":
		s.Threshold, err = p.float(k.Value, v)
		if err == nil && !(s.Threshold > 0 && s.Threshold < 1) {
			err = specErr(p.file, v.Line, k.Value, ErrThresholdRange, "threshold %s is not strictly between 0 and 1", v.Value)
		}
	case "groups":
		err = p.groups(s, v)
	case "metrics":
		err = p.metrics(s, v)
	case "graph":
		err = p.graph(s, v)
	case "seed":
		err = p.decode(k.Value, v, &s.Seed, "a non-negative integer")
	case "missing":
		s.Missing, err = p.oneOf(k.Value, v, MissingError, MissingDrop, MissingIndicator)
	case "categorical":
		s.Categorical, s.catLines, err = p.strs(k.Value, v)
	case "model_inputs":
		s.ModelInputs, s.inputLines, err = p.strs(k.Value, v)
	case "probabilities":
		s.Probabilities, s.probLines, err = p.strs(k.Value, v)
	case "folds":
		err = p.decode(k.Value, v, &s.Folds, "an integer")
		if err == nil && s.Folds < 2 {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "folds must be at least 2, got %d", s.Folds)
		}
		if err == nil && s.Folds > MaxFolds {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "folds must be at most %d, got %d", MaxFolds, s.Folds)
		}
	case "fold_splits":
		err = p.decode(k.Value, v, &s.FoldSplits, "an integer")
		if err == nil && (s.FoldSplits < 1 || s.FoldSplits > MaxFoldSplits) {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "fold_splits must be between 1 and %d, got %d (omit it for the default by group size)", MaxFoldSplits, s.FoldSplits)
		}
	case "classifier":
		s.Classifier, err = p.oneOf(k.Value, v, ClassifierAuto, ClassifierLinear, ClassifierExpanded, ClassifierBoosted)
		if err == nil {
			if _, ok := candidateLearners(s.Classifier); !ok {
				err = specErr(p.file, v.Line, k.Value, ErrClassifierUnavailable, "classifier %s is not available", s.Classifier)
			}
		}
	case "ece_bins":
		err = p.decode(k.Value, v, &s.ECEBins, "an integer")
		if err == nil && s.ECEBins < 1 {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "ece_bins must be at least 1, got %d", s.ECEBins)
		}
		if err == nil && s.ECEBins > MaxECEBins {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "ece_bins must be at most %d, got %d", MaxECEBins, s.ECEBins)
		}
	case "estimator":
		s.Estimator, err = p.oneOf(k.Value, v, attribution.EstimatorWeighting.String(), attribution.EstimatorRobust.String(), attribution.EstimatorBoth.String())
	case "estimate_from":
		s.EstimateFrom, err = p.oneOf(k.Value, v, attribution.SideReference.String(), attribution.SideComparison.String(), attribution.SideBoth.String())
	case "combine_sides":
		var names []string
		for _, x := range attribution.Mixes() {
			names = append(names, x.String())
		}
		s.CombineSides, err = p.oneOf(k.Value, v, names...)
	case "clip_ratios":
		s.ClipRatios, err = p.float(k.Value, v)
		if err == nil && !(s.ClipRatios > 0 && s.ClipRatios < 1) {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "clip_ratios %s is not strictly between 0 and 1 (e.g. 0.99 keeps the central 99%% of each mechanism's log-ratios)", v.Value)
		}
	case "exact_limit":
		err = p.decode(k.Value, v, &s.ExactLimit, "an integer")
		if err == nil && (s.ExactLimit < 1 || s.ExactLimit > attribution.MaxExactMechanisms) {
			err = specErr(p.file, v.Line, k.Value, ErrBadValue, "exact_limit must be between 1 and %d, got %d", attribution.MaxExactMechanisms, s.ExactLimit)
		}
	case "intervals":
		err = p.intervals(s, v)
	case "synthetic":
		err = p.decode(k.Value, v, &s.Synthetic, "true or false")
	case "title":
		if v.Kind != yaml.ScalarNode {
			return specErr(p.file, v.Line, k.Value, ErrBadValue, "title must be text")
		}
		s.Title = v.Value
	case "names":
		err = p.names(s, v)
	case "model":
		err = p.model(s, v)
	case "audit_date":
		err = p.auditDate(s, v)
	case "hidden_factor":
		err = p.hiddenFactor(s, v)
	case "suppress_below":
		err = p.decode(k.Value, v, &s.SuppressBelow, "an integer")
		if err == nil {
			if e := CheckSuppressBelow(s.SuppressBelow); e != nil {
				err = specErr(p.file, v.Line, k.Value, ErrBadValue, "suppress_below %v", e)
			}
		}
	default:
		return p.unknownKey(k.Line, k.Value, k.Value, topKeys)
	}
	return err
}

// finish checks required keys and fills defaults.
func (s *Spec) finish(p *specParser) error {
	for _, key := range []string{"data", "label", "score", "threshold", "groups", "metrics", "graph"} {
		if _, ok := s.lines[key]; !ok {
			return specErr(p.file, 0, key, ErrMissingKey, "missing required key %q", key)
		}
	}
	if _, ok := s.lines["seed"]; !ok {
		s.Seed = DefaultSeed
	}
	if s.Missing == "" {
		s.Missing = MissingError
	}
	if s.Folds == 0 {
		s.Folds = DefaultFolds
	}
	if s.Classifier == "" {
		s.Classifier = ClassifierAuto
	}
	if s.ECEBins == 0 {
		s.ECEBins = metrics.DefaultECEBins
	}
	if s.EstimateFrom == "" {
		s.EstimateFrom = attribution.DefaultSide.String()
	}
	if s.Estimator == "" {
		s.Estimator = attribution.DefaultEstimator.String()
	}
	if s.CombineSides == "" {
		s.CombineSides = attribution.DefaultMix.String()
	}
	if s.ExactLimit == 0 {
		s.ExactLimit = attribution.DefaultExactLimit
	}
	if s.Intervals.Level == 0 {
		s.Intervals.Level = DefaultIntervalLevel
	}
	s.DataPath = s.Data
	if !filepath.IsAbs(s.Data) {
		s.DataPath = filepath.Join(filepath.Dir(s.File), s.Data)
	}
	return nil
}

func (p *specParser) str(key string, v *yaml.Node) (string, error) {
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" || strings.TrimSpace(v.Value) == "" {
		return "", specErr(p.file, v.Line, key, ErrBadValue, "%s needs a single non-empty value", key)
	}
	return v.Value, nil
}

// strs decodes a list of strings and the line of each.
func (p *specParser) strs(key string, v *yaml.Node) ([]string, []int, error) {
	if v.Kind != yaml.SequenceNode {
		return nil, nil, specErr(p.file, v.Line, key, ErrBadValue, "%s must be a list such as [a, b]", key)
	}
	out := make([]string, 0, len(v.Content))
	lines := make([]int, 0, len(v.Content))
	for _, item := range v.Content {
		item = resolve(item)
		sv, err := p.str(key, item)
		if err != nil {
			return nil, nil, err
		}
		out = append(out, sv)
		lines = append(lines, item.Line)
	}
	return out, lines, nil
}

func (p *specParser) float(key string, v *yaml.Node) (float64, error) {
	var f float64
	err := p.decode(key, v, &f, "a number")
	return f, err
}

func (p *specParser) decode(key string, v *yaml.Node, dst any, want string) error {
	if v.Kind != yaml.ScalarNode || v.Tag == "!!null" || v.Decode(dst) != nil {
		return specErr(p.file, v.Line, key, ErrBadValue, "%s must be %s, got %q", key, want, v.Value)
	}
	return nil
}

func (p *specParser) oneOf(key string, v *yaml.Node, allowed ...string) (string, error) {
	sv, err := p.str(key, v)
	if err != nil {
		return "", err
	}
	for _, a := range allowed {
		if sv == a {
			return sv, nil
		}
	}
	sentinel := ErrBadValue
	if key == "classifier" {
		sentinel = ErrUnknownClassifier
	}
	return "", specErr(p.file, v.Line, key, sentinel, "%s must be one of %s, got %q", key, strings.Join(allowed, ", "), sv)
}

// eachKey calls fn for every key of the mapping v, in order, with the key's
// full name (prefix + "." + key); it rejects a key given twice and returns
// the set of keys seen, or fn's first error.
func (p *specParser) eachKey(v *yaml.Node, prefix string, fn func(k, val *yaml.Node, key string) error) (map[string]bool, error) {
	seen := map[string]bool{}
	for i := 0; i+1 < len(v.Content); i += 2 {
		k, val := resolve(v.Content[i]), resolve(v.Content[i+1])
		key := prefix + "." + k.Value
		if seen[k.Value] {
			return nil, specErr(p.file, k.Line, key, ErrDuplicateKey, "key given twice")
		}
		seen[k.Value] = true
		if err := fn(k, val, key); err != nil {
			return nil, err
		}
	}
	return seen, nil
}

func (p *specParser) groups(s *Spec, v *yaml.Node) error {
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, "groups", ErrBadValue, "groups must be a mapping with column, reference and comparison")
	}
	if usesCombinedForm(v) {
		return p.combinedGroups(s, v) // groups_combined_spec.go
	}
	seen, err := p.eachKey(v, "groups", func(k, val *yaml.Node, key string) error {
		var dst *string
		switch k.Value {
		case "column":
			dst = &s.Groups.Column
		case "reference":
			dst = &s.Groups.Reference
		case "comparison":
			if val.Kind == yaml.SequenceNode || isEveryOther(val) {
				return p.comparisons(s, val, key) // several comparisons (multigroup_spec.go)
			}
			dst = &s.Groups.Comparison
		default:
			return p.unknownKey(k.Line, key, k.Value, groupKeys)
		}
		sv, err := p.str(key, val)
		*dst = sv
		return err
	})
	if err != nil {
		return err
	}
	for _, k := range []string{"column", "reference", "comparison"} {
		if !seen[k] {
			return specErr(p.file, v.Line, "groups."+k, ErrMissingKey, "missing required key %q", "groups."+k)
		}
	}
	if s.Groups.Several() {
		return p.checkComparisons(s)
	}
	if s.Groups.Reference == s.Groups.Comparison {
		return specErr(p.file, v.Line, "groups", ErrBadValue, "reference and comparison are both %q", s.Groups.Reference)
	}
	return nil
}

// intervals decodes the intervals mapping: replicates, level, keep_ratios,
// form.
func (p *specParser) intervals(s *Spec, v *yaml.Node) error {
	if v.Kind != yaml.MappingNode {
		return specErr(p.file, v.Line, "intervals", ErrBadValue, "intervals must be a mapping such as {replicates: 50, level: 0.95, keep_ratios: false, form: normal}")
	}
	_, err := p.eachKey(v, "intervals", func(k, val *yaml.Node, key string) error {
		var err error
		switch k.Value {
		case "replicates":
			err = p.decode(key, val, &s.Intervals.Replicates, "an integer")
			s.IntervalReplicatesGiven = true
			if err == nil && (s.Intervals.Replicates < 0 || s.Intervals.Replicates == 1) {
				err = specErr(p.file, val.Line, key, ErrBadValue, "%s must be 0 (no intervals) or at least 2, got %d", key, s.Intervals.Replicates)
			}
			if err == nil && s.Intervals.Replicates > MaxReplicates {
				err = specErr(p.file, val.Line, key, ErrBadValue, "%s must be at most %d, got %d", key, MaxReplicates, s.Intervals.Replicates)
			}
		case "level":
			s.Intervals.Level, err = p.float(key, val)
			if err == nil && !(s.Intervals.Level > 0 && s.Intervals.Level < 1) {
				err = specErr(p.file, val.Line, key, ErrBadValue, "%s %s is not strictly between 0 and 1 (e.g. 0.95)", key, val.Value)
			}
		case "keep_ratios":
			err = p.decode(key, val, &s.Intervals.KeepRatios, "true or false")
		case "form":
			var f string
			if err = p.decode(key, val, &f, "normal or percentile"); err == nil {
				s.Intervals.Form = attribution.IntervalForm(f)
				if !s.Intervals.Form.Known() {
					err = specErr(p.file, val.Line, key, ErrBadValue, "%s must be normal or percentile, got %q", key, f)
				}
			}
		default:
			err = p.unknownKey(k.Line, key, k.Value, intervalKeys)
		}
		return err
	})
	return err
}

func (p *specParser) metrics(s *Spec, v *yaml.Node) error {
	names, lines, err := p.strs("metrics", v)
	if err != nil {
		return err
	}
	if len(names) == 0 {
		return specErr(p.file, v.Line, "metrics", ErrBadValue, "metrics must list at least one of %s", strings.Join(metrics.Names(), ", "))
	}
	seen := map[string]bool{}
	for i, n := range names {
		line := lines[i]
		key := fmt.Sprintf("metrics[%d]", i)
		if !metrics.Known(n) {
			return specErr(p.file, line, key, ErrUnknownMetric, "unknown metric %q (known: %s)", n, strings.Join(metrics.Names(), ", "))
		}
		if seen[n] {
			return specErr(p.file, line, key, ErrBadValue, "metric %q is listed twice", n)
		}
		seen[n] = true
	}
	s.Metrics = names
	return nil
}

func (p *specParser) graph(s *Spec, v *yaml.Node) error {
	if v.Kind != yaml.SequenceNode || len(v.Content) == 0 {
		return specErr(p.file, v.Line, "graph", ErrBadValue, "graph must be a non-empty list of nodes")
	}
	if len(v.Content) > MaxNodes {
		return specErr(p.file, v.Line, "graph", ErrBadValue, "graph has %d nodes; at most %d are supported", len(v.Content), MaxNodes)
	}
	for i, item := range v.Content {
		item = resolve(item)
		prefix := fmt.Sprintf("graph[%d]", i)
		if item.Kind != yaml.MappingNode {
			return specErr(p.file, item.Line, prefix, ErrBadValue, "each graph entry must be a mapping with node, columns and parents")
		}
		n := NodeSpec{Line: item.Line}
		seen, err := p.eachKey(item, prefix, func(k, val *yaml.Node, key string) error {
			var err error
			switch k.Value {
			case "node":
				n.Node, err = p.str(key, val)
			case "columns":
				n.Columns, n.columnLines, err = p.strs(key, val)
				if err == nil && len(n.Columns) == 0 {
					err = specErr(p.file, val.Line, key, ErrBadValue, "columns must not be empty (omit it to use the node's name)")
				}
			case "parents":
				n.Parents, n.parentLines, err = p.strs(key, val)
			default:
				err = p.unknownKey(k.Line, key, k.Value, graphNodeKeys)
			}
			return err
		})
		if err != nil {
			return err
		}
		if !seen["node"] {
			return specErr(p.file, item.Line, prefix+".node", ErrMissingKey, "missing required key %q", prefix+".node")
		}
		if n.Columns == nil {
			n.Columns = []string{n.Node}
			n.columnLines = []int{item.Line}
		}
		s.Graph = append(s.Graph, n)
	}
	return nil
}

// resolve follows YAML aliases to the node they stand for.
func resolve(n *yaml.Node) *yaml.Node {
	for i := 0; n.Kind == yaml.AliasNode && n.Alias != nil && i < 16; i++ {
		n = n.Alias
	}
	return n
}
