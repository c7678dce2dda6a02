"""Equivalent positions and arrangement counts of planner/engine/equivalence.py.

Geometries are made up for the test (their symmetry is what matters, not
their bond lengths); every expected number is labelled "textbook identity"
(a group order or counting fact) or "invented test data".
"""

from __future__ import annotations

import math
import time

import numpy as np
import pytest

from planner.engine.equivalence import arrangement_count, equivalent_positions
from planner.engine.structure import linear_triatomic_builder, triatomic_bent_builder

#: SO2-like bent triatomic, atom order (S, O, O) as triatomic_bent_builder documents (invented test data).
SO2_ELEMENTS = ("S", "O", "O")
SO2_LIKE = triatomic_bent_builder(1.43, 1.43, 119.5)

#: OCS-like linear triatomic, atom order (O, C, S) (invented test data).
OCS_ELEMENTS = ("O", "C", "S")
OCS_LIKE = linear_triatomic_builder(1.16, 1.56)

#: CH4 with H on alternate corners of a cube of edge 2 Å, a regular tetrahedron (invented test data).
CH4_ELEMENTS = ("C", "H", "H", "H", "H")
CH4_LIKE = np.array([[0, 0, 0], [1, 1, 1], [1, -1, -1], [-1, 1, -1], [-1, -1, 1]], dtype=float)


def _methyl_top(symbol_x: str = "Cl") -> tuple[tuple[str, ...], np.ndarray]:
    """CH3–X with a threefold axis along z: C, X, H, H, H (invented test data)."""
    angles = np.radians([0.0, 120.0, 240.0])
    hydrogens = np.column_stack([1.03 * np.cos(angles), 1.03 * np.sin(angles), np.full(3, -0.36)])
    coords = np.vstack([[0.0, 0.0, 0.0], [0.0, 0.0, 1.78], hydrogens])
    return ("C", symbol_x, "H", "H", "H"), coords


def _methyl_cyanide() -> tuple[tuple[str, ...], np.ndarray]:
    """CH3–C≡N with C3v symmetry: C, C, N, H, H, H (invented test data)."""
    angles = np.radians([0.0, 120.0, 240.0])
    hydrogens = np.column_stack([1.03 * np.cos(angles), 1.03 * np.sin(angles), np.full(3, -0.36)])
    return ("C", "C", "N", "H", "H", "H"), np.vstack([[0, 0, 0], [0, 0, 1.46], [0, 0, 2.62], hydrogens])


def _benzene() -> tuple[tuple[str, ...], np.ndarray]:
    """A regular planar hexagon of C with H outside each: C1..C6 then H1..H6, 12 atoms (invented test data)."""
    angles = np.radians(np.arange(6) * 60.0)
    ring = np.column_stack([np.cos(angles), np.sin(angles), np.zeros(6)])
    return ("C",) * 6 + ("H",) * 6, np.vstack([1.39 * ring, 2.47 * ring])


def _icosahedron() -> np.ndarray:
    """The 12 vertices (0, ±1, ±φ) and their cyclic shifts, scaled (invented test data)."""
    phi = (1.0 + math.sqrt(5.0)) / 2.0
    corners = [p for a in (-1, 1) for b in (-phi, phi) for p in ([0, a, b], [a, b, 0], [b, 0, a])]
    return 0.9 * np.array(corners, dtype=float)


# --- Permutation groups ------------------------------------------------------------------------


def test_bent_triatomic_has_the_identity_and_the_exchange_of_the_two_o():
    """C2v on atoms: E and the swap of the O (the molecular plane moves no atom) (textbook identity)."""
    assert equivalent_positions(SO2_ELEMENTS, SO2_LIKE) == [(0, 1, 2), (0, 2, 1)]


def test_linear_ocs_has_only_the_identity():
    """Three different elements: nothing can be exchanged (textbook identity)."""
    assert equivalent_positions(OCS_ELEMENTS, OCS_LIKE) == [(0, 1, 2)]


def test_linear_symmetric_triatomic_exchanges_its_end_atoms():
    """O=C=O: D∞h moves the two O into each other and nothing else (textbook identity)."""
    assert len(equivalent_positions(("O", "C", "O"), linear_triatomic_builder(1.16, 1.16))) == 2


