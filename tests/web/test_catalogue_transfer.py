"""Catalogue JSON in and out: web import/export, the CLI commands, all or nothing, access, the CSV table."""

import csv
import io
import json
import os
import re
import subprocess
import sys
from html.parser import HTMLParser
from pathlib import Path

import pytest
from django.core.files.uploadedfile import SimpleUploadedFile
from django.core.management import CommandError, call_command
from django.test import Client
from django.urls import reverse
from django.utils import timezone

from planner.catalogue.models import Constant, Species, State
from planner.catalogue.revisions import Timeline
from planner.catalogue.store import export_species
from planner.catalogue.summary import CATALOGUE_COLUMNS
from planner.catalogue.views.transfer import MAX_UPLOAD_BYTES

REPO = Path(__file__).resolve().parents[2]
EXPORT = reverse("catalogue:export")
IMPORT = reverse("catalogue:import")
CSV_URL = reverse("catalogue:csv")

#: Species in the demo catalogue (planner/demo/catalogue.json; demo data, invented).
DEMO_SPECIES_COUNT = 23

#: Shift given to one constant to make an import change something (arbitrary, no source).
SHIFT_MHZ = 0.5


# --- helpers -------------------------------------------------------------------------------------------------


def _counts() -> dict[str, int]:
    """Rows of every catalogue table and of its history table."""
    return {
        "species": Species.objects.count(),
        "states": State.objects.count(),
        "constants": Constant.objects.count(),
        "species history": Species.history.count(),
        "states history": State.history.count(),
        "constants history": Constant.history.count(),
    }


def _upload(client, content: bytes, name: str = "catalogue.json"):
    upload = SimpleUploadedFile(name, content, content_type="application/json")
    return client.post(IMPORT, {"catalogue_file": upload})


def _messages(client, response) -> list[str]:
    """The messages the page after ``response`` shows (following its redirect, which also uses them up)."""
    assert response.status_code == 302, response.status_code
    page = client.get(response["Location"])
    assert page.status_code == 200
    return [str(message) for message in page.context["messages"]]


def _export_document() -> dict:
    """The catalogue file of the database catalogue, as JSON data."""
    out = io.StringIO()
    call_command("export_catalogue", stdout=out, stderr=io.StringIO())
    return json.loads(out.getvalue())


def _entry(document: dict, name: str) -> dict:
    return next(entry for entry in document["species"] if entry["name"] == name)


def _file_bytes(document: dict) -> bytes:
    return json.dumps(document).encode("utf-8")


def _member_client(make_member, username: str, role: str | None) -> Client:
    client = Client()
    client.force_login(make_member(username, role))
    return client


class _ProblemTable(HTMLParser):
    """(species, field, message) of every row of the import page's problem table."""

    def __init__(self):
        super().__init__()
        self.depth = 0  # > 0 inside <section id="import-problems">
        self.in_body = False
        self.cell = None
        self.rows: list[list[str]] = []

    def handle_starttag(self, tag, attrs):
        if tag == "section" and dict(attrs).get("id") == "import-problems":
            self.depth = 1
        elif self.depth and tag == "section":
            self.depth += 1
        elif self.depth and tag == "tbody":
            self.in_body = True
        elif self.in_body and tag == "tr":
            self.rows.append([])
        elif self.in_body and tag == "td":
            self.cell = []

    def handle_endtag(self, tag):
        if self.depth and tag == "section":
            self.depth -= 1
        elif tag == "tbody":
            self.in_body = False
        elif tag == "td" and self.cell is not None:
            self.rows[-1].append("".join(self.cell).strip())
            self.cell = None

    def handle_data(self, data):
        if self.cell is not None:
            self.cell.append(data)


def _problem_rows(response) -> list[tuple[str, str, str]]:
    parser = _ProblemTable()
    parser.feed(response.content.decode())
    return [tuple(row) for row in parser.rows]


# --- round trips ---------------------------------------------------------------------------------------------


