"""Isotopologue scaling of planner/engine/isotopologue.py: Dunham relations, geometry ratios, dipole axes.

Isotopic masses [u] and abundances come from the periodictable package, never
typed here.  Every expected number is labelled "textbook identity", "from
memory" or "invented test data" (a made-up geometry whose answer follows
exactly from its own moments).
"""

from __future__ import annotations

import math

import numpy as np
import periodictable
import pytest
from numpy.testing import assert_allclose

from planner.engine.isotopologue import (
    dunham_scaled_b0_mhz,
    dunham_scaled_constants_mhz,
    geometry_scaled_constants_mhz,
    natural_abundance,
    rotated_dipole_debye,
)
from planner.engine.structure import (
    linear_triatomic_builder,
    reduced_mass_amu,
    rotational_constants_mhz,
    triatomic_bent_builder,
)

C12, C13 = periodictable.C[12].mass, periodictable.C[13].mass
O16, O18 = periodictable.O[16].mass, periodictable.O[18].mass
S32 = periodictable.S[32].mass

MU_12C16O = reduced_mass_amu(C12, O16)
MU_13C16O = reduced_mass_amu(C13, O16)

#: 12C16O ground state: B0 and αe [MHz] (from memory).
B0_12C16O_MHZ = 57635.968
ALPHA_E_12C16O_MHZ = 524.8
#: 13C16O ground state B0 [MHz] (from memory).
B0_13C16O_MHZ = 55101.01

#: Invented SO2-like bent geometry, atom order (S, O, O) (invented test data).
SO2_LIKE = triatomic_bent_builder(1.43, 1.43, 119.5)
#: Invented dipole (μ_a, μ_b, μ_c) [D] along the C2 axis, which is b for this shape (invented test data).
SO2_LIKE_DIPOLE_DEBYE = (0.0, 1.63, 0.0)


# --- Dunham isotope relations ----------------------------------------------------------------------


def test_dunham_constants_scale_as_powers_of_the_reduced_mass_ratio():
    """B ∝ μ⁻¹, D ∝ μ⁻², H ∝ μ⁻³, and each σ by the same factor (textbook identity)."""
    parent = {"B": (B0_12C16O_MHZ, 0.002), "D": (0.1835, 1e-5), "H": (1.7e-7, 1e-8)}
    scaled = dunham_scaled_constants_mhz(parent, MU_12C16O, MU_13C16O)
    rho = MU_12C16O / MU_13C16O
    for name, power in (("B", 1), ("D", 2), ("H", 3)):
        assert_allclose(scaled[name][0] / parent[name][0], rho**power, rtol=1e-14)
        assert_allclose(scaled[name][1] / parent[name][1], rho**power, rtol=1e-14)
    assert set(scaled) == set(parent)


def test_dunham_scaled_b0_of_13co_matches_the_measured_value():
    """13C16O B0 from 12C16O B0 and αe within 0.5 MHz (measured values from memory)."""
    b0 = dunham_scaled_b0_mhz(B0_12C16O_MHZ, ALPHA_E_12C16O_MHZ, MU_12C16O, MU_13C16O)
    assert abs(b0 - B0_13C16O_MHZ) < 0.5


def test_plain_inverse_mass_law_on_b0_misses_by_about_alpha_e_times_rho_minus_one_over_four():
    """The 1/μ law applied to B0 is off by (αe/2)ρ(√ρ − 1), several MHz for 13CO (textbook identity)."""
    rho = MU_12C16O / MU_13C16O
    naive = dunham_scaled_constants_mhz({"B": (B0_12C16O_MHZ, 0.0)}, MU_12C16O, MU_13C16O)["B"][0]
    corrected = dunham_scaled_b0_mhz(B0_12C16O_MHZ, ALPHA_E_12C16O_MHZ, MU_12C16O, MU_13C16O)
    assert_allclose(naive - corrected, ALPHA_E_12C16O_MHZ / 2 * rho * (math.sqrt(rho) - 1), rtol=1e-9)
    assert abs(naive - B0_13C16O_MHZ) > 3.0


