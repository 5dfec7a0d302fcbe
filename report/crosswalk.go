package report

// The appendix that every report ends with: which items of three published
// reporting frameworks this report gives evidence for, and which it does
// not. Its wording is fixed (it describes what gapwise's reports contain,
// not what one result holds) and lives only here; text, Markdown and HTML
// render it. It is a factual map, not a statement of compliance.

// crosswalkSource is one framework the appendix maps the report to: the
// short name its rows use and its full citation, worded as in the
// project's checked references (README, References).
type crosswalkSource struct {
	Short, Citation string
}

// crosswalkSources are the frameworks, in the order of the rows.
var crosswalkSources = []crosswalkSource{
	{"TRIPOD+AI", "G. S. Collins, K. G. M. Moons, P. Dhiman, et al. (2024). TRIPOD+AI statement: updated guidance for reporting clinical prediction models that use regression or machine learning methods. BMJ 385:e078378. doi:10.1136/bmj-2023-078378."},
	{"Model cards", "M. Mitchell, S. Wu, A. Zaldivar, P. Barnes, L. Vasserman, B. Hutchinson, E. Spitzer, I. D. Raji, T. Gebru (2019). Model cards for model reporting. Proceedings of the Conference on Fairness, Accountability, and Transparency (FAT* 2019), 220–229 (pages from memory)."},
	{"EU AI Act", `Regulation (EU) 2024/1689 (Artificial Intelligence Act), Article 10 "Data and data governance".`},
}

// What a report does for an item.
const (
	crosswalkSupplied    = "supplied"
	crosswalkPartly      = "partly"
	crosswalkNotSupplied = "not supplied"
)

// crosswalkWhere names the parts of each output that hold an item's
// evidence: HTML section ids (rendered as links with the sections'
// headings, htmlSections) and Markdown headings (or a part without one,
// crosswalkMarkdownPlaces); none means the output has nothing towards it.
// The text report points to the appendix of the other two
// (crosswalkPointer).
type crosswalkWhere struct {
	HTML     []string
	Markdown []string
}

// crosswalkMarkdownPlaces are the parts of the Markdown report without a
// heading of their own that the crosswalk names, with the heading they
// follow: the groups' sizes are in the paragraph after the warnings, and
// each metric's decomposition has a heading of its own.
var crosswalkMarkdownPlaces = map[string]string{
	"the paragraph on the groups": "Warnings",
	"Decomposition of the … gap":  "Decomposition of the ",
}

// crosswalkItem is one row of the appendix: the framework (Short of a
// crosswalkSource), the item in our words (the EU AI Act's points quoted
// as our references word them), whether the report supplies it, what it
// gives towards it or lacks, and where.
type crosswalkItem struct {
	Source, Item, Status, What string
	Where                      crosswalkWhere
}

