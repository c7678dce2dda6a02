"""Structure functions of planner/engine/structure.py: bond lengths, moments, Kraitchman, r0 fits.

Isotopic masses [u] come from the periodictable package (its isotope table),
never typed here.  Physical constants are CODATA via scipy.constants.  Every
expected number is labelled "from memory", "textbook identity" or "synthetic"
(an invented geometry whose moments are computed exactly, so the expected
answer is the geometry itself).
"""

from __future__ import annotations

import math

import numpy as np
import periodictable
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from planner.engine.structure import (
    Isotopologue,
    bond_length_a,
    equilibrium_b_mhz,
    fit_internal_coordinates,
    inertia_tensor_amu_a2,
    kraitchman_coordinates_a,
    kraitchman_linear_coordinate_a,
    linear_triatomic_builder,
    principal_axis_coordinates_a,
    principal_moments_amu_a2,
    reduced_mass_amu,
    rotational_constants_mhz,
    triatomic_bent_builder,
)

#: h / (8π²) in MHz·u·Å², written out here from CODATA (scipy.constants), independently of the engine.
H_OVER_8PI2_MHZ_AMU_A2 = constants.h / (8 * math.pi**2) / 1e6 / constants.atomic_mass / 1e-20


def mass(symbol: str, isotope: int | None = None) -> float:
    """Isotopic (or, with no isotope, natural) atomic mass [u] from periodictable."""
    element = periodictable.elements.symbol(symbol)
    return element[isotope].mass if isotope is not None else element.mass


C12, C13 = mass("C", 12), mass("C", 13)
O16, O18 = mass("O", 16), mass("O", 18)
S32, S34 = mass("S", 32), mass("S", 34)
H1, H2 = mass("H", 1), mass("H", 2)
N14 = mass("N", 14)
CL35, CL37 = mass("Cl", 35), mass("Cl", 37)

#: CO ground-state B0 [MHz] (from memory: 57 635.968 MHz, the J = 1–0 line at 115 271.2 MHz / 2).
CO_B0_MHZ = 57635.968
#: CO vibration–rotation constant αe [MHz] (from memory: 0.01750 cm⁻¹ ≈ 524.8 MHz).
CO_ALPHA_E_MHZ = 524.8


def rotation_matrix(angles_rad) -> np.ndarray:
    """A proper rotation from three Euler-like angles (synthetic)."""
    a, b, c = angles_rad
    rz = np.array([[math.cos(a), -math.sin(a), 0], [math.sin(a), math.cos(a), 0], [0, 0, 1]])
    ry = np.array([[math.cos(b), 0, math.sin(b)], [0, 1, 0], [-math.sin(b), 0, math.cos(b)]])
    rx = np.array([[1, 0, 0], [0, math.cos(c), -math.sin(c)], [0, math.sin(c), math.cos(c)]])
    return rz @ ry @ rx


#: Invented non-planar five-atom molecule (synthetic), atoms C, H, O, N, H.
NONPLANAR_MASSES = np.array([C12, H1, O16, N14, H1])
NONPLANAR_COORDS_A = np.array(
    [[0.0, 0.0, 0.0], [1.09, 0.10, 0.20], [-0.30, 1.20, -0.10], [0.20, -0.40, 1.30], [-1.00, -0.50, -0.60]]
)

#: Invented planar four-atom molecule in a tilted plane (synthetic), atoms C, O, N, H.
PLANAR_MASSES = np.array([C12, O16, N14, H1])
PLANAR_COORDS_A = np.array(
    [[0.0, 0.0, 0.0], [1.21, 0.0, 0.0], [-0.70, 1.15, 0.0], [-0.45, -0.98, 0.0]]
) @ rotation_matrix((0.3, -0.7, 1.1)).T + np.array([0.4, -0.2, 0.9])


# --- Diatomics ----------------------------------------------------------------------------------


def test_reduced_mass_of_equal_masses_is_half():
    """μ(m, m) = m/2 (textbook identity)."""
    assert reduced_mass_amu(O16, O16) == pytest.approx(O16 / 2, rel=1e-15)


