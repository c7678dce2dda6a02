"""Weighted least-squares fitting of constants to assigned lines (planner/engine/fitting.py).

Sources of the numbers used here:
- The asymmetric top and the symmetric top are invented test data.
- CO: B ≈ 57635.97 MHz, D ≈ 0.1835 MHz, from memory; the "measured" lines are
  synthesised from those values with seeded Gaussian noise of known σ.
- Linear levels E = B x − D x² (x = J(J+1)) and the J+1 ← J frequency
  ν = 2B(J+1) − 4D(J+1)³: textbook identity (docs/PHYSICS.md).
- a-type ΔK = 0 lines of a symmetric top do not depend on A (nor on DK): the
  K² and K⁴ terms cancel in E_up − E_lo, textbook identity.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from numpy.testing import assert_allclose

from planner.engine import PredictionRequest, Species, State, predict
from planner.engine.fitting import (
    AssignedLine,
    UndeterminedError,
    fit_constants,
    frequencies_and_jacobian,
    significant_digits,
    undetermined_constants,
)

#: Invented asymmetric top, A-reduction, Ir [MHz] (kappa ≈ −0.73; invented test data).
ASYMMETRIC_TRUTH = {
    "A": 9012.345,
    "B": 3504.321,
    "C": 2612.987,
    "DeltaJ": 0.00213,
    "DeltaJK": -0.0105,
    "DeltaK": 0.0512,
    "deltaJ": 0.00047,
    "deltaK": 0.0031,
}
CO_B_MHZ = 57635.97  # from memory
CO_D_MHZ = 0.1835  # from memory


def _species(rotor: str, constants: dict[str, float], dipole=(1.0, 0.5, 0.0), **kwargs) -> Species:
    return Species(
        name=kwargs.pop("name", "test molecule"),
        rotor=rotor,
        mass_amu=kwargs.pop("mass_amu", 60.0),
        dipole_debye=dipole,
        states=kwargs.pop("states", None) or (State("v=0", 0.0, {k: (v, 0.0) for k, v in constants.items()}),),
        **kwargs,
    )


def _co(constants=None) -> Species:
    constants = constants or {"B": CO_B_MHZ, "D": CO_D_MHZ}
    return _species("linear", constants, dipole=(0.11, 0.0, 0.0), name="CO", mass_amu=28.0)


def _co_frequency(j_lo: int) -> float:
    """ν(J+1 ← J) = 2B(J+1) − 4D(J+1)³ [MHz]; textbook identity."""
    return 2 * CO_B_MHZ * (j_lo + 1) - 4 * CO_D_MHZ * (j_lo + 1) ** 3


def _co_lines(j_values, sigma_mhz: float, rng=None) -> list[AssignedLine]:
    lines = []
    for j in j_values:
        noise = rng.normal(0.0, sigma_mhz) if rng is not None else 0.0
        lines.append(AssignedLine(j + 1, None, None, j, None, None, _co_frequency(j) + noise, sigma_mhz))
    return lines


@pytest.fixture(scope="module")
def asymmetric_lines() -> list[AssignedLine]:
    """Exact a- and b-type lines of the invented top from the engine's predict (J ≤ 10 up to 120 GHz)."""
    truth = _species("asymmetric", ASYMMETRIC_TRUTH)
    table = predict(truth, PredictionRequest(1000.0, 120000.0, 100.0, j_cap=10)).lines
    lines = [
        AssignedLine(
            int(table["j_up"][i]),
            int(table["ka_up"][i]),
            int(table["kc_up"][i]),
            int(table["j_lo"][i]),
            int(table["ka_lo"][i]),
            int(table["kc_lo"][i]),
            float(table["frequency_mhz"][i]),
            0.01,
        )
        for i in range(len(table))
    ]
    assert len(lines) > 40
    return lines


def test_round_trip_recovers_asymmetric_constants_from_exact_lines(asymmetric_lines):
    # Start off by several MHz in A, B, C and with every distortion constant absent (it starts at 0).
    start = _species(
        "asymmetric",
        {"A": ASYMMETRIC_TRUTH["A"] + 5.0, "B": ASYMMETRIC_TRUTH["B"] - 2.0, "C": ASYMMETRIC_TRUTH["C"] + 1.0},
    )
    result = fit_constants(start, asymmetric_lines, list(ASYMMETRIC_TRUTH))
    assert result.names == tuple(ASYMMETRIC_TRUTH)  # already in engine parameter order
    assert_allclose(result.values, list(ASYMMETRIC_TRUTH.values()), rtol=1e-6)
    # Exact data: the scatter is eigensolver rounding only, so σ (scaled by the fit's scatter) vanishes.
    assert np.all(result.sigmas < 1e-6 * np.abs(list(ASYMMETRIC_TRUTH.values())))
    assert result.weighted_rms < 1e-6
    assert result.degrees_of_freedom == len(asymmetric_lines) - len(ASYMMETRIC_TRUTH)
    assert not result.outliers
    assert result.condition_number > 1