def test_tetrahedral_ch4_has_the_24_permutations_of_td():
    """Td has order 24 and acts on the four H as the full symmetric group S4 (textbook identity)."""
    permutations = equivalent_positions(CH4_ELEMENTS, CH4_LIKE)
    assert len(permutations) == 24
    assert all(p[0] == 0 for p in permutations)  # C stays put
    assert len({p[1:] for p in permutations}) == math.factorial(4)


def test_methyl_symmetric_top_has_the_six_permutations_of_c3v():
    """C3v, order 6: E, 2 C3, 3 σv, each a different permutation of the H (textbook identity)."""
    elements, coords = _methyl_top()
    assert len(equivalent_positions(elements, coords)) == 6


def test_methyl_cyanide_has_the_six_permutations_of_c3v():
    """CH3CN, C3v (textbook identity)."""
    elements, coords = _methyl_cyanide()
    assert len(equivalent_positions(elements, coords)) == 6


def test_planar_benzene_gives_twelve_permutations_within_a_second():
    """D6h has order 24, but σh fixes every atom of a planar ring: 24/2 = 12 permutations (textbook identity)."""
    elements, coords = _benzene()
    start = time.perf_counter()
    permutations = equivalent_positions(elements, coords)
    assert time.perf_counter() - start < 1.0
    assert len(permutations) == 12


def test_twelve_like_atoms_of_an_icosahedron_give_the_120_permutations_of_ih_within_a_second():
    """Ih has order 120 and only E fixes all twelve vertices (textbook identity)."""
    start = time.perf_counter()
    permutations = equivalent_positions(("B",) * 12, _icosahedron())
    assert time.perf_counter() - start < 1.0
    assert len(permutations) == 120


def test_permutations_keep_every_distance_and_start_with_the_identity():
    """Each permutation found is an isometry of the atoms; the list is sorted (invented test data)."""
    elements, coords = _methyl_cyanide()
    permutations = equivalent_positions(elements, coords)
    distances = np.linalg.norm(coords[:, None] - coords[None, :], axis=-1)
    assert permutations[0] == tuple(range(len(elements)))
    assert permutations == sorted(permutations)
    for p in permutations:
        np.testing.assert_allclose(distances[np.ix_(p, p)], distances, atol=1e-12)
        assert all(elements[i] == elements[j] for i, j in enumerate(p))


def test_the_answer_does_not_depend_on_orientation_or_atom_order():
    """Rotating, shifting and reordering the atoms leaves |G| alone (invented test data)."""
    elements, coords = _methyl_top()
    angle = 0.7
    rotation = np.array([[math.cos(angle), -math.sin(angle), 0], [math.sin(angle), math.cos(angle), 0], [0, 0, 1]])
    moved = coords @ rotation.T @ np.array([[1, 0, 0], [0, 0, 1], [0, -1, 0]]) + [3.0, -2.0, 5.0]
    order = [3, 0, 4, 1, 2]
    assert len(equivalent_positions([elements[i] for i in order], moved[order])) == 6


def test_a_single_atom_has_one_arrangement():
    assert equivalent_positions(["Ar"], [[0.0, 0.0, 0.0]]) == [(0,)]
    assert arrangement_count(["Ar"], [40], [[0.0, 0.0, 0.0]]) == 1


# --- Arrangement counts ------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("labels", "expected"),
    [
        ((32, 16, 16), 1),  # parent (textbook identity)
        ((32, 16, 18), 2),  # 16O-S-18O and 18O-S-16O (textbook identity)
        ((32, 18, 16), 2),  # the same species written the other way (textbook identity)
        ((32, 18, 18), 1),  # both O substituted (textbook identity)
        ((34, 16, 16), 1),  # the S is unique (textbook identity)
        ((34, 16, 18), 2),  # (textbook identity)
    ],
)
def test_so2_arrangements(labels, expected):
    assert arrangement_count(SO2_ELEMENTS, labels, SO2_LIKE) == expected


@pytest.mark.parametrize("labels", [(16, 12, 32), (18, 12, 32), (16, 13, 34), (17, 13, 33)])
def test_every_ocs_isotopologue_has_one_arrangement(labels):
    """All atoms of OCS are unique (textbook identity)."""
    assert arrangement_count(OCS_ELEMENTS, labels, OCS_LIKE) == 1


