// Energy-level diagram from #levels-data (planner/catalogue/levels_plot.py):
// one short horizontal bar per level at its J, hover names the level.
// Levels that a spin weight of 0 removes are drawn as thin grey dashes.
(function () {
  "use strict";
  var holder = document.getElementById("levels-plot");
  var source = document.getElementById("levels-data");
  if (!holder || !source || typeof Plotly === "undefined") { return; }
  var data = JSON.parse(source.textContent);
  var half = 0.32;

  function bars(part, name, line) {
    var x = [], y = [], text = [];
    part.j.forEach(function (j, i) {
      x.push(j - half, j + half, null);
      y.push(part.energy_cm1[i], part.energy_cm1[i], null);
      text.push(part.label[i], part.label[i], null);
    });
    return {type: "scatter", mode: "lines", x: x, y: y, text: text, name: name, line: line,
            hovertemplate: "%{text}<br>%{y:.4f} cm⁻¹<extra></extra>"};
  }

  var traces = [bars(data.present, "levels", {color: "#1d4f91", width: 2})];
  if (data.absent.j.length) {
    traces.push(bars(data.absent, "spin weight 0 (absent)", {color: "#9aa3ad", width: 1, dash: "dot"}));
  }
  var layout = {
    margin: {l: 64, r: 12, t: 8, b: 44},
    xaxis: {title: {text: "J"}, dtick: 1, range: [-0.6, data.j_max + 0.6], zeroline: false,
            showline: true, linecolor: "#888", ticks: "outside"},
    yaxis: {title: {text: "Energy [cm⁻¹]"}, showline: true, linecolor: "#888", ticks: "outside", zeroline: false},
    hovermode: "closest", showlegend: data.absent.j.length > 0,
    legend: {orientation: "h", y: 1.02, yanchor: "bottom", x: 0},
    plot_bgcolor: "#fff", paper_bgcolor: "#fff",
    font: {family: "system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif", size: 12}
  };
  Plotly.react(holder, traces, layout, {responsive: true, displaylogo: false,
    toImageButtonOptions: {format: "png", filename: "linecast-levels"}});
  // On paper: the height the print stylesheet gives the diagram, then back to the window's size.
  window.addEventListener("beforeprint", function () {
    Plotly.relayout(holder, {width: 1000, height: 260});
  });
  window.addEventListener("afterprint", function () {
    Plotly.relayout(holder, {width: null, height: null, autosize: true});
  });
})();
