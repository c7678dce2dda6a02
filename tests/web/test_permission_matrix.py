"""Who may open which page: every URL of the site against anonymous, a member without a role, viewer,
editor and staff.

The URL names come from the resolver, so a new page without a row in ROUTES fails
``test_every_url_has_a_row``.  The API (namespace ``api-v1``) is tested by its own module.
Expected outcomes are the site's rules (planner/catalogue/access.py, roles.py): log in first, then
viewers read, editors change, staff use the admin.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import pytest
from django.test import Client
from django.urls import NoReverseMatch, URLPattern, URLResolver, get_resolver, reverse

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import Stamp, update_species
from tests.web.security_world import World, snapshot

ROLES = ("anonymous", "member", "viewer", "editor", "staff")

# Who may pass: "public" (everyone), "view" (viewers and above), "edit" (editors and staff).
ALLOWED = {
    "public": set(ROLES),
    "view": {"viewer", "editor", "staff"},
    "edit": {"editor", "staff"},
}


@dataclass(frozen=True)
class Route:
    """One URL: who may GET it and with what status; the same for POST when the view changes things."""

    args: str = ""  # which object the URL needs (World attribute), "" for none
    get: tuple[str, int] = ("view", 200)
    post: tuple[str, int] | None = None
    post_changes: bool = False  # an allowed POST (with the empty form) writes something


ROUTES = {
    "home": Route(get=("public", 302)),
    "login": Route(get=("public", 200)),
    "logout": Route(get=("public", 405)),  # log out is a POST (Django 5); its POST is checked below
    "catalogue:list": Route(),
    "catalogue:csv": Route(),
    "catalogue:export": Route(),
    "catalogue:deleted": Route(),
    "catalogue:import": Route(get=("edit", 200), post=("edit", 400)),
    "catalogue:create": Route(get=("edit", 200), post=("edit", 400)),
    "catalogue:species": Route("species"),
    "catalogue:history": Route("species"),
    "catalogue:edit": Route("species", get=("edit", 200), post=("edit", 400)),
    "catalogue:delete": Route("species", get=("edit", 200), post=("edit", 302), post_changes=True),
    "catalogue:isotopologue": Route("species", get=("edit", 200), post=("edit", 400)),
    "catalogue:restore": Route("history", get=("edit", 200), post=("edit", 302), post_changes=True),
    "spectra:spectrum": Route(),
    "spectra:spectrum_csv": Route(get=("view", 400)),  # no query: a plain-text 400 naming the problem
    "spectra:spectrum_json": Route(get=("view", 400)),
    "planning:plan": Route(),
    "planning:save": Route(get=("edit", 302), post=("edit", 302)),  # empty form: back to the plan, nothing saved
    "planning:saved_list": Route(),
    "planning:saved": Route("saved_plan"),
    "planning:operator_sheet": Route("saved_plan"),
    "planning:targets_csv": Route("saved_plan"),
    "planning:segments_csv": Route("saved_plan"),
    "planning:plan_json": Route("saved_plan"),
    "planning:instruments": Route(),
    "planning:instrument_create": Route(get=("edit", 200), post=("edit", 400)),
    "planning:instrument_edit": Route("instrument", get=("edit", 200), post=("edit", 400)),
    # Viewers may run a fit (it writes a FitRun, not the catalogue); saving it is an edit.
    "fitting:fit": Route(post=("view", 400)),
    "fitting:run": Route("fit_run"),
    "fitting:save": Route("fit_run", get=("edit", 302), post=("edit", 302), post_changes=True),
    "fitting:catalogue_json": Route("fit_run"),
    "fitting:substitution": Route(),
    "fitting:geometry": Route(),
}


def _names(patterns, namespace: str = ""):
    for pattern in patterns:
        if isinstance(pattern, URLResolver):
            inner = f"{namespace}:{pattern.namespace}" if namespace and pattern.namespace else pattern.namespace
            yield from _names(pattern.url_patterns, inner or namespace)
        elif isinstance(pattern, URLPattern) and pattern.name:
            yield f"{namespace}:{pattern.name}" if namespace else pattern.name


def _site_names() -> list[str]:
    """Every named URL except the API's (tested by its author)."""
    return [name for name in _names(get_resolver().url_patterns) if not name.startswith("api")]


SITE_NAMES = _site_names()
PAGE_NAMES = [name for name in SITE_NAMES if not name.startswith("admin:")]
ADMIN_NAMES = [name for name in SITE_NAMES if name.startswith("admin:")]


def test_every_url_has_a_row():
    assert sorted(set(PAGE_NAMES) - set(ROUTES)) == [], "new page: give it a row in ROUTES"
    assert sorted(set(ROUTES) - set(PAGE_NAMES)) == [], "ROUTES names a page that no longer exists"
    assert "admin:index" in ADMIN_NAMES


