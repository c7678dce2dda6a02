"""Q(T) from predict() against the classical high-temperature limits and exact identities.

Boltzmann and Planck constants: CODATA via scipy.constants.  Q(T) is read from
Prediction.partition_function; the frequency window is kept tiny so that
only the level sums (not the line lists) cost time.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from planner.engine import PredictionRequest, Species, SpinWeights, State, predict
from planner.engine.levels import AsymmetricSolver


def kt_mhz(temperature_k: float) -> float:
    """kT/h [MHz] (CODATA via scipy.constants)."""
    return constants.k * temperature_k / constants.h / 1e6


def partition_function(species: Species, temperature_k: float) -> float:
    prediction = predict(species, PredictionRequest(1.0, 2.0, temperature_k))
    return prediction.partition_function[species.name]


def _state(label="v=0", energy_cm1=0.0, **values: float) -> State:
    return State(label, energy_cm1, {name: (value, 0.0) for name, value in values.items()})


def _linear(b_mhz: float, states=None) -> Species:
    return Species("linear", "linear", 28.0, (0.1, 0.0, 0.0), states or (_state(B=b_mhz),))


#: Rigid asymmetric top [MHz]; synthetic, no source (kappa = -0.5).
A_MHZ, B_MHZ, C_MHZ = 3000.0, 1500.0, 1000.0


def _asymmetric(spin_weights=None, states=None) -> Species:
    return Species(
        "asymmetric",
        "asymmetric",
        40.0,
        (0.0, 1.0, 0.0),
        states or (_state(A=A_MHZ, B=B_MHZ, C=C_MHZ),),
        spin_weights=spin_weights,
    )


def stripp_kirkwood_correction(a: float, b: float, c: float, temperature_k: float) -> float:
    """First high-temperature correction factor of the rigid-rotor Q, 1 + (h/12kT)(2(A+B+C) - AB/C - BC/A - CA/B).

    From memory (the leading quantum correction to the classical rotational Q).  For a prolate symmetric
    top (B = C) it reduces to 1 + (hB/3kT)(1 - B/4A), for a linear molecule the +1/3 of kT/hB + 1/3.
    """
    return 1.0 + (2 * (a + b + c) - a * b / c - b * c / a - c * a / b) / (12 * kt_mhz(temperature_k))


def test_linear_q_approaches_kt_over_hb_plus_one_third():
    """Q = kT/hB + 1/3 + hB/(15 kT) + ... (from memory: high-temperature expansion of the linear-rotor Q)."""
    b_mhz = 10000.0
    temperature_k = 1000 * b_mhz / kt_mhz(1.0)  # kT/hB = 1000
    x = kt_mhz(temperature_k) / b_mhz
    q = partition_function(_linear(b_mhz), temperature_k)
    # Neglected hB/(15 kT) = 6.7e-5 against Q ~ 1000: 7e-8 relative.
    assert_allclose(q, x + 1 / 3, rtol=1e-6)
    # With it, the next term 4/(315 x^2) ~ 1e-11 relative; the ladder stops at 1e-12 of Q.
    assert_allclose(q, x + 1 / 3 + 1 / (15 * x), rtol=1e-10)


def test_asymmetric_q_approaches_the_classical_limit():
    """Q ~ (sum g_I / sigma) sqrt(pi/(ABC)) (kT/h)^(3/2) (PHYSICS.md); no spin weights: sum g_I / sigma = 1."""
    temperature_k = 10.0
    classical = math.sqrt(math.pi / (A_MHZ * B_MHZ * C_MHZ)) * kt_mhz(temperature_k) ** 1.5
    q = partition_function(_asymmetric(), temperature_k)
    # The first correction is O(h B/kT): bounded here by hA/kT = 0.014 (its actual size is 0.0016).
    assert_allclose(q, classical, rtol=A_MHZ / kt_mhz(temperature_k))
    # With the first correction the rest is O((hA/kT)^2) = 2e-4 (a bound; its actual size is 2e-6).
    corrected = classical * stripp_kirkwood_correction(A_MHZ, B_MHZ, C_MHZ, temperature_k)
    assert_allclose(q, corrected, rtol=(A_MHZ / kt_mhz(temperature_k)) ** 2)


def test_spin_weights_scale_q_by_the_mean_weight_at_high_temperature():
    """Weights 1 (even) / 3 (odd) about b: half the levels each at high T, so Q -> (1 + 3)/2 = 2 times Q
    without weights (PHYSICS.md: sum g_I / sigma)."""
    temperature_k = 10.0
    plain = partition_function(_asymmetric(), temperature_k)
    weighted = partition_function(_asymmetric(SpinWeights("b", 1.0, 3.0)), temperature_k)
    # The even/odd imbalance is at most O(hA/kT) = 0.014.
    assert_allclose(weighted, 2 * plain, rtol=A_MHZ / kt_mhz(temperature_k))


def test_spin_weighted_q_at_low_temperature_is_the_explicit_level_sum():
    """Q = sum g_I (2J+1) e^(-E/kT) (PHYSICS.md), g_I from (-1)^(Ka+Kc) for a b axis; energies from the solver,
    weights assigned here from the labels.  At 0.2 K (kT/h = 4167 MHz) the J = 1 levels weigh e^(-0.6..-1),
    and past J = 12 (E > 156 C = 37 kT) nothing is left above 1e-16."""
    temperature_k = 0.2
    solver = AsymmetricSolver(_state(A=A_MHZ, B=B_MHZ, C=C_MHZ), "A", "Ir")
    expected = 0.0
    for j in range(0, 13):
        levels = solver.solve(j)
        weights = np.where((levels.ka + levels.kc) % 2 == 0, 1.0, 3.0)
        expected += float(np.sum(weights * (2 * j + 1) * np.exp(-levels.energies_mhz / kt_mhz(temperature_k))))
    q = partition_function(_asymmetric(SpinWeights("b", 1.0, 3.0)), temperature_k)
    assert_allclose(q, expected, rtol=1e-11)  # same terms summed in another order; the climb stops at 1e-12 of Q
    # Not the unweighted sum: the odd J = 1 levels (1_01, 1_10) count three times.
    unweighted = partition_function(_asymmetric(), temperature_k)
    assert q - unweighted > 2 * 3 * math.exp(-(A_MHZ + B_MHZ) / kt_mhz(temperature_k))


@pytest.mark.parametrize("rotor", ["symmetric-prolate", "symmetric-oblate"])
def test_symmetric_top_q_approaches_the_classical_limit(rotor):
    """Q ~ sqrt(pi/(A B^2)) (kT/h)^(3/2), C in place of A for an oblate top (PHYSICS.md; sigma = 1)."""
    temperature_k = 10.0
    b = 1500.0
    unique, dipole = (3000.0, (1.0, 0.0, 0.0)) if rotor == "symmetric-prolate" else (800.0, (0.0, 0.0, 1.0))
    name = "A" if rotor == "symmetric-prolate" else "C"
    species = Species("top", rotor, 40.0, dipole, (_state(**{name: unique, "B": b}),))
    classical = math.sqrt(math.pi / (unique * b * b)) * kt_mhz(temperature_k) ** 1.5
    q = partition_function(species, temperature_k)
    assert_allclose(q, classical, rtol=max(unique, b) / kt_mhz(temperature_k))  # first correction O(hB/kT)
    corrected = classical * stripp_kirkwood_correction(unique, b, b, temperature_k)
    assert_allclose(q, corrected, rtol=(max(unique, b) / kt_mhz(temperature_k)) ** 2)


@pytest.mark.parametrize("kind", ["linear", "asymmetric"])
def test_excited_vibrational_state_adds_its_boltzmann_factor_times_q_rot(kind):
    """Identical rotational constants in v = 1 at E: Q = Q_rot (1 + e^(-E/kT)) (exact, PHYSICS.md definition of Q)."""
    temperature_k, energy_cm1 = 10.0, 15.0  # kT/hc = 6.95 cm-1
    if kind == "linear":
        ground, excited = _state(B=10000.0), _state("v=1", energy_cm1, B=10000.0)
        single, double = _linear(0, (ground,)), _linear(0, (ground, excited))
    else:
        values = {"A": A_MHZ, "B": B_MHZ, "C": C_MHZ}
        ground, excited = _state(**values), _state("v=1", energy_cm1, **values)
        single, double = _asymmetric(states=(ground,)), _asymmetric(states=(ground, excited))
    boltzmann = math.exp(-energy_cm1 * constants.c * 100 / 1e6 / kt_mhz(temperature_k))
    assert 0.05 < boltzmann < 0.2  # the state matters at this temperature
    q_rot = partition_function(single, temperature_k)
    # Each ladder stops where its terms fall below 1e-12 of Q: a few 1e-12 relative.
    assert_allclose(partition_function(double, temperature_k), q_rot * (1 + boltzmann), rtol=1e-10)
