"""Frequency σ from a covariance of the constants: σν² = gᵀ C g."""

import numpy as np
import pytest

from planner.engine import PredictionRequest, Species, SpeciesError, State, predict

# CO ground state, from memory (B ≈ 57 635.97 MHz, D ≈ 0.1835 MHz); σ and ρ invented test data.
B, D = 57635.968, 0.18350
SIGMA_B, SIGMA_D, RHO = 0.002, 0.00004, 0.9


def co(covariance=True):
    cov = RHO * SIGMA_B * SIGMA_D
    extra = {"covariance_names": ("B", "D"), "covariance_mhz2": ((SIGMA_B**2, cov), (cov, SIGMA_D**2))}
    state = State("v=0", 0.0, {"B": (B, SIGMA_B), "D": (D, SIGMA_D)}, **(extra if covariance else {}))
    return Species(name="CO", rotor="linear", mass_amu=28.0, dipole_debye=(0.11, 0, 0), states=(state,))


def test_correlated_sigma_follows_g_c_g():
    lines = predict(co(), PredictionRequest(0.0, 500_000.0, 50.0)).lines
    j1 = lines["j_lo"] + 1.0
    # ν = 2B(J+1) − 4D(J+1)³ (textbook linear rotor), so g = (2(J+1), −4(J+1)³).
    g_b, g_d = 2 * j1, -4 * j1**3
    expected = np.sqrt((g_b * SIGMA_B) ** 2 + (g_d * SIGMA_D) ** 2 + 2 * g_b * g_d * RHO * SIGMA_B * SIGMA_D)
    np.testing.assert_allclose(lines["sigma_mhz"], expected, rtol=1e-9)


def test_a_positive_correlation_of_b_and_d_narrows_the_sigma():
    request = PredictionRequest(0.0, 500_000.0, 50.0)
    correlated = predict(co(), request).lines["sigma_mhz"]
    independent = predict(co(covariance=False), request).lines["sigma_mhz"]
    assert np.all(correlated < independent)  # g_B and g_D have opposite signs


@pytest.mark.parametrize(
    "names, matrix, message",
    [
        (("B", "H"), ((SIGMA_B**2, 0.0), (0.0, 1e-12)), "does not list: H"),
        (("B", "D"), ((SIGMA_B**2, 1e-8), (2e-8, SIGMA_D**2)), "must be symmetric"),
        (("B", "D"), ((SIGMA_B**2, 0.0), (0.0, 4 * SIGMA_D**2)), "diagonal of D must be its σ²"),
        (("B", "D"), ((SIGMA_B**2, 0.0),), "must be 2 × 2"),
    ],
)
def test_a_bad_covariance_is_refused_naming_the_problem(names, matrix, message):
    state = State("v=0", 0.0, {"B": (B, SIGMA_B), "D": (D, SIGMA_D)}, names, matrix)
    with pytest.raises(SpeciesError, match=message):
        Species(name="CO", rotor="linear", mass_amu=28.0, dipole_debye=(0.11, 0, 0), states=(state,))