@pytest.fixture
def world(db):
    return World()


@pytest.fixture
def as_role(make_member):
    """A Client logged in as ``role`` (anonymous: not logged in)."""

    def login(role: str) -> Client:
        client = Client()
        if role == "member":
            client.force_login(make_member("nora"))
        elif role in ("viewer", "editor"):
            client.force_login(make_member(f"{role}-1", role))
        elif role == "staff":
            client.force_login(make_member("stella", "editor", is_staff=True, is_superuser=True))
        return client

    return login


def _url(name: str, world: World) -> str:
    route = ROUTES[name]
    if route.args == "history":
        return reverse(name, args=[world.species.pk, world.history_id])
    if route.args:
        return reverse(name, args=[getattr(world, route.args).pk])
    return reverse(name)


def _assert_refused(response, role: str, url: str) -> None:
    if role == "anonymous":
        assert response.status_code == 302
        assert response["Location"] == f"{reverse('login')}?next={url}"
    else:
        assert response.status_code == 403


@pytest.mark.parametrize("role", ROLES)
@pytest.mark.parametrize("name", sorted(ROUTES))
def test_get(name, role, world, as_role):
    url = _url(name, world)
    client = as_role(role)
    who, status = ROUTES[name].get
    response = client.get(url)
    if role in ALLOWED[who]:
        assert response.status_code == status
    else:
        _assert_refused(response, role, url)


POSTED = sorted(name for name, route in ROUTES.items() if route.post)


@pytest.mark.parametrize("role", ROLES)
@pytest.mark.parametrize("name", POSTED)
def test_post(name, role, world, as_role):
    url = _url(name, world)
    if name == "catalogue:restore":  # a restore needs a later version to go back from
        edited = dataclasses.replace(species_of_row(world.species), notes="edited")
        update_species(world.species, edited, Stamp(None, "a later version"), world.species.version)
    client = as_role(role)
    who, status = ROUTES[name].post
    before = snapshot()
    response = client.post(url, {})
    if role in ALLOWED[who]:
        assert response.status_code == status
        assert (snapshot() != before) == ROUTES[name].post_changes
    else:
        _assert_refused(response, role, url)
        assert snapshot() == before


def test_editor_post_to_delete_removes_the_species_and_a_viewer_cannot(world, as_role):
    pk = world.species.pk
    assert as_role("viewer").post(reverse("catalogue:delete", args=[pk])).status_code == 403
    assert SpeciesRow.objects.filter(pk=pk).exists()
    assert as_role("editor").post(reverse("catalogue:delete", args=[pk])).status_code == 302
    assert not SpeciesRow.objects.filter(pk=pk).exists()


@pytest.mark.parametrize("role", ROLES)
def test_logout_post_ends_any_session(role, as_role):
    client = as_role(role)
    response = client.post(reverse("logout"))
    assert response.status_code == 302
    assert client.get(reverse("catalogue:list")).status_code == 302


# The admin: only staff get in; everyone else is sent to the admin's own login page.
def _admin_url(name: str, world: World) -> str:
    pattern_kwargs = {
        "admin:app_list": {"app_label": "catalogue"},
        "admin:view_on_site": {"content_type_id": 1, "object_id": 1},
    }
    if name in pattern_kwargs:
        return reverse(name, kwargs=pattern_kwargs[name])
    for args in ([], [1], [1, 1]):  # change/delete/history pages take the object's id (and a history row's)
        try:
            return reverse(name, args=args)
        except NoReverseMatch:
            continue
    raise AssertionError(f"cannot build {name}: give it arguments in _admin_url")


@pytest.mark.parametrize("name", [n for n in ADMIN_NAMES if n != "admin:login"])
def test_admin_refuses_everyone_but_staff(name, world, as_role):
    url = _admin_url(name, world)
    expected = reverse("admin:index") if name == "admin:logout" else reverse("admin:login")
    for role in ("anonymous", "member", "viewer", "editor"):
        response = as_role(role).get(url)
        assert response.status_code == 302, role
        assert response["Location"].startswith(expected), role


@pytest.mark.parametrize("name", [n for n in ADMIN_NAMES if n.endswith(("_changelist", "_add")) or n == "admin:index"])
def test_staff_open_the_admin(name, world, as_role):
    assert as_role("staff").get(_admin_url(name, world)).status_code == 200


def test_staff_open_a_species_in_the_admin(world, as_role):
    url = reverse("admin:catalogue_species_change", args=[world.species.pk])
    assert as_role("staff").get(url).status_code == 200
