"""The OpenAPI description: it loads in schemathesis, lists every endpoint, documents auth and errors."""

from __future__ import annotations

import schemathesis

from planner.api.api import API_VERSION
from tests.api.conftest import API

OPERATIONS = {
    ("GET", "/api/v1/species"),
    ("GET", "/api/v1/species/{species_id}"),
    ("POST", "/api/v1/predict"),
    ("POST", "/api/v1/plan"),
    ("POST", "/api/v1/fit"),
}
ERROR_STATUSES = {"400", "401", "403", "404", "422", "500"}


def _document(client) -> dict:
    response = client.get(f"{API}/openapi.json")
    assert response.status_code == 200
    return response.json()


def test_description_is_open_to_scripts_without_logging_in(client, db):
    document = _document(client)
    assert document["info"]["title"] == "Linecast API"
    assert document["info"]["version"] == API_VERSION
    assert "Bearer" in document["info"]["description"]


def test_schemathesis_loads_it_and_finds_every_endpoint(client, db):
    schema = schemathesis.openapi.from_dict(_document(client))
    found = {(op.ok().method.upper(), op.ok().path) for op in schema.get_all_operations()}
    assert found == OPERATIONS


def test_every_operation_documents_both_ways_in_and_every_error(client, db):
    document = _document(client)
    schemes = document["components"]["securitySchemes"]
    assert {s["type"] for s in schemes.values()} == {"http", "apiKey"}
    for path, methods in document["paths"].items():
        for method, operation in methods.items():
            assert {name for requirement in operation["security"] for name in requirement} == set(schemes)
            assert ERROR_STATUSES <= set(operation["responses"]), (method, path)
            error_schema = operation["responses"]["400"]["content"]["application/json"]["schema"]
            assert error_schema["$ref"].endswith("/ErrorOut")


def test_input_keys_carry_their_units(client, db):
    schemas = _document(client)["components"]["schemas"]
    assert {"fmin_mhz", "fmax_mhz", "temperature_k", "min_intensity_nm2mhz"} <= set(schemas["PredictIn"]["properties"])
    assert {"frequency_mhz", "sigma_mhz"} <= set(schemas["FitLineIn"]["properties"])
    assert {"slot_minutes", "margin_mhz", "max_eu_k", "pressure_pa"} <= set(schemas["PlanIn"]["properties"])


def test_docs_page_is_served_from_our_own_static_files(viewer_client_api):
    html = viewer_client_api.get(f"{API}/docs").content.decode()
    assert "/static/ninja/swagger-ui-bundle.js" in html
    assert "https://" not in html and "cdn" not in html.lower()


def test_docs_page_asks_anonymous_visitors_to_log_in(client, db):
    response = client.get(f"{API}/docs")
    assert response.status_code == 302 and "/accounts/login/" in response["Location"]


def test_swagger_assets_are_served(client):
    assert client.get("/static/ninja/swagger-ui-bundle.js").status_code == 200
