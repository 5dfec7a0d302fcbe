package report

// crosswalkView is the appendix of reporting items as the page shows it
// (crosswalk.go).
type crosswalkView struct {
	Intro, Note string
	Rows        []crosswalkRow
	Sources     []crosswalkSource
}

// crosswalkRow is one item with links to the page's sections that hold
// it.
type crosswalkRow struct {
	Source, Item, Status, What string
	Where                      []keyValue // section id and heading
}

// crosswalkPage builds the appendix for the page; it panics on a section
// id that htmlSections does not name (a programmer error, caught by the
// tests).
func crosswalkPage() crosswalkView {
	v := crosswalkView{Intro: crosswalkIntro, Note: crosswalkNote, Sources: crosswalkSources}
	for _, it := range crosswalkItems {
		r := crosswalkRow{Source: it.Source, Item: it.Item, Status: it.Status, What: it.What}
		for _, id := range it.Where.HTML {
			title, ok := htmlSections[id]
			if !ok {
				panic("report: crosswalk names an unknown section " + id)
			}
			r.Where = append(r.Where, keyValue{id, title})
		}
		v.Rows = append(v.Rows, r)
	}
	return v
}
