package report

import (
	"bytes"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// policyProbe is a test script added to the page with its hash in the
// policy. It records every Content-Security-Policy violation the browser
// reports (the securitypolicyviolation event, W3C CSP Level 3) in
// <html data-csp-violations>, opens the tooltip of every chart (ECharts
// writes tooltips with style attributes) and counts the charts that showed
// one in <html data-tooltips>, then clicks a javascript: link and records
// whether the injected style hid the page.
const policyProbe = `(function () {
  var root = document.documentElement, seen = [];
  document.addEventListener("securitypolicyviolation", function (e) {
    seen.push(e.effectiveDirective);
    root.setAttribute("data-csp-violations", seen.join(" "));
  });
  function tipShown(el) {
    return Array.prototype.some.call(el.querySelectorAll("div"), function (d) {
      return d.style.zIndex === "9999999" && d.style.display !== "none" && d.textContent.trim() !== "";
    });
  }
  window.addEventListener("load", function () {
    var charts = Array.prototype.slice.call(document.querySelectorAll("[_echarts_instance_]"));
    var shown = {}, steps = [];
    charts.forEach(function (el, k) {
      var c = echarts.getInstanceByDom(el);
      (c.getOption().series || []).forEach(function (s, i) {
        [0, 1, 2].forEach(function (d) {
          steps.push(function () {
            if (!shown[k]) { c.dispatchAction({ type: "showTip", seriesIndex: i, dataIndex: d }); }
          }, function () { if (tipShown(el)) { shown[k] = true; } });
        });
      });
    });
    function next() {
      if (steps.length) {
        steps.shift()();
        setTimeout(next, 10);
        return;
      }
      root.setAttribute("data-tooltips", String(Object.keys(shown).length));
      var link = document.getElementById("gw-injected-link");
      if (link) { link.click(); }
      root.setAttribute("data-main-display", getComputedStyle(document.querySelector("main")).display);
      root.setAttribute("data-probe-done", "1");
    }
    setTimeout(next, 100);
  });
})();`

// injectedMarkup is what an escaping bug could let into the page: an
// inline script, an event handler, a style element and a javascript:
// link, each of which would mark <html data-injected> if it ran.
const injectedMarkup = `<script>document.documentElement.setAttribute("data-injected", "script")</script>` +
	`<img src="data:," onerror="document.documentElement.setAttribute('data-injected', 'handler')">` +
	`<style>main { display: none }</style>` +
	`<a id="gw-injected-link" href="javascript:document.documentElement.setAttribute('data-injected', 'link')">x</a>`

// TestBrowserPolicy loads a report into which injectedMarkup was written
// and checks in headless Chromium that the page's own scripts still draw
// every chart and open every tooltip without a policy violation, while
// each injected piece is refused: nothing injected ran or applied, and the
// violations reported are exactly the injected script and link
// (script-src-elem), handler (script-src-attr) and style element
// (style-src-elem).
func TestBrowserPolicy(t *testing.T) {
	if testing.Short() && os.Getenv("GAPWISE_REQUIRE_BROWSER") != "1" {
		t.Skip("skipping the browser test in -short mode")
	}
	bin := chromium(t)
	res := handResult()
	res.Details = handDetails()
	var buf bytes.Buffer
	if err := WriteHTML(&buf, res); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	meta := cspMetaRE.FindStringIndex(page)
	if meta == nil || !strings.Contains(page, "script-src ") {
		t.Fatal("page has no script-src policy")
	}
	page = page[:meta[1]] + "<script>" + policyProbe + "</script>" + page[meta[1]:]
	page = strings.Replace(page, "script-src ", "script-src "+cspHash(policyProbe)+" ", 1)
	page = strings.Replace(page, "</main>", injectedMarkup+"</main>", 1)
	file := filepath.Join(t.TempDir(), "report.html")
	if err := os.WriteFile(file, []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	dom, _ := runChromium(t, bin, "file://"+file, "--dump-dom")
	html := regexp.MustCompile(`<html[^>]*>`).FindString(dom)
	attr := func(name string) string {
		m := regexp.MustCompile(name + `="([^"]*)"`).FindStringSubmatch(html)
		if m == nil {
			return ""
		}
		return m[1]
	}
	if attr("data-probe-done") != "1" {
		t.Fatalf("the probe did not finish: %s", html)
	}
	charts := 3 + len(res.Details.Columns)
	if got := regexp.MustCompile(`data-charts-rendered="(\d+)"`).FindStringSubmatch(dom); got == nil || got[1] != itoa(charts) {
		t.Errorf("charts rendered %v, want %d", got, charts)
	}
	if got := attr("data-tooltips"); got != itoa(charts) {
		t.Errorf("%s of %d charts showed a tooltip", got, charts)
	}
	if got := attr("data-injected"); got != "" {
		t.Errorf("injected markup ran: data-injected=%q", got)
	}
	if got := attr("data-main-display"); got == "none" {
		t.Error("the injected style element applied")
	}
	count := map[string]int{}
	for _, d := range strings.Fields(attr("data-csp-violations")) {
		count[d]++
	}
	want := map[string]int{"script-src-elem": 2, "script-src-attr": 1, "style-src-elem": 1}
	for d, n := range want {
		if count[d] != n {
			t.Errorf("%d %s violations, want %d (all: %q)", count[d], d, n, attr("data-csp-violations"))
		}
	}
	for d, n := range count {
		if _, ok := want[d]; !ok {
			t.Errorf("%d unexpected %s violations: the page's own content breaks its policy", n, d)
		}
	}
}
