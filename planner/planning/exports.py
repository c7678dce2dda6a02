"""The plan's files: targets CSV, segments CSV, the whole plan as JSON.

One shape for every consumer: the plan document of compute.py.  The pages,
the saved-plan downloads and `manage.py plan` all write through here.
"""

from __future__ import annotations

import csv
import math

from .compute import document_json

#: Columns of the targets CSV (units in the names; quantum numbers as in the predict CSV).
TARGET_COLUMNS = (
    "rank",
    "species",
    "state",
    "frequency_mhz",
    "sigma_mhz",
    "j_up",
    "ka_up",
    "kc_up",
    "j_lo",
    "ka_lo",
    "kc_lo",
    "eu_k",
    "s_mu2_d2",
    "einstein_a_s",
    "intensity_nm2mhz",
    "fwhm_mhz",
    "vib_energy_cm1",
    "satellite",
    "hfs_low_mhz",
    "hfs_high_mhz",
    "isotopic_fraction",
    "expected_signal",
    "time_to_snr_s",
    "selected",
    "segment",
    "blends",
    "reason",
)
SEGMENT_COLUMNS = ("number", "start_mhz", "stop_mhz", "width_mhz", "dwell_s", "target_ranks")


def _cell(value):
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (list, tuple)):
        return "; ".join(str(v) for v in value)
    return value


def targets_csv(document: dict, file) -> None:
    writer = csv.writer(file, lineterminator="\n")
    writer.writerow(TARGET_COLUMNS)
    for target in document["result"]["targets"]:
        writer.writerow([_cell(target.get(key)) for key in TARGET_COLUMNS])


def segments_csv(document: dict, file) -> None:
    writer = csv.writer(file, lineterminator="\n")
    writer.writerow(SEGMENT_COLUMNS)
    for segment in document["result"]["segments"]:
        row = segment | {"width_mhz": segment["stop_mhz"] - segment["start_mhz"]}
        writer.writerow([_cell(row.get(key)) for key in SEGMENT_COLUMNS])


def plan_file_content(document: dict) -> dict:
    """The plan JSON: the engine's result keys at the top (targets, segments, left_out, totals, ...)
    beside the inputs, the catalogue versions used, the hazard notes and the temperature curves."""
    outer = {key: value for key, value in document.items() if key != "result"}
    return {"inputs": outer.pop("inputs"), **document["result"], **outer}


def plan_json(document: dict) -> str:
    return document_json(plan_file_content(document)) + "\n"
