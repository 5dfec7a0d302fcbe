package report

import (
	"bytes"
	"html"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/gapwise/gapwise/fairness"
)

// layoutResult is the hand result with every optional column a table can
// have: the details, both sides' diagnostics with clipping (seventeen
// diagnostics columns), sampled Shapley values and the sides' differences
// and split SDs in the decomposition, a long title, and the what-if panel
// (withGames) with the CSV buttons under every table.
func layoutResult() *fairness.Result {
	res := handResult()
	res.Details = handDetails()
	withDiagnostics(res)
	withGames(res)
	res.Title = "Anaemia screening in the outpatient clinics, spring audit of the haemoglobin rule"
	for i := range res.Metrics {
		for j := range res.Metrics[i].Contributions {
			c := &res.Metrics[i].Contributions[j]
			c.StdError, c.SplitSD = ptr(0.0012), ptr(0.0008)
			c.SideDifference = &fairness.SideDifference{Difference: -0.0123, StdError: ptr(0.0045)}
		}
	}
	return res
}

// frameTemplate is a page that shows report.html in a frame WIDTH pixels
// wide (Chromium's window is at least 500 px wide, a phone is narrower),
// optionally has it prepare for printing (its beforeprint handler lays it
// out at paper width), and then copies what the report's script recorded
// about its layout into its own <body data-inner>: the page's width, the
// window's, and the tables and charts cut off by their box.
const frameTemplate = `<!DOCTYPE html><html><body>
<iframe id="f" src="report.html" width="WIDTH" height="900"></iframe>
<script>
var f = document.getElementById("f"), printed = false;
setInterval(function () {
  var d = f.contentDocument, b = d && d.body;
  if (!b || !b.hasAttribute("data-charts-expected") || b.getAttribute("data-charts-rendered") !== b.getAttribute("data-charts-expected")) { return; }
  if (PRINT && !printed) { f.contentWindow.dispatchEvent(new Event("beforeprint")); printed = true; return; }
  document.body.setAttribute("data-inner", [b.getAttribute("data-page-width"), b.getAttribute("data-view-width"), b.getAttribute("data-cut")].join("|"));
}, 100);
</script></body></html>`