@pytest.mark.parametrize(
    ("labels", "expected"),
    [
        ((12, 1, 1, 1, 1), 1),  # (textbook identity)
        ((12, 2, 1, 1, 1), 4),  # CH3D: the D on any of 4 sites (textbook identity)
        ((12, 1, 1, 2, 1), 4),  # (textbook identity)
        ((12, 2, 2, 1, 1), 6),  # CH2D2: C(4, 2) = 6 pairs of sites (textbook identity)
        ((12, 2, 2, 2, 1), 4),  # CHD3 (textbook identity)
        ((12, 2, 2, 2, 2), 1),  # CD4 (textbook identity)
        ((13, 2, 1, 1, 1), 4),  # 13CH3D (textbook identity)
        ((12, 2, 3, 1, 1), 12),  # CH2DT: 4 × 3 ordered sites for D and T (textbook identity)
    ],
)
def test_ch4_arrangements(labels, expected):
    assert arrangement_count(CH4_ELEMENTS, labels, CH4_LIKE) == expected


def test_ch4_orbit_times_stabiliser_is_the_group_order():
    """|orbit| · |Stab| = |G| for CH3D: 4 × 6 = 24 (textbook identity, orbit–stabiliser theorem)."""
    labels = (12, 2, 1, 1, 1)
    permutations = equivalent_positions(CH4_ELEMENTS, CH4_LIKE)
    stabiliser = [p for p in permutations if all(labels[p[i]] == labels[i] for i in range(5))]
    assert len(stabiliser) == 6
    assert arrangement_count(CH4_ELEMENTS, labels, CH4_LIKE) * len(stabiliser) == len(permutations)


@pytest.mark.parametrize(("deuterium_count", "expected"), [(0, 1), (1, 3), (2, 3), (3, 1)])
def test_methyl_top_arrangements(deuterium_count, expected):
    """CH3X, CH2DX, CHD2X, CD3X: 1, 3, 3, 1 (textbook identity)."""
    elements, coords = _methyl_top()
    labels = (12, 35) + (2,) * deuterium_count + (1,) * (3 - deuterium_count)
    assert arrangement_count(elements, labels, coords) == expected


def test_methyl_cyanide_with_one_d_or_one_13c():
    """CH2DCN: 3; 13CH3CN and CH3(13)CN: 1 (textbook identity)."""
    elements, coords = _methyl_cyanide()
    assert arrangement_count(elements, (12, 12, 14, 2, 1, 1), coords) == 3
    assert arrangement_count(elements, (13, 12, 14, 1, 1, 1), coords) == 1
    assert arrangement_count(elements, (12, 13, 14, 1, 1, 1), coords) == 1


@pytest.mark.parametrize(
    ("deuterated_sites", "expected"),
    [((0,), 6), ((0, 1), 6), ((0, 2), 6), ((0, 3), 3), ((0, 1, 2, 3, 4, 5), 1)],
)
def test_benzene_deuteration_ortho_meta_para(deuterated_sites, expected):
    """C6H5D 6; ortho and meta C6H4D2 6 each, para 3; C6D6 1 (textbook identity)."""
    elements, coords = _benzene()
    labels = [12] * 6 + [2 if k in deuterated_sites else 1 for k in range(6)]
    assert arrangement_count(elements, labels, coords) == expected


def test_the_orbits_of_all_h_d_patterns_of_benzene_are_the_13_two_colour_bracelets():
    """Σ over all 2⁶ patterns of 1/orbit size = number of species = 13 bracelets of 6 beads (textbook identity)."""
    elements, coords = _benzene()
    total = 0.0
    for pattern in range(64):
        hydrogens = [2 if pattern >> k & 1 else 1 for k in range(6)]
        total += 1.0 / arrangement_count(elements, [12] * 6 + hydrogens, coords)
    assert total == pytest.approx(13.0, abs=1e-9)


def test_labels_may_be_any_hashable():
    """Text labels work as well as mass numbers (invented test data)."""
    assert arrangement_count(SO2_ELEMENTS, ("32S", "16O", "18O"), SO2_LIKE) == 2


# --- Tolerance ---------------------------------------------------------------------------------


