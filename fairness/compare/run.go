package compare

import (
	"path/filepath"
	"strconv"

	"github.com/gapwise/gapwise/fairness"
)

// Run identifies one result file in a comparison.
type Run struct {
	File string `json:"file"`
	// Label is how the reports name the run: the model's name and
	// version when the result names a model, else the audit date, else
	// the file's name.
	Label     string              `json:"label"`
	Model     *fairness.ModelInfo `json:"model,omitempty"`
	AuditDate string              `json:"audit_date,omitempty"`
	Score     string              `json:"score"`
	Threshold float64             `json:"threshold"`
	// DataSHA256 is the data file's digest, from the result's inputs.
	DataSHA256  string `json:"data_sha256"`
	NReference  int    `json:"n_reference"`
	NComparison int    `json:"n_comparison"`
	// IntervalLevel is the level of the run's bootstrap intervals; 0
	// when it has none.
	IntervalLevel float64 `json:"interval_level,omitempty"`
	Synthetic     bool    `json:"synthetic,omitempty"`
}

// newRun describes the result r read from file.
func newRun(file string, r *fairness.Result) Run {
	run := Run{File: file, Model: r.Model, AuditDate: r.AuditDate, Score: r.Score, Threshold: r.Threshold,
		DataSHA256: r.Inputs.DataSHA256, NReference: r.Groups.NReference, NComparison: r.Groups.NComparison,
		Synthetic: r.Synthetic}
	run.IntervalLevel = intervalLevel(r)

	switch {
	case r.Model != nil && r.Model.Name != "" && r.Model.Version != "":
		run.Label = r.Model.Name + " " + r.Model.Version
	case r.Model != nil && r.Model.Name != "":
		run.Label = r.Model.Name
	case r.AuditDate != "":
		run.Label = r.AuditDate
	default:
		run.Label = filepath.Base(file)
	}
	return run
}

// intervalLevel is the level of r's intervals: the bootstrap's, or
// without a bootstrap that of the robust estimator's Wald intervals,
// which then are the metrics' intervals (MetricResult.Uncertainty); 0
// when the run has none.
func intervalLevel(r *fairness.Result) float64 {
	if iv := r.Settings.Intervals; iv != nil {
		return iv.Level
	}
	for _, m := range r.Metrics {
		if m.Uncertainty != nil && m.GapCI != nil {
			return m.Uncertainty.Level
		}
	}
	return 0
}

// distinctLabels makes the runs' labels distinct: a label that several
// runs share gets the run's number, "name (run 2)".
func distinctLabels(runs []Run) {
	count := map[string]int{}
	for _, r := range runs {
		count[r.Label]++
	}
	for i := range runs {
		if count[runs[i].Label] > 1 {
			runs[i].Label += " (run " + strconv.Itoa(i+1) + ")"
		}
	}
}