def test_reduced_mass_of_co():
    """μ = m1 m2 / (m1 + m2) (textbook identity), ≈ 6.8562 u for 12C16O (from memory)."""
    assert reduced_mass_amu(C12, O16) == pytest.approx(C12 * O16 / (C12 + O16), rel=1e-15)
    assert reduced_mass_amu(C12, O16) == pytest.approx(6.8562, abs=1e-4)


def test_co_r0_from_b0():
    """r0(12C16O) ≈ 1.1309 Å from B0 (from memory: r0 ≈ 1.131 Å)."""
    r, sigma = bond_length_a(CO_B0_MHZ, C12, O16)
    assert r == pytest.approx(1.1309, abs=1e-4)
    assert sigma == 0.0


def test_bond_length_is_the_inverse_of_b_equals_h_over_8pi2_mu_r2():
    """B = h / (8π² μ r²) (textbook identity, constants written out here from CODATA)."""
    r, _ = bond_length_a(CO_B0_MHZ, C12, O16)
    mu = C12 * O16 / (C12 + O16)
    assert H_OVER_8PI2_MHZ_AMU_A2 / (mu * r**2) == pytest.approx(CO_B0_MHZ, rel=1e-12)


def test_bond_length_sigma_is_r_sigma_b_over_2b():
    """σ_r = r σ_B / (2B) (first-order propagation, textbook identity), checked by finite difference."""
    r, sigma = bond_length_a(CO_B0_MHZ, C12, O16, sigma_b_mhz=0.5)
    assert sigma == pytest.approx(r * 0.5 / (2 * CO_B0_MHZ), rel=1e-12)
    r_low, _ = bond_length_a(CO_B0_MHZ - 0.5, C12, O16)
    r_high, _ = bond_length_a(CO_B0_MHZ + 0.5, C12, O16)
    assert sigma == pytest.approx((r_low - r_high) / 2, rel=1e-6)


def test_equilibrium_b_adds_half_alpha():
    """Be = B0 + αe/2 and σ_Be = √(σ_B0² + (σ_α/2)²), from B_v = Be − αe(v + ½) (textbook identity)."""
    be, sigma = equilibrium_b_mhz(CO_B0_MHZ, CO_ALPHA_E_MHZ, sigma_b0=0.3, sigma_alpha=0.8)
    assert be == pytest.approx(CO_B0_MHZ + CO_ALPHA_E_MHZ / 2, rel=1e-15)
    assert sigma == pytest.approx(0.5, rel=1e-12)


def test_co_re_from_be():
    """re(12C16O) ≈ 1.1283 Å from Be = B0 + αe/2 (from memory: re ≈ 1.1283 Å, Be ≈ 1.9313 cm⁻¹)."""
    be, _ = equilibrium_b_mhz(CO_B0_MHZ, CO_ALPHA_E_MHZ)
    assert be / (constants.c * 100 / 1e6) == pytest.approx(1.9313, abs=1e-4)
    r_e, _ = bond_length_a(be, C12, O16)
    assert r_e == pytest.approx(1.1283, abs=1e-4)
    assert r_e < bond_length_a(CO_B0_MHZ, C12, O16)[0]


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: reduced_mass_amu(0.0, 1.0), "m1_amu"),
        (lambda: reduced_mass_amu(1.0, math.nan), "m2_amu"),
        (lambda: bond_length_a(-1.0, C12, O16), "b_mhz"),
        (lambda: bond_length_a(CO_B0_MHZ, C12, O16, sigma_b_mhz=-0.1), "sigma_b_mhz"),
        (lambda: equilibrium_b_mhz(0.0, 1.0), "b0_mhz"),
        (lambda: equilibrium_b_mhz(100.0, -300.0), "alpha_e_mhz"),
        (lambda: equilibrium_b_mhz(100.0, 1.0, sigma_alpha=-1.0), "sigma_alpha"),
    ],
)
def test_diatomic_bad_input_names_the_parameter(call, name):
    with pytest.raises(ValueError, match=name):
        call()


# --- Moments from a geometry --------------------------------------------------------------------


