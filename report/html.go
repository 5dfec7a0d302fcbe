package report

import (
	"bytes"
	"embed"
	"fmt"
	"html"
	"html/template"
	"io"
	"math"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/gapwise/gapwise/fairness"
)

//go:embed templates/report.html.tmpl
var templateFS embed.FS

//go:embed assets/echarts.min.js
var echartsJS string

//go:embed assets/report.js
var reportJS string

//go:embed assets/report.css
var reportCSS string

var pageTemplate = template.Must(template.ParseFS(templateFS, "templates/report.html.tmpl"))

// drillNodes is how many of a metric's largest contributions the
// drill-down marks as the ones to look at first.
const drillNodes = 3

// WriteHTML writes res to w as one standalone HTML page: the audit's
// question, the overview of every metric and the warnings (most serious
// first), the plain-language summaries, the groups' metrics, confusion
// counts and reliability curves, the decomposition of every metric as a
// chart of each mechanism's contribution with its interval around zero
// (forestChart) beside a table, the
// causal graph shaded by contribution, per-column distributions for the
// largest contributions, estimation diagnostics, assumptions
// and cautions, the appendix of reporting items (crosswalk.go), and a
// reproducibility footer. All scripts (ECharts 6.1.0,
// vendored under assets/ with its licence), styles and data are inline: the
// page makes no network request. Its Content-Security-Policy admits
// those scripts and the style element by their SHA-256 hashes only
// (pagePolicy), so markup that an escaping bug let in could not run.
// Sections that need res.Details say so
// when it is nil; intervals appear only where the Result has them. It
// returns an error if the data cannot be encoded or w fails.
func WriteHTML(w io.Writer, res *fairness.Result) error {
	games, res := takeGames(res)
	res, err := visibleCopy(res)
	if err != nil {
		return err
	}
	p, err := newPage(res, games)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	if err := pageTemplate.Execute(&buf, p); err != nil {
		return fmt.Errorf("report: rendering HTML: %w", err)
	}
	_, err = w.Write(buf.Bytes())
	return err
}

// page is the view of a Result the template renders: every string is
// already formatted.
type page struct {
	Res          *fairness.Result
	Title        string
	Subject      template.HTML // what the audit evaluates: the model, or the score as code (subject)
	RefName      string        // the groups' display names (refName, cmpName)
	CmpName      string
	Names        namesView // display names of the header's facts
	Cohort       string
	Threshold    string
	LabelWords   string // how label words were read (labelWords), or ""
	Excluded     string // rows left out for their group value (excludedSentence)
	Metrics      []metricView
	Mechanisms   []mechanismView
	Confusion    []confusionView
	Reliability  []reliabilityRow
	HasDetails   bool
	Columns      []columnView
	Overview     []overviewView
	Caution      string   // overviewCaution
	Suppression  []string // suppressionSentences, none when it is off
	DroppedRef   string   // the groups' rows dropped for missing values, as suppression allows
	DroppedCmp   string
	Warnings     []warningView
	Assumptions  []string
	Settings     []keyValue
	Scripts      []template.JS     // the text of each script element, in order
	CSS          template.CSS      // the text of the style element
	Policy       template.HTMLAttr // content="…" of the Content-Security-Policy
	LowESSShare  string
	HasIntervals bool
	DrillNodes   int

	IntervalName    string // e.g. "95% interval"
	EstimateName    string // the contributions' intervals: IntervalName, "approximate" in the fast mode
	ApproximateNote string // why the contributions' intervals are approximate, or ""
	IntervalSetting string // how the intervals were made, or ""
	HasStdError     bool   // some contribution has a sampling standard error
	HasSides        bool   // some contribution has a difference between the sides
	HasSplitSD      bool   // some contribution has a spread over fold splits
	Diagnostics     diagnosticsView
	WhatIf          whatIfView // the what-if panel (html_whatif.go)
	Gate            *gateView  // the policy section (html_policy.go), nil without a policy
	ImpactNote      string     // what the ratio beside a rate's gap is (impactNote), or ""
	Crosswalk       crosswalkView
	HiddenFactor    *hiddenView    // the sensitivity section (sensitivity_html.go), nil without one
	AltGraphs       *altGraphsView // the alternative graphs (altgraph_html.go), nil without them
}

type keyValue struct{ Key, Value string }

// overviewView is one metric's row of the overview (overviewRow), its
// user text escaped for HTML (htmlInline).
type overviewView struct {
	Metric                            string
	Title, Lead, Because              template.HTML
	Reference, Comparison, Gap, Share string
	Level, Verdict                    string
	Refs                              []int
}

