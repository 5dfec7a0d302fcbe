package report

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

// WriteText renders res as a plain-text report for a terminal: first the
// overview of every metric (overviewRows: the gap, the largest
// contribution and its share, the verdict) with a caution, and the
// warnings with their severities, most serious first; then the groups
// and their sizes; per metric the reference and comparison values, the gap,
// each mechanism's contribution (Shapley value), its effect alone v({i}) and
// the gap if it alone were equalised v(N∖{i}) (with the Monte Carlo
// standard error when the values were sampled, the standard deviation
// over the fold splits when there were several, and the difference between
// the two sides' estimates when both sides estimate), the residual
// gap − Σ contributions with what it holds, the effective records behind
// the estimate and the comparison of the two sides; then per-mechanism diagnostics, the
// assumptions under which the numbers hold, the inputs and settings, and
// the appendix of reporting items (crosswalk.go). Columns are aligned; metric
// values print with four decimals, differences with a sign. NaN prints as
// "n/a". It returns the first write error.
func WriteText(w io.Writer, res *fairness.Result) error {
	bw := bufio.NewWriter(w)
	tw := &textWriter{w: bw}
	tw.header(res)
	tw.overview(res)
	tw.warnings(res)
	tw.policy(res)
	tw.groups(res)
	for i, m := range res.Metrics {
		tw.metric(res, i, m)
	}
	tw.hiddenFactor(res)
	tw.altGraphs(res)
	tw.diagnostics(res)
	tw.list("Assumptions and cautions", res.Assumptions, "")
	tw.inputs(res)
	tw.line("")
	tw.line("%s", crosswalkPointer)
	return bw.Flush()
}

// textWriter accumulates the report; bufio.Writer keeps the first error.
type textWriter struct{ w *bufio.Writer }

// line prints one line, with every control character in it, user text's
// included, shown escaped (Printable): the report's own text has none.
func (t *textWriter) line(format string, args ...any) {
	fmt.Fprintln(t.w, Printable(fmt.Sprintf(format, args...)))
}

func (t *textWriter) header(res *fairness.Result) {
	if res.Title != "" {
		t.line("%s", strings.Join(strings.Fields(res.Title), " "))
	}
	t.line("%s %s: audit of %s against label %s%s, positive when score >= %s",
		res.Tool.Name, res.Tool.Version, quotedWithID(colLabel(res, res.Score), res.Score), quotedWithID(nodeName(res, res.Label), res.Label),
		labelWords(res.LabelValues), trimFloat(res.Threshold))
	if m := modelLabel(res); m != "" {
		t.line("model audited: %s", m)
	}
	if res.AuditDate != "" {
		t.line("audit date: %s", res.AuditDate)
	}
	if res.Synthetic {
		t.line("SYNTHETIC DATA: the records are invented and describe no real patients.")
	}
	t.line("")
}

func (t *textWriter) groups(res *fairness.Result) {
	g := res.Groups
	t.line("Groups (column %s)", quotedWithID(colLabel(res, g.Column), g.Column))
	tab := textTable{header: []string{"role", "value", "records", "events", "dropped"}, right: []bool{false, false, true, true, true}}
	named := refName(res) != g.Reference || cmpName(res) != g.Comparison
	if named {
		tab = textTable{header: []string{"role", "group", "value", "records", "events", "dropped"}, right: []bool{false, false, false, true, true, true}}
	}
	for _, r := range []struct {
		role, name, value string
		n, events         int
		dropped           string
	}{
		{"reference", refName(res), g.Reference, g.NReference, g.EventsReference, countAt(res, fairness.PathDroppedReference, g.DroppedReference, strconv.Itoa)},
		{"comparison", cmpName(res), g.Comparison, g.NComparison, g.EventsComparison, countAt(res, fairness.PathDroppedComparison, g.DroppedComparison, strconv.Itoa)},
	} {
		row := []string{r.role, r.value, fmt.Sprint(r.n), fmt.Sprint(r.events), r.dropped}
		if named {
			row = append([]string{r.role, r.name}, row[1:]...)
		}
		tab.add(row...)
	}
	tab.write(t.w, "  ")
	if s := excludedSentence(res); s != "" {
		t.line("  %s", s)
	}
	t.line("")
}

