package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
)

// Flag names of the coalition output.
const (
	flagCoalitions     = "coalitions"
	flagCoalitionLimit = "coalition-limit"
)

// coalitionOptions are decompose's flags for every metric's values of all
// coalitions of the mechanisms (fairness.MetricResult.Coalitions): json
// writes them into the JSON output (they are always in the HTML page, up
// to limit mechanisms), limit is fairness.RunOptions.CoalitionLimit.
type coalitionOptions struct {
	json  bool
	limit int
}

// bindCoalitionFlags adds --coalitions and --coalition-limit to cmd.
func bindCoalitionFlags(cmd *cobra.Command, o *coalitionOptions) {
	f := cmd.Flags()
	f.BoolVar(&o.json, flagCoalitions, false, "write every coalition's value into the JSON output (metrics[].coalitions)")
	f.IntVar(&o.limit, flagCoalitionLimit, fairness.DefaultCoalitionLimit,
		fmt.Sprintf("keep all coalitions' values for up to `N` mechanisms, for the report's what-if panel and --coalitions (at most %d)", fairness.MaxCoalitionLimit))
}

// check rejects a --coalition-limit outside [0, fairness.MaxCoalitionLimit].
func (o coalitionOptions) check() error {
	if o.limit < 0 || o.limit > fairness.MaxCoalitionLimit {
		return &usageError{fmt.Sprintf("--%s must be between 0 and %d, got %d", flagCoalitionLimit, fairness.MaxCoalitionLimit, o.limit)}
	}
	return nil
}

// runLimit is the limit as fairness.RunOptions.CoalitionLimit reads it
// (negative for none, as 0 there means the default).
func (o coalitionOptions) runLimit() int {
	if o.limit == 0 {
		return -1
	}
	return o.limit
}

// withoutCoalitions returns res, or without json a copy whose metrics
// carry neither the coalitions nor the reason they are absent: the JSON
// output has them only on request, as they are 2^k values per metric.
func withoutCoalitions(res *fairness.Result, json bool) *fairness.Result {
	if json {
		return res
	}
	cp := *res
	cp.Metrics = append([]fairness.MetricResult(nil), res.Metrics...)
	for i := range cp.Metrics {
		cp.Metrics[i].Coalitions, cp.Metrics[i].CoalitionsOmitted = nil, ""
	}
	return &cp
}
