// Draws the stick spectrum from the numbers the page embeds as #plot-data
// (see planner/spectra/plot.py for their shape).  Each line is a vertical
// stick from the axis floor to its intensity, with a marker on top that
// carries the hover text.
(function () {
  "use strict";
  var holder = document.getElementById("spectrum-plot");
  var source = document.getElementById("plot-data");
  if (!holder || !source || typeof Plotly === "undefined") { return; }
  var data = JSON.parse(source.textContent);
  // Plotly reads a few HTML-like tags (<b>, <a href>, ...) in names; a state label is text, so
  // its < > & go in as entities, which Plotly shows as the characters themselves.
  function asText(value) {
    return String(value).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
  }
  var logBox = document.getElementById("log-scale");
  var colours = ["#1d4f91", "#b6412b", "#2c7a4b", "#7047a8", "#9a6b00", "#3b7f8f"];
  var hover = "<b>%{customdata[0]}</b><br>" +
    "%{x:.4f} ± %{customdata[1]:.4f} MHz<br>" +
    "E<sub>u</sub> = %{customdata[2]:.2f} K<br>" +
    "Sμ² = %{customdata[3]:.4g} D²<br>" +
    "A = %{customdata[4]:.3e} s⁻¹<br>" +
    "I = %{y:.3e} nm² MHz<extra>%{fullData.name}</extra>";

  function smallestIntensity() {
    var low = Infinity;
    data.series.forEach(function (s) {
      s.intensity_nm2mhz.forEach(function (v) { if (v > 0 && v < low) { low = v; } });
    });
    return isFinite(low) ? low : 1e-12;
  }

  function traces(logScale) {
    // A log axis cannot show 0, so sticks then start a decade below the weakest line.
    var floor = logScale ? smallestIntensity() / 10 : 0;
    var all = [];
    data.series.forEach(function (s, index) {
      var colour = colours[index % colours.length];
      var x = [], y = [];
      s.frequency_mhz.forEach(function (f, i) {
        x.push(f, f, null);
        y.push(floor, s.intensity_nm2mhz[i], null);
      });
      all.push({
        type: "scatter", mode: "lines", x: x, y: y, name: asText(s.state), legendgroup: s.state,
        line: {color: colour, width: 1}, hoverinfo: "skip", showlegend: false
      });
      all.push({
        type: "scatter", mode: "markers", x: s.frequency_mhz, y: s.intensity_nm2mhz,
        name: asText(s.state), legendgroup: s.state, customdata: s.hover, hovertemplate: hover,
        marker: {color: colour, size: 4}, showlegend: data.series.length > 1,
        // ±1σ of each frequency as a horizontal bar on the stick's top (visible when zoomed in)
        error_x: {type: "data", array: s.hover.map(function (h) { return h[1] || 0; }),
                  visible: true, color: colour, thickness: 1, width: 3}
      });
    });
    return all;
  }

  function layout(logScale) {
    return {
      margin: {l: 72, r: 16, t: 8, b: 48},
      xaxis: {title: {text: "Frequency [MHz]"}, exponentformat: "none", separatethousands: true,
              showline: true, linecolor: "#888", ticks: "outside", zeroline: false},
      yaxis: {title: {text: "Intensity [nm² MHz]"}, type: logScale ? "log" : "linear",
              exponentformat: "power", showline: true, linecolor: "#888", ticks: "outside",
              rangemode: logScale ? "normal" : "tozero"},
      hovermode: "closest",
      showlegend: data.series.length > 1,
      legend: {orientation: "h", y: 1.02, yanchor: "bottom", x: 0},
      plot_bgcolor: "#fff", paper_bgcolor: "#fff",
      font: {family: "system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif", size: 12}
    };
  }

  var config = {responsive: true, displaylogo: false, scrollZoom: false,
                modeBarButtonsToRemove: ["select2d", "lasso2d"],
                toImageButtonOptions: {format: "png", filename: "linecast-spectrum"}};

  function draw() {
    var logScale = logBox && logBox.checked;
    Plotly.react(holder, traces(logScale), layout(logScale), config);
  }

  draw();
  if (logBox) { logBox.addEventListener("change", draw); }
  // On paper the plot gets the printable width of an A4/Letter landscape page
  // (about 1000 CSS px), then goes back to following the window.
  window.addEventListener("beforeprint", function () {
    Plotly.relayout(holder, {width: 1000, height: 300});
  });
  window.addEventListener("afterprint", function () {
    Plotly.relayout(holder, {width: null, height: null, autosize: true});
  });
})();
