package report

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// renderAll renders res as text, Markdown, HTML and the demo summary.
func renderAll(t *testing.T, res *fairness.Result) map[string]string {
	t.Helper()
	out := map[string]string{}
	for name, write := range map[string]func(*bytes.Buffer) error{
		"text":     func(b *bytes.Buffer) error { return WriteText(b, res) },
		"markdown": func(b *bytes.Buffer) error { return WriteMarkdown(b, res) },
		"html":     func(b *bytes.Buffer) error { return WriteHTML(b, res) },
		"demo": func(b *bytes.Buffer) error {
			return DemoSummary(b, res, DemoOutputs{Dir: "d", Data: "c.csv", Spec: "s.yaml", Result: "r.json", Report: "r.html"})
		},
	} {
		var b bytes.Buffer
		if err := write(&b); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		out[name] = b.String()
	}
	return out
}

// TestFastIntervalsLabelledApproximate: intervals from the fast bootstrap
// (keep_ratios) leave out the classifiers' error, so wherever a
// contribution's interval appears (the decomposition tables' headings,
// the overview's lead, the chart's tooltips) it is called approximate and
// every output says why; intervals from refits are never called so.
// handResult's FNR has intervals for the gap and two contributions.
func TestFastIntervalsLabelledApproximate(t *testing.T) {
	// Where each output names a contribution's interval, with the fast
	// bootstrap (%s is "approximate ") and with refits (%s is "").
	where := map[string][]string{
		"text":     {"mechanism contribution alone gap if equalised %s95% interval\n", "+6.1 pts (%s95% interval [+4.8, +7.3] pts)"},
		"markdown": {"| Mechanism | Contribution | %s95% interval | Alone |", "+6.1 pts (%s95% interval [+4.8, +7.3] pts)"},
		"html":     {"<th class=\"num\">%s95% interval</th>", "+6.1 pts (%s95% interval [+4.8, +7.3] pts)", "%s95% interval [+4.8, +7.3] pts"},
		"demo":     {"Intervals in brackets: 100 bootstrap replicates"},
	}
	for _, fast := range []bool{true, false} {
		res := handResult()
		res.Settings.Intervals = &fairness.IntervalSettings{Intervals: fairness.Intervals{Replicates: 100, Level: 0.95, KeepRatios: fast}}
		prefix := ""
		if fast {
			prefix = "approximate "
		}
		outs := renderAll(t, res)
		// The chart's tooltips: the hb row's interval is approximate, the
		// observed gap's is not.
		for _, item := range forestItems(t, pageData(t, outs["html"]), "fnr") {
			tip, _ := json.Marshal(item["tooltip"])
			kind := item["gwKind"]
			hasCI := strings.Contains(string(tip), "95% interval")
			approx := strings.Contains(string(tip), "approximate 95% interval")
			if item["gwInterval"] == true && (!hasCI || approx != (fast && kind == "mechanism")) {
				t.Errorf("fast=%v: %v row's tooltip %s", fast, kind, tip)
			}
		}
		for name, out := range outs {
			if name == "html" {
				out = out[:strings.Index(out, "<script")] + out[strings.LastIndex(out, "</script>"):]
			} else {
				out = strings.Join(strings.FieldsFunc(out, func(r rune) bool { return r == ' ' }), " ") // aligned columns
			}
			for _, w := range where[name] {
				want := strings.ReplaceAll(w, "%s", prefix)
				if !strings.Contains(out, want) {
					t.Errorf("fast=%v: %s output lacks %q", fast, name, want)
				}
			}
			note := strings.Contains(out, "Contribution intervals are approximate: the fast bootstrap kept the fitted density ratios")
			if note != fast {
				t.Errorf("fast=%v: %s output has the note on approximate intervals: %v", fast, name, note)
			}
			if !fast && strings.Contains(strings.ToLower(out), "approximate") {
				t.Errorf("%s output with refitted intervals calls something approximate", name)
			}
		}
	}
}
