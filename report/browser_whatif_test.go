package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"math/bits"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// whatIfResult is the hand result with its details and a game for each
// metric (withGames). The reference group's name holds a formula, a comma
// and quotes, which the CSV of the group-metrics table must quote and
// neutralise.
func whatIfResult() *fairness.Result {
	res := handResult()
	res.Details = handDetails()
	res.Groups.Reference = `=SUM(1,2) "men"`
	withGames(res)
	return res
}

// withGames gives every metric of res a game over all 2^k coalitions:
// v(S) = (Σ_{i∈S} φ_i)·(1 + 0.15·(|S| − 1)), not additive, so that the
// remaining gap of a set differs from the gap minus its contributions; the
// estimated gap becomes v(N) and the residual gap − v(N).
func withGames(res *fairness.Result) {
	for m := range res.Metrics {
		md := &res.Metrics[m]
		k := len(md.Contributions)
		md.Coalitions = make([]fairness.Coalition, 1<<k)
		for S := range md.Coalitions {
			var sum float64
			nodes := []string{}
			for i, c := range md.Contributions {
				if S&(1<<i) != 0 {
					sum += c.Value
					nodes = append(nodes, c.Node)
				}
			}
			v := sum * (1 + 0.15*float64(bits.OnesCount(uint(S))-1))
			md.Coalitions[S] = fairness.Coalition{ComparisonNodes: nodes, ChangeFromReference: v}
		}
		md.Estimated = md.Coalitions[1<<k-1].ChangeFromReference
		md.Residual = md.Gap - md.Estimated
	}
}

// whatIfFrame shows report.html#FRAGMENT in a frame and drives it as a
// reader would: it records the metric shown and the fragment; ticks the
// mechanisms of bits 0 and 2 and records the remaining gap (reference
// form), then with the comparison form; chooses the first metric in the
// menu and records the fragment and the figure; then clicks the CSV
// buttons of the fnr decomposition and the group-metrics tables, with
// URL.createObjectURL wrapped to keep each Blob (and the download link's
// click stopped, so that no file is written), and records the Blobs'
// text with its byte-order mark; last it sets the fragment to
// #metric=brier, as a reader editing the address would. Everything goes into <body data-steps> as JSON, with the policy
// violations the frame reported.
const whatIfFrame = `<!DOCTYPE html><html><body>
<iframe id="f" src="report.html#FRAGMENT" width="1200" height="900"></iframe>
<script>
var f = document.getElementById("f"), started = false, out = { violations: [] };
function state(d) {
  var o = d.getElementById("whatif-remaining");
  return { metric: d.getElementById("gw-metric").value, hash: f.contentWindow.location.hash,
    value: o.getAttribute("data-value"), text: o.textContent, sentence: d.getElementById("whatif-result").textContent };
}
setInterval(function () {
  var d = f.contentDocument, b = d && d.body, w = f.contentWindow;
  if (started || !b || !b.hasAttribute("data-charts-expected") || b.getAttribute("data-charts-rendered") !== b.getAttribute("data-charts-expected")) { return; }
  started = true;
  d.addEventListener("securitypolicyviolation", function (e) { out.violations.push(e.effectiveDirective); });
  out.opened = state(d);
  if (!CHECK) { document.body.setAttribute("data-steps", JSON.stringify(out)); return; }
  d.querySelector('input[data-bit="0"]').click();
  d.querySelector('input[data-bit="2"]').click();
  out.reference = state(d);
  d.querySelector('input[name="gw-whatif-form"][value="comparison"]').click();
  out.comparison = state(d);
  var menu = d.getElementById("gw-metric");
  menu.value = menu.options[0].value;
  menu.dispatchEvent(new Event("change"));
  out.switched = state(d);
  var blobs = [], make = w.URL.createObjectURL;
  w.URL.createObjectURL = function (blob) { blobs.push(blob); return make.call(w.URL, blob); };
  d.addEventListener("click", function (e) { if (e.target.hasAttribute && e.target.hasAttribute("download")) { e.preventDefault(); } }, true);
  d.querySelector('button[data-csv-for="decomp-fnr"]').click();
  d.querySelector('button[data-csv-for="metric-table"]').click();
  // Decoded keeping the byte-order mark, which Blob.text() would drop.
  Promise.all(blobs.map(function (x) { return x.arrayBuffer(); })).then(function (bufs) {
    out.csv = bufs.map(function (b) { return new TextDecoder("utf-8", { ignoreBOM: true }).decode(b); });
    out.types = blobs.map(function (x) { return x.type; });
    w.location.hash = "#metric=brier";
    setTimeout(function () {
      out.edited = state(d);
      document.body.setAttribute("data-steps", JSON.stringify(out));
    }, 200);
  });
}, 100);
</script></body></html>`

