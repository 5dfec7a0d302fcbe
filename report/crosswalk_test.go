package report

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// referenceText normalises Markdown reference lists for comparison with
// the crosswalk's plain citations: emphasis marks (*) go, an escaped \*
// stays a literal *, and every run of whitespace (line wraps) is one space.
func referenceText(md string) string {
	md = strings.ReplaceAll(md, `\*`, "\x00")
	md = strings.ReplaceAll(md, "*", "")
	md = strings.ReplaceAll(md, "\x00", "*")
	return strings.Join(strings.Fields(md), " ")
}

// sharedReferences returns the project's checked reference list
// (shared/REFERENCES.md beside the repository, in a folder above this
// one), or "" when there is none here; GAPWISE_REQUIRE_REFERENCES=1 makes
// its absence a failure.
func sharedReferences(t *testing.T) string {
	t.Helper()
	dir, err := filepath.Abs(".")
	if err != nil {
		t.Fatal(err)
	}
	for {
		if b, err := os.ReadFile(filepath.Join(dir, "shared", "REFERENCES.md")); err == nil {
			return string(b)
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			break
		}
		dir = parent
	}
	if os.Getenv("GAPWISE_REQUIRE_REFERENCES") == "1" {
		t.Fatal("shared/REFERENCES.md not found above the package folder")
	}
	return ""
}

// readmeReferences returns the References section of the README.
func readmeReferences(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	i := strings.Index(s, "\n## References\n")
	if i < 0 {
		t.Fatal("README has no References section")
	}
	s = s[i+1:]
	if j := strings.Index(s[3:], "\n## "); j >= 0 {
		s = s[:j+3]
	}
	return s
}

// TestCrosswalkCitationsChecked: every citation of the appendix (but for
// its final full stop), and every point of Article 10 it quotes, appears
// word for word in the project's
// checked references (shared/REFERENCES.md) and in the README's
// References, so the appendix cites nothing that was not checked.
func TestCrosswalkCitationsChecked(t *testing.T) {
	lists := map[string]string{"README References": referenceText(readmeReferences(t))}
	if shared := sharedReferences(t); shared != "" {
		lists["shared/REFERENCES.md"] = referenceText(shared)
	} else {
		t.Log("shared/REFERENCES.md not found: checking the README only")
	}
	var quotes []string
	for _, s := range crosswalkSources {
		quotes = append(quotes, s.Citation)
	}
	article := regexp.MustCompile(`^Article (10\(\d\)\([a-z]\)): (.+)$`)
	points := 0
	for _, it := range crosswalkItems {
		if m := article.FindStringSubmatch(it.Item); m != nil {
			quotes = append(quotes, m[1]+" "+m[2])
			points++
		}
		known := false
		for _, s := range crosswalkSources {
			known = known || s.Short == it.Source
		}
		if !known {
			t.Errorf("item %q cites %q, which is not among the sources", it.Item, it.Source)
		}
	}
	if points != 3 {
		t.Errorf("%d points of Article 10 quoted, want 3 ((f), (g), (h))", points)
	}
	for name, list := range lists {
		for _, q := range quotes {
			if q = strings.TrimSuffix(q, "."); !strings.Contains(list, q) {
				t.Errorf("%s lacks %q", name, q)
			}
		}
	}
}

