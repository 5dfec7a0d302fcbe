package compare

import (
	"cmp"
	"math"
	"slices"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
)

// Point is one run's value of a quantity, with its interval when the run
// has one.
type Point struct {
	Value float64            `json:"value"`
	CI    *fairness.Interval `json:"ci,omitempty"`
	// NotEstimable marks a contribution the run could not estimate.
	NotEstimable bool `json:"not_estimable,omitempty"`
}

// Series is one mechanism's contribution over the runs.
type Series struct {
	Node   string  `json:"node"`
	Points []Point `json:"points"`
}

// MetricHistory is one metric over the runs: the gap and the leading
// contributions (Options.Leading of them, the largest in absolute value
// in any run, largest first).
type MetricHistory struct {
	Metric  string   `json:"metric"`
	Gap     []Point  `json:"gap"`
	Leading []Series `json:"leading"`
}

// ComparisonHistory is the history of one comparison group.
type ComparisonHistory struct {
	Groups  Groups          `json:"groups"`
	Metrics []MetricHistory `json:"metrics"`
}

// History is several runs in time order. Its JSON encoding is what
// `gapwise compare --format json` prints for three or more files.
type History struct {
	Runs        []Run               `json:"runs"`
	SharedOnly  bool                `json:"shared_only,omitempty"`
	Notes       []string            `json:"notes"`
	Omitted     []Omission          `json:"omitted,omitempty"`
	Mechanisms  []Mechanism         `json:"mechanisms"`
	Comparisons []ComparisonHistory `json:"comparisons"`
	// Names are the display names of the last run.
	Names *fairness.Names `json:"names,omitempty"`
	// Policy is the judgement of a policy file on the last run; absent
	// without one.
	Policy      *policy.Outcome `json:"policy,omitempty"`
	Assumptions []string        `json:"assumptions"`
}

// NewHistory follows the runs rs, read from files, in the order given
// (oldest first; at least two). Comparability is checked as for
// NewReview, against the last run.
func NewHistory(files []string, rs []*fairness.Result, o Options) (*History, error) {
	if len(rs) < 2 {
		return nil, &Error{Err: wrapf(ErrTooFewRuns, "a history needs at least two result files")}
	}
	s, err := match(files, rs, o.Shared)
	if err != nil {
		return nil, err
	}
	last := rs[len(rs)-1]
	h := &History{SharedOnly: o.Shared, Omitted: s.omitted, Mechanisms: s.mechanisms, Names: last.Names,
		Assumptions: historyAssumptions()}
	for i, r := range rs {
		h.Runs = append(h.Runs, newRun(files[i], r))
	}
	distinctLabels(h.Runs)
	h.Notes = []string{}
	if s.graphDiffers {
		h.Notes = append(h.Notes, "The graphs differ: a shared mechanism's contribution is a Shapley value over a different set of mechanisms in each run.")
	}
	leading := o.Leading
	if leading <= 0 {
		leading = 3
	}
	ch := ComparisonHistory{Groups: Groups{last.Groups.Column, last.Groups.Reference, last.Groups.Comparison}}
	for _, name := range s.metrics {
		mh := MetricHistory{Metric: name}
		for _, r := range rs {
			m := metricOf(r, name)
			mh.Gap = append(mh.Gap, Point{Value: m.Gap, CI: m.GapCI})
		}
		type ranked struct {
			node string
			max  float64
			pos  int
		}
		var rank []ranked
		for j, mech := range s.mechanisms {
			mx := 0.0
			for _, r := range rs {
				c := contributionOf(metricOf(r, name), mech.Node)
				if !c.NotEstimable {
					mx = math.Max(mx, math.Abs(c.Value))
				}
			}
			rank = append(rank, ranked{mech.Node, mx, j})
		}
		slices.SortStableFunc(rank, func(a, b ranked) int { return cmp.Compare(b.max, a.max) })
		for _, rk := range rank[:min(leading, len(rank))] {
			se := Series{Node: rk.node}
			for _, r := range rs {
				c := contributionOf(metricOf(r, name), rk.node)
				se.Points = append(se.Points, Point{Value: c.Value, CI: ciOf(c), NotEstimable: c.NotEstimable})
			}
			mh.Leading = append(mh.Leading, se)
		}
		ch.Metrics = append(ch.Metrics, mh)
	}
	h.Comparisons = []ComparisonHistory{ch}
	return h, nil
}
