package fairness

import (
	"github.com/gapwise/gapwise/attribution"
	"github.com/gapwise/gapwise/attribution/classify"
)

// PlanInfo describes what an audit would estimate, without fitting
// anything: it is what `gapwise check` prints.
type PlanInfo struct {
	Title       string
	Model       *ModelInfo // nil unless the spec names the model
	Names       *Names     // display names (spec key names), nil when none
	Synthetic   bool
	Label       string
	LabelValues *LabelValues // nil unless the spec names the positive value
	ModelInputs *ModelInputs // nil unless the spec declares model_inputs
	Score       string
	Threshold   float64
	Groups      GroupInfo
	Metrics     []string
	Nodes       []PlanNode // in spec order
	Features    int        // columns of the encoded feature matrix
	Classifier  string
	Learners    []string // candidate learners per mechanism
	Folds       int
	FoldSplits  int       // fold splits the audit would average (fold_splits or its default)
	Warnings    []Warning // problems visible before fitting, e.g. dropped rows
}

// PlanNode is one mechanism of the plan.
type PlanNode struct {
	Node      string
	Mechanism string // "node | parent1, parent2"
	Parents   []string
	Columns   []string // data columns of the node
	Features  int      // encoded feature columns of the node (one per level for a categorical column)
}

// Plan loads the data named by spec and checks everything an audit needs
// before any fitting: the data file, every column, the groups, and that
// every metric has a value in both groups. Errors are input errors (see
// IsInputError).
func Plan(spec *Spec) (*PlanInfo, error) {
	d, sample, mechs, err := prepare(spec)
	if err != nil {
		return nil, err
	}
	if err := observeMetrics(spec, sample); err != nil {
		return nil, err
	}
	learners, _ := candidateLearners(spec.Classifier)
	info := &PlanInfo{
		Title:       spec.Title,
		Model:       spec.Model,
		Synthetic:   spec.Synthetic,
		Label:       spec.Label,
		LabelValues: d.LabelValues,
		Score:       spec.Score,
		Threshold:   spec.Threshold,
		Groups:      groupInfo(spec, d),
		Metrics:     append([]string(nil), spec.Metrics...),
		Features:    sample.X.RawMatrix().Cols,
		Classifier:  spec.Classifier,
		Learners:    classify.NamesOf(learners),
		Folds:       spec.Folds,
		FoldSplits:  spec.FoldSplits,
	}
	if info.FoldSplits == 0 {
		info.FoldSplits = attribution.DefaultFoldSplits(sample.Counts())
	}
	info.ModelInputs = modelInputs(spec)
	names := resultNames(spec, d.levelNames)
	info.Names = names
	info.Warnings = append(dataWarnings(info.Groups, names.GroupName(info.Groups.Reference, false), names.GroupName(info.Groups.Comparison, true), plainCount),
		modelInputWarnings(info.ModelInputs, spec.Groups.Column, spec.Score, spec.ScoreIsNode(), nil, names)...)
	for i, n := range spec.Graph {
		info.Nodes = append(info.Nodes, PlanNode{
			Node:      n.Node,
			Mechanism: mechs[i].Label(),
			Parents:   append([]string{}, n.Parents...),
			Columns:   append([]string(nil), n.Columns...),
			Features:  len(mechs[i].NodeCols),
		})
	}
	return info, nil
}