def test_dunham_scaling_to_the_same_mass_changes_nothing():
    """ρ = 1 is the identity (textbook identity)."""
    b0 = dunham_scaled_b0_mhz(B0_12C16O_MHZ, ALPHA_E_12C16O_MHZ, MU_12C16O, MU_12C16O)
    assert_allclose(b0, B0_12C16O_MHZ, rtol=1e-15)


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: dunham_scaled_constants_mhz({"A": (1.0, 0.0)}, 7.0, 7.2), "constants_mhz"),
        (lambda: dunham_scaled_constants_mhz({"B": (1.0, -1.0)}, 7.0, 7.2), "sigma"),
        (lambda: dunham_scaled_constants_mhz({"B": (1.0, 0.0)}, 7.0, -7.2), "mu_new_amu"),
        (lambda: dunham_scaled_b0_mhz(1000.0, 1.0, 0.0, 7.2), "mu_parent_amu"),
        (lambda: dunham_scaled_b0_mhz(-1000.0, 1.0, 7.0, 7.2), "b0_mhz"),
    ],
)
def test_dunham_bad_input_names_the_parameter(call, name):
    with pytest.raises(ValueError, match=name):
        call()


# --- Geometry scaling ---------------------------------------------------------------------------


def test_geometry_scaling_of_exact_constants_gives_the_directly_computed_ones():
    """With parent constants computed from the geometry itself, the ratio is the identity (invented test data)."""
    parent, new = (S32, O16, O16), (S32, O16, O18)
    exact_parent = rotational_constants_mhz(parent, SO2_LIKE)
    scaled = geometry_scaled_constants_mhz(exact_parent, parent, new, SO2_LIKE)
    assert_allclose(scaled, rotational_constants_mhz(new, SO2_LIKE), rtol=1e-12)


def test_geometry_scaling_carries_each_axis_vibration_correction_over():
    """Parent 'experimental' = calc × (1 + ε_g) gives new = calc′ × (1 + ε_g) (invented test data)."""
    parent, new = (S32, O16, O16), (S32, O18, O18)
    factors = np.array([0.995, 1.002, 1.004])
    experimental = np.array(rotational_constants_mhz(parent, SO2_LIKE)) * factors
    scaled = geometry_scaled_constants_mhz(tuple(experimental), parent, new, SO2_LIKE)
    assert_allclose(scaled, np.array(rotational_constants_mhz(new, SO2_LIKE)) * factors, rtol=1e-12)


def test_geometry_scaling_of_a_linear_molecule_returns_only_b():
    """OCS-like linear geometry: B′ = B · B_calc′/B_calc, A and C None (invented test data)."""
    coords = linear_triatomic_builder(1.16, 1.56)
    parent, new = (O16, C12, S32), (O16, C13, S32)
    b_exp = 6081.49
    a, b, c = geometry_scaled_constants_mhz((None, b_exp, None), parent, new, coords)
    assert a is None and c is None
    ratio = rotational_constants_mhz(new, coords)[1] / rotational_constants_mhz(parent, coords)[1]
    assert_allclose(b, b_exp * ratio, rtol=1e-12)


def test_geometry_scaling_follows_the_physical_axis_when_the_substitution_swaps_a_and_b():
    """Planar rhombus, Ia ≈ Ib: heavier atoms on y swap a and b; the a correction moves to B′ (invented)."""
    coords = np.array([[1.0, 0.0, 0.0], [-1.0, 0.0, 0.0], [0.0, 0.99, 0.0], [0.0, -0.99, 0.0]])
    parent, new = (C12, C12, C12, C12), (C12, C12, C13, C13)
    calc_parent = np.array(rotational_constants_mhz(parent, coords))
    calc_new = np.array(rotational_constants_mhz(new, coords))
    experimental = calc_parent * np.array([1.01, 1.02, 1.03])
    scaled = geometry_scaled_constants_mhz(tuple(experimental), parent, new, coords)
    # Parent a (x) is new b, parent b (y) is new a, c stays c.
    assert_allclose(scaled, calc_new * np.array([1.02, 1.01, 1.03]), rtol=1e-12)


