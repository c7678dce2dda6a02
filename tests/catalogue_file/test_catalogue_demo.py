"""The demo catalogue loads, covers the format's options, predicts and reproduces a few recalled line frequencies."""

import dataclasses

import numpy as np
import pytest

from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue
from planner.engine import PredictionRequest, State, predict
from planner.engine.species import ROTOR_KINDS, SpinWeights

#: Names of the demo species, read once so that tests can be parametrised by species.
DEMO_NAMES = [species.name for species in load_catalogue(DEMO_CATALOGUE_PATH)]

#: The label every demo source carries (planner/demo/README.md, "Where the numbers come from").
FROM_MEMORY_LABEL = "from memory — verify before use"
#: The sentence every demo hazards text ends with.
HAZARDS_DEFERRAL = "Follow your facility's rules and ask the safety officer before use."


@pytest.fixture(scope="module")
def demo():
    return {species.name: species for species in load_catalogue(DEMO_CATALOGUE_PATH)}


def test_demo_file_is_shipped_beside_the_package():
    assert DEMO_CATALOGUE_PATH.name == "catalogue.json"
    assert DEMO_CATALOGUE_PATH.is_file()


def test_demo_has_about_twenty_species_of_every_rotor_kind(demo):
    assert 18 <= len(demo) <= 24
    assert len(demo) == len(DEMO_NAMES)  # names are unique
    assert {s.rotor for s in demo.values()} == set(ROTOR_KINDS)


def test_demo_covers_the_format_options(demo):
    species = demo.values()
    assert any(s.rotor == "asymmetric" and s.reduction == "S" for s in species)
    assert any(s.rotor == "asymmetric" and s.reduction == "A" for s in species)
    assert any(s.rotor == "asymmetric" and s.representation == "IIIr" for s in species)
    assert any(s.rotor == "asymmetric" and s.representation == "Ir" for s in species)
    assert any(not s.has_dipole for s in species)
    assert any(s.rotor == "asymmetric" and s.spin_weights is None for s in species)
    assert any(s.rotor == "asymmetric" and s.dipole_debye[0] and s.dipole_debye[1] for s in species)


def test_demo_has_spin_weights_about_a_c2_axis_and_a_c3_axis(demo):
    axes = {s.spin_weights.axis for s in demo.values() if s.spin_weights}
    assert "C3" in axes
    assert axes & {"a", "b", "c"}
    assert {"a", "b"} <= axes
    assert any(s.rotor == "symmetric-prolate" and s.spin_weights for s in demo.values())
    assert any(s.rotor == "symmetric-oblate" and s.spin_weights for s in demo.values())


def test_demo_has_at_least_three_species_with_excited_vibrational_states(demo):
    multi_state = [s for s in demo.values() if len(s.states) > 1 and max(st.energy_cm1 for st in s.states) > 0]
    assert len(multi_state) >= 3
    for species in multi_state:
        assert species.states[0].energy_cm1 == 0.0, species.name  # ground state first, by convention


def test_demo_spin_weights(demo):
    # textbook nuclear-spin statistics, in the engine's convention (even: (-1)^Ka on a, (-1)^(Ka+Kc) on b):
    # H2CO ortho (Ka odd) 3 : para 1 about its a axis; SO2 and O3 with spin-0 16O nuclei keep only the
    # levels symmetric under C2(b); H2S ortho (Ka+Kc odd) 3 : para 1; c-C2H4O, whose C2(b) exchanges
    # two pairs of protons, 10 : 6; three equivalent protons or 19F nuclei about a C3 axis, 4 : 2.
    assert demo["H2CO"].spin_weights == SpinWeights(axis="a", even=1, odd=3)
    assert demo["SO2"].spin_weights == SpinWeights(axis="b", even=1, odd=0)
    assert demo["O3"].spin_weights == SpinWeights(axis="b", even=1, odd=0)
    assert demo["H2S"].spin_weights == SpinWeights(axis="b", even=1, odd=3)
    assert demo["c-C2H4O"].spin_weights == SpinWeights(axis="b", even=10, odd=6)
    for name in ("CH3CN", "CHF3", "CH3CCH", "CH3F", "PH3"):
        assert demo[name].spin_weights == SpinWeights(axis="C3", even=4, odd=2), name


