"""Data for the stick spectrum: one series per vibrational state.

The browser draws the sticks (static/js/spectrum.js) from this compact shape,
so the page ships numbers, not a prebuilt figure, and the log/linear toggle can
redraw without a round trip.
"""

from __future__ import annotations

from planner.spectra.exports import finite_or_none
from planner.spectra.table import QUANTUM_LABELS

#: Strongest lines drawn; weaker ones are invisible on a linear axis anyway and
#: a few thousand points keep the browser responsive.
PLOT_LINE_LIMIT = 5000


def quantum_label(record: dict, rotor: str) -> str:
    """'J Ka Kc ← J Ka Kc' (or J K, or J) of one line; undefined numbers left out."""
    count = len(QUANTUM_LABELS[rotor])

    def level(suffix: str) -> str:
        values = [record[f"{prefix}_{suffix}"] for prefix in ("j", "ka", "kc")[:count]]
        return " ".join(str(v) for v in values if v is not None)

    return f"{level('up')} ← {level('lo')}"


def plot_data(records: list[dict], rotor: str, limit: int | None = None) -> dict:
    """Series for the plot and how many lines were left out.

    Returns ``{"series": [{"state", "frequency_mhz", "intensity_nm2mhz",
    "hover"}...], "plotted": n, "total": N}``; ``hover`` rows are
    [quantum label, σ [MHz], E_u [K], Sμ² [D²], A [s⁻¹]].
    """
    limit = PLOT_LINE_LIMIT if limit is None else limit
    chosen = records
    if len(records) > limit:
        strongest = sorted(range(len(records)), key=lambda i: records[i]["intensity_nm2mhz"], reverse=True)[:limit]
        chosen = [records[i] for i in sorted(strongest)]
    series: dict[str, dict] = {}
    for record in chosen:
        entry = series.setdefault(
            record["state"], {"state": record["state"], "frequency_mhz": [], "intensity_nm2mhz": [], "hover": []}
        )
        entry["frequency_mhz"].append(record["frequency_mhz"])
        entry["intensity_nm2mhz"].append(record["intensity_nm2mhz"])
        entry["hover"].append(
            [
                quantum_label(record, rotor),
                finite_or_none(record["sigma_mhz"]),
                finite_or_none(record["eu_k"]),
                finite_or_none(record["s_mu2_d2"]),
                finite_or_none(record["einstein_a_s"]),
            ]
        )
    return {"series": list(series.values()), "plotted": len(chosen), "total": len(records)}