@pytest.mark.parametrize(
    ("args", "name"),
    [
        (((3.0, 2.0, 1.0), (S32, O16), (S32, O16, O18), SO2_LIKE), "masses_new_amu"),
        (((3.0, 2.0, 1.0), (S32, O16, -O18), (S32, O16, O18), SO2_LIKE), "masses_parent_amu"),
        (((1.0, 2.0, 3.0), (S32, O16, O16), (S32, O16, O18), SO2_LIKE), "parent_abc_mhz"),
        (((None, 2.0, 1.0), (S32, O16, O16), (S32, O16, O18), SO2_LIKE), "parent_abc_mhz"),
        (((3.0, 2.0, 1.0), (S32, O16, O16), (S32, O16, O18), SO2_LIKE[:2]), "coordinates_a"),
    ],
)
def test_geometry_scaling_bad_input_names_the_parameter(args, name):
    with pytest.raises(ValueError, match=name):
        geometry_scaled_constants_mhz(*args)


# --- Dipole in the new principal axes ----------------------------------------------------------------


def test_symmetric_substitution_keeps_the_dipole_on_the_same_axis():
    """S18O2 keeps C2v symmetry: the dipole stays along b (textbook identity)."""
    mu = rotated_dipole_debye(SO2_LIKE_DIPOLE_DEBYE, (S32, O16, O16), (S32, O18, O18), SO2_LIKE)
    assert_allclose(mu, SO2_LIKE_DIPOLE_DEBYE, atol=1e-12)


def test_asymmetric_substitution_rotates_the_dipole_and_keeps_its_magnitude():
    """S16O18O: the axes rotate in the plane, a small μ_a appears, |μ| is unchanged (textbook identity)."""
    mu = rotated_dipole_debye(SO2_LIKE_DIPOLE_DEBYE, (S32, O16, O16), (S32, O16, O18), SO2_LIKE)
    assert_allclose(np.linalg.norm(mu), 1.63, rtol=1e-12)
    assert 0.01 < mu[0] < 0.2 * mu[1]
    assert mu[2] == pytest.approx(0.0, abs=1e-12)


def test_dipole_follows_the_physical_axis_when_a_and_b_swap():
    """Rhombus of the swap test: a dipole along parent a (x) ends up along new b (invented test data)."""
    coords = np.array([[1.0, 0.0, 0.0], [-1.0, 0.0, 0.0], [0.0, 0.99, 0.0], [0.0, -0.99, 0.0]])
    mu = rotated_dipole_debye((0.8, 0.0, 0.0), (C12,) * 4, (C12, C12, C13, C13), coords)
    assert_allclose(mu, (0.0, 0.8, 0.0), atol=1e-12)


def test_dipole_with_two_signed_components_uses_the_given_signs():
    """Flipping the sign of μ_a of the parent changes the new components (invented test data)."""
    parent, new = (S32, O16, O16), (S32, O16, O18)
    plus = rotated_dipole_debye((0.5, 1.5, 0.0), parent, new, SO2_LIKE)
    minus = rotated_dipole_debye((-0.5, 1.5, 0.0), parent, new, SO2_LIKE)
    assert_allclose(np.linalg.norm(plus), np.linalg.norm(minus), rtol=1e-12)
    assert abs(plus[0] - minus[0]) > 0.01


def test_dipole_bad_input_names_the_parameter():
    with pytest.raises(ValueError, match="dipole_abc_debye"):
        rotated_dipole_debye((0.0, math.nan, 0.0), (S32, O16, O16), (S32, O16, O18), SO2_LIKE)
    with pytest.raises(ValueError, match="dipole_abc_debye"):
        rotated_dipole_debye((0.0, 1.0), (S32, O16, O16), (S32, O16, O18), SO2_LIKE)


# --- Natural abundance -----------------------------------------------------------------------------------


def test_natural_abundance_of_13c16o():
    """13C16O ≈ 0.0107 × 0.9976 (from memory); exactly the product of periodictable's fractions."""
    fractions = (periodictable.C[13].abundance / 100, periodictable.O[16].abundance / 100)
    x = natural_abundance(fractions)
    assert_allclose(x, fractions[0] * fractions[1], rtol=1e-15)
    assert_allclose(x, 0.0107 * 0.9976, rtol=0.02)


@pytest.mark.parametrize("fractions", [(), (1.07,), (0.5, 0.0), (0.5, math.nan)])
def test_natural_abundance_bad_input_names_the_parameter(fractions):
    with pytest.raises(ValueError, match="fractions"):
        natural_abundance(fractions)
