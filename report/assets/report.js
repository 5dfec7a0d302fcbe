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

  function draw(el, option) {
    if (!el || !option) {
      return null;
    }
    var chart = echarts.init(el, null, { renderer: "svg" });
    chart.on("finished", function once() {
      chart.off("finished", once);
      rendered++;
      document.body.setAttribute("data-charts-rendered", String(rendered));
    });
    chart.setOption(prepare(option));
    charts.push(chart);
    return chart;
  }

  var walk = null, graph = null;

  function selectMetric(name) {
    document.querySelectorAll(".gw-metric-panel").forEach(function (p) {
      p.hidden = p.getAttribute("data-metric") !== name;
    });
    if (walk && data.walk[name]) {
      walk.setOption(prepare(data.walk[name]), true);
    }
    if (graph && data.graph[name]) {
      graph.setOption(prepare(data.graph[name]), true);
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
      var c = draw(el, option);
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
    window.addEventListener("resize", function () {
      charts.forEach(function (c) { c.resize(); });
    });
    // Print every table: open the collapsed equivalents, then restore.
    var opened = [];
    window.addEventListener("beforeprint", function () {
      document.querySelectorAll("details.gw-equiv:not([open])").forEach(function (d) { d.open = true; opened.push(d); });
      charts.forEach(function (c) { c.resize(); });
    });
    window.addEventListener("afterprint", function () {
      opened.forEach(function (d) { d.open = false; });
      opened = [];
      charts.forEach(function (c) { c.resize(); });
    });
  }

  window.addEventListener("error", function (e) {
    document.body.setAttribute("data-charts-error", String(e.message));
  });
  start();
})();
