"""What the plan pages show of a plan document: plot data, segment rows with their targets, notices."""

from __future__ import annotations

from planner.catalogue.models import Species as SpeciesRow

from .compute import target_label


def plot_data(document: dict) -> dict:
    """Sticks of every target (selected or not), the segments to shade, the temperature curves."""
    targets = document["result"]["targets"]
    sticks = {"selected": [], "other": []}
    for target in targets:
        group = sticks["selected" if target["selected"] else "other"]
        group.append([target["frequency_mhz"], target["expected_signal"], target_label(target), target["rank"]])
    segments = [[s["start_mhz"], s["stop_mhz"], s["number"]] for s in document["result"]["segments"]]
    window = [document["inputs"]["fmin_mhz"], document["inputs"]["fmax_mhz"]]
    return {"sticks": sticks, "segments": segments, "window": window, "curve": document["temperature_curve"]}


def segment_rows(document: dict) -> list[dict]:
    by_rank = {t["rank"]: t for t in document["result"]["targets"]}
    return [
        segment | {"targets": [by_rank[r] for r in segment["target_ranks"] if r in by_rank]}
        for segment in document["result"]["segments"]
    ]


def plan_context(document: dict) -> dict:
    return {
        "targets": document["result"]["targets"],
        "segments": segment_rows(document),
        "left_out": document["result"]["left_out"],
        "totals": document["result"]["totals"],
        "plan_messages": document["result"].get("messages", []),
        "hazards": document["hazards"],
        "plot": plot_data(document),
        "inputs": document["inputs"],
    }


def catalogue_changes(catalogue_versions: dict) -> list[str]:
    """Species whose catalogue entry changed (or went) since the plan was computed."""
    current = {row.name: [row.pk, row.version] for row in SpeciesRow.objects.all()}
    changed = [name for name, version in catalogue_versions.items() if current.get(name) != version]
    added = [name for name in current if name not in catalogue_versions]
    return sorted(changed + added)