// warningView is one warning as the page lists it: its number in
// warningOrder, its severity and its sentence.
type warningView struct {
	Number   int
	Severity string
	Message  template.HTML
}

// metricView is one metric's summary, group values and decomposition.
type metricView struct {
	Name, Title                      string
	Summary                          template.HTML
	Reference, Comparison, Gap       string
	ReferenceCI, ComparisonCI, GapCI string
	Estimated, Residual              string
	Basis                            string // records each group's value rests on (basisPair)
	SumLabel                         string // "Sum of contributions", noting those not shown (sumLabel)
	AllRecords                       string // the gap before rows were dropped (allRecordsText), or ""
	Impact                           string // the impact ratio of a rate (impactText), or ""
	SidesNote, ResidualNote          string // sidesLine ("" without) and residualNote
	Rows                             []contributionRow
	Selected                         bool
	TopNodes                         []string
}

type contributionRow struct {
	Node, Mechanism, Value, CI, Alone, IfEqualised string
	StdError                                       string // "" unless sampled
	Sides                                          string // difference between the sides, or ""
	Role                                           string // gapRole: "widens", "narrows" or "neutral"
	RoleWords                                      string // the role in words
	SplitSD                                        string // "" for one fold split
	Unreliable                                     string // reason, or ""
}

type mechanismView struct {
	Node, Mechanism, Parents, Columns string
	Classifier, ParentClassifier      string
	AUC, ESS, ESSShare, MaxShare      string
	MeanRatio                         string
	Unreliable                        string

	WorstStratum, Extreme, ComparisonESS    string
	Tail, ComparisonTail, ComparisonExtreme string
	ClippedReference, ClippedComparison     string
}

type confusionView struct {
	Group, Role           string
	N, Events, Prevalence string
	TP, FP, TN, FN        string
	TPShade, FPShade      tint // the cell's shade
	TNShade, FNShade      tint
}

type reliabilityRow struct {
	Group, Bin, Count, MeanScore, EventRate string
}

type columnView struct {
	Name, Node, Mechanism string        // Name is the column, the page script's key
	Label                 template.HTML // the column as the card names it: display name and unit, then the column (colCode)
	LabelText             string        // the same as text (colWithID)
	Kind                  string        // "numeric", "categorical" or "numeric, two values" (binary)
	OutsideGraph          bool          // a declared model input in no graph node
	StdDiff               string
	Imbalanced            bool
	Levels                bool // described by levels, with counts, rather than bins
	Bins                  []binRow
	Summary               string
}

// binRow is one bin or level of a column card's table: each group's share
// and, for levels, its records.
type binRow struct{ Bin, Reference, Comparison, ReferenceCount, ComparisonCount string }

// chartData is everything the page script draws, keyed for lookup.
type chartData struct {
	Metric      string                  `json:"metric"` // initially selected
	Forest      map[string]chartOption  `json:"forest"`
	Graph       map[string]chartOption  `json:"graph"`
	Reliability chartOption             `json:"reliability,omitempty"`
	Columns     map[string]chartOption  `json:"columns"`
	Order       map[string][]string     `json:"order"`  // per metric: column names, largest contributions first
	Top         map[string][]string     `json:"top"`    // per metric: the drillNodes largest contributions' columns
	WhatIf      map[string]whatIfMetric `json:"whatif"` // per metric with coalitions: its game (whatIf)
}

