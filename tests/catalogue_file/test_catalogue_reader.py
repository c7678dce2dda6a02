"""A valid catalogue file is read into engine Species, with the documented defaults."""

import pytest

from planner.catalogue_file import load_catalogue, mass_from_formula, parse_catalogue
from planner.engine import Species, SpinWeights


def test_valid_file_loads_every_species_in_order(catalogue_data, write_json):
    species = load_catalogue(write_json(catalogue_data))

    assert [s.name for s in species] == ["lin", "prolate", "oblate", "asym"]
    assert all(isinstance(s, Species) for s in species)
    assert [s.rotor for s in species] == ["linear", "symmetric-prolate", "symmetric-oblate", "asymmetric"]


def test_path_may_be_text(catalogue_data, write_json):
    assert len(load_catalogue(str(write_json(catalogue_data)))) == 4


def test_states_keep_values_sigmas_and_energies(catalogue_data):
    linear = parse_catalogue(catalogue_data)[0]

    assert [s.label for s in linear.states] == ["v=0", "v1=1"]
    assert linear.states[0].constants_mhz["D"] == (0.0013, 1e-6)
    assert linear.states[1].energy_cm1 == 859.0
    assert linear.states[1].constants_mhz == {"B": (6063.0, 0.01)}


def test_missing_dipole_components_are_zero(catalogue_data):
    species = parse_catalogue(catalogue_data)

    assert species[0].dipole_debye == (0.7, 0.0, 0.0)
    assert species[2].dipole_debye == (0.0, 0.0, 1.65)
    assert species[3].dipole_debye == (0.0, 1.63, 0.0)


def test_mass_comes_from_the_formula_unless_given(catalogue_data):
    species = parse_catalogue(catalogue_data)

    assert species[0].mass_amu == mass_from_formula("OCS")
    assert species[3].mass_amu == 63.96


def test_defaults_for_reduction_representation_source_notes(catalogue_data):
    linear, asym = parse_catalogue(catalogue_data)[0], parse_catalogue(catalogue_data)[3]

    assert (linear.reduction, linear.representation, linear.source, linear.notes) == ("A", "Ir", "", "")
    assert (asym.source, asym.notes) == ("test fixture", "fixture only")


def test_spin_weights_of_both_kinds_map_to_the_engine(catalogue_data):
    species = parse_catalogue(catalogue_data)

    assert species[1].spin_weights == SpinWeights(axis="C3", even=4, odd=2)
    assert species[3].spin_weights == SpinWeights(axis="b", even=1, odd=0)
    assert species[0].spin_weights is None


def test_s_reduction_and_iiir_are_read(catalogue_data):
    entry = catalogue_data["species"][3]
    entry.update(reduction="S", representation="IIIr")
    entry["states"][0]["constants_mhz"].update({"DJ": [0.0066, 0], "d1": [-0.0017, 0], "d2": [-0.0001, 0]})

    asym = parse_catalogue(catalogue_data)[3]

    assert (asym.reduction, asym.representation) == ("S", "IIIr")
    assert asym.states[0].constants_mhz["d2"] == (-0.0001, 0.0)


def test_an_empty_species_list_is_a_valid_empty_catalogue(catalogue_data):
    catalogue_data["species"] = []

    assert parse_catalogue(catalogue_data) == []


@pytest.mark.parametrize("formula", ["C[13]O", "HDO", "OCS[34]"])
def test_isotopic_formulas_are_accepted(catalogue_data, formula):
    catalogue_data["species"][0]["formula"] = formula

    assert parse_catalogue(catalogue_data)[0].mass_amu == mass_from_formula(formula)
