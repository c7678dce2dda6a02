"""GET /api/v1/species and /api/v1/species/{id}: the catalogue list, and one species in the catalogue format."""

from __future__ import annotations

import pytest

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue_file import parse_catalogue
from planner.catalogue_file.writer import catalogue_to_dict
from tests.api.conftest import API, assert_error
from tests.web.conftest import catalogue_document

SUMMARY_KEYS = {"id", "name", "formula", "rotor", "version", "mass_amu", "dipole_debye", "url"}


def test_list_has_every_species_with_units_in_its_keys(token_client, demo_species):
    document = token_client.get(f"{API}/species").json()
    assert document["count"] == len(demo_species) == len(document["species"])
    co = next(item for item in document["species"] if item["name"] == "CO")
    assert set(co) == SUMMARY_KEYS
    row = SpeciesRow.objects.get(name="CO")
    assert co["mass_amu"] == row.mass_amu and co["version"] == row.version
    assert co["dipole_debye"] == {"a": row.dipole_a_debye, "b": row.dipole_b_debye, "c": row.dipole_c_debye}
    assert co["url"] == f"http://testserver{API}/species/{row.pk}"


def test_list_is_sorted_by_name_like_the_catalogue_page(token_client, demo_in_db):
    names = [item["name"] for item in token_client.get(f"{API}/species").json()["species"]]
    assert names == sorted(names, key=str.lower)


@pytest.mark.parametrize(
    "query, expected",
    [
        ({"search": "co"}, lambda s: "co" in s.name.lower() or "co" in s.formula.lower()),
        ({"rotor": "linear"}, lambda s: s.rotor == "linear"),
        ({"dipole": "b"}, lambda s: s.dipole_debye[1] != 0),
        ({"rotor": "asymmetric", "dipole": "a"}, lambda s: s.rotor == "asymmetric" and s.dipole_debye[0] != 0),
    ],
)
def test_filters_choose_the_same_species_as_a_plain_filter(token_client, demo_species, query, expected):
    listed = {item["name"] for item in token_client.get(f"{API}/species", query).json()["species"]}
    assert listed == {s.name for s in demo_species if expected(s)}
    assert listed  # the demo catalogue has species of every kind filtered here


def test_unknown_rotor_kind_is_a_400_naming_the_filter(token_client):
    assert_error(token_client.get(f"{API}/species", {"rotor": "wobbly"}), 400, "invalid_input", "rotor")


def test_one_species_is_its_catalogue_file_entry_with_id_and_version(token_client, demo_in_db):
    row = SpeciesRow.objects.get(name="OCS")
    document = token_client.get(f"{API}/species/{row.pk}").json()
    entry = catalogue_to_dict([species_of_row(row)])["species"][0]
    assert document == {"id": row.pk, "version": row.version, **entry}


def test_the_entry_reads_back_as_the_same_species(token_client, demo_species):
    """The API speaks the catalogue format: the file reader takes the entry as it is."""
    row = SpeciesRow.objects.get(name="CO")
    document = token_client.get(f"{API}/species/{row.pk}").json()
    entry = {key: value for key, value in document.items() if key not in ("id", "version")}
    (species,) = parse_catalogue(catalogue_document(entry))
    assert species == next(s for s in demo_species if s.name == "CO")


@pytest.mark.parametrize("species_id", ["999999", "9" * 30])
def test_missing_species_is_a_404_in_the_error_shape(token_client, species_id):
    assert_error(token_client.get(f"{API}/species/{species_id}"), 404, "not_found")


def test_species_list_queries_do_not_grow_with_the_catalogue(token_client, django_assert_max_num_queries):
    # Token lookup and its last-used stamp, the account's and its groups' permissions, the rotor
    # counts of the filter form, the list itself: six, whatever the number of species.
    with django_assert_max_num_queries(6):
        token_client.get(f"{API}/species")