// newPage formats res for the template and builds the chart options;
// games holds the metrics' games over all coalitions (takeGames).
func newPage(res *fairness.Result, games map[string][]float64) (*page, error) {
	p := &page{
		Res:             res,
		Title:           fmt.Sprintf("Performance audit of %s: %s compared with %s", subject(res, plainText), cmpName(res), refName(res)),
		Subject:         template.HTML(subject(res, htmlInline)),
		RefName:         refName(res),
		CmpName:         cmpName(res),
		Names:           headerNames(res),
		IntervalName:    intervalName(res),
		EstimateName:    estimateIntervalName(res),
		ApproximateNote: approximateNote(res),
		IntervalSetting: intervalSetting(res),
		Diagnostics:     diagnostics(res),
		Cohort:          filepath.Base(res.Inputs.DataFile), // the footer has the full path
		Threshold:       formatThreshold(res.Threshold),
		Excluded:        excludedSentence(res),
		LabelWords:      labelWords(res.LabelValues),
		Assumptions:     res.Assumptions,
		LowESSShare:     fmt.Sprintf("%.0f%%", 100*fairness.WarnESSShare),
		DrillNodes:      drillNodes,
		Caution:         overviewCaution,
		Gate:            policyGate(res),
		ImpactNote:      impactNote(res),
		Crosswalk:       crosswalkPage(),
		Suppression:     suppressionSentences(res),
		DroppedRef:      countAt(res, fairness.PathDroppedReference, res.Groups.DroppedReference, strconv.Itoa),
		DroppedCmp:      countAt(res, fairness.PathDroppedComparison, res.Groups.DroppedComparison, strconv.Itoa),
	}
	if res.Inputs.DataFile == "" {
		p.Cohort = "the audited records"
	}
	if len(res.Metrics) > 0 {
		p.HiddenFactor = hiddenPage(res, res.Metrics[0].Metric)
		p.AltGraphs = altGraphPage(res, res.Metrics[0].Metric)
	}
	if res.Title != "" {
		p.Title = res.Title
	}
	data := chartData{Forest: map[string]chartOption{}, Graph: map[string]chartOption{}, Columns: map[string]chartOption{},
		Order: map[string][]string{}, Top: map[string][]string{}}
	flags := unreliable(res)
	nodeOfColumn := map[string]string{}
	for _, m := range res.Mechanisms {
		for _, c := range m.Columns {
			nodeOfColumn[c] = m.Node
		}
	}
	for i, m := range res.Metrics {
		mv := metricView{Name: m.Metric, Title: MetricTitle(m.Metric), Selected: i == 0,
			Summary:   codeSpans(Summary(res, m)),
			Reference: formatValue(m.Metric, m.Reference), Comparison: formatValue(m.Metric, m.Comparison),
			Gap: formatDelta(m.Metric, m.Gap), ReferenceCI: formatValueInterval(m.Metric, m.ReferenceCI),
			ComparisonCI: formatValueInterval(m.Metric, m.ComparisonCI), GapCI: formatGapInterval(m),
			Estimated: formatDelta(m.Metric, m.Estimated), Residual: residualDelta(m),
			Basis: basisPair(m.Metric, m.RecordsReference, m.RecordsComparison), AllRecords: allRecordsText(m), Impact: impactText(m),
			SidesNote: checksLines(m, reportUnits), ResidualNote: residualNote(res, m), SumLabel: sumLabel(m, "Sum of contributions")}
		mv.Rows = p.contributionRows(res, m, flags)
		if m.ReferenceCI != nil || m.ComparisonCI != nil || m.GapCI != nil {
			p.HasIntervals = true
		}
		data.Forest[m.Metric] = forestChart(res, m)
		data.Graph[m.Metric] = graphChart(res, m)
		order, top := columnOrder(res, m, nodeOfColumn)
		data.Order[m.Metric], data.Top[m.Metric] = order, top
		mv.TopNodes = topNodes(m)
		p.Metrics = append(p.Metrics, mv)
	}
	if len(res.Metrics) > 0 {
		data.Metric = res.Metrics[0].Metric
	}
	p.WhatIf, data.WhatIf = whatIf(res, games)
	for _, m := range res.Mechanisms {
		p.Mechanisms = append(p.Mechanisms, mechanismDiagnostics(res, m, flags[m.Node]))
	}
	p.addOverview(res)
	p.addDetails(res, &data, nodeOfColumn)
	p.Settings = pageSettings(res, p.Threshold)
	js, err := encodeOptions(data)
	if err != nil {
		return nil, err
	}
	p.inline([]string{echartsJS, "window.gapwiseData = " + js + ";", reportJS}, reportCSS+tintRules(p.Confusion))
	return p, nil
}

// contributionRows returns metric m's contribution rows and notes on p
// which optional columns (intervals, standard errors, sides, split spread)
// any row fills.
func (p *page) contributionRows(res *fairness.Result, m fairness.MetricResult, flags map[string]string) []contributionRow {
	var rows []contributionRow
	for _, c := range m.Contributions {
		role := gapRole(m, c.Value)
		ci := formatDeltaInterval(m.Metric, c.CILow, c.CIHigh)
		if ci != "" {
			p.HasIntervals = true
		}
		row := contributionRow{Node: c.Node, Mechanism: contribMech(res, c), Value: formatDelta(m.Metric, c.Value),
			CI: ci, Alone: formatDelta(m.Metric, c.Alone), IfEqualised: formatDelta(m.Metric, c.IfEqualised),
			Role: role, RoleWords: roleWords[role], Unreliable: flags[c.Node]}
		if c.NotEstimable {
			row.Value, row.CI, row.Alone, row.IfEqualised, row.Role, row.RoleWords = notEstimable, "", "–", "–", "none", "not estimable"
		}
		if c.StdError != nil {
			row.StdError = formatSpread(m.Metric, *c.StdError)
			p.HasStdError = true
		}
		if row.Sides = contributionSides(m.Metric, c, reportUnits); row.Sides != "" {
			p.HasSides = true
		}
		if c.SplitSD != nil && !c.NotEstimable {
			row.SplitSD = formatSpread(m.Metric, *c.SplitSD)
			p.HasSplitSD = true
		}
		rows = append(rows, row)
	}
	return rows
}

