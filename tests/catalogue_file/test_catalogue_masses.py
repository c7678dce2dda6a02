"""Molecular masses from formulas, against periodictable's own element masses and CODATA."""

import periodictable
import pytest
from scipy import constants

from planner.catalogue_file import mass_from_formula

PT = periodictable


@pytest.mark.parametrize(
    "formula, expected_amu",
    [
        # source: periodictable library (IUPAC masses), summed element by element
        ("CO", PT.C.mass + PT.O.mass),
        ("OCS", PT.O.mass + PT.C.mass + PT.S.mass),
        ("C[13]O", PT.C[13].mass + PT.O.mass),
        ("OCS[34]", PT.O.mass + PT.C.mass + PT.S[34].mass),
        ("D2O", 2 * PT.D.mass + PT.O.mass),
        ("HDO", PT.H.mass + PT.D.mass + PT.O.mass),
        ("CH3CN", 2 * PT.C.mass + 3 * PT.H.mass + PT.N.mass),
        ("(CH3)2O", 2 * PT.C.mass + 6 * PT.H.mass + PT.O.mass),
    ],
)
def test_mass_is_the_sum_of_periodictable_masses(formula, expected_amu):
    assert mass_from_formula(formula) == pytest.approx(expected_amu, rel=1e-12)


def test_natural_abundance_co_textbook_value():
    # from memory: standard atomic weights C 12.011 + O 15.999 give CO ≈ 28.0101 u
    assert mass_from_formula("CO") == pytest.approx(28.0101, abs=1e-3)


def test_carbon_12_is_exactly_12_u():
    # textbook identity: the unified atomic mass unit is defined as 1/12 of the mass of a 12C atom
    assert mass_from_formula("C[12]") == 12.0


def test_deuterium_is_a_deuteron_plus_an_electron():
    # CODATA via scipy.constants; the 13.6 eV binding energy (1.5e-8 u) is below the tolerance
    expected_amu = (
        constants.physical_constants["deuteron mass in u"][0] + constants.physical_constants["electron mass in u"][0]
    )
    assert mass_from_formula("D") == pytest.approx(expected_amu, abs=1e-7)


def test_isotopologue_differs_from_natural_formula():
    # 12C16O against natural CO: common practice, no source — the natural mixture is heavier by ~0.015 u
    assert mass_from_formula("C[12]O[16]") < mass_from_formula("CO") - 0.01


def test_surrounding_spaces_are_ignored():
    assert mass_from_formula(" H2CO ") == mass_from_formula("H2CO")


@pytest.mark.parametrize(
    "formula, words",
    [
        ("", "empty"),
        ("   ", "empty"),
        ("co", "periodictable"),
        ("Xx2", "periodictable"),
        ("OC[34]S", "34 is not an isotope of C"),  # the bracket belongs to the element before it
        ("C[99]O", "not an isotope"),
        ("2CO", "count"),
        ("C1.5O", "fractional"),
        ("H2O@1.0", "material"),
        ("50%wt H2O // D2O", "material"),
    ],
)
def test_unreadable_formulas_raise_value_error(formula, words):
    with pytest.raises(ValueError, match=words):
        mass_from_formula(formula)


def test_non_text_formula_raises_value_error():
    with pytest.raises(ValueError):
        mass_from_formula(None)
