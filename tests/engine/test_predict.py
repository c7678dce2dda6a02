"""predict(): the shape of the result, messages, states, uncertainties and validation."""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from planner.engine import (
    LINE_COLUMNS,
    PredictionRequest,
    Species,
    SpeciesError,
    SpinWeights,
    State,
    predict,
    predict_many,
)

# H2CO ground-state constants recalled from the literature (from memory), with invented 1σ values.
H2CO_CONSTANTS = {
    "A": (281970.56, 0.05),
    "B": (38836.0455, 0.002),
    "C": (34002.2034, 0.002),
    "DeltaJ": (0.075295, 2e-5),
    "DeltaJK": (1.2907, 1e-4),
    "DeltaK": (19.39, 0.01),
    "deltaJ": (0.010444, 1e-6),
    "deltaK": (1.0274, 1e-4),
}


def formaldehyde(**overrides):
    values = dict(
        name="H2CO",
        rotor="asymmetric",
        mass_amu=30.0106,
        dipole_debye=(2.331, 0, 0),
        spin_weights=SpinWeights("a", 1.0, 3.0),
        states=(State("v=0", 0.0, H2CO_CONSTANTS),),
    )
    values.update(overrides)
    return Species(**values)


def carbon_monoxide(states=None):
    # B, D from memory; σ invented for the test.
    ground = State("v=0", 0.0, {"B": (57635.968, 0.001), "D": (0.1835, 1e-4)})
    return Species(
        name="CO", rotor="linear", mass_amu=27.9949, dipole_debye=(0.11011, 0, 0), states=states or (ground,)
    )


def test_every_column_is_present_and_lines_are_sorted_inside_the_window():
    prediction = predict(formaldehyde(), PredictionRequest(100000.0, 300000.0, 50.0))
    assert set(prediction.lines.columns) == set(LINE_COLUMNS)
    frequency = prediction.lines["frequency_mhz"]
    assert len(frequency) > 10
    assert np.all(np.diff(frequency) >= 0)
    assert frequency.min() >= 100000.0 and frequency.max() <= 300000.0


def test_species_without_dipole_says_why_it_has_no_lines():
    carbon_dioxide = Species(
        name="CO2",
        rotor="linear",
        mass_amu=43.99,
        dipole_debye=(0, 0, 0),
        states=(State("v=0", 0.0, {"B": (11698.5, 0.0)}),),  # B from memory
    )
    prediction = predict(carbon_dioxide, PredictionRequest(0.0, 1e6, 300.0))
    assert len(prediction.lines) == 0
    assert "no permanent dipole moment" in prediction.messages[0]


def test_empty_window_says_so():
    prediction = predict(carbon_monoxide(), PredictionRequest(1000.0, 2000.0, 300.0))
    assert len(prediction.lines) == 0
    assert "no lines between 1000 and 2000 MHz" in prediction.messages[0]


def test_records_leave_undefined_quantum_numbers_blank_and_put_k_in_ka():
    linear_row = predict(carbon_monoxide(), PredictionRequest(0.0, 2e5, 30.0)).records()[0]
    assert (linear_row["ka_up"], linear_row["kc_up"], linear_row["ka_lo"], linear_row["kc_lo"]) == (None,) * 4
    top = Species(
        name="CH3CN",
        rotor="symmetric-prolate",
        mass_amu=41.03,
        dipole_debye=(3.92, 0, 0),
        states=(State("v=0", 0.0, {"A": (158099.0, 0), "B": (9198.899, 0)}),),  # from memory
    )
    rows = predict(top, PredictionRequest(91000.0, 93000.0, 30.0)).records()
    assert {row["ka_up"] for row in rows} == set(range(5))  # J = 5–4, K = 0..4
    assert all(row["kc_up"] is None and row["ka_up"] == row["ka_lo"] for row in rows)


def test_excited_state_lines_are_labelled_and_boltzmann_weakened():
    # Textbook identity: identical constants in a state at E_v scale each line by e^(−E_v/kT).
    constants_mhz = {"B": (57635.968, 0.0), "D": (0.1835, 0.0)}
    species = carbon_monoxide(states=(State("v=0", 0.0, constants_mhz), State("v=1", 200.0, constants_mhz)))
    prediction = predict(species, PredictionRequest(100000.0, 120000.0, 300.0))
    by_state = {row["state"]: row for row in prediction.records()}
    assert set(by_state) == {"v=0", "v=1"}
    kelvin_per_cm1 = constants.h * constants.c * 100 / constants.k  # CODATA via scipy.constants
    expected = math.exp(-200.0 * kelvin_per_cm1 / 300.0)
    assert_allclose(by_state["v=1"]["intensity_nm2mhz"] / by_state["v=0"]["intensity_nm2mhz"], expected, rtol=1e-9)
    assert_allclose(by_state["v=1"]["el_cm1"], 200.0, rtol=1e-12)


