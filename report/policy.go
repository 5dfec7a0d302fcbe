package report

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
)

// policyCaution is printed under every policy section.
const policyCaution = "The limits are the policy's, not gapwise's. A pass does not find the model fair, nor a breach unfair: " +
	"each check judges a statistical estimate under the assumptions stated in this report, and local regulation and institutional review govern what a gap means."

// policyRow is one check of a policy outcome as the reports show it; the
// limit is written in plain ASCII for the text report and with ≤, ≥ and ÷
// for Markdown and HTML.
type policyRow struct {
	Rule, Line                 int
	Metric, Group              string
	LimitPlain, Limit          string // e.g. "|gap| <= 5.00 pts", "lower ÷ higher ≥ 0.8"
	Judged                     string // "estimate", "worst bound of the 95% interval"
	Value                      string // the judged value, with the estimate beside a bound; "" when unjudged or skipped
	Status, StatusWord, Reason string // policy.Status*, its wording, and why a check was not judged
	Level                      string // the verdict class the HTML page colours it with (statusLevels)
	Preset                     string
}

// policyRows formats the checks of o in their order, naming the
// comparison group by its display name in names (nil: by its value).
func policyRows(o *policy.Outcome, names *fairness.Names) []policyRow {
	var rows []policyRow
	for _, c := range o.Checks {
		r := policyRow{Rule: c.Rule, Line: c.Line, Metric: c.Metric, Group: names.GroupName(c.Comparison, true), Judged: judgedWords(c),
			Status: c.Status, StatusWord: statusWords[c.Status], Level: statusLevels[c.Status], Reason: c.Reason, Preset: c.Preset}
		dec := checkDecimals(c)
		if c.Limit == policy.LimitMaxGap {
			lim := gapQuantity(c.Metric, c.LimitValue, dec)
			r.LimitPlain, r.Limit = "|gap| <= "+lim, "|gap| ≤ "+lim
		} else {
			lim := strconv.FormatFloat(c.LimitValue, 'g', -1, 64)
			r.LimitPlain, r.Limit = "lower/higher >= "+lim, "lower ÷ higher ≥ "+lim
		}
		if c.Value != nil && (c.Status == policy.StatusPass || c.Status == policy.StatusBreach) {
			r.Value = checkQuantity(c, *c.Value, dec)
			if c.Judge != policy.JudgeEstimate && c.Estimate != nil {
				r.Value += " (estimate " + checkQuantity(c, *c.Estimate, dec) + ")"
			}
		}
		rows = append(rows, r)
	}
	return rows
}

var statusWords = map[string]string{
	policy.StatusPass:     "pass",
	policy.StatusBreach:   "BREACH",
	policy.StatusUnjudged: "not judged, counted as a breach",
	policy.StatusSkipped:  "skipped",
}

// statusLevels maps a check's status to the verdict classes of the page:
// a pass looks sound, a breach unreliable, a check not judged calls for
// caution.
var statusLevels = map[string]string{
	policy.StatusPass:     "sound",
	policy.StatusBreach:   "unreliable",
	policy.StatusUnjudged: "caution",
	policy.StatusSkipped:  "note",
}

// judgedWords says what a check judged: the estimate or an interval bound.
func judgedWords(c policy.Check) string {
	switch c.Judge {
	case policy.JudgeWorstBound, policy.JudgeBestBound:
		which := "worst"
		if c.Judge == policy.JudgeBestBound {
			which = "best"
		}
		if c.Level == 0 {
			return which + " bound of the interval"
		}
		return fmt.Sprintf("%s bound of the %s interval", which, trimPercent(c.Level))
	}
	return "estimate"
}

// checkQuantity prints a judged value: |gap| in the metric's unit, a ratio
// as a plain number.
func checkQuantity(c policy.Check, v float64, dec int) string {
	if c.Limit == policy.LimitMaxGap {
		return gapQuantity(c.Metric, v, dec)
	}
	return strconv.FormatFloat(v, 'f', dec, 64)
}

// gapQuantity prints |gap| with dec decimals in the metric's unit
// ("5.00 pts" for a rate).
func gapQuantity(metric string, v float64, dec int) string {
	s := magnitudeAt(metric, v, dec)
	if isProportion(metric) {
		s += " pts"
	}
	return s
}

// checkDecimals returns the decimals at which a check's value prints
// apart from its limit when it breaches (so that "5.00 pts" never shows a
// breach of "5.00 pts"): two for a gap in points, three otherwise, up to
// three more when needed.
func checkDecimals(c policy.Check) int {
	dec := 3
	if c.Limit == policy.LimitMaxGap && isProportion(c.Metric) {
		dec = 2
	}
	if c.Value == nil || c.Status != policy.StatusBreach {
		return dec
	}
	for extra := 0; extra < 3 && checkQuantity(c, *c.Value, dec) == checkQuantity(c, c.LimitValue, dec); extra++ {
		dec++
	}
	return dec
}

// policyHeadline is the one-line verdict: "passed: 3 checks, none
// breached" or "BREACHED: 1 of 3 checks".
func policyHeadline(o *policy.Outcome) string {
	judged := 0
	for _, c := range o.Checks {
		if c.Status != policy.StatusSkipped {
			judged++
		}
	}
	if o.Passed {
		return fmt.Sprintf("passed: %s, none breached", plural(judged, "check", "checks"))
	}
	return fmt.Sprintf("BREACHED: %d of %s", o.Breaches, plural(judged, "check", "checks"))
}

// policyNotes returns, once per preset used, the preset's caution, e.g.
// that the four-fifths rule is an employment rule used as an analogy.
func policyNotes(o *policy.Outcome) []string {
	var notes []string
	seen := map[string]bool{}
	for _, c := range o.Checks {
		if c.Preset != "" && c.Note != "" && !seen[c.Preset] {
			seen[c.Preset] = true
			notes = append(notes, fmt.Sprintf("Preset %s: %s.", c.Preset, c.Note))
		}
	}
	return notes
}

// PolicyBreachMessage is the one-line message with which the command line
// ends a run whose result breaches its policy (exit status 3): the file,
// how many checks breached, and the first three.
func PolicyBreachMessage(o *policy.Outcome) string {
	var parts []string
	rows := policyRows(o, nil)
	for _, r := range rows {
		if r.Status != policy.StatusBreach && r.Status != policy.StatusUnjudged {
			continue
		}
		if len(parts) == 3 {
			parts = append(parts, "...")
			break
		}
		what := fmt.Sprintf("rule %d (line %d) %s for %q: %s", r.Rule, r.Line, r.Metric, r.Group, r.LimitPlain)
		if r.Status == policy.StatusBreach {
			what += " breached at " + r.Value
		} else {
			what += " not judged (" + r.Reason + ")"
		}
		parts = append(parts, what)
	}
	return fmt.Sprintf("policy %s %s: %s", o.File, strings.ToLower(policyHeadline(o)), strings.Join(parts, "; "))
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}