// addOverview sets the page's overview rows and its warnings, most
// serious first.
func (p *page) addOverview(res *fairness.Result) {
	for _, r := range overviewRows(res, htmlInline) {
		p.Overview = append(p.Overview, overviewView{Metric: r.Metric, Title: template.HTML(r.Title), Lead: template.HTML(r.Lead),
			Because: template.HTML(r.Because), Reference: r.Reference, Comparison: r.Comparison, Gap: r.Gap, Share: r.Share,
			Level: r.Level, Verdict: r.Verdict, Refs: r.Refs})
	}
	for n, i := range warningOrder(res.Warnings) {
		w := res.Warnings[i]
		p.Warnings = append(p.Warnings, warningView{Number: n + 1, Severity: severityWord(w.Severity), Message: codeSpans(w.Message)})
	}
}

// addDetails sets the page's confusion tables, reliability bins and
// columns from res.Details, with their charts in data.
func (p *page) addDetails(res *fairness.Result, data *chartData, nodeOfColumn map[string]string) {
	if d := res.Details; d != nil {
		p.HasDetails = true
		p.Confusion = []confusionView{
			confusion(res, refName(res), "reference", d.Reference),
			confusion(res, cmpName(res), "comparison", d.Comparison),
		}
		for _, g := range []struct {
			name, role string
			d          fairness.GroupDetails
		}{{refName(res), "reference", d.Reference}, {cmpName(res), "comparison", d.Comparison}} {
			for j, b := range g.d.Curve {
				pct := func(field string, v float64) string {
					if t, ok := withheldText(res, fairness.ReliabilityPath(g.role, j, field)); ok {
						return t
					}
					return fmt.Sprintf("%.1f%%", 100*v)
				}
				p.Reliability = append(p.Reliability, reliabilityRow{Group: g.name,
					Bin:       fmt.Sprintf("%.0f–%.0f%%", 100*b.Lower, 100*b.Upper),
					Count:     countAt(res, fairness.ReliabilityPath(g.role, j, "count"), b.Count, strconv.Itoa),
					MeanScore: pct("mean_score", b.MeanScore), EventRate: pct("event_rate", b.EventRate)})
			}
		}
		data.Reliability = reliabilityChart(res, d)
		for i, c := range d.Columns {
			p.Columns = append(p.Columns, column(res, i, c, nodeOfColumn[c.Name]))
			data.Columns[c.Name] = columnChart(res, i, c)
		}
	}
}

// pageSettings lists the run's settings for the page's settings table;
// threshold is the decision threshold as shown.
func pageSettings(res *fairness.Result, threshold string) []keyValue {
	settings := []keyValue{
		{"Tool", strings.TrimSpace(res.Tool.Name + " " + res.Tool.Version)},
	}
	if m := modelLabel(res); m != "" {
		settings = append(settings, keyValue{"Model audited", m})
	}
	if res.AuditDate != "" {
		settings = append(settings, keyValue{"Audit date", res.AuditDate})
	}
	settings = append(settings, []keyValue{
		{"Spec file", res.Inputs.SpecFile}, {"Spec SHA-256", res.Inputs.SpecSHA256},
		{"Data file", res.Inputs.DataFile}, {"Data SHA-256", res.Inputs.DataSHA256},
		{"Seed", fmt.Sprint(res.Seed)}, {"Decision threshold", threshold},
		{"Cross-fitting folds", fmt.Sprint(res.Settings.Folds)}, {"Fold splits", foldSplitsSetting(res.Settings.FoldSplits)},
		{"Classifier setting", res.Settings.Classifier},
		{"Candidate learners", strings.Join(res.Settings.Learners, ", ")},
		{"Probabilities read as logits", probabilitySetting(res.Settings.ProbabilityColumns)},
		{"ECE bins", fmt.Sprint(res.Settings.ECEBins)}, {"Missing values", missingSetting(res.Settings)},
		{"Estimator", estimatorSetting(res)}, {"Hybrids estimated from", res.Settings.EstimateFrom}, {"Log-ratios clipped to", clipSetting(res.Settings.ClipRatios)},
		{"Exact Shapley values up to", exactSetting(res.Settings.ExactLimit)}, {"Intervals", intervalSettingOrNone(res)},
	}...)
	if s := suppressionSetting(res); s != "" {
		settings = append(settings, keyValue{"Small-cell suppression", s})
	}
	return settings
}