// whatIfSteps is what whatIfFrame records.
type whatIfSteps struct {
	Violations                                      []string
	Opened, Reference, Comparison, Switched, Edited whatIfState
	CSV, Types                                      []string
}

type whatIfState struct {
	Metric, Hash, Value, Text, Sentence string
}

// runWhatIfFrame writes the frame page for fragment and returns what it
// recorded.
func runWhatIfFrame(t *testing.T, bin, dir, fragment string, check bool) whatIfSteps {
	t.Helper()
	page := strings.NewReplacer("FRAGMENT", fragment, "CHECK", strconv.FormatBool(check)).Replace(whatIfFrame)
	name := filepath.Join(dir, "frame-"+strconv.Itoa(len(fragment))+".html")
	if err := os.WriteFile(name, []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	dom, logs := runChromium(t, bin, "file://"+name, "--window-size=1300,900", "--allow-file-access-from-files", "--dump-dom")
	if p := consoleProblems(logs); len(p) > 0 {
		t.Errorf("#%s: browser reported problems:\n%s", fragment, strings.Join(p, "\n"))
	}
	raw := attrOf(regexp.MustCompile(`<body[^>]*>`).FindString(dom), "data-steps")
	var s whatIfSteps
	if err := json.Unmarshal([]byte(raw), &s); err != nil {
		t.Fatalf("#%s: the frame recorded no steps (%q): %v", fragment, raw, err)
	}
	if len(s.Violations) > 0 {
		t.Errorf("#%s: policy violations %v", fragment, s.Violations)
	}
	return s
}

// TestBrowserWhatIfAndCSV opens a report with its coalitions in headless
// Chromium, offline, and checks the what-if panel, the metric in the URL
// fragment and the CSV downloads against the Result:
//
//   - #metric=brier opens the Brier score and keeps the fragment; an
//     unknown metric opens the first one and the fragment names it;
//     choosing a metric in the menu writes it into the fragment, and
//     editing the fragment chooses the metric;
//   - ticking age and hb (bits 0 and 2) shows v(N∖T) from the Result's
//     coalitions in the reference group's form and v(N) − v(T) in the
//     comparison group's, as a number (data-value, to 1e-12) and as
//     formatDelta prints it, in a sentence that names the residual;
//   - the CSV of the fnr decomposition holds every contribution and gap
//     if equalised as the table prints them, and that of the group
//     metrics quotes the header "=SUM(1,2) "men" (reference)" by RFC 4180
//     and starts it with an apostrophe (OWASP, "CSV Injection"), so that
//     encoding/csv reads back exactly "'" + the header.
func TestBrowserWhatIfAndCSV(t *testing.T) {
	if testing.Short() && os.Getenv("GAPWISE_REQUIRE_BROWSER") != "1" {
		t.Skip("skipping the browser test in -short mode")
	}
	bin := chromium(t)
	dir := t.TempDir()
	res := whatIfResult()
	var buf bytes.Buffer
	if err := WriteHTML(&buf, res); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "report.html"), buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	s := runWhatIfFrame(t, bin, dir, "metric=brier", true)
	if s.Opened.Metric != "brier" || s.Opened.Hash != "#metric=brier" {
		t.Errorf("#metric=brier opened %q with fragment %q", s.Opened.Metric, s.Opened.Hash)
	}
	if s.Switched.Metric != "fnr" || s.Switched.Hash != "#metric=fnr" {
		t.Errorf("choosing fnr shows %q with fragment %q", s.Switched.Metric, s.Switched.Hash)
	}
	if s.Edited.Metric != "brier" {
		t.Errorf("editing the fragment to #metric=brier shows %q", s.Edited.Metric)
	}
	brier, fnr := res.Metrics[1], res.Metrics[0]
	const ticked = 0b0101 // age and hb
	full := len(brier.Coalitions) - 1
	v := func(m fairness.MetricResult, S int) float64 { return m.Coalitions[S].ChangeFromReference }
	for _, tc := range []struct {
		name  string
		got   whatIfState
		m     fairness.MetricResult
		want  float64
		words string
	}{
		{"brier, reference form", s.Reference, brier, v(brier, full&^ticked), "in the reference group's form"},
		{"brier, comparison form", s.Comparison, brier, v(brier, full) - v(brier, ticked), "in the comparison group's form"},
		{"fnr, comparison form", s.Switched, fnr, v(fnr, full) - v(fnr, ticked), "in the comparison group's form"},
	} {
		got, err := strconv.ParseFloat(tc.got.Value, 64)
		if err != nil || math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("%s: remaining gap %q, want %v from the coalitions", tc.name, tc.got.Value, tc.want)
		}
		if want := formatDelta(tc.m.Metric, tc.want); tc.got.Text != want {
			t.Errorf("%s: shows %q, want %q", tc.name, tc.got.Text, want)
		}
		for _, w := range []string{"If these 2 mechanisms were the same in both groups", tc.words, formatDelta(tc.m.Metric, tc.m.Estimated),
			"the residual " + formatDelta(tc.m.Metric, tc.m.Residual) + " is attributed to no mechanism"} {
			if !strings.Contains(tc.got.Sentence, w) {
				t.Errorf("%s: sentence %q lacks %q", tc.name, tc.got.Sentence, w)
			}
		}
	}
	if len(s.CSV) != 2 {
		t.Fatalf("%d CSV files made, want 2", len(s.CSV))
	}
	for _, typ := range s.Types {
		if typ != "text/csv;charset=utf-8" {
			t.Errorf("Blob type %q", typ)
		}
	}
	checkDecompositionCSV(t, s.CSV[0], fnr)
	checkMetricTableCSV(t, s.CSV[1], res)

	bogus := runWhatIfFrame(t, bin, dir, "metric=nosuch", false)
	if bogus.Opened.Metric != "fnr" || bogus.Opened.Hash != "#metric=fnr" {
		t.Errorf("#metric=nosuch opened %q with fragment %q, want the first metric", bogus.Opened.Metric, bogus.Opened.Hash)
	}
}

