package report

import (
	"fmt"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// intervalLevel prints the level of the Result's bootstrap intervals as a
// percentage ("95%", "90%", "97.5%"); without settings.intervals it is the
// default level, 95%.
func intervalLevel(res *fairness.Result) string {
	level := fairness.DefaultIntervalLevel
	if iv := res.Settings.Intervals; iv != nil && iv.Level > 0 {
		level = iv.Level
	}
	return trimPercent(level)
}

// trimPercent prints a probability as a percentage with up to two
// decimals and no trailing zeros: 0.95 → "95%", 0.975 → "97.5%".
func trimPercent(p float64) string {
	s := strings.TrimRight(strings.TrimRight(fmt.Sprintf("%.2f", 100*p), "0"), ".")
	return s + "%"
}

// intervalName is the heading of an interval column, e.g. "95% interval".
func intervalName(res *fairness.Result) string {
	return intervalLevel(res) + " interval"
}

// intervalSetting describes how the intervals were made, e.g. "200
// bootstrap replicates, classifiers refitted in each, level 95%"; "" when
// no bootstrap ran.
func intervalSetting(res *fairness.Result) string {
	iv := res.Settings.Intervals
	if iv == nil {
		return ""
	}
	mode := "classifiers refitted in each"
	if iv.KeepRatios {
		mode = "fitted density ratios kept (fast mode: narrower)"
	}
	s := fmt.Sprintf("%d bootstrap replicates, %s, level %s", iv.Replicates, mode, intervalLevel(res))
	if r := res.Settings.FoldSplits; r > 1 {
		s += fmt.Sprintf(", replicates spread over the %d fold splits", r)
	}
	if iv.Failed > 0 {
		s += fmt.Sprintf("; %d could not be computed", iv.Failed)
	}
	return s
}

// foldSplitsSetting describes the fold splits behind the contributions,
// e.g. "1" or "10 (contributions are their mean; split SD is the spread
// between them)".
func foldSplitsSetting(r int) string {
	if r <= 1 {
		return fmt.Sprint(r)
	}
	return fmt.Sprintf("%d (contributions are their mean; split SD is the spread between them)", r)
}

// foldSplitsPhrase is the fold splits in the check table: "1 fold split"
// (also for 0, a plan that does not say) or "10 fold splits averaged".
func foldSplitsPhrase(r int) string {
	if r <= 1 {
		return "1 fold split"
	}
	return fmt.Sprintf("%d fold splits averaged", r)
}
