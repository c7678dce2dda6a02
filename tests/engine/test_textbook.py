"""Textbook facts: the rigid and distorted linear rotor, conversion factors, line prefactors.

Physical constants: CODATA via scipy.constants.  Rounded values printed in the
project conventions: Linecast physics conventions (shared/PHYSICS.md), rounded.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants as codata

from planner.engine import PredictionRequest, Species, SpinWeights, State, predict
from planner.engine import constants as engine_constants
from planner.engine.intensity import doppler_fwhm, einstein_a, integrated_intensity
from planner.engine.levels import LinearSolver

#: Synthetic linear molecule [MHz, u, D]; no source.
B_MHZ = 20000.0
D_MHZ = 0.065
MASS_AMU = 30.0
DIPOLE_DEBYE = 0.8


def _linear(**values: float) -> Species:
    state = State("v=0", 0.0, {name: (value, 0.0) for name, value in values.items()})
    return Species("diatomic", "linear", MASS_AMU, (DIPOLE_DEBYE, 0.0, 0.0), (state,))


def kt_mhz(temperature_k: float) -> float:
    """kT/h [MHz] (CODATA via scipy.constants)."""
    return codata.k * temperature_k / codata.h / 1e6


# --- the linear rotor -----------------------------------------------------------------------------


def test_rigid_linear_levels_are_0_2b_6b_12b():
    """E(J) = B J(J+1) (textbook identity, Gordy & Cook 1984; PHYSICS.md)."""
    solver = LinearSolver(State("v=0", 0.0, {"B": (B_MHZ, 0.0)}))
    energies = [solver.solve(j).energies_mhz[0] for j in range(4)]
    assert_allclose(energies, [0.0, 2 * B_MHZ, 6 * B_MHZ, 12 * B_MHZ], rtol=1e-15, atol=0)


def test_level_degeneracy_2j_plus_1_shows_in_low_temperature_q():
    """Q = 1 + 3 e^(-2hB/kT) + 5 e^(-6hB/kT) + ... (textbook identity: PHYSICS.md Q with degeneracy 2J+1)."""
    temperature_k = 2.0
    ratio = B_MHZ / kt_mhz(temperature_k)  # hB/kT ~ 0.48
    expected = sum((2 * j + 1) * math.exp(-ratio * j * (j + 1)) for j in range(40))
    q = predict(_linear(B=B_MHZ), PredictionRequest(1.0, 2.0, temperature_k)).partition_function["diatomic"]
    # Same terms; the engine's sum stops where terms fall under 1e-12 of Q.
    assert_allclose(q, expected, rtol=1e-11)
    # Without the 2J+1 the sum would be ~1.6, not ~3.5: the test tells them apart.
    assert q > 1 + 3 * math.exp(-2 * ratio) + 5 * math.exp(-6 * ratio)


def test_rigid_linear_lines_are_spaced_by_2b_with_strength_j_plus_1():
    """nu(J -> J+1) = 2B(J+1) (textbook identity, Gordy & Cook 1984); S = J+1 (PHYSICS.md)."""
    prediction = predict(_linear(B=B_MHZ), PredictionRequest(1.0, 250000.0, 300.0))
    lines = prediction.lines
    assert lines["j_lo"].tolist() == list(range(6))  # 40, 80, ..., 240 GHz
    assert_allclose(lines["frequency_mhz"], 2 * B_MHZ * (lines["j_lo"] + 1), rtol=1e-14)
    assert_allclose(np.diff(lines["frequency_mhz"]), 2 * B_MHZ, rtol=1e-13)
    assert_allclose(lines["line_strength"], lines["j_lo"] + 1, rtol=1e-14)


def test_centrifugal_distortion_lowers_levels_and_lines():
    """E = B x - D x^2 (x = J(J+1)), so nu = 2B(J+1) - 4D(J+1)^3 < 2B(J+1) for D > 0
    (textbook identity, Gordy & Cook 1984)."""
    rigid = LinearSolver(State("v=0", 0.0, {"B": (B_MHZ, 0.0)}))
    distorted = LinearSolver(State("v=0", 0.0, {"B": (B_MHZ, 0.0), "D": (D_MHZ, 0.0)}))
    for j in range(1, 30):
        assert distorted.solve(j).energies_mhz[0] < rigid.solve(j).energies_mhz[0]
    lines = predict(_linear(B=B_MHZ, D=D_MHZ), PredictionRequest(1.0, 250000.0, 300.0)).lines
    j1 = lines["j_lo"] + 1.0
    assert np.all(lines["frequency_mhz"] < 2 * B_MHZ * j1)
    # Differences of energies ~1e5 MHz: rounding ~1e-11 MHz.
    assert_allclose(lines["frequency_mhz"], 2 * B_MHZ * j1 - 4 * D_MHZ * j1**3, rtol=0, atol=1e-8)


# --- conversion factors and prefactors ------------------------------------------------------------

DEBYE_SI = 1e-21 / codata.c  # C m; 1 D = 1e-18 statC cm (definition of the debye)


def test_unit_conversions_equal_codata():
    """1 cm^-1 = 100 c Hz, 1 K = k/h Hz (CODATA via scipy.constants); formulas written out here."""
    assert engine_constants.MHZ_PER_CM1 == pytest.approx(100 * codata.c / 1e6, rel=1e-15)
    assert engine_constants.MHZ_PER_K == pytest.approx(codata.k / codata.h * 1e-6, rel=1e-15)
    assert engine_constants.DEBYE_CM == pytest.approx(DEBYE_SI, rel=1e-15)


def test_einstein_a_prefactor_from_si_and_gaussian_forms():
    """A = 16 pi^3 nu^3 mu^2 S / (3 eps0 h c^3 (2J+1)) in SI; 64 pi^4 nu^3 mu^2 S / (3 h c^3 (2J+1)) in
    Gaussian units (Gordy & Cook 1984; Townes & Schawlow 1955; PHYSICS.md); nu = 1 MHz, mu^2 S = 1 D^2."""
    si = 16 * math.pi**3 * 1e18 * DEBYE_SI**2 / (3 * codata.epsilon_0 * codata.h * codata.c**3)
    h_cgs, c_cgs = codata.h * 1e7, codata.c * 100  # erg s, cm/s
    gaussian = 64 * math.pi**4 * 1e18 * (1e-18) ** 2 / (3 * h_cgs * c_cgs**3)
    assert engine_constants.EINSTEIN_A_PREFACTOR == pytest.approx(si, rel=1e-14)
    # The two unit systems agree to the 2019 SI's deviation of mu0 from 4 pi 1e-7 (~1e-10).
    assert engine_constants.EINSTEIN_A_PREFACTOR == pytest.approx(gaussian, rel=1e-9)


def test_intensity_prefactor_from_si_and_gaussian_forms():
    """Integrated cross-section per molecule 2 pi^2 nu S mu^2 / (3 eps0 h c) (SI) = 8 pi^3 nu S mu^2 / (3 h c)
    (Gaussian; Gordy & Cook 1984; PHYSICS.md) for nu = 1 MHz, S mu^2 = 1 D^2, converted to nm^2 MHz."""
    si_m2_hz = 2 * math.pi**2 * 1e6 * DEBYE_SI**2 / (3 * codata.epsilon_0 * codata.h * codata.c)
    gaussian_cm2_hz = 8 * math.pi**3 * 1e6 * (1e-18) ** 2 / (3 * codata.h * 1e7 * codata.c * 100)
    nm2_mhz_per_m2_hz = 1e18 / 1e6
    nm2_mhz_per_cm2_hz = 1e14 / 1e6
    assert engine_constants.INTENSITY_PREFACTOR == pytest.approx(si_m2_hz * nm2_mhz_per_m2_hz, rel=1e-14)
    assert engine_constants.INTENSITY_PREFACTOR == pytest.approx(gaussian_cm2_hz * nm2_mhz_per_cm2_hz, rel=1e-9)


def test_doppler_fwhm_equals_direct_computation():
    """FWHM = nu sqrt(8 kT ln2 / (m c^2)) (Townes & Schawlow 1955; PHYSICS.md), CODATA via scipy.constants."""
    for nu, temperature_k, mass in ((100000.0, 300.0, 28.0), (3000.0, 10.0, 120.0), (950000.0, 1000.0, 2.0)):
        direct = nu * math.sqrt(8 * codata.k * temperature_k * math.log(2) / (mass * codata.atomic_mass * codata.c**2))
        assert doppler_fwhm(nu, temperature_k, mass) == pytest.approx(direct, rel=1e-14)


def test_conversions_agree_with_the_rounded_values_in_physics_md():
    """Printed values: Linecast physics conventions (shared/PHYSICS.md), rounded; compared at the printed digits
    (half a unit of the last one) where they agree with CODATA."""
    assert engine_constants.MHZ_PER_CM1 == pytest.approx(29979.2458, abs=0.00005)
    assert engine_constants.MHZ_PER_K == pytest.approx(20836.619, abs=0.0005)
    assert engine_constants.DOPPLER_FACTOR == pytest.approx(7.162e-7, abs=0.0005e-7)


def test_prefactors_agree_with_physics_md_to_five_digits():
    """Linecast physics conventions (shared/PHYSICS.md), rounded: 1.16395e-20 and 4.16231e-5.

    Their sixth digits do not follow from CODATA via scipy.constants: the SI and Gaussian forms
    above both give 1.163965e-20 and 4.162379e-5 (relative differences 1.3e-5 and 1.7e-5), so the
    comparison is at five significant digits (2e-5 relative) and PHYSICS.md should be updated.
    """
    assert engine_constants.EINSTEIN_A_PREFACTOR == pytest.approx(1.16395e-20, rel=2e-5)
    assert engine_constants.INTENSITY_PREFACTOR == pytest.approx(4.16231e-5, rel=2e-5)


def test_predicted_einstein_a_and_intensity_equal_si_formulas():
    """Every line of a rigid linear molecule at 300 K against the SI forms written here (Gordy & Cook 1984;
    PHYSICS.md) with Q = sum (2J+1) e^(-E/kT) summed here, energies E = hB J(J+1)."""
    temperature_k = 300.0
    prediction = predict(_linear(B=B_MHZ), PredictionRequest(1.0, 250000.0, temperature_k))
    assert len(prediction.lines) == 6  # J = 0..5 -> J + 1 below 250 GHz
    kt = kt_mhz(temperature_k)
    q = sum((2 * j + 1) * math.exp(-B_MHZ * j * (j + 1) / kt) for j in range(400))
    assert prediction.partition_function["diatomic"] == pytest.approx(q, rel=1e-11)
    mu = DIPOLE_DEBYE * DEBYE_SI
    for row in prediction.records():
        nu_hz = row["frequency_mhz"] * 1e6
        s = row["j_lo"] + 1  # S(J -> J+1) = J + 1 (PHYSICS.md)
        denominator = 3 * codata.epsilon_0 * codata.h * codata.c**3 * (2 * row["j_up"] + 1)
        a = 16 * math.pi**3 * nu_hz**3 * mu**2 * s / denominator
        e_lo = B_MHZ * row["j_lo"] * (row["j_lo"] + 1)
        e_up = B_MHZ * row["j_up"] * (row["j_up"] + 1)
        population = (math.exp(-e_lo / kt) - math.exp(-e_up / kt)) / q
        sigma_m2_hz = 2 * math.pi**2 * nu_hz * s * mu**2 / (3 * codata.epsilon_0 * codata.h * codata.c) * population
        # Same constants, different arithmetic: rounding, plus Q truncated by the engine at 1e-12 of Q.
        assert row["einstein_a_s"] == pytest.approx(a, rel=1e-12)
        assert row["intensity_nm2mhz"] == pytest.approx(sigma_m2_hz * 1e18 / 1e6, rel=1e-10)


def test_spin_weights_enter_the_intensity_but_not_einstein_a():
    """A is a property of the two levels; g_I weights the population (PHYSICS.md "Intensities")."""
    constants = {"A": (9000.0, 0.0), "B": (4000.0, 0.0), "C": (2750.0, 0.0)}  # synthetic, no source
    request = PredictionRequest(1000.0, 60000.0, 10.0)
    tables = {}
    for weights in (None, SpinWeights("b", 1.0, 3.0)):
        species = Species(
            "top", "asymmetric", 40.0, (0.0, 1.0, 0.0), (State("v=0", 0.0, constants),), spin_weights=weights
        )
        prediction = predict(species, request)
        tables[weights is None] = (prediction.records(), prediction.partition_function["top"])
    (plain, q_plain), (weighted, q_weighted) = tables[True], tables[False]

    def key(row):
        return row["j_up"], row["ka_up"], row["kc_up"], row["j_lo"], row["ka_lo"], row["kc_lo"]

    # The relative intensity floor scales with the largest weight, so the two lists differ near the
    # floor; every line kept in both is compared.
    plain = {key(row): row for row in plain}
    weighted = {key(row): row for row in weighted}
    common = plain.keys() & weighted.keys()
    assert len(common) > 400
    for k in common:
        p, w = plain[k], weighted[k]
        g = 1.0 if (w["ka_lo"] + w["kc_lo"]) % 2 == 0 else 3.0  # b-axis character (-1)^(Ka+Kc)
        assert w["spin_weight"] == g
        assert w["einstein_a_s"] == pytest.approx(p["einstein_a_s"], rel=1e-14)
        assert w["intensity_nm2mhz"] == pytest.approx(p["intensity_nm2mhz"] * g * q_plain / q_weighted, rel=1e-12)


def test_intensity_functions_work_elementwise_on_arrays():
    """A = prefactor nu^3 S mu^2 / (2J_u + 1) (PHYSICS.md); the intensity is linear in the weighted S mu^2."""
    nu = np.array([1000.0, 50000.0])
    a = einstein_a(nu, np.array([2.0, 2.0]), np.array([1, 3]))
    assert_allclose(a, engine_constants.EINSTEIN_A_PREFACTOR * nu**3 * 2.0 / np.array([3.0, 7.0]), rtol=1e-15)
    once = integrated_intensity(nu, 1.0, np.array([0.0, 10.0]), 20.0, 5.0)
    thrice = integrated_intensity(nu, 3.0, np.array([0.0, 10.0]), 20.0, 5.0)
    assert_allclose(thrice, 3 * once, rtol=1e-15)