def test_fitted_species_carries_values_sigmas_and_covariance(asymmetric_lines):
    start = _species("asymmetric", {**ASYMMETRIC_TRUTH, "A": ASYMMETRIC_TRUTH["A"] + 1.0, "PhiJ": 1e-8})
    result = fit_constants(start, asymmetric_lines, ["A", "B", "C"])
    fitted = result.fitted_species()
    state = fitted.states[0]
    assert state.value("A") == pytest.approx(result.value("A"))
    assert state.sigma("B") == pytest.approx(result.sigma("B"))
    assert state.constants_mhz["PhiJ"] == (1e-8, 0.0)  # held fixed: unchanged
    assert state.value("DeltaJ") == ASYMMETRIC_TRUTH["DeltaJ"]
    names, matrix = state.covariance()
    assert names == ("A", "B", "C")
    assert_allclose(matrix, result.covariance_mhz2, rtol=1e-12)
    assert start.states[0].value("A") == ASYMMETRIC_TRUTH["A"] + 1.0  # the input species is untouched


def test_co_noisy_lines_give_b_and_d_within_three_sigma():
    rng = np.random.default_rng(20240611)
    sigma = 0.05  # [MHz], invented test data
    lines = _co_lines(range(4), sigma, rng)  # J = 1-0 … 4-3
    result = fit_constants(_co({"B": 57600.0}), lines, ["B", "D"])
    assert abs(result.value("B") - CO_B_MHZ) < 3 * result.sigma("B")
    assert abs(result.value("D") - CO_D_MHZ) < 3 * result.sigma("D")
    assert result.degrees_of_freedom == 2
    assert result.chi2 == pytest.approx(result.reduced_chi2 * 2)
    assert result.weighted_rms == pytest.approx(np.sqrt(result.chi2 / 4))


def test_co_reduced_chi2_averages_to_one_over_many_noise_draws():
    # With correct σ, χ²/(N − n) has mean 1; 200 draws of 4 lines (2 dof each): std of the mean ≈ 0.07.
    rng = np.random.default_rng(7)
    sigma = 0.05
    reduced = [fit_constants(_co(), _co_lines(range(4), sigma, rng), ["B", "D"]).reduced_chi2 for _ in range(200)]
    assert 0.75 < np.mean(reduced) < 1.25


def test_symmetric_top_a_is_undetermined_by_delta_k_zero_lines():
    # Invented prolate top [MHz].
    truth = {"A": 158000.0, "B": 9198.9, "DJ": 0.0038, "DJK": 0.177}
    species = _species("symmetric-prolate", truth, dipole=(3.9, 0.0, 0.0))
    lines = []
    for j in range(1, 6):
        for k in range(j):
            lines.append(AssignedLine(j, k, None, j - 1, k, None, 1.0, 0.01))
    _, freqs, _ = frequencies_and_jacobian(species, lines, ["B"])
    lines = [AssignedLine(ln.j_up, ln.ka_up, None, ln.j_lo, ln.ka_lo, None, f, 0.01) for ln, f in zip(lines, freqs)]
    assert undetermined_constants(species, lines, ["A", "B", "DJ", "DJK"]) == ["A"]
    assert undetermined_constants(species, lines, ["A", "B", "DJ", "DJK", "DK"]) == ["A", "DK"]
    with pytest.raises(UndeterminedError, match="the lines cannot determine A; hold it fixed"):
        fit_constants(species, lines, ["A", "B", "DJ", "DJK"])
    result = fit_constants(species, lines, ["B", "DJ", "DJK"])  # A held fixed: fine
    assert_allclose(result.values, [truth["B"], truth["DJ"], truth["DJK"]], rtol=1e-6)


def test_two_constants_the_lines_see_only_together_are_both_named():
    # J = 1-0 alone of a linear molecule: ν = 2B − 4D, so B and D are one combination.
    lines = _co_lines([0, 0], 0.05)
    with pytest.raises(UndeterminedError) as caught:
        fit_constants(_co(), lines, ["B", "D"])
    assert caught.value.names == ["B", "D"]


