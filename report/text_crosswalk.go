package report

// crosswalkPointer is the text report's last line: where the appendix of
// reporting items (crosswalk.go) is, which only the Markdown and HTML
// reports print in full.
const crosswalkPointer = "Reporting items (TRIPOD+AI, model cards, EU AI Act Article 10): the appendix of the Markdown and HTML reports (--format markdown, or report.html with --out) lists which this report supplies, partly supplies or does not supply; it is not a compliance statement."
