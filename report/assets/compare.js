/* gapwise comparison page: draws, per metric of a history, the gap and
   its leading contributions over the runs from window.gapwiseCompare
   (values already in the metric's display unit; null where a run has no
   value). Sets <body data-charts-rendered> to the number of charts drawn. */
(function () {
  "use strict";
  var data = window.gapwiseCompare || { charts: [] };
  var palette = ["#22252B", "#E69F00", "#56B4E9", "#009E73", "#CC79A7", "#0072B2", "#D55E00"];
  var rendered = 0;
  data.charts.forEach(function (c) {
    var el = document.getElementById("chart-" + c.metric);
    if (!el || typeof echarts === "undefined") { return; }
    var chart = echarts.init(el, null, { renderer: "svg" });
    var series = [];
    c.series.forEach(function (s, i) {
      var colour = palette[i % palette.length];
      series.push({ name: s.name, type: "line", data: s.values, symbolSize: 7, connectNulls: false,
        lineStyle: { width: i === 0 ? 3 : 2, color: colour }, itemStyle: { color: colour } });
      if (s.low) {
        series.push({ name: s.name, type: "custom", data: s.low.map(function (lo, j) { return [j, lo, s.high[j]]; }),
          renderItem: function (params, api) {
            if (api.value(1) === null || isNaN(api.value(1))) { return null; }
            var lo = api.coord([api.value(0), api.value(1)]), hi = api.coord([api.value(0), api.value(2)]);
            return { type: "line", shape: { x1: lo[0], y1: lo[1], x2: hi[0], y2: hi[1] }, style: { stroke: colour, lineWidth: 1.5 } };
          }, tooltip: { show: false }, z: 1 });
      }
    });
    chart.setOption({
      animation: false,
      grid: { left: 64, right: 24, top: 48, bottom: 40 },
      legend: { top: 0, type: "scroll" },
      tooltip: { trigger: "axis" },
      xAxis: { type: "category", data: c.runs },
      yAxis: { type: "value", name: c.unit, axisLine: { show: true } },
      series: series
    });
    rendered++;
  });
  document.body.setAttribute("data-charts-rendered", String(rendered));
})();
