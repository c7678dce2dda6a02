"""`manage.py plan`: the same plan on the command line, as targets CSV or the whole plan JSON."""

import csv
import io
import json

import pytest
from django.core.management import CommandError, call_command

from planner.catalogue_file import DEMO_CATALOGUE_PATH
from planner.planning.exports import TARGET_COLUMNS

ARGS = ("--catalogue", str(DEMO_CATALOGUE_PATH), "--fmin", "85000", "--fmax", "110000", "--temperature", "300")


def run(*args) -> str:
    out = io.StringIO()
    call_command("plan", *args, stdout=out, stderr=io.StringIO())
    return out.getvalue()


def test_csv_lists_the_ranked_targets():
    rows = list(csv.reader(io.StringIO(run(*ARGS, "--slot-minutes", "30", "--species", "OCS", "SO2"))))
    assert tuple(rows[0]) == TARGET_COLUMNS
    assert [int(r[0]) for r in rows[1:]] == list(range(1, len(rows)))
    assert {r[1] for r in rows[1:]} <= {"OCS", "SO2"}


def test_json_has_inputs_targets_segments_and_left_out(tmp_path):
    path = tmp_path / "plan.json"
    call_command(
        "plan",
        *ARGS,
        "--slot-minutes",
        "30",
        "--species",
        "OCS",
        "--format",
        "json",
        "--output",
        str(path),
        stderr=io.StringIO(),
    )
    document = json.loads(path.read_text())
    assert document["inputs"]["species"] == [{"name": "OCS", "amount": 1.0}]
    assert document["inputs"]["model"]["kind"] == "relative"
    assert {"inputs", "targets", "segments", "left_out", "totals"} <= set(document)
    assert document["totals"]["used_s"] <= 1800
    target = document["targets"][0]
    for key in (
        "rank",
        "species",
        "state",
        "j_up",
        "ka_up",
        "kc_up",
        "j_lo",
        "ka_lo",
        "kc_lo",
        "frequency_mhz",
        "sigma_mhz",
        "expected_signal",
        "time_to_snr_s",
        "selected",
    ):
        assert key in target
    for item in document["left_out"]:
        assert item["reason"]


def test_a_longer_slot_schedules_at_least_as_much():
    short = json.loads(run(*ARGS, "--slot-minutes", "1", "--species", "SO2", "--format", "json"))
    long = json.loads(run(*ARGS, "--slot-minutes", "120", "--species", "SO2", "--format", "json"))
    assert long["totals"]["selected_count"] >= short["totals"]["selected_count"]


def test_unknown_species_and_bad_window_are_command_errors():
    with pytest.raises(CommandError, match="unknown species 'Unobtainium'"):
        run(*ARGS, "--slot-minutes", "10", "--species", "Unobtainium")
    with pytest.raises(CommandError, match="cannot plan"):
        run(
            "--catalogue",
            str(DEMO_CATALOGUE_PATH),
            "--fmin",
            "9",
            "--fmax",
            "1",
            "--temperature",
            "300",
            "--slot-minutes",
            "10",
            "--species",
            "OCS",
        )
