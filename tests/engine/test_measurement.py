"""Sensitivity models: Voigt limits and width, number density, absorption, the time model, validation."""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants
from scipy.optimize import brentq
from scipy.special import voigt_profile

from planner.engine.measurement import (
    DEFAULT_RELATIVE_MODEL,
    AbsorptionCell,
    RelativeModel,
    number_density_cm3,
    time_to_snr_s,
    voigt_fwhm,
    voigt_peak,
)


def cell(**overrides):
    values = dict(path_length_cm=100.0, noise_absorption_per_sqrt_hz=1e-5, pressure_pa=1.0, broadening_khz_per_pa=75.0)
    values.update(overrides)  # invented test data
    return AbsorptionCell(**values)


def test_pure_doppler_peak_is_two_root_ln2_over_pi_over_fwhm():
    fwhm = np.array([0.01, 0.5, 3.0])
    # Textbook identity: a normalised Gaussian of full width f peaks at 2√(ln2/π)/f.
    assert_allclose(voigt_peak(fwhm, 0.0), 2 * math.sqrt(math.log(2) / math.pi) / fwhm, rtol=1e-12)


def test_pure_pressure_peak_is_one_over_pi_gamma():
    gamma = np.array([0.02, 1.0, 7.0])
    # Textbook identity: a normalised Lorentzian of half width γ peaks at 1/(πγ).
    assert_allclose(voigt_peak(0.0, gamma), 1 / (math.pi * gamma), rtol=1e-12)


def test_voigt_peak_lies_below_both_pure_profiles():
    # A convolution of two normalised profiles is lower than either alone (textbook property).
    mixed = voigt_peak(1.0, 0.5)
    assert mixed < voigt_peak(1.0, 0.0)
    assert mixed < voigt_peak(0.0, 0.5)


@pytest.mark.parametrize("ratio", [0.0, 0.1, 0.5, 1.0, 3.0, 20.0])
def test_olivero_longbothum_width_agrees_with_the_numerical_half_maximum(ratio):
    doppler_fwhm, gamma = 1.0, ratio * 0.5
    sigma = doppler_fwhm / (2 * math.sqrt(2 * math.log(2)))
    half = voigt_profile(0.0, sigma, gamma) / 2
    x_half = brentq(lambda x: voigt_profile(x, sigma, gamma) - half, 0.0, 100.0, xtol=1e-14)
    # Published accuracy of the fit: about 0.02 % (Olivero & Longbothum 1977); independent method: root finding.
    assert_allclose(voigt_fwhm(doppler_fwhm, gamma), 2 * x_half, rtol=3e-4)


def test_voigt_width_limits():
    assert_allclose(voigt_fwhm(0.7, 0.0), 0.7, rtol=1e-12)  # pure Gaussian (identity of the fit)
    assert_allclose(voigt_fwhm(0.0, 0.5), 1.0, rtol=2e-5)  # pure Lorentzian: 0.5346 + √0.2166 ≈ 1


def test_number_density_is_loschmidt_at_standard_conditions():
    loschmidt_m3 = constants.physical_constants["Loschmidt constant (273.15 K, 101.325 kPa)"][0]  # CODATA
    assert_allclose(number_density_cm3(101325.0, 273.15), loschmidt_m3 * 1e-6, rtol=1e-12)


def test_number_density_is_pressure_over_kt():
    # Ideal gas n = P/(kT), CODATA k via scipy.constants; 1 Pa at 300 K (invented test data).
    assert_allclose(number_density_cm3(1.0, 300.0), 1.0 / (constants.k * 300.0) / 1e6, rtol=1e-14)
    assert_allclose(number_density_cm3(1.0, 300.0), 2.41e14, rtol=2.5e-3)  # from memory, 3 digits: 2.41e14 cm^-3


def test_weak_line_absorption_is_intensity_times_density_times_peak_times_length():
    model = cell()
    intensity, doppler, amount, temperature = 1e-5, 0.2, 0.1, 300.0  # invented test data
    density = amount * 1.0 / (constants.k * temperature) * 1e-6
    gamma = 75.0 * 1.0 * 1e-3  # kHz/Pa · Pa → MHz
    sigma = doppler / (2 * math.sqrt(2 * math.log(2)))
    alpha_l = intensity * 1e-14 * density * voigt_profile(0.0, sigma, gamma) * 100.0  # Beer–Lambert, small α L
    signal = model.expected_signal(intensity, doppler, amount, temperature)
    assert alpha_l < 1e-3
    assert_allclose(signal, alpha_l, rtol=1e-3)  # 1 − e^(−x) = x − x²/2 …: relative difference ≈ x/2
    assert_allclose(signal, -math.expm1(-alpha_l), rtol=1e-12)


