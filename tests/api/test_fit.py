"""POST /api/v1/fit: the fit page's report as JSON, from JSON lines or the lines CSV; nothing is saved."""

from __future__ import annotations

import csv
import io
import json

import numpy as np
import pytest

from planner.catalogue.models import Species as SpeciesRow
from planner.engine import AssignedLine, PredictionRequest, fit_constants, predict
from planner.fitting.lines_file import REQUIRED_COLUMNS
from planner.fitting.models import FitRun
from planner.fitting.report import fit_document
from planner.limits import FIT_J_CAPS, FIT_MAX_ITERATIONS, MAX_FIT_LINES
from tests.api.conftest import assert_error, post_json

#: Window and temperature that give CO six and OCS dozens of lines (common practice, no source).
REQUEST = PredictionRequest(fmin_mhz=0.0, fmax_mhz=700_000.0, temperature_k=100.0)
SIGMA_MHZ = 0.05
#: Offsets added to the predicted frequencies so the fit has residuals (invented, ± one σ).
OFFSET_MHZ = 0.05


def _measured(species) -> list[dict]:
    """The ground-state lines predicted for ``species``, shifted by ±OFFSET_MHZ in turn, as JSON lines."""
    first_state = species.states[0].label
    records = [r for r in predict(species, REQUEST).records() if r["state"] == first_state]
    keys = ("j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo")
    return [
        {
            **{k: r[k] for k in keys},
            "frequency_mhz": r["frequency_mhz"] + OFFSET_MHZ * (-1) ** i,
            "sigma_mhz": SIGMA_MHZ,
        }
        for i, r in enumerate(records)
    ]


def _expected(species, lines: list[dict], vary: list[str]) -> dict:
    assigned = [AssignedLine(**line) for line in lines]
    row = SpeciesRow.objects.get(name=species.name)
    report = fit_document(fit_constants(species, assigned, vary, max_iterations=FIT_MAX_ITERATIONS), species)
    # Through JSON, as the client reads it (the structure rows are tuples in Python).
    return json.loads(json.dumps({"species_id": row.pk, "species_version": row.version, **report}))


def _species(demo_species, name):
    return next(s for s in demo_species if s.name == name)


def test_fit_of_json_lines_equals_the_fit_report(token_client, demo_species):
    co = _species(demo_species, "CO")
    lines = _measured(co)
    response = post_json(token_client, "/fit", {"species": "CO", "vary": ["B", "D"], "lines": lines})
    assert response.status_code == 200
    report = response.json()
    assert report == _expected(co, lines, ["B", "D"])
    assert [c["name"] for c in report["constants"]] == ["B", "D"]
    # The offsets are ±σ, so the fitted B stays within a few kHz of the catalogue's (textbook identity:
    # a least-squares fit of lines shifted by a small alternating offset moves the constants little).
    np.testing.assert_allclose(report["constants"][0]["value_mhz"], co.states[0].value("B"), atol=0.05)
    assert report["line_count"] == len(lines) >= 5


def test_fit_of_the_lines_csv_equals_the_fit_of_the_same_json_lines(token_client, demo_species):
    ocs = _species(demo_species, "OCS")
    lines = _measured(ocs)
    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=REQUIRED_COLUMNS)
    writer.writeheader()
    writer.writerows({k: ("" if v is None else v) for k, v in line.items()} for line in lines)
    by_csv = post_json(token_client, "/fit", {"species": "OCS", "vary": ["B", "D"], "lines_csv": buffer.getvalue()})
    by_json = post_json(token_client, "/fit", {"species": "OCS", "vary": ["B", "D"], "lines": lines})
    assert by_csv.status_code == by_json.status_code == 200
    assert by_csv.json() == by_json.json() == _expected(ocs, lines, ["B", "D"])