def test_web_export_then_import_gives_back_exactly_the_same_catalogue(make_member, demo_in_db, demo_species):
    assert len(demo_species) == DEMO_SPECIES_COUNT  # guards the numbers below
    viewer = _member_client(make_member, "vera", "viewer")
    before = timezone.now().date()
    first = viewer.get(EXPORT)
    after = timezone.now().date()
    assert first.status_code == 200
    assert first["Content-Type"] == "application/json; charset=utf-8"
    match = re.fullmatch(
        r'attachment; filename="linecast-catalogue-(\d{4}-\d{2}-\d{2})\.json"', first["Content-Disposition"]
    )
    assert match and match[1] in {f"{before:%Y-%m-%d}", f"{after:%Y-%m-%d}"}
    document = json.loads(first.content)
    assert document["format"] == "linecast-catalogue"
    assert [entry["name"] for entry in document["species"]] == sorted(s.name for s in demo_species)

    Species.objects.all().delete()
    assert Species.objects.count() == 0 and State.objects.count() == 0 and Constant.objects.count() == 0

    editor = _member_client(make_member, "eddie", "editor")
    response = _upload(editor, first.content, "round-trip.json")
    assert response.status_code == 302
    assert response["Location"] == reverse("catalogue:list")
    assert _messages(editor, response) == [
        f"Imported round-trip.json: {DEMO_SPECIES_COUNT} new, 0 updated, 0 unchanged "
        f"({DEMO_SPECIES_COUNT} species in the file)."
    ]

    second = viewer.get(EXPORT)
    assert second.content == first.content
    assert export_species() == sorted(demo_species, key=lambda s: s.name)


def test_cli_export_then_import_gives_back_exactly_the_same_catalogue(demo_in_db, demo_species, tmp_path):
    path = tmp_path / "exported.json"
    err = io.StringIO()
    call_command("export_catalogue", "--output", str(path), stderr=err)
    assert f"wrote {DEMO_SPECIES_COUNT} species" in err.getvalue()
    written = path.read_text(encoding="utf-8")

    Species.objects.all().delete()
    assert Species.objects.count() == 0

    out = io.StringIO()
    call_command("import_catalogue", str(path), stdout=out)
    assert f"{DEMO_SPECIES_COUNT} new, 0 updated, 0 unchanged" in out.getvalue()

    again = io.StringIO()
    call_command("export_catalogue", stdout=again, stderr=io.StringIO())
    assert again.getvalue() == written
    assert export_species() == sorted(demo_species, key=lambda s: s.name)


# --- broken files change nothing -----------------------------------------------------------------------------


def _broken_document(broken_entries, co2_entry) -> dict:
    return {"format": "linecast-catalogue", "version": 1, "species": [co2_entry, *broken_entries]}


#: The problems of conftest.BROKEN_ENTRIES (regression: what the reader reports for them).
BROKEN_PROBLEMS = {("NegativeB", "states[0].constants_mhz.B"), ("Wobbly", "rotor")}


def test_broken_file_changes_nothing_and_the_page_lists_every_problem(editor_client, broken_entries, co2_entry):
    before = _counts()
    response = _upload(editor_client, _file_bytes(_broken_document(broken_entries, co2_entry)), "broken.json")
    assert response.status_code == 400
    rows = _problem_rows(response)
    assert {(species, field) for species, field, _ in rows} == BROKEN_PROBLEMS
    assert "must be > 0 MHz" in dict(((s, f), m) for s, f, m in rows)[("NegativeB", "states[0].constants_mhz.B")]
    assert "2 problems" in response.content.decode()
    assert _counts() == before
    assert list(response.context["messages"]) == []


def test_broken_file_on_the_command_line_is_a_command_error_naming_every_problem(
    demo_in_db, broken_entries, co2_entry, write_catalogue
):
    path = write_catalogue(_broken_document(broken_entries, co2_entry), "broken.json")
    before = _counts()
    with pytest.raises(CommandError) as raised:
        call_command("import_catalogue", str(path), stdout=io.StringIO())
    message = str(raised.value)
    assert "nothing imported, 2 problem(s)" in message
    for species, field in BROKEN_PROBLEMS:
        assert f"species {species}, field {field}:" in message
    assert _counts() == before