def test_inertia_tensor_of_two_unit_masses_on_x():
    """Masses 1 u at x = ±1 Å: I = diag(0, 2, 2) u·Å² (textbook identity)."""
    tensor = inertia_tensor_amu_a2([1.0, 1.0], [[1.0, 0.0, 0.0], [-1.0, 0.0, 0.0]])
    assert_allclose(tensor, np.diag([0.0, 2.0, 2.0]), atol=1e-15)


def test_inertia_tensor_removes_the_centre_of_mass():
    """Translating the molecule leaves the tensor unchanged (textbook identity)."""
    shifted = NONPLANAR_COORDS_A + np.array([10.0, -3.0, 7.0])
    assert_allclose(
        inertia_tensor_amu_a2(NONPLANAR_MASSES, shifted),
        inertia_tensor_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A),
        atol=1e-12,
    )


def test_inertia_tensor_off_diagonal_element():
    """I_xy = −Σ m x y about the centre of mass (textbook identity), on the invented non-planar molecule."""
    centred = NONPLANAR_COORDS_A - NONPLANAR_MASSES @ NONPLANAR_COORDS_A / NONPLANAR_MASSES.sum()
    tensor = inertia_tensor_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    assert tensor[0, 1] == pytest.approx(-np.sum(NONPLANAR_MASSES * centred[:, 0] * centred[:, 1]), rel=1e-12)
    assert tensor[2, 2] == pytest.approx(np.sum(NONPLANAR_MASSES * (centred[:, 0] ** 2 + centred[:, 1] ** 2)))


def test_planar_molecule_has_ic_equal_to_ia_plus_ib():
    """Rigid planar molecule: Ic = Ia + Ib, inertial defect 0 (textbook identity)."""
    (i_a, i_b, i_c), _ = principal_moments_amu_a2(PLANAR_MASSES, PLANAR_COORDS_A)
    assert 0 < i_a < i_b < i_c
    assert i_c == pytest.approx(i_a + i_b, rel=1e-13)


def test_principal_moments_are_rotation_invariant_and_axes_diagonalise():
    """Principal moments do not change under rotation; axesᵀ I axes is diagonal (textbook identity)."""
    moments, axes = principal_moments_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    rotated = NONPLANAR_COORDS_A @ rotation_matrix((1.0, 0.4, -2.0)).T
    assert_allclose(principal_moments_amu_a2(NONPLANAR_MASSES, rotated)[0], moments, rtol=1e-12)
    tensor = inertia_tensor_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    assert_allclose(axes.T @ tensor @ axes, np.diag(moments), atol=1e-12)
    assert moments[0] < moments[1] < moments[2]


