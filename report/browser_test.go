package report

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
)

// chromium returns the headless browser to test with: $GAPWISE_CHROMIUM,
// else chromium or chromium-browser on PATH. When none is found the test is
// skipped, unless GAPWISE_REQUIRE_BROWSER=1 (set by CI), which makes it
// fail.
func chromium(t *testing.T) string {
	t.Helper()
	if p := os.Getenv("GAPWISE_CHROMIUM"); p != "" {
		return p
	}
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if p := "/usr/bin/chromium"; fileExists(p) {
		return p
	}
	if os.Getenv("GAPWISE_REQUIRE_BROWSER") == "1" {
		t.Fatal("GAPWISE_REQUIRE_BROWSER=1 but no Chromium found (install it with: apt-get install -y chromium)")
	}
	t.Skip("skipping the browser test: Chromium is not installed (apt-get install -y chromium; set GAPWISE_REQUIRE_BROWSER=1 to make this an error)")
	return ""
}

func fileExists(p string) bool { _, err := os.Stat(p); return err == nil }

// runChromium runs headless Chromium on a local file with networking cut
// off (no DNS resolution, no background or component traffic) and returns
// its stdout and stderr.
func runChromium(t *testing.T, bin, url string, args ...string) (stdout, stderr string) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	base := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--no-first-run", "--disable-component-update", "--disable-sync", "--disable-extensions",
		"--disable-default-apps", "--host-resolver-rules=MAP * ~NOTFOUND",
		"--user-data-dir=" + t.TempDir(), "--enable-logging=stderr", "--v=0",
		"--virtual-time-budget=5000", "--run-all-compositor-stages-before-draw"}
	cmd := exec.CommandContext(ctx, bin, append(append(base, args...), url)...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium failed: %v\n%s", err, lastLines(errb.String(), 30))
	}
	return out.String(), errb.String()
}

func lastLines(s string, n int) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	if len(lines) > n {
		lines = lines[len(lines)-n:]
	}
	return strings.Join(lines, "\n")
}

// consoleProblems returns the log lines that report a script error, a
// console message, a blocked request or a Content-Security-Policy
// violation (which Chromium logs as a console message).
func consoleProblems(stderr string) []string {
	var out []string
	for _, l := range strings.Split(stderr, "\n") {
		if strings.Contains(l, "CONSOLE") || strings.Contains(l, "Uncaught") || strings.Contains(l, "Refused to") || strings.Contains(l, "Content Security Policy") {
			out = append(out, l)
		}
	}
	return out
}

// TestBrowserRendersReport loads a generated report from a file in
// headless Chromium and checks that the script drew every chart without a
// console message, error or blocked request, that choosing a metric
// through the URL shows that metric's panels, and it saves a screenshot
// (kept in $GAPWISE_SCREENSHOT_DIR when set).
func TestBrowserRendersReport(t *testing.T) {
	if testing.Short() && os.Getenv("GAPWISE_REQUIRE_BROWSER") != "1" {
		t.Skip("skipping the browser test in -short mode")
	}
	bin := chromium(t)
	dir := t.TempDir()
	res := handResult()
	res.Details = handDetails()
	withDiagnostics(res) // title, intervals settings and every diagnostics table
	var buf bytes.Buffer
	if err := WriteHTML(&buf, res); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(dir, "report.html")
	if err := os.WriteFile(file, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	url := "file://" + file

	dom, logs := runChromium(t, bin, url+"#metric=brier", "--dump-dom")
	if p := consoleProblems(logs); len(p) > 0 {
		t.Errorf("browser reported problems:\n%s", strings.Join(p, "\n"))
	}
	body := regexp.MustCompile(`<body[^>]*>`).FindString(dom)
	if strings.Contains(body, "data-charts-error") {
		t.Fatalf("page script failed: %s", body)
	}
	// forest, graph, reliability, and one chart per Details column.
	want := 3 + len(res.Details.Columns)
	for _, attr := range []string{"data-charts-expected", "data-charts-rendered"} {
		m := regexp.MustCompile(attr + `="(\d+)"`).FindStringSubmatch(body)
		if m == nil || m[1] != itoa(want) {
			t.Errorf("%s = %v, want %d (body tag %s)", attr, m, want, body)
		}
	}
	if n := strings.Count(dom, `_echarts_instance_="`); n != want {
		t.Errorf("%d chart instances in the DOM, want %d", n, want)
	}
	if n := strings.Count(dom, "<svg"); n < want {
		t.Errorf("%d SVG drawings in the DOM, want at least %d", n, want)
	}
	// #metric=brier selected the Brier score: its table is shown, the
	// FNR one hidden.
	panel := func(metric string) string {
		return regexp.MustCompile(`<div class="gw-metric-panel" data-metric="` + metric + `"[^>]*>`).FindString(dom)
	}
	if p := panel("brier"); p == "" || strings.Contains(p, "hidden") {
		t.Errorf("brier panel not shown: %q", p)
	}
	if p := panel("fnr"); !strings.Contains(p, "hidden") {
		t.Errorf("fnr panel not hidden: %q", p)
	}

	shot := filepath.Join(dir, "report.png")
	_, logs = runChromium(t, bin, url, "--window-size=1280,2400", "--hide-scrollbars", "--screenshot="+shot)
	if p := consoleProblems(logs); len(p) > 0 {
		t.Errorf("browser reported problems while capturing:\n%s", strings.Join(p, "\n"))
	}
	png, err := os.ReadFile(shot)
	if err != nil {
		t.Fatalf("no screenshot: %v", err)
	}
	if !bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")) || len(png) < 20000 {
		t.Errorf("screenshot is not a plausible PNG (%d bytes)", len(png))
	}
	if keep := os.Getenv("GAPWISE_SCREENSHOT_DIR"); keep != "" {
		if err := os.WriteFile(filepath.Join(keep, "report-test.png"), png, 0o644); err != nil {
			t.Error(err)
		}
	}
}