def test_broken_file_makes_the_import_command_exit_non_zero_with_the_problems_on_stderr(
    broken_entries, co2_entry, write_catalogue, tmp_path
):
    path = write_catalogue(_broken_document(broken_entries, co2_entry), "broken.json")
    # A throwaway database, so that the project's db.sqlite3 is never touched (the file is refused before any write).
    env = os.environ | {"DATABASE_URL": f"sqlite:///{tmp_path / 'unused.sqlite3'}"}
    result = subprocess.run(
        [sys.executable, "manage.py", "import_catalogue", str(path)],
        cwd=REPO,
        env=env,
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert result.returncode != 0
    for species, field in BROKEN_PROBLEMS:
        assert f"species {species}, field {field}:" in result.stderr
    assert "imported" not in result.stdout


def _long_label(entry: dict) -> None:
    # 51 characters: one more than State.label holds (LABEL_LENGTH = 50, regression); the file format has no limit.
    entry["states"][0]["label"] = "v" * 51


def _negative_b(entry: dict) -> None:
    entry["states"][0]["constants_mhz"]["B"][0] = -1.0


@pytest.mark.parametrize(
    "spoil, field",
    [(_negative_b, "states[0].constants_mhz.B"), (_long_label, "states[0].label")],
    ids=["refused-by-the-reader", "refused-by-the-store"],
)
def test_file_whose_last_species_alone_is_bad_changes_nothing(editor_client, spoil, field):
    document = _export_document()
    first, last = document["species"][0], document["species"][-1]
    first["states"][0]["constants_mhz"][next(iter(first["states"][0]["constants_mhz"]))][0] += SHIFT_MHZ
    spoil(last)
    catalogue_before, counts_before = export_species(), _counts()

    response = _upload(editor_client, _file_bytes(document), "last-bad.json")
    assert response.status_code == 400
    assert [(species, problem_field) for species, problem_field, _ in _problem_rows(response)] == [
        (last["name"], field)
    ]
    assert _counts() == counts_before
    assert export_species() == catalogue_before


@pytest.mark.parametrize(
    "spoil, field",
    [(_negative_b, "states[0].constants_mhz.B"), (_long_label, "states[0].label")],
    ids=["refused-by-the-reader", "refused-by-the-store"],
)
def test_file_whose_last_species_alone_is_bad_changes_nothing_from_the_command_line(
    demo_in_db, write_catalogue, spoil, field
):
    document = _export_document()
    first, last = document["species"][0], document["species"][-1]
    first["states"][0]["constants_mhz"][next(iter(first["states"][0]["constants_mhz"]))][0] += SHIFT_MHZ
    spoil(last)
    path = write_catalogue(document, "last-bad.json")
    catalogue_before, counts_before = export_species(), _counts()
    with pytest.raises(CommandError, match=re.escape(f"species {last['name']}, field {field}:")):
        call_command("import_catalogue", str(path), stdout=io.StringIO())
    assert _counts() == counts_before
    assert export_species() == catalogue_before


@pytest.mark.parametrize(
    "content, message",
    [
        (b'{"format": "linecast-catalogue", "version": 1, "species": [', "is not valid JSON"),
        ('{"format": "linecast-catalogue", "version": 1, "species": [], "notes": "é"}'.encode("latin-1"), "not UTF-8"),
        (b'[{"format": "linecast-catalogue", "version": 1, "species": []}]', "must hold one JSON object, got a list"),
    ],
    ids=["not-json", "not-utf8", "json-list"],
)
def test_file_that_is_not_a_catalogue_object_is_refused_and_changes_nothing(editor_client, content, message):
    before = _counts()
    response = _upload(editor_client, content, "wrong.json")
    assert response.status_code == 400
    rows = _problem_rows(response)
    assert len(rows) == 1
    species, field, text = rows[0]
    assert (species, field) == ("(file)", "file")
    assert message in text
    assert _counts() == before


def test_file_larger_than_the_upload_limit_is_refused_and_changes_nothing(editor_client):
    before = _counts()
    response = _upload(editor_client, b" " * (MAX_UPLOAD_BYTES + 1), "huge.json")
    assert response.status_code == 400
    assert f"at most {MAX_UPLOAD_BYTES / 1e6:.0f} MB is accepted" in response.content.decode()
    assert _problem_rows(response) == []  # refused before it is read
    assert _counts() == before


def test_form_sent_without_a_file_says_the_file_is_required(editor_client):
    # What a browser sends when no file was chosen: the CSRF token and an empty file part.
    before = _counts()
    response = editor_client.post(IMPORT, {"csrfmiddlewaretoken": "x", "catalogue_file": ""})
    assert response.status_code == 400
    assert response.context["form"].errors["catalogue_file"] == ["This field is required."]
    assert _counts() == before


def test_post_with_no_fields_at_all_says_the_file_is_required(editor_client):
    # A scripted POST with an empty body must explain the 400 like any other refused upload.
    response = editor_client.post(IMPORT, {})
    assert response.status_code == 400
    assert response.context["form"].errors.get("catalogue_file") == ["This field is required."]


# --- updating, unchanged, species kept -----------------------------------------------------------------------


def _shift_ocs_b(document: dict) -> float:
    """Raise the ground-state B of OCS by SHIFT_MHZ in the document; the new value."""
    constants = _entry(document, "OCS")["states"][0]["constants_mhz"]
    constants["B"][0] += SHIFT_MHZ
    return constants["B"][0]


def _ocs_b_row() -> Constant:
    return Constant.objects.get(state__species__name="OCS", state__position=0, name="B")


def test_import_that_changes_one_constant_updates_that_species_with_a_revision(editor_client, editor):
    document = _export_document()
    new_b = _shift_ocs_b(document)
    ocs = Species.objects.get(name="OCS")
    assert ocs.version == 1 and _ocs_b_row().value_mhz != new_b

    response = _upload(editor_client, _file_bytes(document), "ocs-shift.json")
    assert response.status_code == 302
    assert _messages(editor_client, response) == [
        f"Imported ocs-shift.json: 0 new, 1 updated, {DEMO_SPECIES_COUNT - 1} unchanged "
        f"({DEMO_SPECIES_COUNT} species in the file)."
    ]
    assert _ocs_b_row().value_mhz == new_b
    ocs.refresh_from_db()
    assert ocs.version == 2
    newest = Timeline(ocs.pk).revisions()[0]
    assert (newest.kind, newest.version, newest.reason, newest.user) == (
        "changed",
        2,
        "imported from ocs-shift.json",
        editor.username,
    )
    assert newest.species.states[0].constants_mhz["B"][0] == new_b
    assert newest.changes  # the revision shows what changed
    # Only OCS was touched.
    assert Species.objects.exclude(name="OCS").filter(version__gt=1).count() == 0


def test_importing_the_identical_file_again_creates_no_revision(editor_client):
    document = _export_document()
    _shift_ocs_b(document)
    first = _upload(editor_client, _file_bytes(document), "ocs-shift.json")
    assert "1 updated" in _messages(editor_client, first)[0]  # reading the messages also clears them
    before = _counts()
    version = Species.objects.get(name="OCS").version

    response = _upload(editor_client, _file_bytes(document), "ocs-shift.json")
    assert response.status_code == 302
    assert _messages(editor_client, response) == [
        f"Imported ocs-shift.json: 0 new, 0 updated, {DEMO_SPECIES_COUNT} unchanged "
        f"({DEMO_SPECIES_COUNT} species in the file)."
    ]
    assert _counts() == before
    assert Species.objects.get(name="OCS").version == version


def test_species_the_file_does_not_mention_are_kept(editor_client, demo_species, co2_entry):
    document = _export_document()
    new_b = _shift_ocs_b(document)
    co2_entry["name"] = "CO2 (second)"
    small = {"format": "linecast-catalogue", "version": 1, "species": [_entry(document, "OCS"), co2_entry]}

    response = _upload(editor_client, _file_bytes(small), "small.json")
    assert response.status_code == 302
    assert _messages(editor_client, response) == [
        "Imported small.json: 1 new, 1 updated, 0 unchanged (2 species in the file)."
    ]
    assert Species.objects.count() == DEMO_SPECIES_COUNT + 1
    by_name = {species.name: species for species in export_species()}
    for species in demo_species:
        if species.name != "OCS":
            assert by_name[species.name] == species
    assert by_name["OCS"].states[0].constants_mhz["B"][0] == new_b
    assert "CO2 (second)" in by_name


# --- who may import and export -------------------------------------------------------------------------------


@pytest.mark.parametrize("url", [IMPORT, EXPORT, CSV_URL])
def test_anonymous_visitor_is_sent_to_log_in(client, demo_in_db, url):
    response = client.get(url)
    assert response.status_code == 302
    assert response["Location"] == f"{reverse('login')}?next={url}"


def test_anonymous_upload_is_sent_to_log_in_and_changes_nothing(client, demo_in_db, co2_entry):
    before = _counts()
    co2_entry["name"] = "CO2 (second)"
    document = {"format": "linecast-catalogue", "version": 1, "species": [co2_entry]}
    response = _upload(client, _file_bytes(document))
    assert response.status_code == 302
    assert response["Location"].startswith(reverse("login"))
    assert _counts() == before


def test_viewer_may_not_open_the_import_page(viewer_client):
    assert viewer_client.get(IMPORT).status_code == 403


def test_viewer_may_not_import_and_nothing_changes(viewer_client, co2_entry):
    before = _counts()
    co2_entry["name"] = "CO2 (second)"
    document = {"format": "linecast-catalogue", "version": 1, "species": [co2_entry]}
    response = _upload(viewer_client, _file_bytes(document))
    assert response.status_code == 403
    assert _counts() == before


def test_viewer_may_export(viewer_client, demo_species):
    response = viewer_client.get(EXPORT)
    assert response.status_code == 200
    assert len(json.loads(response.content)["species"]) == len(demo_species)


def test_editor_may_open_the_import_page(editor_client):
    response = editor_client.get(IMPORT)
    assert response.status_code == 200
    assert 'name="catalogue_file"' in response.content.decode()


@pytest.mark.parametrize("url", [EXPORT, CSV_URL, IMPORT])
def test_account_without_a_role_may_not_export_or_import(client, make_member, demo_in_db, url):
    client.force_login(make_member("norole"))
    assert client.get(url).status_code == 403


# --- CSV of the catalogue table ------------------------------------------------------------------------------


def _csv(response) -> list[list[str]]:
    return list(csv.reader(io.StringIO(response.content.decode("utf-8"))))


def test_csv_has_the_table_columns_and_a_row_per_species_by_name(viewer_client, demo_species):
    response = viewer_client.get(CSV_URL)
    assert response.status_code == 200
    assert response["Content-Type"] == "text/csv; charset=utf-8"
    assert response["Content-Disposition"] == 'attachment; filename="linecast-catalogue.csv"'
    header, *rows = _csv(response)
    assert header == [key for key, _ in CATALOGUE_COLUMNS]
    # The table's order: names without regard to case.
    assert [row[header.index("name")] for row in rows] == sorted((s.name for s in demo_species), key=str.lower)

    first_species = min(demo_species, key=lambda s: s.name.lower())  # demo data, invented
    first = dict(zip(header, rows[0]))
    assert first["name"] == first_species.name
    assert first["formula"] == first_species.formula
    assert float(first["mass_amu"]) == first_species.mass_amu
    dipoles = tuple(float(first[f"dipole_{axis}_debye"]) for axis in "abc")
    assert dipoles == first_species.dipole_debye
    assert int(first["state_count"]) == len(first_species.states)


def test_csv_follows_the_list_filters(viewer_client, demo_species):
    header, *rows = _csv(viewer_client.get(CSV_URL, {"rotor": "linear"}))
    linear = sorted((s.name for s in demo_species if s.rotor == "linear"), key=str.lower)
    assert linear and len(linear) < len(demo_species)  # the filter must drop something to show anything
    assert [row[header.index("name")] for row in rows] == linear
    assert {row[header.index("rotor")] for row in rows} == {"linear"}


def test_csv_leaves_constants_a_linear_molecule_does_not_have_blank(viewer_client):
    header, *rows = _csv(viewer_client.get(CSV_URL, {"q": "OCS"}))
    row = next(r for r in (dict(zip(header, values)) for values in rows) if r["name"] == "OCS")
    assert row["name"] == "OCS"
    assert (row["ground_a_mhz"], row["ground_c_mhz"], row["ray_kappa"]) == ("", "", "")
    assert float(row["ground_b_mhz"]) > 0
