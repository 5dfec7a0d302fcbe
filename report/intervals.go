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
	if l, ok := influenceIntervals(res); ok {
		level = l
	}
	return trimPercent(level)
}

// trimPercent prints a probability as a percentage with up to two
// decimals and no trailing zeros: 0.95 → "95%", 0.975 → "97.5%".
func trimPercent(p float64) string {
	s := strings.TrimRight(strings.TrimRight(fmt.Sprintf("%.2f", 100*p), "0"), ".")
	return s + "%"
}

// intervalName is the heading of an interval column of observed values
// (the groups' metrics and the gap), e.g. "95% interval". The bootstrap
// resamples those directly in either mode, so they are never approximate.
func intervalName(res *fairness.Result) string {
	return intervalLevel(res) + " interval"
}

// approximateIntervals reports whether the intervals of estimated
// quantities (contributions, the residual) come from the fast bootstrap,
// which keeps the fitted density ratios: it leaves out the classifiers'
// own estimation error, so those intervals are too narrow.
func approximateIntervals(res *fairness.Result) bool {
	iv := res.Settings.Intervals
	return iv != nil && iv.KeepRatios
}

// estimateIntervalName is the heading of an interval of an estimated
// quantity (a contribution, the residual): intervalName, prefixed
// "approximate" when approximateIntervals.
func estimateIntervalName(res *fairness.Result) string {
	if approximateIntervals(res) {
		return "approximate " + intervalName(res)
	}
	return intervalName(res)
}

// approximateNote says why the contributions' intervals are approximate,
// or "" when they are not.
func approximateNote(res *fairness.Result) string {
	if !approximateIntervals(res) {
		return ""
	}
	return "Contribution intervals are approximate: the fast bootstrap kept the fitted density ratios, so they leave out the classifiers' own error and are too narrow; refit in every replicate (intervals key keep_ratios: false, or --fast-intervals=false) for intervals to rely on. The groups' values and the gap are resampled directly and are not affected."
}

// intervalSetting describes how the intervals were made, e.g. "50
// bootstrap replicates, classifiers refitted in each, normal form
// (estimate ± t × bootstrap standard error), level 95%"; "" when no
// bootstrap ran (see noIntervals).
func intervalSetting(res *fairness.Result) string {
	iv := res.Settings.Intervals
	if iv == nil {
		if _, ok := influenceIntervals(res); ok {
			return fmt.Sprintf("influence function of the robust estimator (Wald intervals, no refits), level %s", intervalLevel(res))
		}
		return ""
	}
	mode := "classifiers refitted in each"
	if iv.KeepRatios {
		mode = "fitted density ratios kept (fast mode: contribution intervals approximate, too narrow)"
	}
	s := fmt.Sprintf("%d bootstrap replicates, %s, %s, level %s", iv.Replicates, mode, formPhrase(iv.Form), intervalLevel(res))
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

// formPhrase names how the intervals were read off the replicates, e.g.
// "normal form (estimate ± t × bootstrap standard error; a rate's group values and gap by score intervals)".
func formPhrase(f fairness.IntervalForm) string {
	if f == fairness.FormPercentile {
		return "percentile form (the replicates' quantiles)"
	}
	return "normal form (estimate ± t × bootstrap standard error; a rate's group values and gap by score intervals)"
}

// noIntervals is what the reports say in place of intervalSetting when no
// bootstrap ran.
const noIntervals = "none (decompose adds them unless --intervals 0 or intervals.replicates: 0 turns them off); no value here shows its sampling error"

// intervalSettingOrNone is intervalSetting, or noIntervals when no
// bootstrap ran.
func intervalSettingOrNone(res *fairness.Result) string {
	if s := intervalSetting(res); s != "" {
		return s
	}
	return noIntervals
}
