"""CSRF on every form: each POST form of every page carries the token, and a POST without it is refused.

Pages are the permission matrix's (tests/web/test_permission_matrix.py), rendered for staff, who
see every form, plus the pages that show a form only with results (a plan, a fit run).
"""

from __future__ import annotations

from html.parser import HTMLParser

import pytest
from django.test import Client
from django.urls import reverse

from tests.web.security_world import World, snapshot
from tests.web.test_permission_matrix import ROUTES, _url

TOKEN = "csrfmiddlewaretoken"  # the field name Django's {% csrf_token %} writes


class _PostForms(HTMLParser):
    """For each <form method="post">: its action and whether it holds a csrfmiddlewaretoken input."""

    def __init__(self):
        super().__init__()
        self.forms: list[dict] = []
        self.open: dict | None = None

    def handle_starttag(self, tag, attrs):
        attrs = dict(attrs)
        if tag == "form" and (attrs.get("method") or "get").lower() == "post":
            self.open = {"action": attrs.get("action", ""), "token": False}
            self.forms.append(self.open)
        elif tag == "input" and self.open is not None and attrs.get("name") == TOKEN and attrs.get("value"):
            self.open["token"] = True

    def handle_endtag(self, tag):
        if tag == "form":
            self.open = None


def _post_forms(html: str) -> list[dict]:
    parser = _PostForms()
    parser.feed(html)
    return parser.forms


@pytest.fixture
def world(db):
    return World()


@pytest.fixture
def staff_client(make_member):
    client = Client()
    client.force_login(make_member("stella", "editor", is_staff=True, is_superuser=True))
    return client


def test_the_form_finder_sees_a_form_without_a_token():
    forms = _post_forms('<form method="POST" action="/x"><input name="a"></form><form method="get"></form>')
    assert forms == [{"action": "/x", "token": False}]


DOWNLOADS = {
    "catalogue:csv",
    "catalogue:export",
    "fitting:catalogue_json",
    "planning:plan_json",
    "planning:segments_csv",
    "planning:targets_csv",
}
GET_PAGES = sorted(name for name, route in ROUTES.items() if route.get[1] == 200 and name not in DOWNLOADS)


@pytest.mark.parametrize("name", GET_PAGES)
def test_every_post_form_of_a_page_carries_the_token(name, world, staff_client, client):
    viewer = client if name == "login" else staff_client
    response = viewer.get(_url(name, world))
    assert response.status_code == 200
    assert response["Content-Type"].startswith("text/html"), "a download: list it in DOWNLOADS"
    forms = _post_forms(response.content.decode())
    assert forms, "every page has a POST form (log out, or the login form itself)"
    assert all(form["token"] for form in forms), forms


@pytest.mark.parametrize("page", ["plan results", "fit run", "admin species"])
def test_forms_shown_with_results_carry_the_token(page, world, staff_client):
    if page == "plan results":
        response = staff_client.get(reverse("planning:plan"), world.plan_query())
        expected = reverse("planning:save")
    elif page == "fit run":
        response = staff_client.get(reverse("fitting:run", args=[world.fit_run.pk]))
        expected = reverse("fitting:save", args=[world.fit_run.pk])
    else:
        response = staff_client.get(reverse("admin:catalogue_species_change", args=[world.species.pk]))
        expected = ""
    forms = _post_forms(response.content.decode())
    assert expected in [form["action"] for form in forms]
    assert all(form["token"] for form in forms), forms


CHANGING = sorted(name for name, route in ROUTES.items() if route.post)


@pytest.mark.parametrize("name", CHANGING + ["logout"])
def test_a_post_without_the_token_is_refused_and_changes_nothing(name, world, make_member):
    url = _url(name, world)
    client = Client(enforce_csrf_checks=True)
    client.force_login(make_member("stella", "editor", is_staff=True, is_superuser=True))
    before = snapshot()
    response = client.post(url, {})
    assert response.status_code == 403
    assert "CSRF" in response.content.decode()
    assert snapshot() == before


def test_the_same_post_with_the_token_goes_through(world, make_member):
    # The refusal above is the missing token, not the role: with it, the editor's delete is done.
    client = Client(enforce_csrf_checks=True)
    client.force_login(make_member("stella", "editor"))
    url = reverse("catalogue:delete", args=[world.species.pk])
    page = client.get(url)
    token = page.context["csrf_token"]
    assert client.post(url, {TOKEN: str(token)}).status_code == 302
    assert snapshot()[0] == []


def test_login_without_the_token_is_refused(make_member):
    make_member("vera", "viewer")
    client = Client(enforce_csrf_checks=True)
    response = client.post(reverse("login"), {"username": "vera", "password": "spectral-lines-77"})
    assert response.status_code == 403
    assert "_auth_user_id" not in client.session


def test_admin_delete_without_the_token_is_refused(world, make_member):
    client = Client(enforce_csrf_checks=True)
    client.force_login(make_member("stella", "editor", is_staff=True, is_superuser=True))
    url = reverse("admin:catalogue_species_delete", args=[world.species.pk])
    before = snapshot()
    response = client.post(url, {"post": "yes"})
    assert response.status_code == 403
    assert snapshot() == before
