"""The demo catalogue loads, covers every rotor kind and reproduces a few recalled line frequencies."""

import pytest

from planner.catalogue_file import DEMO_CATALOGUE_PATH, load_catalogue
from planner.engine.species import ROTOR_KINDS, SpinWeights


@pytest.fixture(scope="module")
def demo():
    return {species.name: species for species in load_catalogue(DEMO_CATALOGUE_PATH)}


def test_demo_file_is_shipped_beside_the_package():
    assert DEMO_CATALOGUE_PATH.name == "catalogue.json"
    assert DEMO_CATALOGUE_PATH.is_file()


def test_demo_has_six_to_nine_species_of_every_rotor_kind(demo):
    assert 6 <= len(demo) <= 9
    assert {s.rotor for s in demo.values()} == set(ROTOR_KINDS)


def test_demo_covers_the_format_options(demo):
    species = demo.values()
    assert any(s.rotor == "asymmetric" and s.reduction == "S" for s in species)
    assert any(s.rotor == "asymmetric" and s.reduction == "A" for s in species)
    assert any(len(s.states) > 1 and max(st.energy_cm1 for st in s.states) > 0 for s in species)
    assert any(not s.has_dipole for s in species)
    assert {s.spin_weights.axis for s in species if s.spin_weights} >= {"C3", "a", "b"}


def test_demo_spin_weights(demo):
    # textbook nuclear-spin statistics: H2CO ortho (Ka odd) 3 : para 1 about its a axis;
    # SO2 with two spin-0 16O nuclei keeps only the levels symmetric under C2(b)
    assert demo["H2CO"].spin_weights == SpinWeights(axis="a", even=1, odd=3)
    assert demo["SO2"].spin_weights == SpinWeights(axis="b", even=1, odd=0)


def test_every_demo_species_says_where_its_numbers_come_from_and_that_the_scenario_is_invented(demo):
    for species in demo.values():
        assert "from memory" in species.source, species.name
        assert "invented" in species.notes, species.name


def linear_line_mhz(species, j_lower, k=0):
    """ν(J+1 <- J) = 2B(J+1) - 4D(J+1)^3 - 2DJK(J+1)K^2 [MHz] (textbook closed form, sextic terms left out)."""
    state = species.states[0]
    j1 = j_lower + 1
    if species.rotor == "linear":
        return 2 * state.value("B") * j1 - 4 * state.value("D") * j1**3
    return 2 * state.value("B") * j1 - 4 * state.value("DJ") * j1**3 - 2 * state.value("DJK") * j1 * k**2


@pytest.mark.parametrize(
    "name, j_lower, k, frequency_mhz",
    [
        ("CO", 0, 0, 115271.202),  # CO J=1-0, from memory
        ("OCS", 7, 0, 97301.21),  # OCS J=8-7, from memory
        ("HCN", 0, 0, 88631.60),  # HCN J=1-0 without hyperfine, from memory
        ("CH3CN", 4, 0, 91987.09),  # CH3CN J=5-4 K=0, from memory
        ("CH3CN", 4, 3, 91971.13),  # CH3CN J=5-4 K=3, from memory
    ],
)
def test_demo_constants_reproduce_recalled_lines(demo, name, j_lower, k, frequency_mhz):
    assert linear_line_mhz(demo[name], j_lower, k) == pytest.approx(frequency_mhz, abs=0.05)