// TestCrosswalkInReports: the Markdown report and the HTML page end with
// the appendix (every item with its status, the citations, the note that
// it is not a compliance statement), each place named exists in that
// output (an HTML link resolves to a section whose heading it shows; a
// Markdown place is one of its headings), and the text report points to
// it.
func TestCrosswalkInReports(t *testing.T) {
	res := handResult()
	res.Details = handDetails()
	var md, page, text bytes.Buffer
	if err := WriteMarkdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteHTML(&page, res); err != nil {
		t.Fatal(err)
	}
	if err := WriteText(&text, res); err != nil {
		t.Fatal(err)
	}
	statuses := map[string]bool{crosswalkSupplied: true, crosswalkPartly: true, crosswalkNotSupplied: true}

	// Markdown: a table row per item, after the assumptions.
	m := md.String()
	at := strings.Index(m, "### Appendix: reporting items")
	if at < 0 || at < strings.Index(m, "### Assumptions and cautions") {
		t.Fatal("Markdown has no appendix after the assumptions")
	}
	headings := map[string]bool{}
	for _, line := range strings.Split(m, "\n") {
		if h, ok := strings.CutPrefix(line, "### "); ok {
			headings[h] = true
		}
	}
	hasHeading := func(h string) bool {
		for got := range headings {
			if got == h || (strings.HasSuffix(h, " ") && strings.HasPrefix(got, h)) {
				return true
			}
		}
		return false
	}
	for _, it := range crosswalkItems {
		if !statuses[it.Status] {
			t.Errorf("item %q has status %q", it.Item, it.Status)
		}
		row := "| " + mdText(it.Source) + " | " + mdText(it.Item) + " | **" + it.Status + "** | " + mdText(it.What) + " |"
		if !strings.Contains(m[at:], row) {
			t.Errorf("Markdown appendix lacks the row %q", row)
		}
		for _, w := range it.Where.Markdown {
			h := w
			if follows, ok := crosswalkMarkdownPlaces[w]; ok {
				h = follows
			}
			if !hasHeading(h) {
				t.Errorf("item %q: Markdown place %q has no heading %q in the report", it.Item, w, h)
			}
		}
	}
	for _, want := range []string{mdText(crosswalkNote), "2024/1689", "e078378", "Model cards for model reporting"} {
		if !strings.Contains(m[at:], want) {
			t.Errorf("Markdown appendix lacks %q", want)
		}
	}

	// HTML: the section, its table, and links to the page's sections.
	p := page.String()
	sec := between(t, p, `<section id="crosswalk">`, "</section>")
	for _, it := range crosswalkItems {
		if !strings.Contains(sec, "<strong>"+it.Status+"</strong></td><td data-label=\"What it gives\">"+htmlText(it.What)+"</td>") {
			t.Errorf("HTML appendix lacks %q with its status", it.What)
		}
		for _, id := range it.Where.HTML {
			if !strings.Contains(sec, `<a href="#`+id+`">`+htmlText(htmlSections[id])+`</a>`) {
				t.Errorf("item %q: no link to #%s", it.Item, id)
			}
		}
	}
	for id, title := range htmlSections {
		open := `id="` + id + `">`
		i := strings.Index(p, open)
		if i < 0 {
			t.Errorf("the page has no section %q", id)
			continue
		}
		if h := between(t, p[i:], "<h2>", "</h2>"); h != htmlText(title) {
			t.Errorf("section %q is headed %q, the crosswalk calls it %q", id, h, title)
		}
	}
	if !strings.Contains(sec, htmlText(crosswalkNote)) || !strings.Contains(p, `<a href="#crosswalk">Appendix</a>`) {
		t.Error("HTML appendix lacks its note or the page's link to it")
	}

	if !strings.HasSuffix(strings.TrimSpace(text.String()), crosswalkPointer) {
		t.Error("the text report does not end with the pointer to the appendix")
	}
}

// between returns the text of s between the first open and the next
// close after it.
func between(t *testing.T, s, open, close string) string {
	t.Helper()
	i := strings.Index(s, open)
	if i < 0 {
		t.Fatalf("no %q", open)
	}
	rest := s[i+len(open):]
	j := strings.Index(rest, close)
	if j < 0 {
		t.Fatalf("no %q after %q", close, open)
	}
	return rest[:j]
}

// htmlText escapes s as html/template escapes text in an element.
func htmlText(s string) string {
	r := strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&#34;", "'", "&#39;", "+", "&#43;")
	return r.Replace(s)
}
