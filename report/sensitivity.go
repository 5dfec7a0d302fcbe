package report

import (
	"fmt"

	"github.com/gapwise/gapwise/fairness"
)

// hiddenIntro says, in plain words, what the sensitivity section shows
// and how far it goes; every report prints it above the tables.
const hiddenIntro = "How strong would a factor missing from the data have to be to change these conclusions? " +
	"Suppose an unrecorded factor shifts the odds that a patient belongs to the comparison group, given everything recorded, by up to a factor Λ " +
	"(Λ = 1.25: up to 25%). Each range below is what a contribution could become under such a factor " +
	"(marginal sensitivity model: Tan 2006; Zhao, Small & Bhattacharya 2019). The ranges are conservative: they let every mix of the groups' mechanisms take its own worst case, " +
	"so a range that reaches zero means the sign cannot be ruled out, not that it would change. " +
	"Whether such a factor exists is a question for subject-matter knowledge, not for the data."

// hiddenRow is one value of the sensitivity tables: the mechanism (or the
// estimated gap), its value, its range at each factor, the smallest
// factor that reaches zero, and the plain-words verdict.
type hiddenRow struct {
	Name     string // mechanism display name; "" for the estimated gap
	Value    float64
	Ranges   [][2]float64
	Reversal *float64
	Words    string
}

// hiddenMetric is one metric's sensitivity as the reports show it.
type hiddenMetric struct {
	Metric  string
	Skipped string
	Rows    []hiddenRow // the contributions, then the estimated gap
	Lead    string      // the sentence about the lead, or ""
}

// hiddenMetrics returns the sensitivity section of res per metric; nil
// when the result has none.
func hiddenMetrics(res *fairness.Result) []hiddenMetric {
	hf := res.HiddenFactor
	if hf == nil {
		return nil
	}
	var out []hiddenMetric
	for _, hm := range hf.Metrics {
		v := hiddenMetric{Metric: hm.Metric, Skipped: hm.Skipped}
		if hm.Skipped != "" {
			out = append(out, v)
			continue
		}
		for _, c := range hm.Contributions {
			v.Rows = append(v.Rows, hiddenRowOf(mechName(res, c.Node), c, "this contribution", hf.MaxFactor))
		}
		v.Rows = append(v.Rows, hiddenRowOf("", *hm.EstimatedGap, "the sign of the estimated gap", hf.MaxFactor))
		v.Lead = leadSentence(res, hm, hf.MaxFactor)
		out = append(out, v)
	}
	return out
}

func hiddenRowOf(name string, c fairness.HiddenFactorValue, what string, maxF float64) hiddenRow {
	r := hiddenRow{Name: name, Value: c.Value, Reversal: c.ReversalFactor, Words: reversalWords(c.ReversalFactor, what, maxF)}
	for _, b := range c.Bounds {
		r.Ranges = append(r.Ranges, [2]float64{b.Low, b.High})
	}
	return r
}

// reversalWords is the verdict in plain words at Λ = FragileFactor, with
// the smallest factor that could reverse the sign.
func reversalWords(rev *float64, what string, maxF float64) string {
	pct := oddsShift(fairness.FragileFactor)
	switch {
	case rev == nil:
		return fmt.Sprintf("an unrecorded factor that shifts the odds of group membership by up to %s could not reverse %s; not even one of Λ = %s could", pct, what, factorWords(maxF))
	case *rev <= 1:
		return fmt.Sprintf("%s is zero at the precision of the estimate: any unrecorded factor could change its sign", what)
	case *rev <= fairness.FragileFactor:
		return fmt.Sprintf("an unrecorded factor that shifts the odds of group membership by up to %s could reverse %s (from a shift of %s, Λ = %s)", pct, what, oddsShift(*rev), factorWords(*rev))
	}
	return fmt.Sprintf("an unrecorded factor that shifts the odds of group membership by up to %s could not reverse %s; it would take one of Λ = %s (a shift of %s)", pct, what, factorWords(*rev), oddsShift(*rev))
}

// leadSentence says from which factor another mechanism could lead.
func leadSentence(res *fairness.Result, hm fairness.HiddenFactorMetric, maxF float64) string {
	if hm.LeadNode == "" || len(hm.Contributions) < 2 {
		return ""
	}
	lead := mechName(res, hm.LeadNode)
	if hm.LeadChangeFactor == nil {
		return fmt.Sprintf("The largest contribution, that of %s, stays the largest under any unrecorded factor up to Λ = %s.", quoteName(lead), factorWords(maxF))
	}
	return fmt.Sprintf("The largest contribution, that of %s, could be overtaken by another mechanism's under an unrecorded factor of Λ = %s (a shift of %s in the odds of group membership).", quoteName(lead), factorWords(*hm.LeadChangeFactor), oddsShift(*hm.LeadChangeFactor))
}

// factorWords writes Λ with two decimals, or without decimals when whole.
func factorWords(f float64) string {
	if f == float64(int(f)) {
		return fmt.Sprintf("%d", int(f))
	}
	return fmt.Sprintf("%.2f", f)
}

// oddsShift writes Λ as the percentage shift of the odds it allows.
func oddsShift(f float64) string {
	return fmt.Sprintf("%.0f%%", 100*(f-1))
}

// quoteName quotes a mechanism for a sentence (backticks, as the warnings
// do; each report renders them as code).
func quoteName(s string) string { return "`" + s + "`" }

// factorHeads are the table's headings of the factors ("Λ = 1.25").
func factorHeads(res *fairness.Result) []string {
	var out []string
	for _, f := range res.HiddenFactor.Factors {
		out = append(out, "Λ = "+trimFloat(f))
	}
	return out
}
