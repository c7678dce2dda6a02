"""Uploads are limited in size and read safely: catalogue import and the fit page's lines CSV.

Every refusal is a message (next to the field, or in the import's problem table) and writes nothing.
The caps are planner/limits.py's.
"""

from __future__ import annotations

import json

import pytest
from django.conf import settings
from django.core.files.uploadedfile import SimpleUploadedFile
from django.urls import reverse

from planner.catalogue.models import Species as SpeciesRow
from planner.fitting.models import FitRun
from planner.limits import (
    MAX_CATALOGUE_BYTES,
    MAX_FIT_LINES,
    MAX_IMPORT_SPECIES,
    MAX_LINES_BYTES,
    MAX_LINES_FIELD_CHARS,
)
from tests.fitting.test_fit_command import CO_LINES
from tests.web.conftest import CO2_ENTRY, catalogue_document

IMPORT = reverse("catalogue:import")
FIT = reverse("fitting:fit")
#: The first bytes of a PNG file (the PNG specification's signature) and some binary after them.
PNG_BYTES = b"\x89PNG\r\n\x1a\n" + bytes(range(256)) * 4


def test_django_limits_stay_above_the_form_caps():
    # Above the caps, so that an accepted file stays in memory and a bigger one still reaches the
    # form (which names the problem) instead of Django's bare 400.
    assert settings.FILE_UPLOAD_MAX_MEMORY_SIZE >= max(MAX_CATALOGUE_BYTES, MAX_LINES_BYTES)
    assert settings.DATA_UPLOAD_MAX_MEMORY_SIZE >= MAX_LINES_BYTES  # pasted lines are form data


# Catalogue import ------------------------------------------------------------------------------


def _import(client, content: bytes, name: str = "catalogue.json"):
    upload = SimpleUploadedFile(name, content, content_type="application/json")
    return client.post(IMPORT, {"catalogue_file": upload})


def _problems(response) -> str:
    return " ".join(f"{p.field}: {p.message}" for p in response.context["problems"])


@pytest.fixture
def catalogue_state(editor_client):
    def state():
        return sorted(SpeciesRow.objects.values_list("name", "version")), SpeciesRow.history.count()

    return state