// clipSetting describes clip_ratios: "central 99% of each mechanism's
// log-ratios", or "no clipping".
func clipSetting(p float64) string {
	if p <= 0 {
		return "no clipping"
	}
	return "central " + trimPercent(p) + " of each mechanism's log-ratios"
}

// probabilitySetting lists the columns the classifiers read as logits, or
// says there are none.
func probabilitySetting(cols []string) string {
	if len(cols) == 0 {
		return "none"
	}
	return strings.Join(cols, ", ")
}

// exactSetting describes exact_limit, or "" when it is not recorded.
func exactSetting(k int) string {
	if k <= 0 {
		return ""
	}
	return fmt.Sprintf("%d mechanisms (sampled above)", k)
}

// topNodes returns the nodes of a metric's drillNodes largest |φ|.
func topNodes(m fairness.MetricResult) []string {
	idx := make([]int, len(m.Contributions))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool {
		return math.Abs(m.Contributions[idx[a]].Value) > math.Abs(m.Contributions[idx[b]].Value)
	})
	var out []string
	for _, i := range idx {
		if len(out) == drillNodes {
			break
		}
		out = append(out, m.Contributions[i].Node)
	}
	return out
}

// columnOrder lists the Details columns for a metric's drill-down: columns
// of nodes with larger |φ| first, then the rest in their own order; top
// holds the columns of the topNodes.
func columnOrder(res *fairness.Result, m fairness.MetricResult, nodeOfColumn map[string]string) (order, top []string) {
	if res.Details == nil {
		return []string{}, []string{}
	}
	rank := map[string]int{}
	for i, n := range topNodes(fairness.MetricResult{Contributions: m.Contributions}) {
		rank[n] = i
	}
	all := append([]fairness.Contribution{}, m.Contributions...)
	sort.SliceStable(all, func(a, b int) bool { return math.Abs(all[a].Value) > math.Abs(all[b].Value) })
	pos := map[string]int{}
	for i, c := range all {
		pos[c.Node] = i
	}
	var cols []string
	for _, c := range res.Details.Columns {
		cols = append(cols, c.Name)
	}
	key := func(col string) int {
		if i, ok := pos[nodeOfColumn[col]]; ok {
			return i
		}
		return len(all)
	}
	sort.SliceStable(cols, func(a, b int) bool { return key(cols[a]) < key(cols[b]) })
	top = []string{}
	for _, c := range cols {
		if _, ok := rank[nodeOfColumn[c]]; ok && key(c) < len(all) {
			top = append(top, c)
		}
	}
	return cols, top
}

// confusion formats one group's confusion counts; each cell's tint is its
// share of the group's records.
func confusion(res *fairness.Result, name, role string, g fairness.GroupDetails) confusionView {
	total := float64(g.N)
	shade := func(cell string, v float64) tint {
		if _, ok := withheldText(res, fairness.ConfusionPath(role, cell)); ok || total <= 0 {
			return "0" // a withheld count's shade would tell its size
		}
		return tint(fmt.Sprintf("%.2f", 0.08+0.6*v/total))
	}
	count := func(cell string, v float64) string {
		if t, ok := withheldText(res, fairness.ConfusionPath(role, cell)); ok {
			return t
		}
		return formatCount(v)
	}
	prev := "n/a"
	if g.N > 0 {
		prev = fmt.Sprintf("%.1f%%", 100*float64(g.Events)/float64(g.N))
	}
	return confusionView{Group: name, Role: role, N: fmt.Sprint(g.N), Events: fmt.Sprint(g.Events), Prevalence: prev,
		TP: count("tp", g.Confusion.TP), FP: count("fp", g.Confusion.FP), TN: count("tn", g.Confusion.TN), FN: count("fn", g.Confusion.FN),
		TPShade: shade("tp", g.Confusion.TP), FPShade: shade("fp", g.Confusion.FP), TNShade: shade("tn", g.Confusion.TN), FNShade: shade("fn", g.Confusion.FN)}
}