def test_principal_axis_coordinates_give_diagonal_second_moments():
    """In the principal-axis system Σ m a = 0 and Σ m a b = 0, Σ m (b² + c²) = Ia (textbook identity)."""
    pac = principal_axis_coordinates_a(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    moments, _ = principal_moments_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    assert_allclose(NONPLANAR_MASSES @ pac, 0.0, atol=1e-12)
    second = np.einsum("i,ij,ik->jk", NONPLANAR_MASSES, pac, pac)
    assert_allclose(second - np.diag(np.diag(second)), 0.0, atol=1e-12)
    assert np.sum(NONPLANAR_MASSES * (pac[:, 1] ** 2 + pac[:, 2] ** 2)) == pytest.approx(moments[0], rel=1e-12)


def test_rotational_constants_of_co_at_r0_give_b0_back():
    """A diatomic at r0 from B0 gives B = C = B0 and A = inf (two methods agree)."""
    r, _ = bond_length_a(CO_B0_MHZ, C12, O16)
    a, b, c = rotational_constants_mhz([C12, O16], [[0, 0, 0], [0, 0, r]])
    assert a == math.inf
    assert b == pytest.approx(CO_B0_MHZ, rel=1e-12)
    assert c == pytest.approx(CO_B0_MHZ, rel=1e-12)


def test_rotational_constants_are_h_over_8pi2_i():
    """G = h / (8π² I_g) (textbook identity), A ≥ B ≥ C."""
    moments, _ = principal_moments_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    constants_mhz = rotational_constants_mhz(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    assert_allclose(constants_mhz, H_OVER_8PI2_MHZ_AMU_A2 / moments, rtol=1e-12)
    assert constants_mhz[0] > constants_mhz[1] > constants_mhz[2]


@pytest.mark.parametrize(
    ("masses", "coords", "name"),
    [
        ([1.0, -1.0], [[0, 0, 0], [1, 0, 0]], "masses_amu"),
        ([1.0, 1.0], [[0, 0, 0]], "coordinates_a"),
        ([1.0], [[0, 0, math.inf]], "coordinates_a"),
    ],
)
def test_geometry_bad_input_names_the_parameter(masses, coords, name):
    with pytest.raises(ValueError, match=name):
        inertia_tensor_amu_a2(masses, coords)


def test_rotational_constants_refuse_a_single_point():
    with pytest.raises(ValueError, match="coordinates_a"):
        rotational_constants_mhz([1.0, 2.0], [[1, 1, 1], [1, 1, 1]])


# --- Kraitchman ---------------------------------------------------------------------------------


def _substituted_moments(masses, coords, atom, delta_mass):
    shifted = np.array(masses, dtype=float)
    shifted[atom] += delta_mass
    return principal_moments_amu_a2(shifted, coords)[0]


@pytest.mark.parametrize("atom", range(5))
@pytest.mark.parametrize("delta_mass", [1.0, 2.0, -0.5])
def test_kraitchman_recovers_every_atom_of_a_nonplanar_molecule(atom, delta_mass):
    """Exact moments of an invented non-planar molecule: Kraitchman returns |a|, |b|, |c| (synthetic)."""
    parent, _ = principal_moments_amu_a2(NONPLANAR_MASSES, NONPLANAR_COORDS_A)
    substituted = _substituted_moments(NONPLANAR_MASSES, NONPLANAR_COORDS_A, atom, delta_mass)
    result = kraitchman_coordinates_a(parent, substituted, NONPLANAR_MASSES.sum(), delta_mass)
    expected = np.abs(principal_axis_coordinates_a(NONPLANAR_MASSES, NONPLANAR_COORDS_A)[atom])
    assert_allclose(result.coordinates_a, expected, atol=1e-6)
    assert min(expected) > 0.01  # every coordinate is off-axis, so the test does check each formula
    assert result.imaginary == (False, False, False)


@pytest.mark.parametrize("atom", range(4))
def test_kraitchman_planar_form_recovers_every_atom_of_a_planar_molecule(atom):
    """Exact moments of an invented planar molecule: the planar form returns |a|, |b| and c = 0 (synthetic)."""
    parent, _ = principal_moments_amu_a2(PLANAR_MASSES, PLANAR_COORDS_A)
    substituted = _substituted_moments(PLANAR_MASSES, PLANAR_COORDS_A, atom, 1.0)
    planar = kraitchman_coordinates_a(parent, substituted, PLANAR_MASSES.sum(), 1.0, planar=True)
    expected = np.abs(principal_axis_coordinates_a(PLANAR_MASSES, PLANAR_COORDS_A)[atom])
    assert expected[2] < 1e-12
    assert_allclose(planar.coordinates_a, expected, atol=1e-6)
    assert planar.c_a == 0.0
    general = kraitchman_coordinates_a(parent, substituted, PLANAR_MASSES.sum(), 1.0)
    assert_allclose(general.coordinates_a, expected, atol=1e-6)


def test_kraitchman_planar_form_ignores_the_inertial_defect():
    """The planar form uses Ia, Ib only: a vibrational Ic (Δ ≠ 0) leaves its answer unchanged (synthetic)."""
    parent, _ = principal_moments_amu_a2(PLANAR_MASSES, PLANAR_COORDS_A)
    substituted = _substituted_moments(PLANAR_MASSES, PLANAR_COORDS_A, 1, 2.0)
    exact = kraitchman_coordinates_a(parent, substituted, PLANAR_MASSES.sum(), 2.0, planar=True)
    parent_defect = parent + np.array([0.0, 0.0, 0.05])
    substituted_defect = substituted + np.array([0.0, 0.0, 0.06])
    with_defect = kraitchman_coordinates_a(parent_defect, substituted_defect, PLANAR_MASSES.sum(), 2.0, planar=True)
    assert with_defect.coordinates_a == exact.coordinates_a


def test_kraitchman_near_axis_reports_an_imaginary_coordinate_as_zero():
    """O of an invented H2O-like molecule lies on the C2 (b) axis, so a = 0 exactly; with Ib′ lowered by
    1e-5 u·Å² (as vibration may do) a² < 0, reported as a = 0 and flagged (synthetic)."""
    masses = np.array([O16, H1, H1])
    coords = triatomic_bent_builder(0.9600, 0.9600, 104.5)
    parent, _ = principal_moments_amu_a2(masses, coords)
    delta = O18 - O16
    substituted = _substituted_moments(masses, coords, 0, delta)
    exact = kraitchman_coordinates_a(parent, substituted, masses.sum(), delta, planar=True)
    assert exact.a_a < 1e-5
    expected_b = abs(principal_axis_coordinates_a(masses, coords)[0, 1])
    assert exact.b_a == pytest.approx(expected_b, abs=1e-6)
    lowered = substituted - np.array([0.0, 1e-5, 0.0])
    result = kraitchman_coordinates_a(parent, lowered, masses.sum(), delta, planar=True)
    assert result.imaginary == (True, False, False)
    assert result.squared_a2[0] < 0
    assert result.a_a == 0.0
    assert result.b_a == pytest.approx(expected_b, abs=1e-3)


@pytest.mark.parametrize("atom", range(3))
def test_kraitchman_linear_recovers_every_atom_of_a_linear_molecule(atom):
    """Exact moments of an invented OCS-like linear molecule: |z| = √(ΔI/μ) returns each |z| (synthetic)."""
    masses = np.array([O16, C12, S32])
    coords = linear_triatomic_builder(1.16, 1.56)
    parent = principal_moments_amu_a2(masses, coords)[0][1]
    substituted = _substituted_moments(masses, coords, atom, 1.0)[1]
    z, imaginary = kraitchman_linear_coordinate_a(parent, substituted, masses.sum(), 1.0)
    centre = masses @ coords[:, 2] / masses.sum()
    assert z == pytest.approx(abs(coords[atom, 2] - centre), abs=1e-6)
    assert not imaginary


def test_kraitchman_linear_flags_a_negative_square():
    z, imaginary = kraitchman_linear_coordinate_a(100.0, 99.9, 60.0, 1.0)
    assert (z, imaginary) == (0.0, True)


@pytest.mark.parametrize(
    ("kwargs", "name"),
    [
        ({"parent_moments_amu_a2": (10.0, 10.0, 30.0)}, "parent_moments_amu_a2"),
        ({"parent_moments_amu_a2": (20.0, 10.0, 30.0)}, "parent_moments_amu_a2"),
        ({"parent_moments_amu_a2": (10.0, 20.0)}, "parent_moments_amu_a2"),
        ({"substituted_moments_amu_a2": (10.0, -20.0, 30.0)}, "substituted_moments_amu_a2"),
        ({"parent_mass_amu": 0.0}, "parent_mass_amu"),
        ({"delta_mass_amu": 0.0}, "delta_mass_amu"),
        ({"delta_mass_amu": -60.0}, "delta_mass_amu"),
    ],
)
def test_kraitchman_bad_input_names_the_parameter(kwargs, name):
    arguments = {
        "parent_moments_amu_a2": (10.0, 20.0, 31.0),
        "substituted_moments_amu_a2": (10.5, 20.5, 31.5),
        "parent_mass_amu": 50.0,
        "delta_mass_amu": 1.0,
    } | kwargs
    with pytest.raises(ValueError, match=name):
        kraitchman_coordinates_a(**arguments)


# --- r0 fits ------------------------------------------------------------------------------------

#: Invented bent H–O–Cl-like geometry (synthetic): O–H, O–Cl [Å], H–O–Cl [degrees]; atom order (O, H, Cl).
BENT_TRUE = (0.9650, 1.6900, 102.5)
BENT_NAMES = ("r_OH", "r_OCl", "angle_HOCl")


def _bent_isotopologue(name, masses):
    moments, _ = principal_moments_amu_a2(masses, triatomic_bent_builder(*BENT_TRUE))
    return Isotopologue(name, masses, tuple(moments))


def test_r0_fit_recovers_an_invented_bent_geometry_from_two_isotopologues():
    """Exact moments of H-O-35Cl and H-O-37Cl: the fit returns the invented parameters (synthetic)."""
    data = [_bent_isotopologue("HO35Cl", (O16, H1, CL35)), _bent_isotopologue("HO37Cl", (O16, H1, CL37))]
    fit = fit_internal_coordinates(triatomic_bent_builder, (1.0, 1.65, 100.0), data, names=BENT_NAMES)
    assert_allclose(fit.values, BENT_TRUE, rtol=1e-9)
    assert fit.rms_amu_a2 < 1e-9
    assert fit.names == BENT_NAMES
    assert fit.labels == ("HO35Cl:Ia", "HO35Cl:Ib", "HO35Cl:Ic", "HO37Cl:Ia", "HO37Cl:Ib", "HO37Cl:Ic")
    assert fit.degrees_of_freedom == 3


def test_r0_fit_from_rotational_constants_of_three_isotopologues():
    """Exact A, B, C of HO35Cl, HO37Cl, DO35Cl via Isotopologue.from_constants_mhz (synthetic)."""
    data = []
    for name, masses in (("HO35Cl", (O16, H1, CL35)), ("HO37Cl", (O16, H1, CL37)), ("DO35Cl", (O16, H2, CL35))):
        a, b, c = rotational_constants_mhz(masses, triatomic_bent_builder(*BENT_TRUE))
        data.append(Isotopologue.from_constants_mhz(name, masses, a, b, c))
    fit = fit_internal_coordinates(triatomic_bent_builder, (0.90, 1.70, 110.0), data, names=BENT_NAMES)
    assert_allclose(fit.values, BENT_TRUE, rtol=1e-9)
    assert fit.as_dict()["angle_HOCl"][0] == pytest.approx(102.5, rel=1e-9)


def test_r0_fit_refuses_one_isotopologue_of_a_planar_triatomic():
    """One planar isotopologue gives 2 independent moments (Ic = Ia + Ib) for 3 parameters: undetermined."""
    data = [_bent_isotopologue("HO35Cl", (O16, H1, CL35))]
    with pytest.raises(ValueError, match="undetermined"):
        fit_internal_coordinates(triatomic_bent_builder, (1.0, 1.65, 100.0), data, names=BENT_NAMES)


def test_r0_fit_refuses_fewer_moments_than_parameters():
    """One linear isotopologue: 1 moment (B) for 2 bond lengths."""
    masses = (O16, C12, S32)
    moment = principal_moments_amu_a2(masses, linear_triatomic_builder(1.16, 1.56))[0][1]
    data = [Isotopologue("OCS", masses, (None, moment, None))]
    with pytest.raises(ValueError, match="1 observed moments cannot determine 2 parameters"):
        fit_internal_coordinates(linear_triatomic_builder, (1.1, 1.6), data, names=("r_CO", "r_CS"))


def test_r0_fit_names_a_parameter_the_moments_do_not_depend_on():
    data = [_bent_isotopologue("HO35Cl", (O16, H1, CL35)), _bent_isotopologue("HO37Cl", (O16, H1, CL37))]

    def build(r1, r2, angle, unused):
        return triatomic_bent_builder(r1, r2, angle)

    with pytest.raises(ValueError, match="'unused'"):
        fit_internal_coordinates(build, (1.0, 1.65, 100.0, 3.0), data, names=(*BENT_NAMES, "unused"))


def test_r0_fit_recovers_an_invented_linear_triatomic_from_two_isotopologues():
    """Exact B of 16O12C32S and 16O12C34S (invented bond lengths): the fit returns them (synthetic)."""
    true = (1.1600, 1.5600)
    data = []
    for name, masses in (("OCS", (O16, C12, S32)), ("OC34S", (O16, C12, S34))):
        moment = principal_moments_amu_a2(masses, linear_triatomic_builder(*true))[0][1]
        data.append(Isotopologue(name, masses, (None, moment, None)))
    fit = fit_internal_coordinates(linear_triatomic_builder, (1.10, 1.60), data, names=("r_CO", "r_CS"))
    assert_allclose(fit.values, true, rtol=1e-9)
    assert fit.degrees_of_freedom == 0
    assert all(math.isnan(s) for s in fit.sigmas)


def test_r0_fit_sigma_from_the_jacobian():
    """Diatomic I = μ r²: σ_r = σ_I / (2 μ r) (first-order propagation, textbook identity)."""
    r_true, sigma_i = 1.1309, 0.002
    masses = (C12, O16)
    mu = C12 * O16 / (C12 + O16)
    data = [Isotopologue("CO", masses, (None, mu * r_true**2, mu * r_true**2))]

    def diatomic(r):
        return np.array([[0.0, 0.0, 0.0], [0.0, 0.0, r]])

    fit = fit_internal_coordinates(diatomic, (1.0,), data, names=("r_CO",), moment_uncertainty_amu_a2=sigma_i)
    assert fit.values[0] == pytest.approx(r_true, rel=1e-10)
    # Two identical observations of the same moment: σ_r = σ_I / (2 μ r) / √2.
    assert fit.sigmas[0] == pytest.approx(sigma_i / (2 * mu * r_true) / math.sqrt(2), rel=1e-6)


def test_r0_fit_with_noisy_moments_reports_residuals_and_finite_sigmas():
    """Moments perturbed by ±1e-3 u·Å²: values near the truth, residuals = observed − calculated (synthetic)."""
    data = []
    offsets = iter([1e-3, -1e-3, 0.0, -1e-3, 1e-3, 0.0, 1e-3, 1e-3, -2e-3])
    for name, masses in (("HO35Cl", (O16, H1, CL35)), ("HO37Cl", (O16, H1, CL37)), ("DO35Cl", (O16, H2, CL35))):
        moments, _ = principal_moments_amu_a2(masses, triatomic_bent_builder(*BENT_TRUE))
        data.append(Isotopologue(name, masses, tuple(m + next(offsets) for m in moments)))
    fit = fit_internal_coordinates(triatomic_bent_builder, (1.0, 1.65, 100.0), data, names=BENT_NAMES)
    assert_allclose(fit.values, BENT_TRUE, rtol=1e-3)
    assert all(0 < s < 1e-2 * v for s, v in zip(fit.sigmas, fit.values, strict=True))
    calculated = [principal_moments_amu_a2(iso.masses_amu, triatomic_bent_builder(*fit.values))[0] for iso in data]
    expected = [iso.moments_amu_a2[g] - calculated[k][g] for k, iso in enumerate(data) for g in range(3)]
    assert_allclose(fit.residuals_amu_a2, expected, atol=1e-12)


@pytest.mark.parametrize(
    ("call", "name"),
    [
        (lambda: triatomic_bent_builder(1.0, 1.0, 0.0), "angle_deg"),
        (lambda: triatomic_bent_builder(1.0, 1.0, 181.0), "angle_deg"),
        (lambda: triatomic_bent_builder(-1.0, 1.0, 100.0), "r1_a"),
        (lambda: linear_triatomic_builder(1.0, 0.0), "r2_a"),
        (lambda: Isotopologue("X", (1.0, 2.0), (None, None, None)), "moments_amu_a2"),
        (lambda: Isotopologue("X", (1.0, -2.0), (None, 1.0, None)), r"masses_amu\[1\]"),
        (lambda: Isotopologue.from_constants_mhz("X", (1.0, 2.0), None, 0.0, None), "b_mhz"),
    ],
)
def test_builder_and_isotopologue_bad_input_names_the_parameter(call, name):
    with pytest.raises(ValueError, match=name):
        call()


def test_r0_fit_refuses_masses_that_do_not_match_the_builder():
    data = [
        Isotopologue("two atoms", (O16, C12), (None, 10.0, None)),
        Isotopologue("b", (O16, C12), (None, 11.0, None)),
    ]
    with pytest.raises(ValueError, match="2 atoms"):
        fit_internal_coordinates(linear_triatomic_builder, (1.1, 1.6), data)
