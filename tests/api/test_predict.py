"""POST /api/v1/predict: the page's one prediction shape for several species, validated by the engine's rules."""

from __future__ import annotations

import pytest

from planner.api.schemas import MAX_PREDICT_SPECIES
from planner.engine import EngineLimitError, PredictionRequest, predict, predict_many
from planner.spectra.exports import prediction_json
from tests.api.conftest import assert_error, csrf_headers, post_json

#: A millimetre-wave window with lines of CO and OCS at a cold temperature (common practice, no source).
WINDOW = {"fmin_mhz": 100_000.0, "fmax_mhz": 120_000.0, "temperature_k": 50.0}


def _demo(demo_species, *names):
    by_name = {s.name: s for s in demo_species}
    return [by_name[name] for name in names]


def test_prediction_equals_the_exports_shape_of_the_engine_prediction(token_client, demo_species):
    response = post_json(token_client, "/predict", {"species": ["CO", "OCS"], **WINDOW})
    assert response.status_code == 200
    request = PredictionRequest(**WINDOW)
    expected = prediction_json(predict_many(_demo(demo_species, "CO", "OCS"), request), request)
    assert response.json() == expected
    assert {line["species"] for line in expected["lines"]} == {"CO", "OCS"}  # both species have lines here


def test_intensity_floor_drops_weaker_lines(token_client, demo_species):
    (ocs,) = _demo(demo_species, "OCS")
    full = predict(ocs, PredictionRequest(**WINDOW))
    floor = float(sorted(full.lines["intensity_nm2mhz"])[len(full.lines) // 2])  # the median line
    body = {"species": ["OCS"], **WINDOW, "min_intensity_nm2mhz": floor}
    document = post_json(token_client, "/predict", body).json()
    request = PredictionRequest(**WINDOW, min_intensity_nm2mhz=floor)
    assert document == prediction_json(predict(ocs, request), request)
    assert 0 < len(document["lines"]) < len(full.lines)


def test_every_quantity_key_carries_its_unit(token_client, demo_in_db):
    document = post_json(token_client, "/predict", {"species": ["CO"], **WINDOW}).json()
    assert set(document["request"]) == {"fmin_mhz", "fmax_mhz", "temperature_k", "min_intensity_nm2mhz"}
    line = document["lines"][0]
    assert {"frequency_mhz", "sigma_mhz", "intensity_nm2mhz"} <= set(line)
    assert set(document["columns"]) == set(line)


def test_session_post_with_csrf_token_gets_the_same_prediction(session_client, token_client, demo_in_db):
    body = {"species": ["CO"], **WINDOW}
    by_session = post_json(session_client, "/predict", body, **csrf_headers(session_client))
    assert by_session.status_code == 200
    assert by_session.json() == post_json(token_client, "/predict", body).json()


@pytest.mark.parametrize(
    "change, field",
    [
        ({"fmax_mhz": 90_000.0}, "fmax_mhz"),  # below fmin_mhz: the engine's rule
        ({"fmin_mhz": -5.0}, "fmin_mhz"),
        ({"temperature_k": 0.0}, "temperature_k"),
        ({"temperature_k": 1e6}, "temperature_k"),  # past the engine's MAX_TEMPERATURE_K
        ({"min_intensity_nm2mhz": -1.0}, "min_intensity_nm2mhz"),
        ({"temperature_k": "warm"}, "temperature_k"),  # not a number: the schema's rule
        ({"species": ["CO", "Unobtainium"]}, "species"),
        ({"species": []}, "species"),
        ({"species": ["CO"] * (MAX_PREDICT_SPECIES + 1)}, "species"),
    ],
)
def test_bad_input_is_a_400_naming_the_field(token_client, demo_in_db, change, field):
    body = {"species": ["CO"], **WINDOW} | change
    error = assert_error(post_json(token_client, "/predict", body), 400, "invalid_input", field)
    assert error["fields"][field][0] in error["message"]


def test_missing_field_is_named(token_client, demo_in_db):
    body = {"species": ["CO"], "fmin_mhz": 0.0, "fmax_mhz": 1000.0}
    assert_error(post_json(token_client, "/predict", body), 400, "invalid_input", "temperature_k")


def test_temperature_past_the_engines_j_cap_is_a_422_with_the_engines_message(token_client, demo_species):
    """The largest asymmetric top of the demo at the highest temperature needs levels past J = 250."""
    heavy = max((s for s in demo_species if s.rotor == "asymmetric"), key=lambda s: s.mass_amu)
    request = PredictionRequest(0.0, 1_000_000.0, 5000.0)
    with pytest.raises(EngineLimitError) as refusal:
        predict(heavy, request)
    body = {"species": [heavy.name], "fmin_mhz": 0.0, "fmax_mhz": 1_000_000.0, "temperature_k": 5000.0}
    error = assert_error(post_json(token_client, "/predict", body), 422, "refused_by_engine")
    assert error["message"] == str(refusal.value)