// stdDiffFlag is the |standardised difference| above which a column is
// marked as imbalanced: 0.1, common practice in balance diagnostics
// (Austin 2009, from memory).
const stdDiffFlag = 0.1

// column formats one column's distributions for its drill-down card.
func column(res *fairness.Result, i int, c fairness.ColumnDetails, node string) columnView {
	v := columnView{Name: c.Name, Label: colCode(res, c.Name), LabelText: colWithID(res, c.Name), Node: node, Kind: "numeric", StdDiff: "undefined", OutsideGraph: c.OutsideGraph}
	for _, m := range res.Mechanisms {
		if m.Node == node {
			v.Mechanism = mechName(res, m.Node)
		}
	}
	switch {
	case c.Categorical:
		v.Kind = "categorical"
	case c.Binary && len(c.Levels) == 1:
		v.Kind = "numeric, one value"
	case c.Binary:
		v.Kind = "numeric, two values"
	}
	v.Levels = c.Levels != nil
	if c.StdDiff != nil {
		v.StdDiff = trimNegZero(fmt.Sprintf("%.2f", *c.StdDiff))
		v.Imbalanced = math.Abs(*c.StdDiff) > stdDiffFlag
	}
	labels := binLabels(res, c)
	share := func(role string, j int, p float64) string {
		if t, ok := withheldText(res, fairness.SharePath(i, role, j)); ok {
			return t
		}
		return fmt.Sprintf("%.1f%%", 100*p)
	}
	count := func(role string, j, n int) string {
		return countAt(res, fairness.LevelCountPath(i, role, j), n, func(n int) string { return formatCount(float64(n)) })
	}
	for j := range c.Reference {
		row := binRow{Bin: labels[j], Reference: share("reference", j, c.Reference[j]), Comparison: share("comparison", j, c.Comparison[j])}
		if j < len(c.CountsReference) && j < len(c.CountsComparison) {
			row.ReferenceCount, row.ComparisonCount = count("reference", j, c.CountsReference[j]), count("comparison", j, c.CountsComparison[j])
		}
		v.Bins = append(v.Bins, row)
	}
	if !c.Categorical && !c.Binary {
		v.Summary = fmt.Sprintf("mean %s (SD %s) for %s, %s (SD %s) for %s", formatEdge(c.MeanRef), formatEdge(c.SDRef), refName(res),
			formatEdge(c.MeanCmp), formatEdge(c.SDCmp), cmpName(res))
	}
	return v
}

// codeSpans escapes text for HTML and turns `quoted` words into <code>
// elements.
func codeSpans(s string) template.HTML {
	parts := strings.Split(s, "`")
	var b strings.Builder
	for i, part := range parts {
		esc := html.EscapeString(part)
		if i%2 == 1 && i < len(parts)-1 {
			b.WriteString("<code>" + esc + "</code>")
		} else {
			if i%2 == 1 {
				b.WriteString("`")
			}
			b.WriteString(esc)
		}
	}
	return template.HTML(b.String())
}

// namesView holds the header's facts as the page shows them: display
// names, each followed by the identifier it stands for when it has one
// (withID; the column, label and score as code, codeWithID), and the
// model and audit date ("" when absent).
type namesView struct {
	GroupColumn, Label, Score template.HTML
	Reference, Comparison     string
	Model, AuditDate          string
}

// headerNames builds the header's facts of res.
func headerNames(res *fairness.Result) namesView {
	g := res.Groups
	return namesView{GroupColumn: colCode(res, g.Column), Reference: withID(refName(res), g.Reference),
		Comparison: withID(cmpName(res), g.Comparison), Label: codeWithID(nodeName(res, res.Label), res.Label),
		Score: colCode(res, res.Score), Model: modelLabel(res), AuditDate: res.AuditDate}
}

// colCode writes a column as colWithID does, label and identifier each as
// a <code> element.
func colCode(res *fairness.Result, col string) template.HTML {
	if res.Names.ColumnName(col) == col {
		return template.HTML(htmlInline.code(colLabel(res, col)))
	}
	return codeWithID(colLabel(res, col), col)
}

// codeWithID writes a display name as a <code> element followed by the
// identifier it stands for as another, when they differ; the identifier
// alone otherwise. Both are escaped.
func codeWithID(display, id string) template.HTML {
	if display == id {
		return template.HTML(htmlInline.code(id))
	}
	return template.HTML(htmlInline.code(display) + " (" + htmlInline.code(id) + ")")
}