func (t *textWriter) metric(res *fairness.Result, mi int, m fairness.MetricResult) {
	t.line("%s (%s)", m.Metric, MetricTitle(m.Metric))
	vals := textTable{header: []string{"", "value", intervalName(res), "from"}, right: []bool{false, true, true, true}}
	vals.add("reference", fixed(m.Reference), interval(m.ReferenceCI, fixed), basis(m.Metric, m.RecordsReference))
	vals.add("comparison", fixed(m.Comparison), interval(m.ComparisonCI, fixed), basis(m.Metric, m.RecordsComparison))
	vals.add("gap (comparison - reference)", signed(m.Gap), interval(m.GapCI, signed), "")
	impactRow(&vals, m)
	if a := m.AllRecords; a != nil {
		vals.add("gap before dropping rows", signed(a.Gap), "", fmt.Sprintf("%s / %s records",
			countAt(res, fairness.AllRecordsPath(mi, "n_reference"), a.NReference, thousandsText), countAt(res, fairness.AllRecordsPath(mi, "n_comparison"), a.NComparison, thousandsText)))
	}
	vals.dropEmpty()
	vals.write(t.w, "  ")
	t.line("")

	hasCI, hasSE, hasSD, hasSides := false, false, false, false
	for _, c := range m.Contributions {
		hasCI = hasCI || (c.CILow != nil && c.CIHigh != nil)
		hasSE = hasSE || c.StdError != nil
		hasSD = hasSD || c.SplitSD != nil
		hasSides = hasSides || c.SideDifference != nil
	}
	head := []string{"mechanism", "contribution", "alone", "gap if equalised"}
	right := []bool{false, true, true, true}
	if hasSE {
		head = append(head, "std error")
		right = append(right, true)
	}
	if hasSD {
		head = append(head, "split SD")
		right = append(right, true)
	}
	if hasCI {
		head = append(head, estimateIntervalName(res))
		right = append(right, true)
	}
	if hasSides {
		head = append(head, "sides differ")
		right = append(right, true)
	}
	tab := textTable{header: head, right: right}
	for _, c := range m.Contributions {
		mech := contribMech(res, c)
		row := []string{mech, signed(c.Value), signed(c.Alone), signed(c.IfEqualised)}
		if c.NotEstimable {
			row = []string{mech, notEstimable, "", ""}
		}
		if hasSE {
			se := ""
			if c.StdError != nil {
				se = fixed(*c.StdError)
			}
			row = append(row, se)
		}
		if hasSD {
			sd := ""
			if c.SplitSD != nil && !c.NotEstimable {
				sd = fixed(*c.SplitSD)
			}
			row = append(row, sd)
		}
		if hasCI {
			ci := ""
			if c.CILow != nil && c.CIHigh != nil && !c.NotEstimable {
				ci = "[" + signed(*c.CILow) + ", " + signed(*c.CIHigh) + "]"
			}
			row = append(row, ci)
		}
		if hasSides {
			row = append(row, textSides(c))
		}
		tab.add(row...)
	}
	sum := make([]string, len(head))
	sum[0], sum[1] = sumLabel(m, "sum of contributions"), signed(m.Estimated)
	resid := make([]string, len(head))
	resid[0], resid[1] = "residual (gap - sum)", signed(m.Residual)
	tab.add(sum...)
	tab.add(resid...)
	tab.write(t.w, "  ")
	if m.EffectiveRecords > 0 {
		t.line("  effective records behind the estimated gap: %.1f", m.EffectiveRecords)
	}
	if m.ResidualSE != nil {
		t.line("  standard error of the residual (sampling of the records): %s", fixed(*m.ResidualSE))
	}
	if s := checksLines(m, textUnits); s != "" {
		t.line("  %s", s)
	}
	t.line("  %s", residualNote(res, m))
	t.line("")
}

func (t *textWriter) list(title string, items []string, empty string) {
	if len(items) == 0 && empty == "" {
		return
	}
	t.line("%s", title)
	if len(items) == 0 {
		t.line("  %s", empty)
	}
	for _, it := range items {
		t.line("  - %s", it)
	}
	t.line("")
}

func (t *textWriter) inputs(res *fairness.Result) {
	in := res.Inputs
	s := res.Settings
	tab := textTable{header: []string{"", ""}, noHeader: true}
	file := func(name, path, sum string) {
		if path != "" {
			tab.add(name, strings.TrimSpace(path+"  sha256 "+sum))
		}
	}
	file("spec", in.SpecFile, in.SpecSHA256)
	file("data", in.DataFile, in.DataSHA256)
	tab.add("seed", fmt.Sprint(res.Seed))
	if s.Folds > 0 {
		tab.add("folds", fmt.Sprint(s.Folds))
	}
	if s.FoldSplits > 0 {
		tab.add("fold splits", foldSplitsSetting(s.FoldSplits))
	}
	if s.Classifier != "" {
		c := s.Classifier
		if len(s.Learners) > 0 {
			c += " (" + strings.Join(s.Learners, ", ") + ")"
		}
		tab.add("classifier", c)
	}
	if len(s.ProbabilityColumns) > 0 {
		tab.add("read as logits", strings.Join(s.ProbabilityColumns, ", ")+" (probabilities)")
	}
	if s.ECEBins > 0 {
		tab.add("ece bins", fmt.Sprint(s.ECEBins))
	}
	if e := estimatorSetting(res); e != "" {
		tab.add("estimator", e)
	}
	if s.EstimateFrom != "" {
		tab.add("estimated from", s.EstimateFrom+" records")
	}
	if s.ClipRatios > 0 {
		tab.add("log-ratios clipped", fmt.Sprintf("to their central %s", trimPercent(s.ClipRatios)))
	}
	if s.ExactLimit > 0 {
		tab.add("exact Shapley up to", fmt.Sprintf("%d mechanisms", s.ExactLimit))
	}
	tab.add("intervals", intervalSettingOrNone(res))
	if s := suppressionSetting(res); s != "" {
		tab.add("small cells", s)
	}
	tab.add("missing values", missingSetting(s))
	t.line("Inputs and settings")
	tab.write(t.w, "  ")
}

// fixed prints a value with four decimals; NaN as "n/a".
func fixed(v float64) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	return zeroSign(fmt.Sprintf("%.4f", v))
}

// signed prints a difference with four decimals and a sign; a difference
// that rounds to zero prints as "0.0000"; NaN as "n/a".
func signed(v float64) string {
	if math.IsNaN(v) {
		return "n/a"
	}
	return zeroSign(fmt.Sprintf("%+.4f", v))
}

// zeroSign strips the sign from a number that prints as zero.
func zeroSign(s string) string {
	if strings.Trim(s, "+-0.") == "" {
		return strings.TrimLeft(s, "+-")
	}
	return s
}

// interval prints "[low, high]" with f, or "" for a nil interval.
func interval(ci *fairness.Interval, f func(float64) string) string {
	if ci == nil {
		return ""
	}
	return "[" + f(ci.Low) + ", " + f(ci.High) + "]"
}

// trimFloat prints v in the shortest form that reads back exactly.
func trimFloat(v float64) string {
	return fmt.Sprint(v)
}
