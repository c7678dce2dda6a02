"""Who may call the API: a token or a logged-in session with a role; CSRF for a session's POST."""

from __future__ import annotations

import pytest
from django.test import Client

from planner.api.models import ApiToken
from planner.api.tokens import create_token, revoke_tokens, token_hash
from planner.catalogue.models import Species as SpeciesRow
from tests.api.conftest import API, assert_error, csrf_headers, post_json

#: One request per endpoint (method, path, JSON body), each valid for a viewer of the demo catalogue.
PREDICT_BODY = {"species": ["CO"], "fmin_mhz": 100_000.0, "fmax_mhz": 120_000.0, "temperature_k": 50.0}
ENDPOINTS = [
    ("get", "/species", None),
    ("post", "/predict", PREDICT_BODY),
]


def call(client, method: str, path: str, body, **headers):
    if method == "get":
        return client.get(f"{API}{path}", headers=headers)
    return post_json(client, path, body, **headers)


@pytest.mark.parametrize("method, path, body", ENDPOINTS + [("post", "/plan", {}), ("post", "/fit", {})])
def test_anonymous_caller_gets_401_in_the_error_shape(client, demo_in_db, method, path, body):
    response = call(client, method, path, body)
    assert_error(response, 401, "not_authenticated")
    assert response["WWW-Authenticate"].startswith("Bearer")


def test_anonymous_caller_gets_401_for_one_species(client, demo_in_db):
    pk = SpeciesRow.objects.get(name="CO").pk
    assert_error(client.get(f"{API}/species/{pk}"), 401, "not_authenticated")


@pytest.mark.parametrize("method, path, body", ENDPOINTS)
def test_viewer_with_a_token_is_answered(token_client, method, path, body):
    assert call(token_client, method, path, body).status_code == 200


@pytest.mark.parametrize("method, path, body", ENDPOINTS)
def test_viewer_session_is_answered(session_client, method, path, body):
    assert call(session_client, method, path, body, **csrf_headers(session_client)).status_code == 200


def test_session_post_without_csrf_token_is_refused(session_client):
    error = assert_error(post_json(session_client, "/predict", PREDICT_BODY), 403, "permission_denied")
    assert "CSRF" in error["message"]


def test_token_post_needs_no_csrf_token(viewer_token, demo_in_db):
    client = Client(enforce_csrf_checks=True, headers={"Authorization": f"Bearer {viewer_token}"})
    assert post_json(client, "/predict", PREDICT_BODY).status_code == 200


def test_revoked_token_gets_401(token_client, viewer):
    assert revoke_tokens(viewer) == 1
    assert_error(token_client.get(f"{API}/species"), 401, "not_authenticated")


@pytest.mark.parametrize("header", ["Bearer not-a-token", "Bearer ", "Basic dmVyYTpwdw==", "Bearer " + "x" * 5000])
def test_wrong_token_gets_401(client, demo_in_db, header):
    assert_error(client.get(f"{API}/species", headers={"Authorization": header}), 401, "not_authenticated")


def test_token_of_a_deactivated_account_gets_401(token_client, viewer):
    viewer.is_active = False
    viewer.save()
    assert_error(token_client.get(f"{API}/species"), 401, "not_authenticated")


def test_account_without_a_role_gets_403_by_token_and_by_session(make_member, demo_in_db):
    member = make_member("nora")  # an account, but neither viewer nor editor
    _, token = create_token(member)
    assert_error(Client().get(f"{API}/species", headers={"Authorization": f"Bearer {token}"}), 403, "permission_denied")
    browser = Client()
    browser.force_login(member)
    assert_error(browser.get(f"{API}/species"), 403, "permission_denied")


def test_tokens_are_stored_only_as_their_hash(viewer):
    row, token = create_token(viewer, "laptop")
    assert len(token) >= 43  # 32 random bytes in URL-safe base64 (library: secrets.token_urlsafe)
    assert row.key_sha256 == token_hash(token) != token
    assert not ApiToken.objects.filter(key_sha256=token).exists()


def test_a_used_token_records_when(token_client, viewer):
    assert ApiToken.objects.get(user=viewer).last_used_at is None
    token_client.get(f"{API}/species")
    assert ApiToken.objects.get(user=viewer).last_used_at is not None