def test_every_demo_species_says_where_its_numbers_come_from_and_that_the_scenario_is_invented(demo):
    for species in demo.values():
        assert "from memory" in species.source, species.name
        assert "invented" in species.notes, species.name


def test_every_demo_source_carries_the_from_memory_label_and_says_the_sigmas_are_rough(demo):
    for species in demo.values():
        assert FROM_MEMORY_LABEL in species.source, species.name
        assert "rough" in species.source and "1σ" in species.source, species.name


def test_every_demo_species_has_a_hazards_text_that_defers_to_the_facility(demo):
    for species in demo.values():
        hazards = species.hazards.strip()
        assert len(hazards) > len(HAZARDS_DEFERRAL) + 20, species.name
        assert hazards.endswith(HAZARDS_DEFERRAL), species.name


@pytest.mark.parametrize("temperature_k", [10.0, 300.0])
@pytest.mark.parametrize("name", DEMO_NAMES)
def test_every_demo_species_predicts_from_0_to_1_thz(demo, name, temperature_k):
    species = demo[name]
    prediction = predict(species, PredictionRequest(0.0, 1.0e6, temperature_k))
    if species.has_dipole:
        assert len(prediction.lines) > 0
        assert prediction.partition_function[name] > 0
        assert np.all(np.isfinite(prediction.lines["frequency_mhz"]))
        assert np.all(np.isfinite(prediction.lines["sigma_mhz"]))
    else:
        assert len(prediction.lines) == 0
        assert prediction.messages


def linear_line_mhz(species, j_lower, k=0, state_label=None):
    """ν(J+1 <- J) = 2B(J+1) - 4D(J+1)^3 - 2DJK(J+1)K^2 [MHz] (textbook closed form, sextic terms left out).

    The same form holds for prolate and oblate tops, since ΔK = 0 lines do not see A or C.
    """
    state = species.states[0] if state_label is None else next(s for s in species.states if s.label == state_label)
    j1 = j_lower + 1
    if species.rotor == "linear":
        return 2 * state.value("B") * j1 - 4 * state.value("D") * j1**3
    return 2 * state.value("B") * j1 - 4 * state.value("DJ") * j1**3 - 2 * state.value("DJK") * j1 * k**2


@pytest.mark.parametrize(
    "name, state_label, j_lower, k, frequency_mhz, tolerance_mhz",
    [
        ("CO", None, 0, 0, 115271.202, 0.05),  # CO J=1-0, from memory
        ("CO", "v=1", 0, 0, 114221.75, 0.05),  # CO v=1 J=1-0, from memory
        ("OCS", None, 7, 0, 97301.21, 0.05),  # OCS J=8-7, from memory
        ("HCN", None, 0, 0, 88631.60, 0.05),  # HCN J=1-0 without hyperfine, from memory
        ("CH3CN", None, 4, 0, 91987.09, 0.05),  # CH3CN J=5-4 K=0, from memory
        ("CH3CN", None, 4, 3, 91971.13, 0.05),  # CH3CN J=5-4 K=3, from memory
        ("CS", None, 1, 0, 97980.953, 0.05),  # CS J=2-1, from memory
        ("CS", None, 4, 0, 244935.64, 0.05),  # CS J=5-4, from memory
        ("SiO", None, 0, 0, 43423.85, 0.05),  # SiO v=0 J=1-0, from memory
        ("SiO", "v=1", 0, 0, 43122.08, 0.05),  # SiO v=1 J=1-0, from memory
        ("SiO", "v=2", 0, 0, 42820.59, 0.05),  # SiO v=2 J=1-0, from memory
        ("HC3N", None, 9, 0, 90979.02, 0.05),  # HC3N J=10-9 without hyperfine, from memory
        ("N2O", None, 4, 0, 125613.7, 0.1),  # N2O J=5-4, from memory (one decimal)
        ("HCl", None, 0, 0, 625918.7, 0.5),  # H35Cl J=1-0 without hyperfine, from memory
        ("CH3CCH", None, 4, 0, 85457.30, 0.05),  # CH3CCH J=5-4 K=0, from memory
        ("CH3CCH", None, 4, 3, 85442.60, 0.05),  # CH3CCH J=5-4 K=3, from memory
        ("CH3F", None, 1, 1, 102140.9, 0.1),  # CH3F J=2-1 K=1, from memory (one decimal)
        ("PH3", None, 0, 0, 266944.5, 0.5),  # PH3 J=1-0, from memory
    ],
)
def test_demo_constants_reproduce_recalled_lines(demo, name, state_label, j_lower, k, frequency_mhz, tolerance_mhz):
    line = linear_line_mhz(demo[name], j_lower, k, state_label)
    assert line == pytest.approx(frequency_mhz, abs=tolerance_mhz)


