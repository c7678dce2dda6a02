"""Species-page values of planner/engine/derived.py against textbook identities and remembered values.

Physical constants (h, c, k, m_u) are CODATA via scipy.constants.  Every
expected number is labelled: "textbook identity", "from memory", "CODATA" or
"synthetic" (invented constants whose expected levels follow from a
textbook formula written out here, independently of the engine).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from planner.engine import PredictionRequest, Species, SpinWeights, State, predict
from planner.engine.constants import INERTIA_MHZ_AMU_A2
from planner.engine.derived import (
    ENERGY_LEVELS_J_MAX,
    energy_levels,
    inertial_defect_amu_a2,
    moment_of_inertia_amu_a2,
    moments_of_inertia_amu_a2,
    partition_function,
    ray_kappa,
)
from planner.engine.request import MAX_TEMPERATURE_K

#: 1 cm^-1 in MHz, written out here from CODATA c (scipy.constants).
MHZ_PER_CM1 = constants.c * 100.0 / 1e6

#: SO2 ground-state rotational constants [MHz] (from memory).
SO2_A_MHZ, SO2_B_MHZ, SO2_C_MHZ = 60778.55, 10318.07, 8799.70

#: Rigid asymmetric top [MHz]; synthetic (kappa = -0.5).
A_MHZ, B_MHZ, C_MHZ = 3000.0, 1500.0, 1000.0


def kt_mhz(temperature_k: float) -> float:
    """kT/h [MHz] (CODATA via scipy.constants)."""
    return constants.k * temperature_k / constants.h / 1e6


def _state(label="v=0", energy_cm1=0.0, **values: float) -> State:
    return State(label, energy_cm1, {name: (value, 0.0) for name, value in values.items()})


def _linear(states, dipole=0.1) -> Species:
    return Species("linear", "linear", 28.0, (dipole, 0.0, 0.0), tuple(states))


def _asymmetric(states=None, dipole=(0.0, 1.0, 0.0), spin_weights=None, representation="Ir") -> Species:
    return Species(
        "asymmetric",
        "asymmetric",
        40.0,
        dipole,
        tuple(states or (_state(A=A_MHZ, B=B_MHZ, C=C_MHZ),)),
        representation=representation,
        spin_weights=spin_weights,
    )


def _predicted_q(species: Species, request: PredictionRequest) -> float:
    return predict(species, request).partition_function[species.name]


# --- Ray's kappa --------------------------------------------------------------------------------


def test_kappa_is_minus_one_for_a_prolate_top():
    """B = C gives kappa = -1 (textbook identity)."""
    assert ray_kappa(5000.0, 1200.0, 1200.0) == -1.0


def test_kappa_is_plus_one_for_an_oblate_top():
    """A = B gives kappa = +1 (textbook identity)."""
    assert ray_kappa(5000.0, 5000.0, 1200.0) == 1.0


def test_kappa_is_zero_for_b_halfway_between_a_and_c():
    """B = (A + C)/2 gives kappa = 0 (textbook identity: the most asymmetric top)."""
    assert ray_kappa(9000.0, 6000.0, 3000.0) == 0.0


def test_kappa_of_so2():
    """SO2 is a near-prolate top with kappa about -0.942 (from memory), from the constants above."""
    assert_allclose(ray_kappa(SO2_A_MHZ, SO2_B_MHZ, SO2_C_MHZ), -0.942, atol=1e-3)


def test_kappa_refuses_a_equal_to_c():
    with pytest.raises(ValueError, match="A > C"):
        ray_kappa(3000.0, 3000.0, 3000.0)


@pytest.mark.parametrize(
    ("a", "b", "c", "message"),
    [
        (1000.0, 3000.0, 500.0, "A >= B >= C"),
        (3000.0, 500.0, 1000.0, "A >= B >= C"),
        (0.0, 0.0, 0.0, "a_mhz"),
        (3000.0, -1.0, -2.0, "b_mhz"),
        (3000.0, 1000.0, float("nan"), "c_mhz"),
        (3000.0, 1000.0, None, "c_mhz"),
        (True, 1000.0, 500.0, "a_mhz"),
        ("3000", 1000.0, 500.0, "a_mhz"),
    ],
)
def test_bad_constants_are_refused_with_the_problem_named(a, b, c, message):
    for function in (ray_kappa, moments_of_inertia_amu_a2, inertial_defect_amu_a2):
        with pytest.raises(ValueError, match=message):
            function(a, b, c)


# --- Moments of inertia -------------------------------------------------------------------------


def test_inertia_factor_matches_the_remembered_value():
    """B [MHz] * I [u A^2] = 505379.0 (from memory; 7 digits, so 2e-7 relative)."""
    assert_allclose(INERTIA_MHZ_AMU_A2, 505379.0, rtol=2e-7)


def test_inertia_factor_matches_codata():
    """h / (8 pi^2 m_u (1 A)^2 (1 MHz)) from CODATA via scipy.constants, written out independently."""
    m_u_kg = constants.physical_constants["atomic mass constant"][0]
    per_hz = constants.h / (8.0 * math.pi**2) / (m_u_kg * 1e-20)  # B [Hz] * I [u A^2]
    assert_allclose(INERTIA_MHZ_AMU_A2, per_hz / 1e6, rtol=1e-14)


def test_co_bond_length_from_its_moment_of_inertia():
    """CO: B0 = 57635.968 MHz gives r0 = sqrt(I/mu) = 1.131 A (both from memory).

    Atomic masses 12 u (exact by definition) and 15.99491462 u for 16O (from memory).
    """
    mass_c, mass_o = 12.0, 15.99491462
    reduced = mass_c * mass_o / (mass_c + mass_o)
    r0 = math.sqrt(moment_of_inertia_amu_a2(57635.968) / reduced)
    assert_allclose(r0, 1.131, atol=5e-4)


def test_moments_are_the_inverse_constants_in_order():
    """I_g = 505379.0 / G for G = A, B, C (textbook identity; factor from memory, 2e-7)."""
    moments = moments_of_inertia_amu_a2(A_MHZ, B_MHZ, C_MHZ)
    assert_allclose(moments, (505379.0 / A_MHZ, 505379.0 / B_MHZ, 505379.0 / C_MHZ), rtol=2e-7)
    assert moments[0] < moments[1] < moments[2]


@pytest.mark.parametrize("value", [0.0, -57635.968, None, float("inf"), float("nan"), False])
def test_single_moment_refuses_a_missing_or_bad_constant(value):
    with pytest.raises(ValueError, match="constant_mhz must be a finite number > 0 MHz"):
        moment_of_inertia_amu_a2(value)


# --- Inertial defect ----------------------------------------------------------------------------


def _principal_moments(masses_amu, positions_a) -> tuple[np.ndarray, np.ndarray]:
    """Principal moments [u A^2] ascending and the positions in the principal-axis frame [A]."""
    masses = np.asarray(masses_amu, dtype=float)
    positions = np.asarray(positions_a, dtype=float)
    positions = positions - masses @ positions / masses.sum()
    second = np.einsum("i,ij,ik->jk", masses, positions, positions)  # sum m r r
    inertia = np.trace(second) * np.eye(3) - second  # I = sum m (r^2 1 - r r)
    moments, axes = np.linalg.eigh(inertia)
    return moments, positions @ axes


def _rotate(positions, angles) -> np.ndarray:
    """Positions turned by Euler-like angles, so that no body axis lies along x, y or z."""
    ax, ay, az = angles
    rx = np.array([[1, 0, 0], [0, math.cos(ax), -math.sin(ax)], [0, math.sin(ax), math.cos(ax)]])
    ry = np.array([[math.cos(ay), 0, math.sin(ay)], [0, 1, 0], [-math.sin(ay), 0, math.cos(ay)]])
    rz = np.array([[math.cos(az), -math.sin(az), 0], [math.sin(az), math.cos(az), 0], [0, 0, 1]])
    return np.asarray(positions) @ (rz @ ry @ rx).T


#: Invented four-atom bodies [u], [A]; synthetic.
MASSES_AMU = (12.0, 16.0, 1.008, 14.003)
PLANAR_A = ((0.0, 0.0, 0.0), (1.21, 0.0, 0.0), (-0.55, 0.93, 0.0), (-0.61, -1.02, 0.0))
NON_PLANAR_A = ((0.0, 0.0, 0.0), (1.21, 0.0, 0.3), (-0.55, 0.93, -0.6), (-0.61, -1.02, 0.9))


def test_rigid_planar_body_has_no_inertial_defect():
    """Ic = Ia + Ib for a rigid planar body (textbook identity), so Delta = 0."""
    moments, _ = _principal_moments(MASSES_AMU, _rotate(PLANAR_A, (0.3, -0.7, 1.1)))
    a, b, c = INERTIA_MHZ_AMU_A2 / moments
    # The moments come back from the constants to rounding (a few 1e-16 relative).
    assert_allclose(moments_of_inertia_amu_a2(a, b, c), moments, rtol=1e-13)
    # Delta is a difference of moments ~ 30 u A^2: rounding leaves ~1e-14 u A^2.
    assert abs(inertial_defect_amu_a2(a, b, c)) < 1e-11


def test_non_planar_body_has_minus_twice_its_out_of_plane_second_moment():
    """Delta = Ic - Ia - Ib = -2 sum m c^2, c the coordinate along the c axis (textbook identity)."""
    moments, principal = _principal_moments(MASSES_AMU, _rotate(NON_PLANAR_A, (0.3, -0.7, 1.1)))
    a, b, c = INERTIA_MHZ_AMU_A2 / moments
    expected = -2.0 * np.sum(np.asarray(MASSES_AMU) * principal[:, 2] ** 2)
    assert expected < -0.1  # the body really is non-planar
    assert_allclose(inertial_defect_amu_a2(a, b, c), expected, rtol=1e-10)


def test_so2_ground_state_inertial_defect_is_small_and_positive():
    """SO2 ground state: Delta about +0.13 u A^2 (from memory), from the constants above."""
    delta = inertial_defect_amu_a2(SO2_A_MHZ, SO2_B_MHZ, SO2_C_MHZ)
    assert 0.12 < delta < 0.15


# --- Partition function -------------------------------------------------------------------------

#: Q is the same in any window: the window only scales a factor that cancels in the stopping rule
#: (derived.partition_function, Notes).  It can at most end the climb one J earlier or later, and a J
#: past the stop adds less than ladder.Q_TOLERANCE = 1e-12 of Q.
Q_RTOL = 1e-12


def _requests(temperature_k: float) -> list[PredictionRequest]:
    return [
        PredictionRequest(1.0, 2.0, temperature_k),
        PredictionRequest(50000.0, 400000.0, temperature_k),
    ]


@pytest.mark.parametrize("temperature_k", [30.0, 300.0])
def test_linear_q_equals_predicts(temperature_k):
    """Linear molecule with distortion and an excited state; expected values: predict() (two windows).

    Not below ~15 K: there e^(-E_v/kT) of the v=1 state underflows to 0 and the climb (predict's as
    well) finds no Boltzmann peak to stop past, so it runs on until the distortion series breaks.
    """
    species = _linear([_state(B=57635.968, D=0.1835), _state("v=1", 2143.0, B=57110.0, D=0.1835)])
    for request in _requests(temperature_k):
        assert_allclose(partition_function(species, temperature_k), _predicted_q(species, request), rtol=Q_RTOL)


@pytest.mark.parametrize("temperature_k", [5.0, 150.0])
def test_asymmetric_q_equals_predicts(temperature_k):
    """Asymmetric top with spin weights and two states; expected values: predict() (two windows)."""
    species = _asymmetric(
        states=(
            _state(A=SO2_A_MHZ, B=SO2_B_MHZ, C=SO2_C_MHZ, DeltaJ=0.0066),
            _state("v2=1", 517.9, A=61900.0, B=10320.0, C=8780.0, DeltaJ=0.0066),
        ),
        spin_weights=SpinWeights("b", 1.0, 0.0),
    )
    for request in _requests(temperature_k):
        assert_allclose(partition_function(species, temperature_k), _predicted_q(species, request), rtol=Q_RTOL)


def test_linear_q_approaches_kt_over_hb_plus_one_third():
    """Q = kT/hB + 1/3 + O(hB/kT) at high T (textbook identity)."""
    b_mhz = 10000.0
    temperature_k = 1000 * b_mhz / kt_mhz(1.0)  # kT/hB = 1000
    # The neglected hB/(15 kT) = 6.7e-5 against Q ~ 1000: 7e-8 relative.
    assert_allclose(partition_function(_linear([_state(B=b_mhz)]), temperature_k), 1000 + 1 / 3, rtol=1e-6)


def test_j_cap_keeps_only_the_levels_up_to_it():
    """With J <= 1 the linear Q is 1 + 3 e^(-2hB/kT) (textbook identity: the sum of two terms)."""
    b_mhz, temperature_k = 57635.968, 300.0
    q = partition_function(_linear([_state(B=b_mhz)]), temperature_k, j_cap=1)
    assert_allclose(q, 1.0 + 3.0 * math.exp(-2.0 * b_mhz / kt_mhz(temperature_k)), rtol=1e-14)


@pytest.mark.parametrize(
    "species",
    [
        _linear([_state(B=57635.968)], dipole=0.0),
        _asymmetric(dipole=(0.0, 0.0, 0.0), spin_weights=SpinWeights("a", 3.0, 1.0)),
        Species("oblate", "symmetric-oblate", 78.0, (0.0, 0.0, 0.0), (_state(C=2850.0, B=5690.0),)),
    ],
    ids=["linear", "asymmetric", "oblate"],
)
def test_species_without_dipole_has_the_q_of_the_same_levels_with_one(species):
    """A dipole does not change the levels; expected value: predict() for the species given a dipole."""
    axis = 2 if species.rotor == "symmetric-oblate" else 0
    dipole = tuple(0.5 if i == axis else 0.0 for i in range(3))
    with_dipole = Species(
        species.name, species.rotor, species.mass_amu, dipole, species.states, spin_weights=species.spin_weights
    )
    request = PredictionRequest(1.0, 2.0, 20.0)
    assert predict(species, request).partition_function == {}  # predict gives no Q for it
    assert_allclose(partition_function(species, 20.0), _predicted_q(with_dipole, request), rtol=Q_RTOL)


def test_q_at_the_engines_highest_temperature():
    """T = MAX_TEMPERATURE_K is inside the range; linear Q ~ kT/hB + 1/3 (textbook identity) to 1e-6."""
    b_mhz = 57635.968
    q = partition_function(_linear([_state(B=b_mhz)]), MAX_TEMPERATURE_K)
    assert_allclose(q, kt_mhz(MAX_TEMPERATURE_K) / b_mhz + 1 / 3, rtol=1e-6)


@pytest.mark.parametrize("temperature_k", [0.0, -5.0, MAX_TEMPERATURE_K * 1.0001, float("nan"), float("inf"), "300"])
def test_temperature_outside_the_engines_range_is_refused(temperature_k):
    with pytest.raises(ValueError, match="temperature_k"):
        partition_function(_linear([_state(B=57635.968)]), temperature_k)


@pytest.mark.parametrize("j_cap", [0, -3, 2.5, True])
def test_bad_j_cap_is_refused(j_cap):
    with pytest.raises(ValueError, match="j_cap"):
        partition_function(_linear([_state(B=57635.968)]), 300.0, j_cap=j_cap)


# --- Energy levels ------------------------------------------------------------------------------


def test_linear_rigid_rotor_levels_are_b_times_j_j_plus_1():
    """E(J) = B J(J+1): 0, 2B, 6B, 12B (textbook identity), converted with CODATA c."""
    b_mhz = 57635.968
    levels = energy_levels(_linear([_state(B=b_mhz)]), j_max=3)
    assert levels["j"].tolist() == [0, 1, 2, 3]
    assert levels["ka"].tolist() == [-1, -1, -1, -1]
    assert levels["kc"].tolist() == [-1, -1, -1, -1]
    assert levels["spin_weight"].tolist() == [1.0, 1.0, 1.0, 1.0]
    assert_allclose(levels["energy_cm1"], np.array([0.0, 2.0, 6.0, 12.0]) * b_mhz / MHZ_PER_CM1, rtol=1e-14)


def test_linear_levels_include_distortion():
    """E(J) = B x - D x^2 + H x^3, x = J(J+1) (textbook identity, PHYSICS.md); synthetic constants."""
    b, d, h = 11000.0, 0.05, 1e-7
    levels = energy_levels(_linear([_state(B=b, D=d, H=h)]), j_max=20)
    x = np.arange(21) * np.arange(1, 22)
    assert_allclose(levels["energy_cm1"], (b * x - d * x**2 + h * x**3) / MHZ_PER_CM1, rtol=1e-13)


@pytest.mark.parametrize("representation", ["Ir", "IIIr"])
def test_asymmetric_j1_levels_match_their_closed_forms(representation):
    """1_01 = B + C, 1_11 = A + C, 1_10 = A + B (PHYSICS.md closed form), in both representations."""
    levels = energy_levels(_asymmetric(representation=representation), j_max=1)
    labelled = {
        (int(j), int(ka), int(kc)): e
        for j, ka, kc, e in zip(levels["j"], levels["ka"], levels["kc"], levels["energy_cm1"])
    }
    expected = {
        (0, 0, 0): 0.0,
        (1, 0, 1): (B_MHZ + C_MHZ) / MHZ_PER_CM1,
        (1, 1, 1): (A_MHZ + C_MHZ) / MHZ_PER_CM1,
        (1, 1, 0): (A_MHZ + B_MHZ) / MHZ_PER_CM1,
    }
    assert labelled.keys() == expected.keys()
    for label, energy in expected.items():
        # 2x2 blocks at most, entries ~1e3 MHz: eigenvalues to ~1e-13 MHz.
        assert_allclose(labelled[label], energy, rtol=1e-12, atol=1e-15, err_msg=str(label))
    # Sorted by J, then energy: B + C < A + C < A + B.
    assert list(labelled) == [(0, 0, 0), (1, 0, 1), (1, 1, 1), (1, 1, 0)]


def test_asymmetric_levels_are_sorted_and_complete():
    """2J + 1 levels per J (textbook identity), ascending J and, within a J, ascending energy."""
    levels = energy_levels(_asymmetric(states=(_state(A=SO2_A_MHZ, B=SO2_B_MHZ, C=SO2_C_MHZ),)), j_max=12)
    assert len(levels["j"]) == 13**2
    assert np.bincount(levels["j"]).tolist() == [2 * j + 1 for j in range(13)]
    for j in range(13):
        energies = levels["energy_cm1"][levels["j"] == j]
        assert np.all(np.diff(energies) >= 0)
    assert set(levels) == {"j", "ka", "kc", "energy_cm1", "spin_weight"}
    assert np.all(levels["ka"] + levels["kc"] - levels["j"] >= 0)  # Ka + Kc = J or J + 1
    assert np.all(levels["ka"] + levels["kc"] - levels["j"] <= 1)


def test_asymmetric_spin_weights_follow_the_c2_symmetry():
    """b-axis weights: even (-1)^(Ka+Kc) = +1 gets the even weight (PHYSICS.md); synthetic weights 3 and 0."""
    levels = energy_levels(_asymmetric(spin_weights=SpinWeights("b", 3.0, 0.0)), j_max=4)
    expected = np.where((levels["ka"] + levels["kc"]) % 2 == 0, 3.0, 0.0)
    assert levels["spin_weight"].tolist() == expected.tolist()
    assert levels["spin_weight"][:4].tolist() == [3.0, 0.0, 3.0, 0.0]  # 0_00, 1_01, 1_11, 1_10


@pytest.mark.parametrize("rotor", ["symmetric-prolate", "symmetric-oblate"])
def test_symmetric_top_levels_carry_k_in_ka(rotor):
    """E(J,K) = B J(J+1) + (A - B) K^2, C for A when oblate (textbook identity); K in ka, kc = -1."""
    unique = 8000.0 if rotor == "symmetric-prolate" else 2500.0  # A of a prolate top, C of an oblate one
    b_mhz = 5000.0
    constants_mhz = {"A" if rotor == "symmetric-prolate" else "C": unique, "B": b_mhz}
    dipole = (1.0, 0.0, 0.0) if rotor == "symmetric-prolate" else (0.0, 0.0, 1.0)
    species = Species("top", rotor, 40.0, dipole, (_state(**constants_mhz),), spin_weights=SpinWeights("C3", 2.0, 1.0))
    levels = energy_levels(species, j_max=5)
    assert len(levels["j"]) == sum(j + 1 for j in range(6))  # K = 0..J
    assert np.all(levels["kc"] == -1)
    j, k = levels["j"], levels["ka"]
    energy_mhz = b_mhz * j * (j + 1) + (unique - b_mhz) * k**2
    assert_allclose(levels["energy_cm1"], (energy_mhz - energy_mhz.min()) / MHZ_PER_CM1, rtol=1e-13, atol=1e-15)
    assert levels["spin_weight"].tolist() == np.where(k % 3 == 0, 2.0, 1.0).tolist()  # C3: K = 0, 3, ... even


def test_levels_of_an_excited_state_start_at_zero_and_use_its_constants():
    """The state's own constants and no vibrational origin: 1_01 = B + C (PHYSICS.md closed form); synthetic."""
    species = _asymmetric(states=(_state(A=A_MHZ, B=B_MHZ, C=C_MHZ), _state("v=1", 800.0, A=3100.0, B=1450.0, C=990.0)))
    levels = energy_levels(species, state_index=1, j_max=1)
    assert levels["energy_cm1"][0] == 0.0
    assert_allclose(levels["energy_cm1"][1], (1450.0 + 990.0) / MHZ_PER_CM1, rtol=1e-12)


def test_j_max_of_the_bound_is_accepted():
    levels = energy_levels(_linear([_state(B=57635.968)]), j_max=ENERGY_LEVELS_J_MAX)
    assert levels["j"][-1] == ENERGY_LEVELS_J_MAX == 60


@pytest.mark.parametrize(
    ("arguments", "message"),
    [
        ({"j_max": ENERGY_LEVELS_J_MAX + 1}, "j_max must be in 0..60"),
        ({"j_max": -1}, "j_max must be in 0..60"),
        ({"j_max": 2.5}, "j_max must be an integer"),
        ({"j_max": True}, "j_max must be an integer"),
        ({"state_index": 1}, r"state_index must be in 0..0"),
        ({"state_index": -1}, r"state_index must be in 0..0"),
        ({"state_index": "0"}, "state_index must be an integer"),
    ],
)
def test_bad_energy_level_arguments_are_refused(arguments, message):
    with pytest.raises(ValueError, match=message):
        energy_levels(_asymmetric(), **arguments)