def test_analytic_jacobian_matches_finite_differences(asymmetric_lines):
    species = _species("asymmetric", ASYMMETRIC_TRUTH)
    vary = list(ASYMMETRIC_TRUTH)
    names, _, jacobian = frequencies_and_jacobian(species, asymmetric_lines, vary)
    values = np.array([ASYMMETRIC_TRUTH[n] for n in names])
    numeric = np.empty_like(jacobian)

    def central(k: int, h: float) -> np.ndarray:
        step = np.zeros_like(values)
        step[k] = h
        _, up, _ = frequencies_and_jacobian(species, asymmetric_lines, vary, values + step)
        _, down, _ = frequencies_and_jacobian(species, asymmetric_lines, vary, values - step)
        return (up - down) / (2 * h)

    for k in range(len(names)):
        # Central differences with one Richardson step (error O(h⁴)): the only finite differences in the project.
        # Step moving the most sensitive line by 0.1 MHz: eigensolver rounding (~1e-9 MHz) stays negligible.
        h = 0.1 / np.abs(jacobian[:, k]).max()
        numeric[:, k] = (4 * central(k, h / 2) - central(k, h)) / 3
    scale = np.abs(jacobian).max(axis=0)
    # Relative to each column's largest entry; the observed agreement is ~1e-8, the bound leaves 100x margin.
    assert_allclose(jacobian / scale, numeric / scale, rtol=0, atol=1e-6)


def test_line_shifted_by_ten_sigma_is_flagged_as_outlier():
    sigma = 0.05
    lines = _co_lines(range(15), sigma)
    shifted = lines[7]
    lines[7] = AssignedLine(8, None, None, 7, None, None, shifted.frequency_mhz + 10 * sigma, sigma)
    result = fit_constants(_co(), lines, ["B", "D"])
    assert result.outliers == [7]
    assert result.residuals[7].normalised > 3
    assert result.to_dict()["residuals"][7]["outlier"] is True


def test_lines_with_coinciding_calculated_frequencies_are_blends():
    # DJK = 0: the K = 0 and K = 1 components of each J+1 ← J line coincide exactly (textbook identity).
    species = _species("symmetric-prolate", {"A": 150000.0, "B": 9000.0, "DJ": 0.004}, dipole=(3.0, 0.0, 0.0))
    assignments = [(1, 0), (2, 0), (2, 1), (3, 0)]
    probe = [AssignedLine(j, k, None, j - 1, k, None, 1.0, 0.01) for j, k in assignments]
    _, freqs, _ = frequencies_and_jacobian(species, probe, ["B"])
    lines = [AssignedLine(ln.j_up, ln.ka_up, None, ln.j_lo, ln.ka_lo, None, f, 0.01) for ln, f in zip(probe, freqs)]
    lines.append(lines[0])  # a repeated measurement of the same line is not a blend
    result = fit_constants(species, lines, ["B", "DJ"])
    assert result.blends == [(1, 2)]
    assert result.residuals[1].blended_with == (2,)
    assert result.residuals[0].blended_with == ()


def test_correlation_is_symmetric_with_unit_diagonal(asymmetric_lines):
    start = _species("asymmetric", ASYMMETRIC_TRUTH)
    result = fit_constants(start, asymmetric_lines, list(ASYMMETRIC_TRUTH))
    n = len(result.names)
    assert result.correlation.shape == (n, n) == result.covariance_mhz2.shape
    assert_allclose(result.correlation, result.correlation.T, atol=1e-12)
    assert_allclose(np.diag(result.correlation), np.ones(n), atol=1e-12)
    assert np.all(np.abs(result.correlation) <= 1 + 1e-12)


def test_to_dict_is_json_ready_with_units_in_keys():
    result = fit_constants(_co(), _co_lines(range(5), 0.05, np.random.default_rng(3)), ["B", "D"])
    data = json.loads(json.dumps(result.to_dict()))
    assert [c["name"] for c in data["constants"]] == ["B", "D"]
    assert {"value_mhz", "sigma_mhz", "formatted"} <= set(data["constants"][0])
    assert {"observed_mhz", "calculated_mhz", "obs_minus_calc_mhz", "sigma_mhz"} <= set(data["residuals"][0])
    assert data["degrees_of_freedom"] == 3


def test_exactly_as_many_lines_as_constants_reports_no_reduced_chi2():
    result = fit_constants(_co(), _co_lines([0, 3], 0.05), ["B", "D"])
    assert result.degrees_of_freedom == 0
    assert np.isnan(result.reduced_chi2)
    assert result.to_dict()["reduced_chi2"] is None
    assert np.all(result.sigmas > 0)  # unscaled (JᵀWJ)⁻¹


