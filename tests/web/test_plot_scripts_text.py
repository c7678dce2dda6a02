"""The plot scripts hand user text (state labels, species names) to Plotly as text, not as its HTML-like markup.

Plotly reads <b>, <i>, <a href>, <span style> and a few more in trace names and hover text, and
decodes &lt; &gt; &amp;.  The scripts therefore escape those three characters.  Each script runs
here under node with stand-ins for the page and for Plotly, which record the traces drawn.
"""

from __future__ import annotations

import json
import shutil
import subprocess
from pathlib import Path

import pytest

JS = Path(__file__).resolve().parents[2] / "planner" / "static" / "js"
NODE = shutil.which("node")
pytestmark = pytest.mark.skipif(NODE is None, reason="node is not installed")

LABEL = '<a href="https://example.invalid">v=0</a> & <b>'
ESCAPED = '&lt;a href="https://example.invalid"&gt;v=0&lt;/a&gt; &amp; &lt;b&gt;'

HARNESS = """
const fs = require("fs");
const [script, data, holders] = JSON.parse(process.argv[1]);
const elements = {};
for (const id of holders) { elements[id] = {id: id}; }
elements[data.id] = {textContent: JSON.stringify(data.document)};
global.document = {getElementById: (id) => elements[id] || null, querySelectorAll: () => []};
global.window = {addEventListener: () => {}};
const drawn = [];
global.Plotly = {react: (holder, traces) => drawn.push({holder: holder.id, traces: traces}), relayout: () => {}};
eval(fs.readFileSync(script, "utf8"));
console.log(JSON.stringify(drawn));
"""


def _draw(script: str, data_id: str, document: dict, holders: list[str]) -> list[dict]:
    argument = json.dumps([str(JS / script), {"id": data_id, "document": document}, holders])
    result = subprocess.run([NODE, "-e", HARNESS, argument], capture_output=True, text=True, timeout=60)
    assert result.returncode == 0, result.stderr
    return json.loads(result.stdout)


def test_spectrum_plot_names_a_state_as_text():
    series = {
        "state": LABEL,
        "frequency_mhz": [1000.0],
        "intensity_nm2mhz": [1e-5],
        "hover": [["1 ← 0", 0.1, 5.0, 1.0, 1e-7]],
    }
    drawn = _draw("spectrum-plot.js", "plot-data", {"series": [series], "plotted": 1, "total": 1}, ["spectrum-plot"])
    names = {trace["name"] for trace in drawn[0]["traces"]}
    assert names == {ESCAPED}


def test_plan_plots_name_targets_as_text():
    target = [115271.2, 0.5, LABEL, 1]
    document = {
        "sticks": {"selected": [target], "other": []},
        "segments": [[115000.0, 115500.0]],
        "window": [100000.0, 120000.0],
        "curve": {
            "temperatures_k": [10.0, 300.0],
            "lines": [{"rank": 1, "label": LABEL, "expected_signal": [1.0, 0.5]}],
        },
    }
    drawn = {
        plot["holder"]: plot["traces"]
        for plot in _draw("plan-plot.js", "plan-data", document, ["plan-plot", "curve-plot"])
    }
    markers = [trace for trace in drawn["plan-plot"] if trace["mode"] == "markers"]
    assert markers[0]["customdata"] == [[ESCAPED, 1]]
    (curve,) = drawn["curve-plot"]
    assert curve["name"] == f"#1 {ESCAPED}"
    assert curve["hovertemplate"].endswith(f"<extra>{ESCAPED}</extra>")
