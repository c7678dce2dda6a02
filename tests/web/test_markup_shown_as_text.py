"""Names, notes and labels that contain markup are shown as text on every page, never run.

A species, its states, an instrument, a saved plan, a fit's line notes and an upload's file name
all carry two classic payloads (common practice, no source: the usual first probes for HTML
injection).  Each page must show them escaped; data embedded for the plots must sit in
``json_script`` blocks (``<`` written as ``\\u003C``), where the payload is plain data.
"""

from __future__ import annotations

import json
import re

import pytest
from django.core.files.uploadedfile import SimpleUploadedFile
from django.urls import reverse

from planner.catalogue.models import Species as SpeciesRow
from planner.fitting.models import FitRun
from tests.fitting.test_fit_command import CO_LINES
from tests.web.conftest import catalogue_document
from tests.web.security_world import World, demo_entry

SCRIPT = "<script>alert(1)</script>"
IMG = '"><img src=x onerror=alert(1)>'
#: The raw tags that must never reach a page (the quote of IMG alone is harmless in text).
RAW = (SCRIPT, "<img src=x onerror=alert(1)>")
#: How Django's escaping writes them (django.utils.html.escape: < > & " ').
SHOWN = {SCRIPT: "&lt;script&gt;alert(1)&lt;/script&gt;", IMG: "&quot;&gt;&lt;img src=x onerror=alert(1)&gt;"}

NAME = f"CO{SCRIPT}"
GROUND = f"v=0{IMG}"


def _hostile_entry() -> dict:
    entry = demo_entry("CO")
    entry["name"] = NAME
    entry["states"][0]["label"] = GROUND
    entry["states"][1]["label"] = f"v=1{SCRIPT}"
    for key in ("notes", "source", "hazards"):
        entry[key] = f"{key} {SCRIPT} {IMG}"
    return entry


@pytest.fixture
def world(db):
    return World(
        _hostile_entry(), instrument_name=f"cell {SCRIPT}{IMG}", plan_name=f"plan {IMG}{SCRIPT}", line_note=SCRIPT
    )


@pytest.fixture
def editor_page(client, editor, world):
    client.force_login(editor)

    def get(url, data=None, status=200):
        response = client.get(url, data or {})
        assert response.status_code == status, url
        html = response.content.decode()
        for raw in RAW:
            assert raw not in html, f"{url} shows the raw tag {raw}"
        return html

    return get


def _json_scripts(html: str) -> dict:
    """The documents of every <script type="application/json" id=...> block, by id."""
    blocks = re.findall(r'<script id="([^"]+)" type="application/json">(.*?)</script>', html, flags=re.S)
    return {key: json.loads(body) for key, body in blocks}


def test_catalogue_list_and_search_show_the_name_as_text(editor_page, world):
    row = world.species
    assert SHOWN[SCRIPT] in editor_page(reverse("catalogue:list"))
    echoed = editor_page(reverse("catalogue:list"), {"q": IMG})
    assert SHOWN[IMG] in echoed  # the search box gives back what was typed, escaped
    assert row.name == NAME


def test_species_page_shows_name_notes_source_hazards_and_labels_as_text(editor_page, world):
    html = editor_page(reverse("catalogue:species", args=[world.species.pk]))
    assert html.count(SHOWN[SCRIPT]) >= 4  # name, notes, source, hazards at least
    assert SHOWN[IMG] in html
    scripts = _json_scripts(html)
    assert scripts["levels-data"]["state"] == GROUND  # plain data for the level diagram
    assert GROUND in [series["state"] for series in scripts["plot-data"]["series"]]


def test_species_page_echoes_bad_temperatures_as_text(editor_page, world):
    html = editor_page(reverse("catalogue:species", args=[world.species.pk]), {"temperatures_k": IMG})
    assert "is not a number" in html
    assert SHOWN[IMG].replace("&quot;", "") in html.replace("&quot;", "")


@pytest.mark.parametrize("page", ["catalogue:history", "catalogue:edit", "catalogue:delete", "catalogue:isotopologue"])
def test_species_pages_show_the_name_as_text(editor_page, world, page):
    html = editor_page(reverse(page, args=[world.species.pk]))
    assert SHOWN[SCRIPT] in html