// crosswalkItems are the rows of the appendix. TRIPOD+AI's items are
// named by what they ask rather than by number.
var crosswalkItems = []crosswalkItem{
	{
		Source: "TRIPOD+AI", Status: crosswalkPartly,
		Item:  "Performance measures with confidence intervals, including for key subgroups",
		What:  "each audited metric for the two compared groups and their gap, with percentile bootstrap intervals when the audit asks for them (spec key intervals or --intervals); one grouping column and two of its values per audit",
		Where: crosswalkWhere{HTML: []string{"overview", "groups"}, Markdown: []string{"Overview", "Metrics by group"}},
	},
	{
		Source: "TRIPOD+AI", Status: crosswalkPartly,
		Item:  "Calibration as well as discrimination",
		What:  "calibration-in-the-large, expected calibration error, Brier score and the area under the ROC curve per group when the spec lists them, each split into mechanism contributions; the HTML page adds each group's reliability curve and table; no calibration slope or smoothed calibration curve",
		Where: crosswalkWhere{HTML: []string{"groups", "decomposition"}, Markdown: []string{"Metrics by group", "Decomposition of the … gap"}},
	},
	{
		Source: "TRIPOD+AI", Status: crosswalkPartly,
		Item:  "Approaches to model fairness",
		What:  "measures the gap between two groups in each metric and estimates how much each mechanism of the causal graph contributes to it; does not describe how fairness was addressed when the model was developed",
		Where: crosswalkWhere{HTML: []string{"overview", "decomposition", "whatif"}, Markdown: []string{"Overview", "Decomposition of the … gap"}},
	},
	{
		Source: "TRIPOD+AI", Status: crosswalkNotSupplied,
		Item:  "The other items: data sources, participants, outcome and predictors, sample size, model development and specification, the full validation",
		What:  "these belong to the model's own development and validation report; the audit gives the audited records' group sizes, events and rows dropped for missing values, and the inputs' SHA-256 digests",
		Where: crosswalkWhere{HTML: []string{"summary", "reproducibility"}, Markdown: []string{"the paragraph on the groups"}},
	},
	{
		Source: "Model cards", Status: crosswalkPartly,
		Item:  "Disaggregated evaluation: quantitative analyses reported per group",
		What:  "every audited metric for each of the two groups, with the gap and its interval; one factor and two of its groups per audit (run one audit per pair of groups for more)",
		Where: crosswalkWhere{HTML: []string{"overview", "groups"}, Markdown: []string{"Overview", "Metrics by group"}},
	},
	{
		Source: "Model cards", Status: crosswalkNotSupplied,
		Item: "Intersectional evaluation: analyses for combinations of factors",
		What: "one grouping column per audit; an intersection (say, women over 65) can be audited as a group through a column that combines the factors",
	},
	{
		Source: "Model cards", Status: crosswalkPartly,
		Item:  "The other sections: model details, intended use, factors, training data, ethical considerations, caveats and recommendations",
		What:  "only the caveats of this audit (its assumptions and cautions); the rest is the model owner's to state",
		Where: crosswalkWhere{HTML: []string{"assumptions"}, Markdown: []string{"Assumptions and cautions"}},
	},
	{
		Source: "EU AI Act", Status: crosswalkPartly,
		Item:  "Article 10(2)(f): examination in view of possible biases likely to affect health and safety or lead to prohibited discrimination",
		What:  "examines the model's performance in two groups of the audited records and how the groups' data differ, mechanism by mechanism (contributions, diagnostics) and, on the HTML page, column by column; it does not examine the training, validation and testing data sets or the data governance that Article 10 covers",
		Where: crosswalkWhere{HTML: []string{"overview", "decomposition", "drilldown", "diagnostics"}, Markdown: []string{"Overview", "Decomposition of the … gap"}},
	},
	{
		Source: "EU AI Act", Status: crosswalkPartly,
		Item:  "Article 10(2)(g): appropriate measures to detect, prevent and mitigate those biases",
		What:  "detection only: the gaps, the mechanisms behind them and, on the HTML page, what-if estimates of the gap if chosen mechanisms were the same in both groups; no measure to prevent or mitigate is taken or assessed",
		Where: crosswalkWhere{HTML: []string{"overview", "decomposition", "whatif"}, Markdown: []string{"Overview", "Decomposition of the … gap"}},
	},
	{
		Source: "EU AI Act", Status: crosswalkPartly,
		Item:  "Article 10(2)(h): identification of relevant data gaps or shortcomings",
		What:  "the warnings flag small groups and few events, poor overlap between the groups, heavy-tailed weights, rows dropped for missing values and model inputs outside the graph; unrecorded variables and errors in the label itself stay invisible to the tool",
		Where: crosswalkWhere{HTML: []string{"warnings-section"}, Markdown: []string{"Warnings"}},
	},
}

// crosswalkIntro and crosswalkNote open and close the appendix.
const (
	crosswalkIntro = "Which items of three published reporting frameworks this report gives evidence for, and which it does not. The list describes what gapwise's reports contain; it is the same for every audit."
	crosswalkNote  = "This is not a statement of compliance. Meeting TRIPOD+AI, writing a model card or fulfilling Article 10 of the EU AI Act rests on the whole documentation of a model and its data, judged by its developer, its deployer and the competent authorities; an audit is not a validation of the model or a conformity assessment."
)

// htmlSections are the headings of the HTML page's sections that the
// crosswalk points to, by id.
var htmlSections = map[string]string{
	"overview":         "Overview",
	"warnings-section": "Warnings",
	"summary":          "Summary",
	"groups":           "Group metrics",
	"decomposition":    "Where the gap comes from",
	"whatif":           "What if some mechanisms were the same in both groups?",
	"drilldown":        "Columns behind the largest contributions",
	"diagnostics":      "Diagnostics",
	"assumptions":      "Assumptions and cautions",
	"reproducibility":  "Reproducibility",
}
