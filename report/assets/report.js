/* gapwise report script: draws the charts from window.gapwiseData with the
   inlined ECharts library and wires the metric menu. No network access.
   When every chart has finished rendering, it writes their number into
   <body data-charts-rendered>, which the headless browser test reads. */
(function () {
  "use strict";
  var data = window.gapwiseData;
  var charts = [];
  var rendered = 0;

  // Drawing functions for custom series, looked up by series id.
  function floatingBar(params, api) {
    var row = api.value(2);
    var a = api.coord([api.value(0), row]);
    var b = api.coord([api.value(1), row]);
    var h = api.size([0, 1])[1] * 0.56;
    var x0 = Math.min(a[0], b[0]);
    var w = Math.max(Math.abs(b[0] - a[0]), 2);
    var item = params.context.items[params.dataIndex];
    var children = [{
      type: "rect",
      shape: { x: x0, y: a[1] - h / 2, width: w, height: h, r: 2 },
      style: { fill: api.visual("color"), stroke: "#22252B", lineWidth: 0.5 }
    }];
    if (item && item.name) {
      var anchor = api.coord([api.value(3), row]);
      children.push({
        type: "text",
        style: { x: Math.max(x0 + w, anchor[0]) + 6, y: a[1], text: item.name, fill: "#22252B", font: "600 12px sans-serif", verticalAlign: "middle", align: "left" }
      });
    }
    return { type: "group", children: children };
  }

  function whisker(params, api) {
    var row = api.value(2);
    var a = api.coord([api.value(0), row]);
    var b = api.coord([api.value(1), row]);
    var h = api.size([0, 1])[1] * 0.3;
    var line = { stroke: "#22252B", lineWidth: 1.4 };
    return {
      type: "group",
      children: [
        { type: "line", shape: { x1: a[0], y1: a[1], x2: b[0], y2: b[1] }, style: line },
        { type: "line", shape: { x1: a[0], y1: a[1] - h / 2, x2: a[0], y2: a[1] + h / 2 }, style: line },
        { type: "line", shape: { x1: b[0], y1: b[1] - h / 2, x2: b[0], y2: b[1] + h / 2 }, style: line }
      ]
    };
  }

  var renderers = { "gw-walk-bars": floatingBar, "gw-whiskers": whisker };

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
    var left = +s.left || 0, right = +s.right || 0, top = +s.top || 0, bottom = +s.bottom || 0;
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
      document.body.setAttribute("data-charts-rendered", String(rendered));
    });
    chart.setOption(fit ? fit(chart, option) : prepare(option));
    charts.push(chart);
    return chart;
  }

  var walk = null, graph = null, graphMetric = data && data.metric;

  function selectMetric(name) {
    document.querySelectorAll(".gw-metric-panel").forEach(function (p) {
      p.hidden = p.getAttribute("data-metric") !== name;
    });
    if (walk && data.walk[name]) {
      walk.setOption(prepare(data.walk[name]), true);
    }
    if (graph && data.graph[name]) {
      graphMetric = name;
      drawGraph(graph, data.graph[name]);
    }
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

  function resizeAll() {
    charts.forEach(function (c) { c.resize(); });
    if (graph && data.graph[graphMetric]) {
      drawGraph(graph, data.graph[graphMetric]);
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
      if (kind === "walk") { option = data.walk[data.metric]; }
      if (kind === "graph") { option = data.graph[data.metric]; }
      if (kind === "reliability") { option = data.reliability; }
      if (kind === "column") { option = data.columns[el.getAttribute("data-column")]; }
      var c = draw(el, option, kind === "graph" ? fitGraph : null);
      if (c) {
        expected++;
        if (kind === "walk") { walk = c; }
        if (kind === "graph") { graph = c; }
      }
    });
    document.body.setAttribute("data-charts-expected", String(expected));
    var menu = document.getElementById("gw-metric");
    // A link may choose the metric: report.html#metric=fpr.
    var wanted = /metric=([A-Za-z0-9_]+)/.exec(window.location.hash);
    if (menu && wanted && data.walk[wanted[1]]) {
      menu.value = wanted[1];
    }
    if (menu) {
      menu.addEventListener("change", function () { selectMetric(menu.value); });
      selectMetric(menu.value);
    }
    window.addEventListener("resize", resizeAll);
    // Print every table: open the collapsed equivalents, then restore.
    var opened = [];
    window.addEventListener("beforeprint", function () {
      document.querySelectorAll("details.gw-equiv:not([open])").forEach(function (d) { d.open = true; opened.push(d); });
      resizeAll();
    });
    window.addEventListener("afterprint", function () {
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
