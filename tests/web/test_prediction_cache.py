"""Predictions go through Django's cache on every page that shows one: spectrum page, its downloads, species page."""

from __future__ import annotations

import pickle

import pytest
from django.urls import reverse

from planner.catalogue import predictions
from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.predictions import prediction_key
from planner.catalogue.store import Stamp, update_species
from planner.engine import PredictionRequest, predict
from planner.engine.derived import partition_function
from planner.spectra.table import line_table


@pytest.fixture
def engine_calls(monkeypatch):
    """Count the engine's predictions made through the cache module (the real engine still answers)."""
    calls = []

    def counting_predict(species, request):
        calls.append((species.name, request))
        return predict(species, request)

    monkeypatch.setattr(predictions, "predict", counting_predict)
    return calls


def _name_with_lines(demo_with_lines):
    species, _ = demo_with_lines
    return species.name


def test_second_spectrum_page_comes_from_the_cache(
    viewer_client, demo_with_lines, page_query, engine_calls, parse_table
):
    query = page_query(_name_with_lines(demo_with_lines))
    first = viewer_client.get(reverse("spectra:spectrum"), query)
    second = viewer_client.get(reverse("spectra:spectrum"), query)
    assert first.status_code == second.status_code == 200
    assert len(engine_calls) == 1
    # Same table (the pages differ in their CSRF tokens).
    assert parse_table(first.content.decode()) == parse_table(second.content.decode())
    assert parse_table(first.content.decode())[1], "the table has rows"


def test_downloads_share_the_page_prediction(viewer_client, demo_with_lines, page_query, engine_calls):
    species, expected = demo_with_lines
    query = page_query(species.name)
    viewer_client.get(reverse("spectra:spectrum"), query)
    csv_response = viewer_client.get(reverse("spectra:spectrum_csv"), query)
    json_response = viewer_client.get(reverse("spectra:spectrum_json"), query)
    assert csv_response.status_code == json_response.status_code == 200
    assert len(engine_calls) == 1
    # The cached prediction is the engine's (conftest's demo_with_lines predicts the same request directly).
    assert len(json_response.json()["lines"]) == len(expected.lines)


def test_another_window_is_another_prediction(viewer_client, demo_with_lines, page_query, engine_calls):
    name = _name_with_lines(demo_with_lines)
    viewer_client.get(reverse("spectra:spectrum"), page_query(name))
    viewer_client.get(reverse("spectra:spectrum"), page_query(name, fmax_mhz=60_000.0))
    assert len(engine_calls) == 2


def test_second_species_page_comes_from_the_cache(viewer_client, engine_calls):
    row = SpeciesRow.objects.get(name="OCS")
    url = reverse("catalogue:species", args=[row.pk])
    assert viewer_client.get(url).status_code == 200
    assert viewer_client.get(url).status_code == 200
    assert [name for name, _ in engine_calls] == ["OCS"]


def test_an_edit_makes_the_next_page_predict_again(viewer_client, demo_with_lines, page_query, engine_calls):
    name = _name_with_lines(demo_with_lines)
    query = page_query(name)
    viewer_client.get(reverse("spectra:spectrum"), query)
    row = SpeciesRow.objects.get(name=name)
    # A save without changes still raises the version: the cache may not assume the content is the same.
    update_species(row, species_of_row(row), Stamp(None, "test edit"), expected_version=row.version)
    viewer_client.get(reverse("spectra:spectrum"), query)
    assert len(engine_calls) == 2


def test_the_line_table_is_rendered_once_per_species_version(
    viewer_client, demo_with_lines, page_query, monkeypatch, parse_table
):
    from planner.spectra import views

    tables = []

    def counting_line_table(species, records):
        tables.append(species.name)
        return line_table(species, records)

    monkeypatch.setattr(views, "line_table", counting_line_table)
    name = _name_with_lines(demo_with_lines)
    query = page_query(name)
    first = viewer_client.get(reverse("spectra:spectrum"), query).content.decode()
    second = viewer_client.get(reverse("spectra:spectrum"), query).content.decode()
    assert tables == [name]
    assert parse_table(first) == parse_table(second)
    row = SpeciesRow.objects.get(name=name)
    update_species(row, species_of_row(row), Stamp(None, "test edit"), expected_version=row.version)
    viewer_client.get(reverse("spectra:spectrum"), query)
    assert tables == [name, name]


def test_key_names_species_version_and_every_condition():
    request = PredictionRequest(0.0, 120_000.0, 50.0)
    key = prediction_key(7, 3, request)
    assert key == prediction_key(7, 3, PredictionRequest(0.0, 120_000.0, 50.0))
    others = {
        prediction_key(8, 3, request),
        prediction_key(7, 4, request),
        prediction_key(7, 3, PredictionRequest(0.0, 120_000.0, 51.0)),
        prediction_key(7, 3, PredictionRequest(0.0, 120_000.0, 50.0, min_intensity_nm2mhz=1e-6)),
    }
    assert key not in others and len(others) == 4
    assert key.startswith("linecast-prediction:")


def test_prediction_survives_pickling(demo_with_lines):
    """Every cache backend but local memory's stores values pickled (and local memory pickles too)."""
    _, prediction = demo_with_lines
    copy = pickle.loads(pickle.dumps(prediction, pickle.HIGHEST_PROTOCOL))
    assert copy.records() == prediction.records()
    assert copy.partition_function == prediction.partition_function
    assert copy.messages == prediction.messages


def test_species_page_partition_functions_are_cached_too(viewer_client, monkeypatch):
    from planner.catalogue.views import species_page

    calls = []

    def counting_partition_function(species, temperature_k):
        calls.append(temperature_k)
        return partition_function(species, temperature_k)

    monkeypatch.setattr(species_page, "partition_function", counting_partition_function)
    url = reverse("catalogue:species", args=[SpeciesRow.objects.get(name="SO2").pk])
    first = viewer_client.get(url, {"temperatures_k": "20, 300"})
    second = viewer_client.get(url, {"temperatures_k": "20, 300"})
    assert calls == [20.0, 300.0]
    assert first.context["partition_rows"] == second.context["partition_rows"]
    viewer_client.get(url, {"temperatures_k": "20, 150"})
    assert calls == [20.0, 300.0, 20.0, 150.0]


def test_spectrum_page_reads_only_the_chosen_species_constants(
    viewer_client, demo_with_lines, page_query, django_assert_num_queries
):
    # session, user, two permission queries, the names; then the chosen species, its states, constants
    # and covariances: the count does not grow with the size of the catalogue.
    with django_assert_num_queries(9):
        response = viewer_client.get(reverse("spectra:spectrum"), page_query(_name_with_lines(demo_with_lines)))
    assert response.status_code == 200