def test_fit_saves_nothing(token_client, demo_species):
    before = SpeciesRow.objects.get(name="CO").version
    post_json(token_client, "/fit", {"species": "CO", "vary": ["B"], "lines": _measured(_species(demo_species, "CO"))})
    assert FitRun.objects.count() == 0
    assert SpeciesRow.objects.get(name="CO").version == before


@pytest.mark.parametrize(
    "change, field",
    [
        ({"species": "Unobtainium"}, "species"),
        ({"vary": []}, "vary"),
        ({"vary": ["Q"]}, "vary"),  # not a constant of a linear molecule: the engine's rule
        ({"vary": ["B", "B"]}, "vary"),
        ({"lines": None}, "lines"),  # neither lines nor lines_csv
        ({"lines_csv": "j_up,j_lo\n1,0\n"}, "lines"),  # both
    ],
)
def test_bad_input_is_a_400_naming_the_field(token_client, demo_species, change, field):
    body = {"species": "CO", "vary": ["B"], "lines": _measured(_species(demo_species, "CO"))} | change
    assert_error(post_json(token_client, "/fit", body), 400, "invalid_input", field)


def test_a_bad_json_line_is_named_by_its_index_and_column(token_client, demo_species):
    lines = _measured(_species(demo_species, "CO"))
    lines[2]["sigma_mhz"] = 0.0
    error = assert_error(
        post_json(token_client, "/fit", {"species": "CO", "vary": ["B"], "lines": lines}), 400, "invalid_input"
    )
    assert list(error["fields"]) == ["lines[2].sigma_mhz"]


def test_a_bad_csv_row_is_named_by_its_row(token_client, demo_in_db):
    text = ",".join(REQUIRED_COLUMNS) + "\n1,,,0,,,115271.2,0.1\n2,,,1,,,oops,0.1\n"
    body = {"species": "CO", "vary": ["B"], "lines_csv": text}
    error = assert_error(post_json(token_client, "/fit", body), 400, "invalid_input", "lines_csv")
    assert "row 3, frequency_mhz" in error["message"]


def test_too_many_lines_are_refused(token_client, demo_species):
    line = _measured(_species(demo_species, "CO"))[0]
    body = {"species": "CO", "vary": ["B"], "lines": [line] * (MAX_FIT_LINES + 1)}
    assert_error(post_json(token_client, "/fit", body), 400, "invalid_input", "lines")


@pytest.mark.parametrize("species, ka", [("CO", None), ("SO2", 0)])
def test_j_past_the_fit_pages_cap_is_refused_before_any_level_is_solved(token_client, demo_in_db, species, ka):
    rotor = SpeciesRow.objects.get(name=species).rotor
    j = FIT_J_CAPS[rotor] + 1
    line = {"j_up": j, "ka_up": ka, "kc_up": None if ka is None else j, "j_lo": j - 1, "ka_lo": ka}
    line |= {"kc_lo": None if ka is None else j - 1, "frequency_mhz": 1e6, "sigma_mhz": 0.1}
    body = {"species": species, "vary": ["B"], "lines": [line, line | {"frequency_mhz": 2e6}]}
    error = assert_error(post_json(token_client, "/fit", body), 400, "invalid_input", "lines")
    assert f"J above {FIT_J_CAPS[rotor]}" in error["message"]


def test_a_level_that_does_not_exist_is_a_400(token_client, demo_in_db):
    lines = [
        {"j_up": 1, "ka_up": 3, "kc_up": 0, "j_lo": 0, "ka_lo": 0, "kc_lo": 0, "frequency_mhz": 1e4, "sigma_mhz": 0.1},
        {"j_up": 2, "ka_up": 0, "kc_up": 2, "j_lo": 1, "ka_lo": 0, "kc_lo": 1, "frequency_mhz": 2e4, "sigma_mhz": 0.1},
    ]
    error = assert_error(
        post_json(token_client, "/fit", {"species": "SO2", "vary": ["A"], "lines": lines}), 400, "invalid_input"
    )
    assert "does not exist" in error["message"]
