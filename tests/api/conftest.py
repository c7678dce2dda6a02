"""Fixtures for the API tests: the demo catalogue and roles of the web tests, tokens, JSON calls."""

from __future__ import annotations

import json

import pytest
from django.test import Client

from planner.api.tokens import create_token
from tests.web import conftest as web

# The page tests' fixtures: the demo catalogue in the database, members with a role.
demo_species = web.demo_species
demo_in_db = web.demo_in_db
make_member = web.make_member
viewer = web.viewer

API = "/api/v1"


@pytest.fixture
def viewer_token(viewer, demo_in_db):
    """A viewer's API token, with the demo catalogue in the database."""
    _, token = create_token(viewer, "tests")
    return token


@pytest.fixture
def token_client(viewer_token):
    """A client that sends the viewer's token on every request (no session)."""
    return Client(headers={"Authorization": f"Bearer {viewer_token}"})


@pytest.fixture
def session_client(viewer, demo_in_db):
    """A logged-in viewer's browser session, CSRF enforced as in a real browser."""
    client = Client(enforce_csrf_checks=True)
    client.force_login(viewer)
    return client


@pytest.fixture
def viewer_client_api(client, viewer):
    """A logged-in viewer (test client without CSRF checks), for the pages of the API."""
    client.force_login(viewer)
    return client


def post_json(client, path: str, body, **headers):
    """POST ``body`` as JSON to an API path."""
    return client.post(f"{API}{path}", data=json.dumps(body), content_type="application/json", headers=headers)


def csrf_headers(client) -> dict:
    """The X-CSRFToken header a page's script would send (the token from a page that sets the cookie)."""
    client.get("/spectrum/")
    return {"X-CSRFToken": client.cookies["csrftoken"].value}


def assert_error(response, status: int, code: str, field: str | None = None) -> dict:
    """The response is the one error shape with this status and code (and names ``field``)."""
    assert response.status_code == status, response.content[:500]
    assert response["Content-Type"].startswith("application/json")
    error = response.json()["error"]
    assert set(error) == {"status", "code", "message", "fields"}
    assert error["status"] == status and error["code"] == code and error["message"]
    if field is not None:
        assert field in error["fields"], error
    return error