@pytest.mark.parametrize("size", [MAX_CATALOGUE_BYTES + 1, 3 * settings.FILE_UPLOAD_MAX_MEMORY_SIZE // 2])
def test_an_oversize_catalogue_is_refused_next_to_the_field(editor_client, catalogue_state, size):
    before = catalogue_state()
    response = _import(editor_client, b" " * size)
    assert response.status_code == 400
    (message,) = response.context["form"].errors["catalogue_file"]
    assert f"at most {MAX_CATALOGUE_BYTES / 1e6:.0f} MB is accepted" in message
    assert catalogue_state() == before


@pytest.mark.parametrize(
    "content, expected",
    [
        (b"[" * 100_000, "file: is nested too deeply to be a catalogue"),
        (b'{"format": ' + b'{"a": ' * 100_000, "file: is nested too deeply to be a catalogue"),
        ('{"format": "linecast-catalogue", "name": "caf\xe9"}'.encode("latin-1"), "file: is not UTF-8 text"),
        (PNG_BYTES, "file: is not UTF-8 text (byte 0)"),
        (b"\x00" * 1000, "file: is not valid JSON"),
    ],
    ids=["deep-array", "deep-object", "latin-1", "binary", "nul-bytes"],
)
def test_a_malformed_catalogue_is_a_problem_not_a_server_error(editor_client, catalogue_state, content, expected):
    before = catalogue_state()
    response = _import(editor_client, content)
    assert response.status_code == 400
    assert expected in _problems(response)
    assert "Nothing was imported" in response.content.decode()
    assert catalogue_state() == before


def test_too_many_species_in_one_file_are_refused(editor_client, catalogue_state):
    before = catalogue_state()
    entries = [CO2_ENTRY | {"name": f"CO2 copy {n}"} for n in range(MAX_IMPORT_SPECIES + 1)]
    response = _import(editor_client, json.dumps(catalogue_document(*entries)).encode())
    assert response.status_code == 400
    assert f"holds {MAX_IMPORT_SPECIES + 1} species; at most {MAX_IMPORT_SPECIES} per import" in _problems(response)
    assert catalogue_state() == before


# The fit page's lines CSV ----------------------------------------------------------------------


def _fit(client, **data):
    co = SpeciesRow.objects.get(name="CO")
    return client.post(FIT, {"species": co.pk, "vary": "B, D"} | data)


def _upload(content: bytes, name: str = "lines.csv"):
    return SimpleUploadedFile(name, content, content_type="text/csv")


def _field_errors(response, field: str) -> str:
    return " ".join(response.context["form"].errors.get(field, []))


HEADER = CO_LINES.splitlines()[0]
FIRST_ROW = CO_LINES.splitlines()[1]


@pytest.mark.parametrize(
    "content, expected",
    [
        (b"x" * (MAX_LINES_BYTES + 1), "The file is larger than 1 MB."),
        ("j_up,note\n1,caf\xe9\n".encode("latin-1"), "The file is not UTF-8 text."),
        (PNG_BYTES, "The file is not UTF-8 text."),
        (CO_LINES.encode().replace(b"from memory", b"\x00\x00"), "the file holds NUL bytes"),
        (f'{HEADER}\n{FIRST_ROW[: -len("from memory")]}"{"x" * 200_000}"\n'.encode(), "not a readable CSV file"),
        (
            f"{HEADER}\n{FIRST_ROW[: -len('from memory')]}{'x' * (MAX_LINES_FIELD_CHARS + 1)}\n".encode(),
            f"row 2, note: longer than {MAX_LINES_FIELD_CHARS} characters",
        ),
        (
            (HEADER + "\n" + (FIRST_ROW + "\n") * (MAX_FIT_LINES + 1)).encode(),
            f"more than {MAX_FIT_LINES} lines: fit at most {MAX_FIT_LINES} at once",
        ),
    ],
    ids=["oversize", "latin-1", "binary", "nul-bytes", "huge-field", "long-field", "too-many-rows"],
)
def test_a_bad_lines_file_is_refused_next_to_the_field(editor_client, content, expected):
    response = _fit(editor_client, lines_file=_upload(content))
    assert response.status_code == 400
    assert expected in _field_errors(response, "lines_file")
    assert not FitRun.objects.exists()


def test_pasted_lines_over_the_size_cap_are_refused(editor_client):
    text = HEADER + "\n" + (FIRST_ROW + "\n") * (MAX_LINES_BYTES // len(FIRST_ROW) + 1)
    response = _fit(editor_client, lines_text=text)
    assert response.status_code == 400
    assert "The pasted lines are longer than 1 MB." in _field_errors(response, "lines_text")
    assert not FitRun.objects.exists()


def test_pasted_lines_with_too_many_rows_are_refused(editor_client):
    text = HEADER + "\n" + (FIRST_ROW + "\n") * (MAX_FIT_LINES + 1)
    response = _fit(editor_client, lines_text=text)
    assert response.status_code == 400
    assert f"more than {MAX_FIT_LINES} lines" in _field_errors(response, "lines_text")


def test_a_lines_file_at_the_row_cap_is_read(editor_client):
    # The same five CO lines (tests/fitting) repeated up to the cap: the cap itself is accepted.
    rows = CO_LINES.splitlines()[1:]
    text = HEADER + "\n" + "\n".join(rows[i % len(rows)] for i in range(MAX_FIT_LINES)) + "\n"
    response = _fit(editor_client, lines_file=_upload(text.encode()))
    assert response.status_code == 302
    assert FitRun.objects.get().result["line_count"] == MAX_FIT_LINES
