// Plan plots from #plan-data (planner/planning/presentation.py): expected signal
// of every target against frequency with the scheduled segments shaded, and the
// strongest targets' signal against temperature.
(function () {
  "use strict";
  var source = document.getElementById("plan-data");
  if (!source || typeof Plotly === "undefined") { return; }
  var data = JSON.parse(source.textContent);
  // Plotly reads a few HTML-like tags (<b>, <a href>, ...) in names and hover text; species names
  // and state labels are text, so their < > & go in as entities, which Plotly shows as themselves.
  function asText(value) {
    return String(value).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
  }
  var font = {family: "system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif", size: 12};
  var config = {responsive: true, displaylogo: false, modeBarButtonsToRemove: ["select2d", "lasso2d"]};
  var holder = document.getElementById("plan-plot");
  var logBox = document.getElementById("log-scale");

  function sticks(rows, name, colour, floor) {
    var x = [], y = [];
    rows.forEach(function (r) { x.push(r[0], r[0], null); y.push(floor, r[1], null); });
    return [
      {type: "scatter", mode: "lines", x: x, y: y, line: {color: colour, width: 1}, hoverinfo: "skip",
       showlegend: false, legendgroup: name},
      {type: "scatter", mode: "markers", name: name, legendgroup: name, marker: {color: colour, size: 5},
       x: rows.map(function (r) { return r[0]; }), y: rows.map(function (r) { return r[1]; }),
       customdata: rows.map(function (r) { return [asText(r[2]), r[3]]; }),
       hovertemplate: "#%{customdata[1]} %{customdata[0]}<br>%{x:.4f} MHz<br>signal %{y:.3e}<extra></extra>"}
    ];
  }

  function drawSpectrum() {
    if (!holder) { return; }
    var log = logBox && logBox.checked;
    var all = data.sticks.selected.concat(data.sticks.other).map(function (r) { return r[1]; }).filter(function (v) { return v > 0; });
    var floor = log && all.length ? Math.min.apply(null, all) / 10 : 0;
    var traces = sticks(data.sticks.selected, "scheduled", "#1d4f91", floor)
      .concat(sticks(data.sticks.other, "not scheduled", "#b6412b", floor));
    // A segment narrower than a few pixels would vanish: shade at least 0.3 % of the window around it.
    var least = (data.window[1] - data.window[0]) * 0.003;
    var shapes = data.segments.map(function (s) {
      var middle = (s[0] + s[1]) / 2, half = Math.max((s[1] - s[0]) / 2, least / 2);
      return {type: "rect", xref: "x", yref: "paper", x0: middle - half, x1: middle + half, y0: 0, y1: 1,
              fillcolor: "rgba(29, 79, 145, 0.12)", line: {width: 0}, layer: "below"};
    });
    Plotly.react(holder, traces, {
      margin: {l: 72, r: 16, t: 8, b: 48}, shapes: shapes, hovermode: "closest", font: font,
      xaxis: {title: {text: "Frequency [MHz]"}, range: data.window, exponentformat: "none", separatethousands: true,
              showline: true, linecolor: "#888", ticks: "outside", zeroline: false},
      yaxis: {title: {text: "Expected signal"}, type: log ? "log" : "linear", exponentformat: "power",
              showline: true, linecolor: "#888", ticks: "outside"},
      legend: {orientation: "h", y: 1.02, yanchor: "bottom", x: 0}, plot_bgcolor: "#fff", paper_bgcolor: "#fff"
    }, config);
  }

  function drawCurves() {
    var curveHolder = document.getElementById("curve-plot");
    if (!curveHolder) { return; }
    var traces = data.curve.lines.map(function (line) {
      var label = asText(line.label);
      return {type: "scatter", mode: "lines+markers", name: "#" + line.rank + " " + label,
              x: data.curve.temperatures_k, y: line.expected_signal,
              hovertemplate: "%{x} K: %{y:.3e}<extra>" + label + "</extra>"};
    });
    Plotly.react(curveHolder, traces, {
      margin: {l: 72, r: 16, t: 8, b: 44}, font: font, hovermode: "closest",
      xaxis: {title: {text: "Temperature [K]"}, type: "log", showline: true, linecolor: "#888", ticks: "outside"},
      yaxis: {title: {text: "Expected signal"}, type: "log", exponentformat: "power", showline: true, linecolor: "#888", ticks: "outside"},
      legend: {font: {size: 11}}, plot_bgcolor: "#fff", paper_bgcolor: "#fff"
    }, config);
  }

  drawSpectrum();
  drawCurves();
  if (logBox) { logBox.addEventListener("change", drawSpectrum); }
  // On paper both plots get the printable width and the heights print.css gives them.
  var curveHolder = document.getElementById("curve-plot");
  window.addEventListener("beforeprint", function () {
    if (holder) { Plotly.relayout(holder, {width: 1000, height: 300}); }
    if (curveHolder) { Plotly.relayout(curveHolder, {width: 1000, height: 260}); }
  });
  window.addEventListener("afterprint", function () {
    [holder, curveHolder].forEach(function (h) {
      if (h) { Plotly.relayout(h, {width: null, height: null, autosize: true}); }
    });
  });
})();