@pytest.fixture(scope="module")
def asymmetric_lines(demo):
    """name -> line table of the engine from 0 to 1 THz at 300 K, for the asymmetric tops checked below."""
    request = PredictionRequest(0.0, 1.0e6, 300.0)
    return {name: predict(demo[name], request).lines for name in ("H2S", "O3", "HCOOH", "H2CO", "SO2")}


@pytest.mark.parametrize(
    "name, upper, lower, frequency_mhz, tolerance_mhz",
    [
        ("H2CO", (1, 0, 1), (0, 0, 0), 72837.95, 0.05),  # H2CO 1_01-0_00, from memory
        ("SO2", (1, 1, 1), (0, 0, 0), 69575.93, 0.05),  # SO2 1_11-0_00, from memory
        ("H2S", (1, 1, 0), (1, 0, 1), 168762.76, 0.5),  # H2S 1_10-1_01, from memory
        ("H2S", (2, 2, 0), (2, 1, 1), 216710.44, 0.5),  # H2S 2_20-2_11, from memory
        ("H2S", (2, 0, 2), (1, 1, 1), 687303.5, 0.5),  # H2S 2_02-1_11, from memory
        ("O3", (6, 1, 5), (6, 0, 6), 110836.0, 0.3),  # O3 6_15-6_06, from memory
        ("O3", (10, 1, 9), (10, 0, 10), 142175.1, 0.3),  # O3 10_1,9-10_0,10, from memory
        ("O3", (1, 1, 1), (0, 0, 0), 118364.3, 0.3),  # O3 1_11-0_00, from memory
        ("HCOOH", (4, 0, 4), (3, 0, 3), 89579.17, 0.3),  # trans-HCOOH 4_04-3_03, from memory
        ("HCOOH", (4, 1, 3), (3, 1, 2), 93098.35, 0.3),  # trans-HCOOH 4_13-3_12, from memory
    ],
)
def test_demo_asymmetric_tops_reproduce_recalled_lines(
    asymmetric_lines, name, upper, lower, frequency_mhz, tolerance_mhz
):
    lines = asymmetric_lines[name]
    match = np.ones(len(lines), dtype=bool)
    for column, value in zip(("j_up", "ka_up", "kc_up", "j_lo", "ka_lo", "kc_lo"), upper + lower):
        match &= lines[column] == value
    (index,) = np.nonzero(match)
    assert len(index) == 1
    assert lines["frequency_mhz"][index[0]] == pytest.approx(frequency_mhz, abs=tolerance_mhz)


def test_demo_ozone_has_no_levels_with_ka_plus_kc_odd(asymmetric_lines):
    # spin-0 16O nuclei (textbook): the levels odd under C2(b) do not exist, so no line reaches them
    lines = asymmetric_lines["O3"]
    assert len(lines)
    assert np.all((lines["ka_up"] + lines["kc_up"]) % 2 == 0)
    assert np.all((lines["ka_lo"] + lines["kc_lo"]) % 2 == 0)


def test_demo_ethylene_oxide_is_the_same_in_both_representations_when_its_distortion_is_left_out(demo):
    # a rigid rotor has the same levels whatever the axis representation (textbook identity)
    iiir = demo["c-C2H4O"]
    rigid = State("v=0", 0.0, {name: iiir.states[0].constants_mhz[name] for name in ("A", "B", "C")})
    request = PredictionRequest(0.0, 200_000.0, 10.0)
    lines = {
        representation: predict(dataclasses.replace(iiir, states=(rigid,), representation=representation), request)
        for representation in ("Ir", "IIIr")
    }
    assert len(lines["Ir"].lines) == len(lines["IIIr"].lines) > 0
    np.testing.assert_allclose(lines["Ir"].lines["frequency_mhz"], lines["IIIr"].lines["frequency_mhz"], atol=1e-6)
