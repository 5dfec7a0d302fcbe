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
    var menu = document.getElementById("gw-metric");
    // A link may choose the metric: report.html#metric=fpr.
    var wanted = /metric=([A-Za-z0-9_]+)/.exec(window.location.hash);
    if (menu && wanted && data.forest[wanted[1]]) {
      menu.value = wanted[1];
    }
    if (menu) {
      menu.addEventListener("change", function () { selectMetric(menu.value); });
      selectMetric(menu.value);
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
