"""One error shape for every failure: unknown paths, wrong methods, bad JSON, engine refusals, server errors."""

from __future__ import annotations

import logging

import pytest

from planner.api import species as species_module
from tests.api.conftest import API, assert_error, post_json


@pytest.mark.parametrize("path", ["/", "/nothing-here", "/species/", "/species/abc", "/species/-1", "/predict/x"])
def test_unknown_path_is_a_json_404(token_client, path):
    assert_error(token_client.get(f"{API}{path}"), 404, "not_found")


def test_unknown_path_is_a_json_404_for_anonymous_callers_too(client, db):
    assert_error(client.get(f"{API}/nothing-here"), 404, "not_found")


@pytest.mark.parametrize("method, path", [("delete", "/species"), ("put", "/predict"), ("get", "/fit")])
def test_wrong_method_is_a_json_405_naming_the_allowed_one(token_client, method, path):
    response = getattr(token_client, method)(f"{API}{path}")
    error = assert_error(response, 405, "method_not_allowed")
    assert response["Allow"] in error["message"]


@pytest.mark.parametrize("text", ["{not json", "[1, 2]", '"a string"', ""])
def test_body_that_is_not_the_expected_json_object_is_a_400(token_client, text):
    response = token_client.post(f"{API}/predict", data=text, content_type="application/json")
    assert_error(response, 400, "invalid_input")


def test_nested_field_is_named_by_its_path(token_client, demo_in_db):
    body = {"fmin_mhz": 1, "fmax_mhz": 2, "temperature_k": 3, "slot_minutes": 4, "species": [{"name": "CO"}]}
    assert_error(post_json(token_client, "/plan", body), 400, "invalid_input", "species[0].amount")


def test_unexpected_failure_is_a_logged_500_in_the_error_shape(token_client, monkeypatch, caplog):
    def broken(*args, **kwargs):
        raise KeyError("a bug")

    monkeypatch.setattr(species_module, "_summary", broken)
    with caplog.at_level(logging.ERROR, logger="planner.api"):
        error = assert_error(token_client.get(f"{API}/species"), 500, "server_error")
    assert "a bug" not in error["message"]  # nothing of the server's inside is shown
    assert any("KeyError" in (r.exc_text or "") or r.exc_info for r in caplog.records)
