package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"github.com/gapwise/gapwise/fairness"
	"github.com/gapwise/gapwise/fairness/policy"
	"github.com/gapwise/gapwise/report"
)

// Files of the summary of several comparison groups in --out; each
// comparison adds result-<value>.json and report-<value>.html
// (groupFileNames).
const (
	summaryFile     = "summary.json"
	summaryHTMLFile = "summary.html"
)

// runDecomposeGroups is `gapwise decompose` of a spec with several
// comparison values (groups.comparison a list or every-other): one audit
// per comparison against the reference (fairness.RunGroups), each judged
// by the policy; the summary matrix then every comparison on stdout, and
// with o.out one result and report file per comparison with summary.json
// and summary.html, written together. A breach of any comparison exits
// with status 3 after the outputs are written.
func runDecomposeGroups(o decomposeOptions, spec *fairness.Spec, out outDir, pol *policy.Policy, stdout, stderr io.Writer) error {
	if o.out != "" {
		if err := out.checkInputs(summaryFile, summaryHTMLFile); err != nil {
			return err
		}
	}
	line := newProgressLine(stderr)
	defer line.clear()
	ro := fairness.RunOptions{Workers: o.workers, Version: version, Intervals: o.intervals.override(spec),
		Progress: line.bootstrap(), SamplingProgress: line.sampling(), CoalitionLimit: o.coalitions.runLimit()}
	line.show("gapwise: estimating %d mechanisms for %d metrics in each comparison group ...", len(spec.Graph), len(spec.Metrics))
	g, err := fairness.RunGroups(spec, ro)
	if err != nil {
		return err
	}
	for _, r := range g.Results {
		if err := fairness.ApplyPolicy(r, pol); err != nil {
			return err
		}
	}
	g.Summary = fairness.Summarise(spec, g.Results, g.Summary.Skipped)
	var files []outFile
	if o.out != "" {
		if files, err = groupsOutputFiles(g, o.coalitions.json); err != nil {
			return err
		}
		if err := out.checkInputs(outNames(files)...); err != nil {
			return err
		}
	}
	var buf bytes.Buffer
	if err := renderGroups(&buf, g, o.format, o.coalitions.json); err != nil {
		return err
	}
	if o.out != "" {
		if err := out.write(files); err != nil {
			return err
		}
	}
	if _, err = stdout.Write(buf.Bytes()); err != nil {
		return err
	}
	return groupsPolicyVerdict(g)
}

// renderGroups writes g in the given format: text and Markdown print the
// summary matrix and then each comparison's report, JSON an object with
// the summary and the results (groupsJSON).
func renderGroups(w io.Writer, g *fairness.GroupsResult, format string, coalitions bool) error {
	switch format {
	case formatJSON:
		b, err := groupsJSON(g, coalitions)
		if err != nil {
			return err
		}
		_, err = w.Write(b)
		return err
	case formatMarkdown:
		return report.WriteGroupsMarkdown(w, g)
	default:
		return report.WriteGroupsText(w, g)
	}
}

// groupsJSON is {"summary": …, "results": […]} with each result encoded
// as in result.json, indented, with a final newline.
func groupsJSON(g *fairness.GroupsResult, coalitions bool) ([]byte, error) {
	doc := struct {
		Summary *fairness.GroupsSummary `json:"summary"`
		Results []json.RawMessage       `json:"results"`
	}{Summary: g.Summary, Results: []json.RawMessage{}}
	for _, r := range g.Results {
		b, err := resultJSON(r, coalitions)
		if err != nil {
			return nil, err
		}
		doc.Results = append(doc.Results, b)
	}
	b, err := json.MarshalIndent(doc, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("encoding the results as JSON: %w", err)
	}
	return append(b, '\n'), nil
}

// groupsOutputFiles renders the files of an output folder of several
// comparisons: result-<value>.json and report-<value>.html per
// comparison (the names recorded in the summary), summary.json and
// summary.html.
func groupsOutputFiles(g *fairness.GroupsResult, coalitions bool) ([]outFile, error) {
	var files []outFile
	names := groupFileNames(g.Summary.Comparisons)
	for i, r := range g.Results {
		c := &g.Summary.Comparisons[i]
		c.ResultFile, c.ReportFile = "result-"+names[i]+".json", "report-"+names[i]+".html"
		rf, err := outputFiles(r, coalitions)
		if err != nil {
			return nil, err
		}
		files = append(files, outFile{c.ResultFile, rf[0].data}, outFile{c.ReportFile, rf[1].data})
	}
	js, err := json.MarshalIndent(g.Summary, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("encoding the summary as JSON: %w", err)
	}
	var html bytes.Buffer
	if err := report.WriteGroupsHTML(&html, g); err != nil {
		return nil, fmt.Errorf("rendering the HTML summary: %w", err)
	}
	return append(files, outFile{summaryFile, append(js, '\n')}, outFile{summaryHTMLFile, html.Bytes()}), nil
}

// groupFileNames gives each comparison value the part of its file names
// (fileSlug; "group<i>" when nothing is left), made unique ignoring case
// by a suffix -2, -3, … in the order of the comparisons.
func groupFileNames(cs []fairness.ComparisonSummary) []string {
	seen := map[string]bool{}
	out := make([]string, len(cs))
	for i, c := range cs {
		base := fileSlug(c.Value)
		if strings.Trim(base, "._") == "" || len(base) > 80 {
			base = fmt.Sprintf("group%d", i+1)
		}
		name := base
		for k := 2; seen[strings.ToLower(name)]; k++ {
			name = fmt.Sprintf("%s-%d", base, k)
		}
		seen[strings.ToLower(name)] = true
		out[i] = name
	}
	return out
}

// outNames lists the files' names.
func outNames(files []outFile) []string {
	names := make([]string, len(files))
	for i, f := range files {
		names[i] = f.name
	}
	return names
}

// groupsPolicyVerdict returns a *policyBreachError naming every
// comparison whose result breached its policy, else nil.
func groupsPolicyVerdict(g *fairness.GroupsResult) error {
	var e *policyBreachError
	for _, r := range g.Results {
		if r.Policy == nil || r.Policy.Passed {
			continue
		}
		if e == nil {
			e = &policyBreachError{outcome: r.Policy}
		} else {
			e.more = append(e.more, r.Policy)
		}
	}
	if e == nil {
		return nil
	}
	return e
}

// bandSigns are the marks of a band label (fairness.GroupBands.Label)
// spelt out in file names.
var bandSigns = strings.NewReplacer("<", "lt", "≥", "ge", "–", "-")

// fileSlug is a group value as part of a file name: the band marks
// spelt out ("age ≥65" gives age_ge65), every other character than ASCII
// letters, digits, '.', '_' and '-' replaced by '_', and runs of '_'
// made one ("sex F, age 40–65" gives sex_F_age_40-65).
func fileSlug(v string) string {
	s := strings.Map(func(r rune) rune {
		if r < 128 && (r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '.' || r == '_' || r == '-') {
			return r
		}
		return '_'
	}, bandSigns.Replace(v))
	for strings.Contains(s, "__") {
		s = strings.ReplaceAll(s, "__", "_")
	}
	return s
}