def test_restore_and_deleted_pages_show_the_name_as_text(editor_page, world, client):
    pk, history_id = world.species.pk, world.history_id
    assert SHOWN[SCRIPT] in editor_page(reverse("catalogue:restore", args=[pk, history_id]))
    assert client.post(reverse("catalogue:delete", args=[pk])).status_code == 302
    assert SHOWN[SCRIPT] in editor_page(reverse("catalogue:deleted"))
    assert SHOWN[SCRIPT] in editor_page(reverse("catalogue:history", args=[pk]))


def test_an_uploaded_file_name_is_shown_as_text_in_the_history(editor_page, world, client):
    world.species  # noqa: B018 - exists before the import replaces it
    document = json.dumps(catalogue_document(_hostile_entry() | {"notes": "imported again"})).encode()
    upload = SimpleUploadedFile(f"{IMG}.json", document, content_type="application/json")
    response = client.post(reverse("catalogue:import"), {"catalogue_file": upload}, follow=True)
    assert response.status_code == 200
    for raw in RAW:
        assert raw not in response.content.decode()
    html = editor_page(reverse("catalogue:history", args=[world.species.pk]))
    assert f"imported from {SHOWN[IMG]}" in html


def test_spectrum_page_shows_name_and_state_as_text(editor_page, world):
    query = {"species": NAME, "temperature_k": "50", "fmin_mhz": "0", "fmax_mhz": "400000"}
    world.species  # noqa: B018
    html = editor_page(reverse("spectra:spectrum"), query)
    assert SHOWN[SCRIPT] in html and SHOWN[IMG] in html  # the species choice and the state column
    assert GROUND in [series["state"] for series in _json_scripts(html)["plot-data"]["series"]]


def test_spectrum_page_echoes_an_unknown_species_as_text(editor_page, world):
    world.species  # noqa: B018
    html = editor_page(reverse("spectra:spectrum"), {"species": SCRIPT, "temperature_k": "50", "fmin_mhz": "0"})
    assert "Select a valid choice" in html


def test_plan_page_and_its_results_show_names_as_text(editor_page, world):
    world.instrument  # noqa: B018 - in the instrument choice
    html = editor_page(reverse("planning:plan"))
    assert SHOWN[SCRIPT] in html
    results = editor_page(reverse("planning:plan"), world.plan_query())
    assert SHOWN[SCRIPT] in results
    labels = [row[2] for row in _json_scripts(results)["plan-data"]["sticks"]["selected"]]
    assert labels and all(label.startswith(NAME) for label in labels)  # plain data for the plot


@pytest.mark.parametrize("page", ["planning:saved", "planning:operator_sheet"])
def test_saved_plan_and_operator_sheet_show_title_and_names_as_text(editor_page, world, page):
    html = editor_page(reverse(page, args=[world.saved_plan.pk]))
    assert SHOWN[IMG] in html and SHOWN[SCRIPT] in html  # the plan's title; the species and its hazards


def test_saved_plans_and_instruments_lists_show_names_as_text(editor_page, world):
    world.saved_plan, world.instrument  # noqa: B018
    assert SHOWN[IMG] in editor_page(reverse("planning:saved_list"))
    assert SHOWN[SCRIPT] in editor_page(reverse("planning:instruments"))
    assert SHOWN[SCRIPT] in editor_page(reverse("planning:instrument_edit", args=[world.instrument.pk]))


def test_fit_pages_show_species_and_line_notes_as_text(editor_page, world):
    run = world.fit_run
    assert SHOWN[SCRIPT] in editor_page(reverse("fitting:fit"))
    html = editor_page(reverse("fitting:run", args=[run.pk]))
    assert html.count(SHOWN[SCRIPT]) >= 2  # the species' name and the lines' notes


def test_fit_refusal_naming_a_typed_constant_is_text(editor_page, world, client):
    row = world.species
    response = client.post(reverse("fitting:fit"), {"species": row.pk, "vary": SCRIPT, "lines_text": CO_LINES})
    assert response.status_code == 400
    html = response.content.decode()
    assert SCRIPT not in html and "cannot vary" in html
    assert not FitRun.objects.exists()


def test_structure_pages_show_names_as_text(editor_page, world):
    row = world.species
    assert SHOWN[SCRIPT] in editor_page(reverse("fitting:substitution"))
    html = editor_page(reverse("fitting:geometry"), {"species": [row.pk], "geometry": "linear-triatomic"})
    assert SHOWN[SCRIPT] in html  # the refusal names the species
    assert SpeciesRow.objects.filter(name=NAME).exists()
