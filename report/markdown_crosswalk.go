package report

import "strings"

// mdCrosswalk prints the appendix of reporting items (crosswalk.go) as a
// table, with the frameworks' citations and crosswalkNote.
func mdCrosswalk(p mdPrinter) {
	p("### Appendix: reporting items\n\n%s\n\n", mdText(crosswalkIntro))
	p("| Framework | Item | This report | What it gives | Where |\n")
	p("| --- | --- | --- | --- | --- |\n")
	for _, it := range crosswalkItems {
		where := make([]string, len(it.Where.Markdown))
		for i, w := range it.Where.Markdown {
			where[i] = mdText(w)
		}
		p("| %s | %s | **%s** | %s | %s |\n", mdText(it.Source), mdText(it.Item), mdText(it.Status), mdText(it.What), orDash(strings.Join(where, "; ")))
	}
	p("\nSources:\n\n")
	for _, s := range crosswalkSources {
		p("- %s: %s\n", mdText(s.Short), mdText(s.Citation))
	}
	p("\n%s\n\n", mdText(crosswalkNote))
}