def test_sigma_matches_finite_difference_propagation():
    species = formaldehyde()
    request = PredictionRequest(140000.0, 141000.0, 30.0)
    line = predict(species, request).records()[0]
    variance = 0.0
    for name, (value, sigma) in H2CO_CONSTANTS.items():
        step = max(abs(value) * 1e-6, 1e-9)
        shifted = []
        for sign in (1, -1):
            constants_mhz = dict(H2CO_CONSTANTS, **{name: (value + sign * step, sigma)})
            varied = formaldehyde(states=(State("v=0", 0.0, constants_mhz),))
            shifted.append(predict(varied, request).records()[0]["frequency_mhz"])
        variance += ((shifted[0] - shifted[1]) / (2 * step) * sigma) ** 2
    # Central differences are exact for the linear parts of H; 1e-4 covers the rest.
    assert_allclose(line["sigma_mhz"], math.sqrt(variance), rtol=1e-4)


def test_linear_sigma_is_the_closed_form_propagation():
    # ν(J → J+1) = 2B(J+1) − 4D(J+1)³, so σν² = (2(J+1)σB)² + (4(J+1)³σD)²  (textbook identity).
    row = predict(carbon_monoxide(), PredictionRequest(340000.0, 350000.0, 100.0)).records()[0]
    assert row["j_lo"] == 2
    assert_allclose(row["sigma_mhz"], math.hypot(2 * 3 * 0.001, 4 * 27 * 1e-4), rtol=1e-12)


def test_doppler_width_follows_mass_and_temperature():
    row = predict(carbon_monoxide(), PredictionRequest(100000.0, 120000.0, 300.0)).records()[0]
    mass_kg = 27.9949 * constants.atomic_mass  # CODATA via scipy.constants
    expected = row["frequency_mhz"] * math.sqrt(8 * constants.k * 300.0 * math.log(2) / (mass_kg * constants.c**2))
    assert_allclose(row["doppler_fwhm_mhz"], expected, rtol=1e-12)


def test_predict_many_merges_species_by_frequency():
    request = PredictionRequest(0.0, 3e5, 30.0)
    merged = predict_many([formaldehyde(), carbon_monoxide()], request)
    assert set(merged.lines["species"]) == {"H2CO", "CO"}
    assert np.all(np.diff(merged.lines["frequency_mhz"]) >= 0)
    assert set(merged.partition_function) == {"H2CO", "CO"}


def test_lines_between_different_spin_species_are_dropped():
    # A b-type dipole with an a-axis C2 would join Ka-even and Ka-odd levels: spin-forbidden.
    species = formaldehyde(dipole_debye=(0, 1.0, 0))
    prediction = predict(species, PredictionRequest(0.0, 1e6, 30.0))
    assert len(prediction.lines) == 0


@pytest.mark.parametrize(
    "overrides, field",
    [
        ({"rotor": "spherical"}, "rotor"),
        ({"mass_amu": -1.0}, "mass_amu"),
        ({"dipole_debye": (20.0, 0, 0)}, "dipole_debye.a"),
        ({"reduction": "Q"}, "reduction"),
        ({"states": (State("v=0", 0.0, {"A": (1.0, 0), "B": (2.0, 0), "C": (3.0, 0)}),)}, "states[0].constants_mhz"),
        ({"states": (State("v=0", 0.0, dict(H2CO_CONSTANTS, Bogus=(1.0, 0.0))),)}, "states[0].constants_mhz.Bogus"),
        ({"states": (State("v=0", 0.0, dict(H2CO_CONSTANTS, B=(38836.0, -1.0))),)}, "states[0].constants_mhz.B"),
        ({"spin_weights": SpinWeights("C3", 1.0, 2.0)}, "spin_weights.axis"),
    ],
)
def test_bad_species_is_refused_naming_the_field(overrides, field):
    with pytest.raises(SpeciesError) as caught:
        formaldehyde(**overrides)
    assert caught.value.field == field
    assert caught.value.species == "H2CO"


@pytest.mark.parametrize(
    "arguments, name",
    [
        ((100.0, 50.0, 300.0), "fmax_mhz"),
        ((-1.0, 50.0, 300.0), "fmin_mhz"),
        ((0.0, 50.0, 0.0), "temperature_k"),
        ((0.0, 50.0, float("nan")), "temperature_k"),
    ],
)
def test_bad_request_is_refused_naming_the_parameter(arguments, name):
    with pytest.raises(ValueError, match=name):
        PredictionRequest(*arguments)