// TestBrowserLayout opens a report with the widest tables gapwise makes
// (layoutResult) in headless Chromium, offline, and checks that it opens
// with the overview; that at desktop width (1280 px), at phone width
// (400 px) and laid out for paper no table or chart sticks out of its box
// and the page is no wider than the window; and that printing it to PDF
// keeps every column of the diagnostics table (its headers are in the
// PDF's text, read with pdftotext from Debian's poppler-utils).
func TestBrowserLayout(t *testing.T) {
	if testing.Short() && os.Getenv("GAPWISE_REQUIRE_BROWSER") != "1" {
		t.Skip("skipping the browser test in -short mode")
	}
	bin := chromium(t)
	dir := t.TempDir()
	var buf bytes.Buffer
	if err := WriteHTML(&buf, layoutResult()); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	file := filepath.Join(dir, "report.html")
	if err := os.WriteFile(file, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	if !regexp.MustCompile(`<main>\s*<section id="overview">`).MatchString(page) {
		t.Error("the overview is not the first section of the page")
	}

	dom, logs := runChromium(t, bin, "file://"+file, "--window-size=1280,900", "--dump-dom")
	if p := consoleProblems(logs); len(p) > 0 {
		t.Errorf("browser reported problems:\n%s", strings.Join(p, "\n"))
	}
	body := regexp.MustCompile(`<body[^>]*>`).FindString(dom)
	checkLayout(t, "desktop 1280 px", attrOf(body, "data-page-width"), attrOf(body, "data-view-width"), attrOf(body, "data-cut"))
	for _, tc := range []struct {
		name  string
		width int
		print bool
	}{{"phone 400 px", 400, false}, {"paper", 1280, true}} {
		frame := strings.NewReplacer("WIDTH", strconv.Itoa(tc.width), "PRINT", strconv.FormatBool(tc.print)).Replace(frameTemplate)
		name := filepath.Join(dir, "frame-"+strconv.Itoa(tc.width)+".html")
		if err := os.WriteFile(name, []byte(frame), 0o644); err != nil {
			t.Fatal(err)
		}
		dom, _ := runChromium(t, bin, "file://"+name, "--window-size=1300,900", "--allow-file-access-from-files", "--dump-dom")
		inner := strings.Split(attrOf(regexp.MustCompile(`<body[^>]*>`).FindString(dom), "data-inner"), "|")
		if len(inner) != 3 {
			t.Errorf("%s: the frame recorded no layout (%q)", tc.name, inner)
			continue
		}
		checkLayout(t, tc.name, inner[0], inner[1], inner[2])
	}

	pdf := filepath.Join(dir, "report.pdf")
	runChromium(t, bin, "file://"+file, "--window-size=1280,900", "--no-pdf-header-footer", "--print-to-pdf="+pdf)
	text := strings.Join(strings.Fields(pdfText(t, pdf)), " ")
	headers := tableHeaders(t, page, "diagnostics-table")
	if len(headers) != 17 {
		t.Fatalf("diagnostics table has %d columns, want 17 (both sides and clipping): %q", len(headers), headers)
	}
	for _, h := range headers {
		if !strings.Contains(strings.ToLower(text), strings.ToLower(h)) {
			t.Errorf("printed report lacks the diagnostics column %q", h)
		}
	}
}

// checkLayout fails unless the page is no wider than the window and no
// table or chart is cut.
func checkLayout(t *testing.T, name, pageWidth, viewWidth, cut string) {
	t.Helper()
	pw, err1 := strconv.Atoi(pageWidth)
	vw, err2 := strconv.Atoi(viewWidth)
	if err1 != nil || err2 != nil || vw == 0 {
		t.Errorf("%s: no layout recorded (page %q, window %q)", name, pageWidth, viewWidth)
		return
	}
	if pw > vw {
		t.Errorf("%s: the page is %d px wide in a %d px window: it scrolls sideways", name, pw, vw)
	}
	if cut != "" {
		t.Errorf("%s: cut off by their box: %s", name, cut)
	}
}

// attrOf returns the value of attribute name in tag, unescaped.
func attrOf(tag, name string) string {
	m := regexp.MustCompile(` ` + name + `="([^"]*)"`).FindStringSubmatch(tag)
	if m == nil {
		return ""
	}
	return html.UnescapeString(m[1])
}

// tableHeaders returns the header texts of the table with the given id.
func tableHeaders(t *testing.T, page, id string) []string {
	t.Helper()
	i := strings.Index(page, `id="`+id+`"`)
	if i < 0 {
		t.Fatalf("no table %s", id)
	}
	head := page[i:]
	head = head[:strings.Index(head, "</thead>")]
	var out []string
	for _, m := range regexp.MustCompile(`<th[^>]*>(.*?)</th>`).FindAllStringSubmatch(head, -1) {
		out = append(out, html.UnescapeString(regexp.MustCompile(`<[^>]+>`).ReplaceAllString(m[1], "")))
	}
	return out
}

// pdfText returns the text of a PDF by pdftotext (Debian's poppler-utils);
// the test is skipped without it unless GAPWISE_REQUIRE_BROWSER=1.
func pdfText(t *testing.T, pdf string) string {
	t.Helper()
	tool, err := exec.LookPath("pdftotext")
	if err != nil {
		if os.Getenv("GAPWISE_REQUIRE_BROWSER") == "1" {
			t.Fatal("GAPWISE_REQUIRE_BROWSER=1 but pdftotext is missing (apt-get install -y poppler-utils)")
		}
		t.Skip("skipping the print check: pdftotext is not installed (apt-get install -y poppler-utils)")
	}
	out, err := exec.Command(tool, "-enc", "UTF-8", pdf, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	return string(out)
}
