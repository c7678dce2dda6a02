"""Kraitchman substitution coordinates from two catalogue species."""

import pytest
from django.urls import reverse

from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue_file.masses import atom_masses
from planner.engine.structure import linear_triatomic_builder, principal_axis_coordinates_a, rotational_constants_mhz

# An OCS-like geometry (invented test data: r(C–O) 1.16 Å, r(C–S) 1.56 Å), atoms in the order O, C, S.
GEOMETRY = linear_triatomic_builder(1.16, 1.56)


def _entry(name, formula, masses):
    b = rotational_constants_mhz(masses, GEOMETRY)[1]
    return {
        "name": name,
        "formula": formula,
        "rotor": "linear",
        "dipole_debye": {"a": 0.7},
        "states": [{"label": "v=0", "energy_cm1": 0.0, "constants_mhz": {"B": [b, 0.0]}}],
    }


def test_the_substituted_carbon_is_found_where_the_geometry_put_it(viewer_client, use_catalogue):
    # Masses from periodictable, in the builder's O, C, S order.
    o, c, s = atom_masses("O")[0], atom_masses("C")[0], atom_masses("S")[0]
    c13 = atom_masses("C[13]")[0]
    use_catalogue(_entry("OCS", "OCS", [o, c, s]), _entry("O13CS", "OC[13]S", [o, c13, s]))
    parent, substituted = (SpeciesRow.objects.get(name=n).pk for n in ("OCS", "O13CS"))
    response = viewer_client.get(reverse("fitting:substitution"), {"parent": parent, "substituted": substituted})
    ((axis, value, imaginary),) = response.context["coordinates"]["rows"]
    expected = abs(principal_axis_coordinates_a([o, c, s], GEOMETRY)[1]).max()  # textbook: exact for exact data
    assert axis == "z" and not imaginary
    assert value == pytest.approx(expected, abs=1e-6)
    assert 'id="substitution-table"' in response.content.decode()


def test_a_pair_that_is_not_a_single_substitution_is_refused(viewer_client):
    parent, other = (SpeciesRow.objects.get(name=n).pk for n in ("OCS", "HCN"))  # demo data
    response = viewer_client.get(reverse("fitting:substitution"), {"parent": parent, "substituted": other})
    assert "HCN is not a single isotopic substitution of OCS" in response.content.decode()
