"""Fixtures for the web tests: the demo catalogue, small catalogues written on the spot, queries."""

from __future__ import annotations

import json
from html.parser import HTMLParser

import pytest

from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.roles import give_role
from planner.catalogue.store import Stamp, import_species
from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue, parse_catalogue
from planner.engine import PredictionRequest, predict

#: A window and temperature small enough for quick tests (common practice, no source:
#: a centimetre/millimetre-wave window at a cold-ish temperature).
TEST_FMIN_MHZ = 0.0
TEST_FMAX_MHZ = 120_000.0
TEST_TEMPERATURE_K = 50.0


def catalogue_document(*entries: dict) -> dict:
    """A catalogue-file document (docs/catalogue-format.md) holding ``entries``."""
    return {"format": "linecast-catalogue", "version": 1, "species": list(entries)}


#: Carbon dioxide: no permanent dipole, so no rotational lines.
#: B from memory (about 11 698 MHz for 12C16O2); the value does not matter for the test.
CO2_ENTRY = {
    "name": "CO2",
    "formula": "CO2",
    "rotor": "linear",
    "dipole_debye": {"a": 0.0},
    "states": [{"label": "v=0", "energy_cm1": 0.0, "constants_mhz": {"B": [11698.0, 0.0]}}],
}

#: Two entries that break rules: a negative B and an unknown rotor kind.
BROKEN_ENTRIES = (
    {
        "name": "NegativeB",
        "formula": "CO",
        "rotor": "linear",
        "dipole_debye": {"a": 0.1},
        "states": [{"label": "v=0", "energy_cm1": 0.0, "constants_mhz": {"B": [-57000.0, 0.0]}}],
    },
    {
        "name": "Wobbly",
        "formula": "OCS",
        "rotor": "wobbly",
        "dipole_debye": {"a": 0.7},
        "states": [{"label": "v=0", "energy_cm1": 0.0, "constants_mhz": {"B": [6000.0, 0.0]}}],
    },
)


@pytest.fixture(autouse=True)
def empty_cache():
    """Each test starts with an empty cache: test databases hand out the same ids and versions again,
    so a prediction cached by an earlier test could otherwise stand in for another catalogue's."""
    from django.core.cache import cache

    cache.clear()


@pytest.fixture(scope="session")
def demo_species():
    return load_catalogue(DEMO_CATALOGUE_PATH)


@pytest.fixture(scope="session")
def test_request():
    return PredictionRequest(fmin_mhz=TEST_FMIN_MHZ, fmax_mhz=TEST_FMAX_MHZ, temperature_k=TEST_TEMPERATURE_K)


#: Lines a demo species needs in the test window to exercise ordering and truncation.
MIN_TEST_LINES = 5


@pytest.fixture(scope="session")
def demo_with_lines(demo_species, test_request):
    """(species, prediction) for the first demo species with a few lines in the test window."""
    for species in demo_species:
        if species.has_dipole:
            prediction = predict(species, test_request)
            if len(prediction.lines) >= MIN_TEST_LINES:
                return species, prediction
    pytest.fail("no demo species has enough lines in the test window; the demo catalogue or the engine changed")


@pytest.fixture
def write_catalogue(tmp_path):
    """Write a catalogue document to a file and return its path."""

    def write(document: dict, name: str = "catalogue.json"):
        path = tmp_path / name
        path.write_text(json.dumps(document), encoding="utf-8")
        return path

    return write


@pytest.fixture
def demo_in_db(db, demo_species):
    """The demo catalogue imported into the test database."""
    import_species(demo_species, Stamp(None, "demo catalogue"))
    return demo_species


@pytest.fixture
def use_catalogue(db):
    """Make the database catalogue hold exactly ``entries`` (catalogue-file entries) for one test."""

    def use(*entries: dict):
        species = parse_catalogue(catalogue_document(*entries))
        SpeciesRow.objects.all().delete()
        import_species(species, Stamp(None, "test catalogue"))
        return species

    return use


