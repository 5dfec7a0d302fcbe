/* gapwise report script: draws the charts from window.gapwiseData with the
   inlined ECharts library and wires the metric menu. No network access.
   When every chart has finished rendering, it writes their number into
   <body data-charts-rendered>, which the headless browser test reads. */
(function () {
  "use strict";
  var data = window.gapwiseData;
  var charts = [];
  var rendered = 0;

  var ink = "#22252B", muted = "#6B6F76", rule = "#D9D4C7";

  // Draws one row of a contribution chart (series gw-forest): a mechanism
  // as a marker at its contribution with its interval, a square when it
  // widens the gap and a circle when it narrows it, in the item's colour;
  // hollow with a dashed interval in that colour when unreliable; "not estimable" instead of a marker; the
  // residual; the observed gap as a diamond spanning its interval. The
  // value label goes right of the row's drawing, or left of it when it
  // would leave the plot. Data: [value, low, high, row]; the item carries
  // gwKind, gwRole, gwHollow and gwInterval.
  function forestRow(params, api) {
    var item = params.context.items[params.dataIndex] || {};
    var row = api.value(3);
    var y = api.coord([0, row])[1];
    var h = api.size([0, 1])[1];
    var cs = params.coordSys;
    var children = [];
    if (item.gwKind === "residual") {
      children.push({ type: "line", shape: { x1: cs.x, y1: y - h / 2, x2: cs.x + cs.width, y2: y - h / 2 },
        style: { stroke: rule, lineWidth: 1, lineDash: [4, 3] } });
    }
    if (item.gwKind === "unestimable") {
      children.push({ type: "text", style: { x: api.coord([0, row])[0] + 6, y: y, text: item.name, fill: muted,
        font: "italic 12px sans-serif", verticalAlign: "middle", align: "left" } });
      return { type: "group", children: children };
    }
    var p = api.coord([api.value(0), row])[0];
    var lo = api.coord([api.value(1), row])[0], hi = api.coord([api.value(2), row])[0];
    var hollow = !!item.gwHollow;
    if (item.gwKind === "gap") {
      var half = h * 0.26;
      if (!item.gwInterval) { lo = p - 8; hi = p + 8; }
      children.push({ type: "polygon", shape: { points: [[lo, y], [p, y - half], [hi, y], [p, y + half]] },
        style: { fill: ink, stroke: ink, lineWidth: 1 } });
    } else {
      var colour = api.visual("color");
      if (item.gwInterval) {
        var line = { stroke: hollow ? colour : ink, lineWidth: hollow ? 2 : 1.5 };
        if (hollow) { line.lineDash = [5, 3]; }
        var cap = h * 0.2;
        children.push(
          { type: "line", shape: { x1: lo, y1: y, x2: hi, y2: y }, style: line },
          { type: "line", shape: { x1: lo, y1: y - cap, x2: lo, y2: y + cap }, style: line },
          { type: "line", shape: { x1: hi, y1: y - cap, x2: hi, y2: y + cap }, style: line });
      }
      var mark = { fill: hollow ? "#FFFFFF" : colour, stroke: hollow ? colour : ink, lineWidth: hollow ? 2.5 : 1 };
      if (item.gwRole === "narrows") {
        children.push({ type: "circle", shape: { cx: p, cy: y, r: 6 }, style: mark });
      } else if (item.gwKind === "residual") {
        children.push({ type: "polygon", shape: { points: [[p - 6, y], [p, y - 6], [p + 6, y], [p, y + 6]] }, style: mark });
      } else {
        children.push({ type: "rect", shape: { x: p - 5.5, y: y - 5.5, width: 11, height: 11 }, style: mark });
      }
      lo = Math.min(lo, p - 7); hi = Math.max(hi, p + 7);
    }
    var text = item.name || "";
    var width = 6.8 * text.length;
    var x = hi + 8, align = "left";
    if (x + width > api.getWidth() - 4 && lo - 8 - width >= cs.x) { x = lo - 8; align = "right"; }
    children.push({ type: "text", style: { x: x, y: y, text: text, fill: ink, font: "600 12px sans-serif",
      verticalAlign: "middle", align: align } });
    return { type: "group", children: children };
  }

  // Drawing functions for custom series, looked up by series id.
  var renderers = { "gw-forest": forestRow };

  function prepare(option) {
    var o = JSON.parse(JSON.stringify(option));
    (o.series || []).forEach(function (s) {
      if (s.type === "custom" && renderers[s.id]) {
        var draw = renderers[s.id];
        var items = s.data || [];
        s.renderItem = function (params, api) {
          params.context.items = items;
          return draw(params, api);
        };
      }
    });
    return o;
  }

  // The causal graph's links join node centres and bend points. Two things
  // are settled here, where the chart's pixel size is known. First, the
  // series box is fitted to the nodes' aspect ratio, so one unit is the
  // same number of pixels across and down: ECharts would otherwise stretch
  // the drawing and squash the node boxes and arrowheads. Second, ECharts
  // shortens a link only by a circle around its end node, which leaves
  // arrowheads under the wide boxes, so every link end touching a box is
  // moved onto the box's border as an invisible port node. fitGraph runs
  // again whenever the chart's size or the metric changes.
  var portGap = 2; // pixels between an arrow's tip and the box border
  function fitGraph(chart, option) {
    var o = prepare(option);
    var s = (o.series || [])[0];
    if (!s || s.id !== "gw-graph" || !s.data || !s.data.length) {
      return o;
    }
    var minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    s.data.forEach(function (n) {
      minX = Math.min(minX, n.x); maxX = Math.max(maxX, n.x);
      minY = Math.min(minY, n.y); maxY = Math.max(maxY, n.y);
    });
    // Margins hold half of the widest and tallest node box, so that no box
    // and no arrow reaching it leaves the drawing.
    var halfW = 0, halfH = 0;
    s.data.forEach(function (n) {
      if (n.symbolSize && n.symbolSize.length) {
        halfW = Math.max(halfW, n.symbolSize[0] / 2);
        halfH = Math.max(halfH, n.symbolSize[1] / 2);
      }
    });
    var left = Math.max(+s.left || 0, halfW + 6), right = Math.max(+s.right || 0, halfW + 6);
    var top = Math.max(+s.top || 0, halfH + 6), bottom = Math.max(+s.bottom || 0, halfH + 6);
    var w = chart.getWidth() - left - right, h = chart.getHeight() - top - bottom;
    var bw = maxX - minX, bh = maxY - minY;
    if (!(w > 0) || !(h > 0) || !(bw > 0) || !(bh > 0)) {
      return o;
    }
    var k = Math.min(w / bw, h / bh); // pixels per unit
    s.left = left + (w - bw * k) / 2;
    s.top = top + (h - bh * k) / 2;
    s.width = bw * k;
    s.height = bh * k;
    delete s.right;
    delete s.bottom;
    var at = {};
    s.data.forEach(function (n) { at[n.name] = n; });
    function port(box, other, name) {
      var size = box.symbolSize;
      if (!size || !size.length || !other) {
        return null;
      }
      var dx = other.x - box.x, dy = other.y - box.y;
      var len = Math.sqrt(dx * dx + dy * dy) * k;
      if (len === 0) {
        return null;
      }
      // Distance in pixels along the link from the centre to the border.
      var t = Math.min(dx ? size[0] / 2 / Math.abs(dx * k) : Infinity, dy ? size[1] / 2 / Math.abs(dy * k) : Infinity) * len + portGap;
      if (t >= len) {
        return null;
      }
      s.data.push({ name: name, x: box.x + dx * t / len, y: box.y + dy * t / len,
        symbolSize: 0, label: { show: false }, tooltip: { show: false } });
      return name;
    }
    (s.links || []).forEach(function (l, i) {
      var from = at[l.source], to = at[l.target];
      if (!from || !to) {
        return;
      }
      var a = port(from, to, "\u200bport-" + i + "-from");
      var b = port(to, from, "\u200bport-" + i + "-to");
      if (a) { l.source = a; }
      if (b) { l.target = b; }
    });
    return o;
  }

  // A contribution chart keeps at most 38% of its width for row labels,
  // so that on a phone the rows keep room to draw; labels are cut with an
  // ellipsis (the table beside the chart has them in full).
  function fitForest(chart, option) {
    var o = prepare(option);
    var grid = (o.grid || [])[0] || o.grid;
    var y = (o.yAxis || [])[0];
    if (!grid || !y) {
      return o;
    }
    var left = Math.min(+grid.left || 0, Math.max(72, Math.round(chart.getWidth() * 0.38)));
    grid.left = left;
    if (y.axisLabel) { y.axisLabel.width = left - 12; }
    // Room on the right for the longest value label, within a quarter of
    // the width, so that labels sit beside their rows.
    var longest = 0;
    ((o.series || [])[0] && o.series[0].data || []).forEach(function (d) {
      longest = Math.max(longest, (d.name || "").length);
    });
    grid.right = Math.max(+grid.right || 0, Math.min(Math.round(chart.getWidth() * 0.25), Math.round(6.8 * longest) + 12));
    return o;
  }

  // The height of a contribution chart: 34 px per row and room for the
  // axis, set before the chart is drawn.
  function forestHeight(el, option) {
    var y = option && (option.yAxis || [])[0];
    var rows = y && y.data ? y.data.length : 6;
    el.style.height = (rows * 34 + 64) + "px";
  }

  function drawGraph(chart, option) {
    chart.setOption(fitGraph(chart, option), true);
  }

  function draw(el, option, fit) {
    if (!el || !option) {
      return null;
    }
    var chart = echarts.init(el, null, { renderer: "svg" });
    chart.on("finished", function once() {
      chart.off("finished", once);
      rendered++;
      reportLayout();
      document.body.setAttribute("data-charts-rendered", String(rendered));
    });
    chart.setOption(fit ? fit(chart, option) : prepare(option));
    charts.push(chart);
    return chart;
  }

  var forest = null, graph = null, shown = data && data.metric;

  function selectMetric(name) {
    document.querySelectorAll(".gw-metric-panel").forEach(function (p) {
      p.hidden = p.getAttribute("data-metric") !== name;
    });
    if (data.forest[name]) {
      shown = name;
    }
    if (forest && data.forest[name]) {
      forest.setOption(fitForest(forest, data.forest[name]), true);
    }
    if (graph && data.graph[name]) {
      drawGraph(graph, data.graph[name]);
    }
    layoutTables();
    var box = document.getElementById("column-cards");
    if (box && data.order[name]) {
      var top = {};
      (data.top[name] || []).forEach(function (c) { top[c] = true; });
      data.order[name].forEach(function (col) {
        var card = box.querySelector('.gw-card[data-column="' + CSS.escape(col) + '"]');
        if (card) {
          box.appendChild(card);
          card.classList.toggle("gw-is-top", !!top[col]);
          card.querySelector(".gw-top").hidden = !top[col];
        }
      });
    }
    updateWhatIf();
  }

  // A table wider than its box is re-flowed (class gw-stacked: each row a
  // block of label–value pairs), so that no column is cut off and the page
  // never scrolls sideways.
  function layoutTables() {
    var tables = document.querySelectorAll("table.gw-reflow");
    tables.forEach(function (t) { t.classList.remove("gw-stacked"); });
    tables.forEach(function (t) {
      var box = t.parentElement;
      if (box && t.offsetWidth > box.clientWidth + 1) {
        t.classList.add("gw-stacked");
      }
    });
  }

  // Records on <body> what the browser test reads: the page's width
  // against the window's (data-page-width, data-view-width) and the ids
  // of visible tables and charts that stick out of their box (data-cut).
  function reportLayout() {
    var doc = document.documentElement;
    var cut = [];
    document.querySelectorAll("table, .gw-chart").forEach(function (el) {
      var box = el.parentElement;
      if (!box || el.offsetParent === null) {
        return;
      }
      var r = el.getBoundingClientRect(), b = box.getBoundingClientRect();
      if (r.right > b.right + 1 || el.scrollWidth > el.clientWidth + 1) {
        cut.push(el.id || el.className);
      }
    });
    document.body.setAttribute("data-page-width", String(doc.scrollWidth));
    document.body.setAttribute("data-view-width", String(doc.clientWidth));
    document.body.setAttribute("data-cut", cut.join(" "));
  }

  function resizeAll() {
    layoutTables();
    charts.forEach(function (c) { c.resize(); });
    if (forest && data.forest[shown]) {
      forest.setOption(fitForest(forest, data.forest[shown]), true);
    }
    if (graph && data.graph[shown]) {
      drawGraph(graph, data.graph[shown]);
    }
    reportLayout();
  }


  // What-if panel. data.whatif[metric].values[S] is v(S), the estimated
  // change from the reference group's metric with the mechanisms of the
  // bit mask S in the comparison group's form. Ticked set T in the
  // reference group's form: the estimated gap left is v(N∖T); in the
  // comparison group's form: v(N) − v(T). The figure is printed as the
  // report prints a difference (formatDelta): scale·|x| with the metric's
  // decimals, "+" or U+2212 unless it prints as zero, then the unit. The
  // raw number goes to the output's data-value, for the browser test.
  function formatDelta(w, x) {
    var s = (w.scale * Math.abs(x)).toFixed(w.decimals);
    if (!/^[0.]*$/.test(s)) { s = (x > 0 ? "+" : "\u2212") + s; }
    return s + w.unit;
  }

  function remainingGap(w, ticked, toReference) {
    var n = w.values.length - 1; // N, all bits set
    return toReference ? w.values[n & ~ticked] : w.values[n] - w.values[ticked];
  }

  function updateWhatIf() {
    var panel = document.getElementById("whatif-panel");
    var out = document.getElementById("whatif-remaining");
    if (!panel || !out) {
      return;
    }
    var w = data.whatif && data.whatif[shown];
    var result = document.getElementById("whatif-result");
    panel.hidden = !w;
    result.hidden = !w;
    if (!w) {
      return;
    }
    var ticked = 0, count = 0;
    panel.querySelectorAll("input[data-bit]").forEach(function (box) {
      if (box.checked) { ticked |= 1 << +box.getAttribute("data-bit"); count++; }
    });
    var form = panel.querySelector('input[name="gw-whatif-form"]:checked');
    var toReference = !form || form.value !== "comparison";
    var x = remainingGap(w, ticked, toReference);
    out.textContent = formatDelta(w, x);
    out.setAttribute("data-value", String(x));
    out.setAttribute("data-ticked", String(ticked));
    var lead = document.getElementById("whatif-lead");
    var against = document.getElementById("whatif-against");
    if (count === 0) {
      lead.textContent = "With no mechanism made the same, the estimated gap is";
      against.textContent = " (observed gap " + w.observed + "; the residual " + w.residual + " is attributed to no mechanism)";
      return;
    }
    lead.textContent = "If " + (count === 1 ? "this mechanism were" : "these " + count + " mechanisms were") +
      " the same in both groups, in the " + (toReference ? "reference" : "comparison") + " group's form, the estimated gap would be";
    against.textContent = ", against an estimated gap of " + w.estimated + " with every mechanism as it is (observed gap " +
      w.observed + "; the residual " + w.residual + " is attributed to no mechanism and is not in these figures)";
  }

  function startWhatIf() {
    var panel = document.getElementById("whatif-panel");
    if (panel) {
      panel.addEventListener("change", updateWhatIf);
    }
    updateWhatIf();
  }

  // CSV download of every table. A cell's text is that of its parts joined
  // by a space (a value and the interval under it stay apart); a cell is
  // quoted when it holds a comma, a double quote, CR or LF, with double
  // quotes doubled, and rows end in CRLF (RFC 4180). A cell that starts
  // with = + - @, a tab or CR, and is not a plain number, gets a leading
  // apostrophe so that a spreadsheet reads it as text, not as a formula
  // (common practice: OWASP, "CSV Injection"). The file starts with a
  // UTF-8 byte-order mark, which spreadsheets need to read UTF-8.
  function cellText(node) {
    var parts = [];
    node.childNodes.forEach(function (c) {
      var t = c.nodeType === 3 ? c.nodeValue : c.nodeType === 1 ? cellText(c) : "";
      t = t.replace(/\s+/g, " ").trim();
      if (t) { parts.push(t); }
    });
    return parts.join(" ");
  }

  function csvField(text) {
    if (/^[=+\-@\t\r]/.test(text) && !/^[+\-]?[0-9]+(\.[0-9]+)?$/.test(text)) {
      text = "'" + text;
    }
    if (/[",\r\n]/.test(text)) {
      text = '"' + text.replace(/"/g, '""') + '"';
    }
    return text;
  }

  function tableCSV(table) {
    var lines = [];
    table.querySelectorAll("tr").forEach(function (tr) {
      var cells = [];
      tr.querySelectorAll("th, td").forEach(function (c) { cells.push(csvField(cellText(c))); });
      lines.push(cells.join(","));
    });
    return "\ufeff" + lines.join("\r\n") + "\r\n";
  }

  // Saves a table as CSV through a Blob URL and a link with a download
  // attribute: nothing leaves the page, and the Content-Security-Policy
  // (which governs what the page loads, not what it saves) is not asked.
  function downloadCSV(table, name) {
    var url = URL.createObjectURL(new Blob([tableCSV(table)], { type: "text/csv;charset=utf-8" }));
    var a = document.createElement("a");
    a.href = url;
    a.download = name;
    a.hidden = true;
    document.body.appendChild(a);
    a.click();
    document.body.removeChild(a);
    setTimeout(function () { URL.revokeObjectURL(url); }, 0);
  }

  // A "Download CSV" button after every table; the file is named after the
  // table's id, or its section's id and its number there.
  function addCSVButtons() {
    var seen = {};
    document.querySelectorAll("table.gw-table").forEach(function (table) {
      var section = table.closest("section");
      var base = table.id;
      if (!base) {
        var sid = section && section.id ? section.id : "table";
        seen[sid] = (seen[sid] || 0) + 1;
        base = sid + "-" + seen[sid];
      }
      var button = document.createElement("button");
      button.type = "button";
      button.className = "gw-csv";
      button.textContent = "Download CSV";
      button.setAttribute("data-csv-for", base);
      button.setAttribute("aria-label", "Download this table as CSV (" + base + ".csv)");
      button.addEventListener("click", function () { downloadCSV(table, "gapwise-" + base + ".csv"); });
      var after = table.parentElement && table.parentElement.classList.contains("gw-tablebox") ? table.parentElement : table;
      after.insertAdjacentElement("afterend", button);
    });
  }

  // The chosen metric is kept in the URL fragment (#metric=fpr), so that a
  // view can be linked: an unknown metric falls back to the first.
  function metricFromFragment() {
    var m = /(?:^#|&)metric=([A-Za-z0-9_]+)/.exec(window.location.hash);
    return m && data.forest[m[1]] ? m[1] : null;
  }

  function setFragment(name) {
    var hash = "#metric=" + name;
    if (window.location.hash !== hash && window.history && window.history.replaceState) {
      window.history.replaceState(null, "", hash);
    }
  }

  function start() {
    if (!data || typeof echarts === "undefined") {
      document.body.setAttribute("data-charts-error", "missing data or library");
      return;
    }
    var expected = 0;
    document.querySelectorAll("[data-chart]").forEach(function (el) {
      var kind = el.getAttribute("data-chart");
      var option = null;
      if (kind === "forest") { option = data.forest[data.metric]; forestHeight(el, option); }
      if (kind === "graph") { option = data.graph[data.metric]; }
      if (kind === "reliability") { option = data.reliability; }
      if (kind === "column") { option = data.columns[el.getAttribute("data-column")]; }
      var c = draw(el, option, kind === "graph" ? fitGraph : kind === "forest" ? fitForest : null);
      if (c) {
        expected++;
        if (kind === "forest") { forest = c; }
        if (kind === "graph") { graph = c; }
      }
    });
    document.body.setAttribute("data-charts-expected", String(expected));
    layoutTables();
    reportLayout();
    addCSVButtons();
    startWhatIf();
    var menu = document.getElementById("gw-metric");
    // A link may choose the metric: report.html#metric=fpr; without one, or
    // with an unknown metric, the first is shown.
    var wanted = metricFromFragment();
    if (menu) {
      menu.value = wanted || menu.options[0].value;
      menu.addEventListener("change", function () { selectMetric(menu.value); setFragment(menu.value); });
      selectMetric(menu.value);
      if (/(?:^#|&)metric=/.test(window.location.hash)) {
        setFragment(menu.value);
      }
      window.addEventListener("hashchange", function () {
        var m = metricFromFragment();
        if (m && m !== menu.value) {
          menu.value = m;
          selectMetric(m);
        }
      });
    }
    window.addEventListener("resize", resizeAll);
    // Print every table: open the collapsed equivalents, then restore.
    var opened = [];
    // While printing, the page is laid out at a printed page's width
    // (html.gw-print) so that charts and tables are sized for the paper.
    window.addEventListener("beforeprint", function () {
      document.documentElement.classList.add("gw-print");
      document.querySelectorAll("details.gw-equiv:not([open])").forEach(function (d) { d.open = true; opened.push(d); });
      resizeAll();
    });
    window.addEventListener("afterprint", function () {
      document.documentElement.classList.remove("gw-print");
      opened.forEach(function (d) { d.open = false; });
      opened = [];
      resizeAll();
    });
  }

  window.addEventListener("error", function (e) {
    document.body.setAttribute("data-charts-error", String(e.message));
  });
  start();
})();