def test_strong_line_absorption_saturates_below_one():
    model = cell()
    alpha_l = -np.log1p(-model.expected_signal(1e-8, 0.2, 1.0, 300.0)) * np.array([1e5, 3e6])  # α L ∝ intensity
    signal = model.expected_signal(np.array([1e-3, 3e-2]), 0.2, 1.0, 300.0)
    assert 0.3 < alpha_l[0] < 3 and alpha_l[1] > 10  # one line of moderate depth, one optically thick
    assert_allclose(signal, -np.expm1(-alpha_l), rtol=1e-6)  # Beer–Lambert
    assert np.all(signal < 1.0) and signal[1] > 0.999


def test_absorption_scales_with_amount_while_thin():
    model = cell()
    small = model.expected_signal(1e-6, 0.2, 0.01, 300.0)
    # α L ≈ 1.3e-5, so 1 − e^(−α L) departs from linear by ≈ α L / 2 ≈ 6e-6.
    assert_allclose(model.expected_signal(1e-6, 0.2, 0.02, 300.0), 2 * small, rtol=1e-5)


def test_pressure_width_and_noise():
    model = cell(pressure_pa=4.0, broadening_khz_per_pa=50.0)
    assert model.pressure_hwhm_mhz() == pytest.approx(0.2)  # 50 kHz/Pa · 4 Pa = 200 kHz
    assert model.noise_1s() == 1e-5
    assert RelativeModel(2e-6).pressure_hwhm_mhz() == 0.0


def test_relative_model_signal_is_amount_times_intensity():
    model = RelativeModel(detection_floor_1s=1e-6)
    assert_allclose(model.expected_signal(np.array([1e-3, 2e-3]), 0.1, 0.5, 100.0), [5e-4, 1e-3])
    assert model.noise_1s() == 1e-6
    assert DEFAULT_RELATIVE_MODEL.kind == "relative" and DEFAULT_RELATIVE_MODEL.detection_floor_1s > 0


def test_time_to_snr_is_snr_noise_over_signal_squared():
    model = RelativeModel(detection_floor_1s=2e-6)
    # t = (snr · noise / signal)²: (5 · 2e-6 / 1e-5)² = 1 s (noise ∝ 1/√t, textbook identity).
    assert_allclose(time_to_snr_s(model, 1e-5, 5.0), 1.0)
    assert_allclose(time_to_snr_s(model, 1e-6, 5.0), 100.0)


def test_doubling_the_signal_quarters_the_time():
    model = cell()
    signal = np.array([1e-4, 3e-3, 0.2])
    assert_allclose(time_to_snr_s(model, 2 * signal, 3.0), time_to_snr_s(model, signal, 3.0) / 4, rtol=1e-14)
    assert_allclose(time_to_snr_s(model, signal, 6.0), 4 * time_to_snr_s(model, signal, 3.0), rtol=1e-14)


def test_time_is_infinite_without_signal():
    times = time_to_snr_s(RelativeModel(1e-6), np.array([0.0, -1.0, 1e-6]), 1.0)
    assert np.isinf(times[0]) and np.isinf(times[1])
    assert times[2] == pytest.approx(1.0)


@pytest.mark.parametrize(
    "field, value",
    [
        ("path_length_cm", 0.0),
        ("noise_absorption_per_sqrt_hz", -1e-6),
        ("pressure_pa", float("nan")),
        ("broadening_khz_per_pa", -0.1),
    ],
)
def test_absorption_cell_refuses_bad_fields(field, value):
    with pytest.raises(ValueError, match=field):
        cell(**{field: value})


def test_zero_broadening_is_allowed():
    assert cell(broadening_khz_per_pa=0.0).pressure_hwhm_mhz() == 0.0


def test_amount_is_a_mole_fraction_in_a_cell():
    with pytest.raises(ValueError, match=r"amount must be in \(0, 1\]"):
        cell().expected_signal(1e-3, 0.1, 1.5, 300.0)
    with pytest.raises(ValueError, match="amount"):
        RelativeModel(1e-6).expected_signal(1e-3, 0.1, 0.0, 300.0)


def test_relative_model_and_time_refuse_bad_values():
    with pytest.raises(ValueError, match="detection_floor_1s"):
        RelativeModel(detection_floor_1s=0.0)
    with pytest.raises(ValueError, match="snr"):
        time_to_snr_s(RelativeModel(1e-6), 1.0, 0.0)
