package report

import (
	"embed"
	"html/template"
	"io"

	"github.com/gapwise/gapwise/fairness"
)

//go:embed templates/report.html.tmpl
var templateFS embed.FS

var pageTemplate = template.Must(template.ParseFS(templateFS, "templates/report.html.tmpl"))

// WriteHTML writes res to w as one standalone HTML page.
func WriteHTML(w io.Writer, res *fairness.Result) error {
	return pageTemplate.Execute(w, newPage(res))
}

type page struct {
	Score, Reference, Comparison string
	Synthetic                    bool
	Summaries                    []string
	Metrics                      []metricView
}

type metricView struct {
	Title, Reference, Comparison, Gap, Residual string
	Rows                                        []rowView
}

type rowView struct{ Mechanism, Value, CI string }

func newPage(res *fairness.Result) page {
	p := page{Score: res.Score, Reference: res.Groups.Reference, Comparison: res.Groups.Comparison, Synthetic: res.Synthetic}
	for _, m := range res.Metrics {
		p.Summaries = append(p.Summaries, Summary(res, m))
		mv := metricView{Title: MetricTitle(m.Metric), Reference: formatValue(m.Metric, m.Reference),
			Comparison: formatValue(m.Metric, m.Comparison), Gap: formatDelta(m.Metric, m.Gap), Residual: formatDelta(m.Metric, m.Residual)}
		for _, c := range m.Contributions {
			mv.Rows = append(mv.Rows, rowView{c.Mechanism, formatDelta(m.Metric, c.Value), formatDeltaInterval(m.Metric, c.CILow, c.CIHigh)})
		}
		p.Metrics = append(p.Metrics, mv)
	}
	return p
}