// readCSV parses a downloaded file: a UTF-8 byte-order mark, then RFC 4180
// records with CRLF line ends.
func readCSV(t *testing.T, text string) [][]string {
	t.Helper()
	if !strings.HasPrefix(text, "\ufeff") || !strings.HasSuffix(text, "\r\n") || strings.Contains(strings.ReplaceAll(text, "\r\n", ""), "\n") {
		t.Errorf("CSV does not start with a byte-order mark and end its lines in CRLF: %q", text)
	}
	r := csv.NewReader(strings.NewReader(strings.TrimPrefix(text, "\ufeff")))
	r.FieldsPerRecord = -1
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatalf("CSV does not parse: %v\n%s", err, text)
	}
	return rows
}

// checkDecompositionCSV finds each contribution's row by its mechanism
// and compares its cells with formatDelta of the Result's numbers.
func checkDecompositionCSV(t *testing.T, text string, m fairness.MetricResult) {
	t.Helper()
	rows := readCSV(t, text)
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	for _, c := range m.Contributions {
		var row []string
		for _, r := range rows[1:] {
			if len(r) > 0 && (r[0] == c.Mechanism || strings.HasPrefix(r[0], c.Mechanism+" unreliable")) {
				row = r
			}
		}
		if row == nil {
			t.Errorf("CSV has no row for %s:\n%s", c.Mechanism, text)
			continue
		}
		if got, want := row[col["Contribution"]], "'"+formatDelta(m.Metric, c.Value); !csvSame(got, want) {
			t.Errorf("%s: contribution %q in the CSV, want %q", c.Mechanism, got, want)
		}
		if got, want := row[col["Gap if equalised"]], "'"+formatDelta(m.Metric, c.IfEqualised); !csvSame(got, want) {
			t.Errorf("%s: gap if equalised %q in the CSV, want %q", c.Mechanism, got, want)
		}
	}
}

// csvSame compares a CSV cell with the table's text: a cell that starts
// with + carries the apostrophe, one that starts with U+2212 or a digit
// does not (want has the apostrophe in front).
func csvSame(got, want string) bool {
	if strings.HasPrefix(want, "'+") {
		return got == want
	}
	return got == strings.TrimPrefix(want, "'")
}

// checkMetricTableCSV checks the header holding the reference group's
// name and the gap of every metric.
func checkMetricTableCSV(t *testing.T, text string, res *fairness.Result) {
	t.Helper()
	rows := readCSV(t, text)
	if want := "'" + res.Groups.Reference + " (reference)"; len(rows[0]) < 2 || rows[0][1] != want {
		t.Errorf("header %q, want %q", rows[0], want)
	}
	for i, m := range res.Metrics {
		if len(rows) <= i+1 || !csvSame(rows[i+1][3], "'"+formatDelta(m.Metric, m.Gap)+" "+formatGapInterval(m)) &&
			!csvSame(rows[i+1][3], "'"+formatDelta(m.Metric, m.Gap)) {
			t.Errorf("%s: gap cell %q", m.Metric, rows[i+1])
		}
	}
}