PASSWORD = "spectral-lines-77"  # test accounts only


@pytest.fixture
def make_member(db, django_user_model):
    """A user with a role ("viewer", "editor", or None for an account without one)."""

    def make(username: str, role: str | None = None, **extra):
        user = django_user_model.objects.create_user(username=username, password=PASSWORD, **extra)
        if role:
            give_role(user, role)
        return user

    return make


@pytest.fixture
def viewer(make_member):
    return make_member("vera", "viewer")


@pytest.fixture
def editor(make_member):
    return make_member("eddie", "editor")


@pytest.fixture
def viewer_client(client, viewer, demo_in_db):
    """A logged-in viewer, with the demo catalogue in the database."""
    client.force_login(viewer)
    return client


@pytest.fixture
def editor_client(client, editor, demo_in_db):
    """A logged-in editor, with the demo catalogue in the database."""
    client.force_login(editor)
    return client


@pytest.fixture
def second_editor_client(editor, make_member, demo_in_db):
    """Another editor in a browser of their own (its own Client)."""
    from django.test import Client

    other = Client()
    other.force_login(make_member("olga", "editor"))
    return other


@pytest.fixture
def page_query():
    """Query string of the spectrum form for one species, test window unless overridden."""

    def query(species_name: str, **overrides) -> dict:
        defaults = {
            "species": species_name,
            "temperature_k": TEST_TEMPERATURE_K,
            "fmin_mhz": TEST_FMIN_MHZ,
            "fmax_mhz": TEST_FMAX_MHZ,
            "min_intensity_nm2mhz": "",
        }
        return defaults | overrides

    return query


@pytest.fixture
def co2_entry():
    return json.loads(json.dumps(CO2_ENTRY))


@pytest.fixture
def broken_entries():
    return json.loads(json.dumps(BROKEN_ENTRIES))


class _TableParser(HTMLParser):
    """Collects the text of every cell of the table with id ``line-table``: header rows and body rows."""

    def __init__(self):
        super().__init__()
        self.in_table = False
        self.section = None
        self.cell = None
        self.head: list[list[str]] = []
        self.body: list[list[str]] = []

    def handle_starttag(self, tag, attrs):
        if tag == "table" and dict(attrs).get("id") == "line-table":
            self.in_table = True
        elif self.in_table and tag in ("thead", "tbody"):
            self.section = self.head if tag == "thead" else self.body
        elif self.in_table and tag == "tr" and self.section is not None:
            self.section.append([])
        elif self.in_table and tag in ("td", "th"):
            self.cell = []

    def handle_endtag(self, tag):
        if tag == "table" and self.in_table:
            self.in_table = False
        elif self.in_table and tag in ("td", "th") and self.cell is not None:
            self.section[-1].append("".join(self.cell).strip())
            self.cell = None

    def handle_data(self, data):
        if self.cell is not None:
            self.cell.append(data)


@pytest.fixture
def parse_table():
    """HTML -> (header rows, body rows) of the line table, each a list of cell texts."""

    def parse(html: str):
        parser = _TableParser()
        parser.feed(html)
        return parser.head, parser.body

    return parse


@pytest.fixture
def assert_json_matches():
    """Check a prediction JSON (exports.prediction_json) of the test window against a prediction."""
    return _assert_json_matches


def _assert_json_matches(document: dict, prediction) -> None:
    assert set(document) >= {"request", "partition_function", "j_max", "messages", "lines"}
    assert document["request"] == {
        "fmin_mhz": TEST_FMIN_MHZ,
        "fmax_mhz": TEST_FMAX_MHZ,
        "temperature_k": TEST_TEMPERATURE_K,
        "min_intensity_nm2mhz": 0.0,
    }
    assert document["partition_function"] == prediction.partition_function
    assert document["j_max"] == prediction.j_max
    assert len(document["lines"]) == len(prediction.lines)
