"""POST /api/v1/plan: the plan document of the plan page, built by the page's own form from MHz keys."""

from __future__ import annotations

import pytest

from planner.catalogue.models import Species as SpeciesRow
from planner.planning.compute import compute_plan
from planner.planning.demo import load_demo_instruments
from planner.planning.forms import PlanForm
from tests.api.conftest import assert_error, post_json

#: A W-band slot of an hour on OCS and CO in a cooled cell (common practice, no source).  Cold, so that
#: the blend check's predictions of every demo species stay quick on the shared machine.
BODY = {
    "fmin_mhz": 80_000.0,
    "fmax_mhz": 100_000.0,
    "temperature_k": 50.0,
    "slot_minutes": 60.0,
    "species": [{"name": "OCS", "amount": 1.0}, {"name": "CO", "amount": 0.5}],
}
CELL = "Orrin Hollow W-band cell"  # a demo instrument profile: 75–110 GHz absorption cell


def _page_plan(data: dict) -> dict:
    """The plan the plan page makes of its form data (window in GHz, as a person types it)."""
    species = list(SpeciesRow.objects.order_by("name").values_list("pk", "name", "natural_abundance"))
    form = PlanForm(data, species=species)
    assert form.is_valid(), form.errors
    return compute_plan(form.inputs())


def _amount(name: str) -> str:
    return f"amount_{SpeciesRow.objects.get(name=name).pk}"


def test_plan_equals_the_plan_pages_document(token_client, demo_in_db):
    response = post_json(token_client, "/plan", BODY)
    assert response.status_code == 200
    page = {"frequency_unit": "GHz", "fmin": "80", "fmax": "100", "temperature_k": "50", "slot_minutes": "60"}
    page |= {"snr": "5", "k_sigma": "3", "margin_mhz": "0", _amount("OCS"): "1", _amount("CO"): "0.5"}
    expected = _page_plan(page)
    document = response.json()
    assert document == expected
    assert document["inputs"]["fmin_mhz"] == 80_000.0 and document["inputs"]["slot_s"] == 3600.0
    assert {t["species"] for t in document["result"]["targets"]} <= {"OCS", "CO"}
    assert document["result"]["targets"]  # OCS has lines in the W band


def test_plan_with_an_instrument_uses_its_model(token_client, demo_in_db):
    load_demo_instruments()
    body = BODY | {"instrument": CELL, "species": [{"name": "OCS", "amount": 0.01}]}
    document = post_json(token_client, "/plan", body).json()
    assert document["inputs"]["instrument"] == CELL
    assert document["inputs"]["model"]["kind"] == "absorption-cell"


@pytest.mark.parametrize(
    "change, field",
    [
        ({"fmax_mhz": 70_000.0}, "fmax_mhz"),  # below fmin_mhz: the form's rule
        ({"temperature_k": -3.0}, "temperature_k"),
        ({"slot_minutes": 0.0}, "slot_minutes"),
        ({"species": [{"name": "OCS", "amount": -1.0}]}, "species[0].amount"),
        (
            {"species": [{"name": "CO", "amount": 1.0}, {"name": "OCS", "amount": 1.0, "isotopic_fraction": 2.0}]},
            "species[1].isotopic_fraction",
        ),
        ({"species": [{"name": "Unobtainium", "amount": 1.0}]}, "species"),
        ({"species": [{"name": "CO", "amount": 1.0}, {"name": "CO", "amount": 2.0}]}, "species"),
        ({"species": []}, "species"),
        ({"instrument": "The Big Dish"}, "instrument"),
        ({"slot_minutes": None}, "slot_minutes"),
    ],
)
def test_bad_input_is_a_400_naming_the_field(token_client, demo_in_db, change, field):
    assert_error(post_json(token_client, "/plan", BODY | change), 400, "invalid_input", field)


def test_window_outside_the_instrument_is_refused_by_the_pages_rule(token_client, demo_in_db):
    load_demo_instruments()
    body = BODY | {"instrument": CELL, "fmax_mhz": 120_000.0, "species": [{"name": "OCS", "amount": 0.01}]}
    error = assert_error(post_json(token_client, "/plan", body), 400, "invalid_input", "fmax_mhz")
    assert "choose a window inside it" in error["message"]


def test_mole_fraction_above_one_in_a_cell_is_refused(token_client, demo_in_db):
    load_demo_instruments()
    body = BODY | {"instrument": CELL, "species": [{"name": "OCS", "amount": 2.0}]}
    error = assert_error(post_json(token_client, "/plan", body), 400, "invalid_input")
    assert "mole fraction is at most 1" in error["message"]


def test_only_zero_amounts_is_refused(token_client, demo_in_db):
    body = BODY | {"species": [{"name": "OCS", "amount": 0.0}]}
    error = assert_error(post_json(token_client, "/plan", body), 400, "invalid_input")
    assert "at least one species" in error["message"]
