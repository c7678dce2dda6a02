"""The r0 structure page: internal coordinates fitted to the moments of catalogue isotopologues."""

import pytest
from django.urls import reverse

from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue_file.masses import atom_masses
from planner.engine.structure import linear_triatomic_builder, rotational_constants_mhz
from tests.web.test_substitution_page import _entry

GEOMETRY = linear_triatomic_builder(1.16, 1.56)  # invented test data, as in test_substitution_page


def test_bond_lengths_come_back_from_two_isotopologues(viewer_client, use_catalogue):
    o, c, s = atom_masses("O")[0], atom_masses("C")[0], atom_masses("S")[0]
    c13 = atom_masses("C[13]")[0]
    assert rotational_constants_mhz([o, c, s], GEOMETRY)[1] > 0
    use_catalogue(_entry("OCS", "OCS", [o, c, s]), _entry("O13CS", "OC[13]S", [o, c13, s]))
    chosen = [SpeciesRow.objects.get(name=n).pk for n in ("OCS", "O13CS")]
    response = viewer_client.get(
        reverse("fitting:geometry"), {"geometry": "linear-triatomic", "start": "1.1 1.6", "species": chosen}
    )
    (r1, v1, _), (r2, v2, _) = response.context["structure"]["parameters"]
    assert v1 == pytest.approx(1.16, abs=1e-6) and v2 == pytest.approx(1.56, abs=1e-6)
    assert 'id="geometry-table"' in response.content.decode()


def test_one_isotopologue_cannot_determine_two_bond_lengths(viewer_client):
    chosen = [SpeciesRow.objects.get(name="OCS").pk]  # demo data
    response = viewer_client.get(
        reverse("fitting:geometry"), {"geometry": "linear-triatomic", "start": "1.1 1.6", "species": chosen}
    )
    assert 'id="geometry-error"' in response.content.decode()
    assert "cannot determine" in response.context["error"]