def test_unknown_parameter_is_refused_with_the_allowed_names():
    with pytest.raises(ValueError, match="'DeltaJ'.*allowed: B, D, H"):
        fit_constants(_co(), _co_lines(range(4), 0.05), ["B", "DeltaJ"])


def test_fewer_lines_than_constants_is_refused():
    with pytest.raises(ValueError, match="1 line\\(s\\) cannot fit 2 constants"):
        fit_constants(_co(), _co_lines([0], 0.05), ["B", "D"])


def test_level_that_does_not_exist_is_refused_naming_the_line():
    species = _species("asymmetric", ASYMMETRIC_TRUTH)
    lines = [
        AssignedLine(1, 0, 1, 0, 0, 0, 6117.0, 0.01),
        AssignedLine(2, 3, 0, 1, 1, 1, 20000.0, 0.01),  # Ka = 3 > J = 2
    ]
    with pytest.raises(ValueError, match=r"lines\[1\].*upper level 2\(3,0\) does not exist"):
        fit_constants(species, lines, ["B"])


def test_lines_of_several_states_are_refused_naming_them():
    states = (
        State("v=0", 0.0, {"B": (CO_B_MHZ, 0.0), "D": (CO_D_MHZ, 0.0)}),
        State("v=1", 2143.0, {"B": (57100.0, 0.0), "D": (CO_D_MHZ, 0.0)}),
    )
    species = _species("linear", {}, dipole=(0.11, 0.0, 0.0), states=states)
    lines = _co_lines(range(3), 0.05) + [AssignedLine(1, None, None, 0, None, None, 114200.0, 0.05, state="v=1")]
    with pytest.raises(ValueError, match="several states \\('v=0', 'v=1'\\)"):
        fit_constants(species, lines, ["B"])
    with pytest.raises(ValueError, match="unknown state 'v=2'"):
        fit_constants(species, [AssignedLine(1, None, None, 0, None, None, 1e5, 0.05, state="v=2")], ["B"])


@pytest.mark.parametrize(
    "line, message",
    [
        (AssignedLine(1, None, None, 0, None, None, 115271.2, 0.0), "sigma_mhz must be a number > 0"),
        (AssignedLine(1, None, None, 0, None, None, float("nan"), 0.05), "frequency_mhz must be"),
        (AssignedLine(1, 1, None, 0, None, None, 115271.2, 0.05), "linear molecule's levels have no Ka, Kc"),
        (AssignedLine(1, None, None, 1, None, None, 1.0, 0.05), "upper and lower level are the same"),
    ],
)
def test_bad_line_is_refused(line, message):
    with pytest.raises(ValueError, match=message):
        fit_constants(_co(), [line, *_co_lines(range(1, 4), 0.05)], ["B"])


def test_no_convergence_raises():
    start = _species(
        "asymmetric",
        {"A": ASYMMETRIC_TRUTH["A"] + 50.0, "B": ASYMMETRIC_TRUTH["B"] - 20.0, "C": ASYMMETRIC_TRUTH["C"]},
    )
    lines = [AssignedLine(1, 0, 1, 0, 0, 0, 6117.3, 0.01), AssignedLine(1, 1, 1, 0, 0, 0, 11625.3, 0.01)]
    lines.append(AssignedLine(1, 1, 0, 0, 0, 0, 12516.7, 0.01))
    with pytest.raises(RuntimeError, match="did not converge in 1 iterations"):
        fit_constants(start, lines, ["A", "B", "C"], max_iterations=1)


@pytest.mark.parametrize(
    "value, sigma, expected",
    [
        (57635.96812, 0.00123, "57635.9681(12)"),  # the example of the brief
        (0.1835, 0.00042, "0.18350(42)"),
        (1.23456, 0.000999, "1.2346(10)"),  # σ rounds up to one more digit: keep two
        (-0.0123, 0.0005, "-0.01230(50)"),
        (1234.5, 150.0, "1230(150)"),  # σ above the units digit: value rounded to tens
        (2.5, 0.0, "2.5"),  # held fixed: no σ
    ],
)
def test_significant_digits_examples(value, sigma, expected):
    assert significant_digits(value, sigma) == expected


def test_significant_digits_refuses_negative_sigma():
    with pytest.raises(ValueError, match="sigma must be >= 0"):
        significant_digits(1.0, -0.1)