def test_a_bond_difference_within_tolerance_still_counts_as_equal():
    """Bonds 1.43 and 1.4305 Å differ by 5e-4 Å < 1e-3 Å (invented test data)."""
    distorted = triatomic_bent_builder(1.43, 1.4305, 119.5)
    assert len(equivalent_positions(SO2_ELEMENTS, distorted)) == 2
    assert arrangement_count(SO2_ELEMENTS, (32, 16, 18), distorted) == 2


def test_a_bond_difference_beyond_tolerance_breaks_the_equivalence():
    """The same 5e-4 Å with tolerance_a = 1e-4 Å, and 1e-2 Å with the default (invented test data)."""
    distorted = triatomic_bent_builder(1.43, 1.4305, 119.5)
    assert equivalent_positions(SO2_ELEMENTS, distorted, tolerance_a=1e-4) == [(0, 1, 2)]
    assert arrangement_count(SO2_ELEMENTS, (32, 16, 18), distorted, tolerance_a=1e-4) == 1
    assert arrangement_count(SO2_ELEMENTS, (32, 16, 18), triatomic_bent_builder(1.43, 1.44, 119.5)) == 1


def test_a_distorted_ch4_loses_symmetry_step_by_step():
    """Moving one H out by 0.01 Å leaves C3v (6 permutations) at 1e-3 Å, Td (24) at 0.05 Å (invented test data)."""
    coords = CH4_LIKE.copy()
    coords[1] *= 1.0 + 0.01 / math.sqrt(3.0)
    assert len(equivalent_positions(CH4_ELEMENTS, coords)) == 6
    assert len(equivalent_positions(CH4_ELEMENTS, coords, tolerance_a=0.05)) == 24


def test_a_tolerance_that_chains_unequal_distances_is_refused():
    """Sides 1.0, 1.0006, 1.0012 Å: neighbours equal within 1e-3 Å, the extremes not (invented test data)."""
    a, b, c = 1.0006, 1.0012, 1.0  # BC, CA, AB
    x = (b * b - a * a + c * c) / (2 * c)
    triangle = [[0, 0, 0], [c, 0, 0], [x, math.sqrt(b * b - x * x), 0]]
    with pytest.raises(ValueError, match="tolerance_a"):
        equivalent_positions(["X"] * 3, triangle)
    assert len(equivalent_positions(["X"] * 3, triangle, tolerance_a=1e-5)) == 1
    assert len(equivalent_positions(["X"] * 3, triangle, tolerance_a=0.01)) == 6


# --- Bad input ---------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: equivalent_positions([], np.zeros((0, 3))), "elements"),
        (lambda: equivalent_positions("SOO", SO2_LIKE), "elements"),
        (lambda: equivalent_positions(["S", "O", 8], SO2_LIKE), r"elements\[2\]"),
        (lambda: equivalent_positions(["S", "O"], SO2_LIKE), "coordinates_a"),
        (lambda: equivalent_positions(SO2_ELEMENTS, SO2_LIKE[:, :2]), "coordinates_a"),
        (lambda: equivalent_positions(SO2_ELEMENTS, [[0, 0, 0], [1, 0, 0], [0, math.nan, 0]]), "coordinates_a"),
        (lambda: equivalent_positions(SO2_ELEMENTS, "not coordinates"), "coordinates_a"),
        (lambda: equivalent_positions(SO2_ELEMENTS, SO2_LIKE, tolerance_a=0.0), "tolerance_a"),
        (lambda: equivalent_positions(SO2_ELEMENTS, SO2_LIKE, tolerance_a=-1e-3), "tolerance_a"),
        (lambda: equivalent_positions(SO2_ELEMENTS, SO2_LIKE, tolerance_a=math.nan), "tolerance_a"),
        (lambda: arrangement_count(SO2_ELEMENTS, (32, 16), SO2_LIKE), "labels"),
        (lambda: arrangement_count(SO2_ELEMENTS, "abc", SO2_LIKE), "labels"),
        (lambda: arrangement_count(SO2_ELEMENTS, (32, [16], 18), SO2_LIKE), r"labels\[1\]"),
    ],
)
def test_bad_input_names_the_argument(call, name):
    with pytest.raises(ValueError, match=name):
        call()
