"""`manage.py api_token`: make a token (printed once), list tokens, revoke them."""

from __future__ import annotations

import io

import pytest
from django.core.management import CommandError, call_command
from django.test import Client

from planner.api.models import ApiToken
from tests.api.conftest import API


def run(*args) -> tuple[str, str]:
    out, err = io.StringIO(), io.StringIO()
    call_command("api_token", *args, stdout=out, stderr=err)
    return out.getvalue(), err.getvalue()


def test_command_prints_a_token_that_works(viewer, demo_in_db):
    out, err = run("vera", "--label", "night scripts")
    token = out.strip()
    assert "shown only now" in err
    response = Client().get(f"{API}/species", headers={"Authorization": f"Bearer {token}"})
    assert response.status_code == 200
    assert ApiToken.objects.get(user=viewer).label == "night scripts"


def test_list_names_tokens_without_showing_them(viewer):
    token = run("vera", "--label", "laptop")[0].strip()
    listed = run("vera", "--list")[0]
    assert "laptop" in listed and "active" in listed and token not in listed


def test_revoke_stops_every_token_of_the_user(viewer, demo_in_db):
    tokens = [run("vera")[0].strip() for _ in range(2)]
    assert "revoked 2 tokens" in run("vera", "--revoke")[1]
    for token in tokens:
        assert Client().get(f"{API}/species", headers={"Authorization": f"Bearer {token}"}).status_code == 401
    assert "revoked" in run("vera", "--list")[0]


def test_unknown_user_is_an_error(db):
    with pytest.raises(CommandError, match="no user 'nobody'"):
        run("nobody")


def test_inactive_account_gets_no_token(make_member):
    make_member("gone", "viewer", is_active=False)
    with pytest.raises(CommandError, match="not an active account"):
        run("gone")
