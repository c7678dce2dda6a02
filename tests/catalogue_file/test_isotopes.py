"""Isotope masses, natural fractions, isotope text and formula atoms of planner/catalogue_file/isotopes.py.

Most expected values are periodictable's own (the module must pass them on
unchanged, converting per cent to a fraction).  A few handbook values check
that the data are the right ones; each is labelled "from memory" with the
table it comes from, or "textbook identity".
"""

from __future__ import annotations

import dataclasses
import math

import periodictable
import pytest

from planner.catalogue_file.isotopes import (
    IsotopeInfo,
    atoms_of_formula,
    isotope_info,
    isotope_mass_amu,
    isotopes_of,
    most_abundant,
    natural_fraction,
    parse_isotope,
)

#: Representative isotopic composition, (fraction, its stated uncertainty), from memory of
#: J. Meija et al., "Isotopic compositions of the elements 2013", Pure Appl. Chem. 88, 293 (2016).
HANDBOOK_FRACTIONS = {
    ("C", 13): (0.0107, 0.0008),
    ("O", 18): (0.00205, 0.00014),
    ("S", 34): (0.0425, 0.0024),
}

#: Atomic masses [u], from memory of the AME2016/AME2020 mass evaluations (their last digit is
#: well inside the stated uncertainty, so 1e-7 u is the test tolerance).
HANDBOOK_MASSES_AMU = {("C", 13): 13.0033548, ("O", 18): 17.9991596}


# --- Isotope text ------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("13C", ("C", 13)),
        ("12C", ("C", 12)),
        ("18O", ("O", 18)),
        ("34S", ("S", 34)),
        ("2H", ("H", 2)),
        ("1H", ("H", 1)),
        ("37Cl", ("Cl", 37)),
        ("D", ("H", 2)),
        ("T", ("H", 3)),
        ("3H", ("H", 3)),
        ("14C", ("C", 14)),  # synthetic, with a mass: accepted
        ("  15N ", ("N", 15)),
    ],
)
def test_parse_isotope(text, expected):
    assert parse_isotope(text) == expected


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("13c", "did you mean '13C'"),
        ("37CL", "did you mean '37Cl'"),
        ("d", "did you mean 'D'"),
        ("C13", "mass number first: '13C'"),
        ("c13", "mass number first: '13C'"),
        ("C", "give the mass number too, e.g. '12C'"),
        ("13Xx", "'Xx' is not an element symbol"),
        ("13Q", "'Q' is not an element symbol"),
        ("99C", "knows no isotope 99C"),
        ("0O", "knows no isotope 0O"),
        ("2D", "already names a hydrogen isotope"),
        ("13", "write the mass number then the element symbol"),
        ("13C O", "not readable"),
        ("", "empty"),
        ("   ", "empty"),
        (None, "empty or not text"),
    ],
)
def test_parse_isotope_refuses_with_a_clear_message(text, message):
    with pytest.raises(ValueError, match=message):
        parse_isotope(text)


def test_parse_isotope_refuses_an_isotope_with_neither_abundance_nor_mass(monkeypatch):
    """periodictable gives every isotope it lists a mass; one without mass and abundance is refused."""
    # periodictable keeps the mass and the abundance in these attributes behind its properties.
    monkeypatch.setattr(periodictable.C[22], "_mass", None)
    monkeypatch.setattr(periodictable.C[22], "_abundance", 0)
    with pytest.raises(ValueError, match="neither a natural abundance nor a mass"):
        parse_isotope("22C")
    with pytest.raises(ValueError, match="no mass for 22C"):
        isotope_mass_amu("C", 22)


def test_every_isotope_periodictable_lists_has_a_positive_mass():
    """So the refusal above is a guard only: all of periodictable's isotopes parse (periodictable data)."""
    for element in periodictable.elements:
        if element.number < 1:
            continue
        for mass_number in element.isotopes:
            assert parse_isotope(f"{mass_number}{element.symbol}") == (element.symbol, mass_number)


# --- Masses ------------------------------------------------------------------------------------


@pytest.mark.parametrize(("symbol", "mass_number"), [("C", 12), ("C", 13), ("O", 18), ("S", 34), ("H", 2), ("H", 3)])
def test_isotope_mass_is_periodictables(symbol, mass_number):
    assert isotope_mass_amu(symbol, mass_number) == periodictable.elements.symbol(symbol)[mass_number].mass


@pytest.mark.parametrize(("key", "expected_amu"), sorted(HANDBOOK_MASSES_AMU.items()))
def test_isotope_mass_matches_the_mass_evaluation(key, expected_amu):
    """From memory (AME2016/AME2020)."""
    assert isotope_mass_amu(*key) == pytest.approx(expected_amu, abs=1e-7)


def test_carbon_12_is_12_u_exactly():
    """Textbook identity: the unified atomic mass unit is 1/12 of the mass of a 12C atom."""
    assert isotope_mass_amu("C", 12) == 12.0


def test_deuterium_and_tritium_masses_are_those_of_periodictables_d_and_t():
    """periodictable's D and T are H[2] and H[3] (periodictable data)."""
    assert isotope_mass_amu(*parse_isotope("D")) == periodictable.D.mass
    assert isotope_mass_amu(*parse_isotope("T")) == periodictable.T.mass


# --- Natural fractions -------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("symbol", "mass_number"), [("C", 12), ("C", 13), ("O", 16), ("O", 17), ("O", 18), ("S", 34), ("H", 2)]
)
def test_natural_fraction_is_periodictables_per_cent_over_100(symbol, mass_number):
    abundance_per_cent = periodictable.elements.symbol(symbol)[mass_number].abundance
    assert natural_fraction(symbol, mass_number) == pytest.approx(abundance_per_cent / 100.0, rel=1e-15)


@pytest.mark.parametrize(("key", "handbook"), sorted(HANDBOOK_FRACTIONS.items()))
def test_natural_fraction_is_within_the_handbooks_stated_uncertainty(key, handbook):
    """From memory (IUPAC 2013 representative composition), value ± its stated uncertainty."""
    value, uncertainty = handbook
    assert abs(natural_fraction(*key) - value) <= uncertainty


def test_synthetic_isotopes_have_fraction_zero():
    """3H and 14C are not part of the natural composition in periodictable's table."""
    assert natural_fraction("H", 3) == 0.0
    assert natural_fraction(*parse_isotope("T")) == 0.0
    assert natural_fraction("C", 14) == 0.0


def test_fractions_of_each_element_are_in_zero_one_and_sum_to_one_or_zero():
    """A composition sums to 1 (textbook identity); periodictable adjusted its per cents to sum to 100."""
    for element in periodictable.elements:
        if element.number < 1:
            continue
        fractions = [natural_fraction(element.symbol, n) for n in element.isotopes]
        assert all(0.0 <= f <= 1.0 for f in fractions), element.symbol
        assert math.fsum(fractions) == pytest.approx(1.0, abs=1e-3) or math.fsum(fractions) == 0.0, element.symbol


# --- Most abundant and the list of isotopes ----------------------------------------------------


@pytest.mark.parametrize(
    ("symbol", "expected"), [("H", 1), ("C", 12), ("N", 14), ("O", 16), ("S", 32), ("Cl", 35), ("Br", 79)]
)
def test_most_abundant(symbol, expected):
    """From memory (every chemistry handbook); Br: 79Br 50.7 % against 81Br 49.3 %."""
    assert most_abundant(symbol) == expected


def test_most_abundant_refuses_an_element_with_no_natural_isotope():
    with pytest.raises(ValueError, match="no naturally occurring isotope of Tc"):
        most_abundant("Tc")


def test_isotopes_of_hydrogen_are_1h_and_2h():
    """Deuterium is listed; tritium, with no natural abundance, is not."""
    listed = isotopes_of("H")
    assert [iso.label for iso in listed] == ["1H", "2H"]
    assert listed[1] == IsotopeInfo("H", 2, periodictable.D.mass, periodictable.D.abundance / 100.0)


def test_isotopes_of_sulfur_sorted_by_mass_number_with_periodictables_values():
    listed = isotopes_of("S")
    assert [iso.mass_number for iso in listed] == [32, 33, 34, 36]
    for iso in listed:
        assert iso.symbol == "S"
        assert iso.label == f"{iso.mass_number}S"
        assert iso.mass_amu == periodictable.S[iso.mass_number].mass
        assert iso.natural_fraction == pytest.approx(periodictable.S[iso.mass_number].abundance / 100.0, rel=1e-15)


def test_min_fraction_drops_the_rare_isotopes():
    assert [iso.label for iso in isotopes_of("S", min_fraction=0.01)] == ["32S", "34S"]
    assert [iso.label for iso in isotopes_of("O", min_fraction=0.001)] == ["16O", "18O"]
    assert [iso.label for iso in isotopes_of("H", min_fraction=0.001)] == ["1H"]
    assert isotopes_of("C", min_fraction=1.0) == []


def test_isotopes_of_an_element_with_no_natural_isotope_is_empty():
    assert isotopes_of("Tc") == []


def test_isotope_info_is_frozen_and_its_label_follows_the_fields():
    info = isotope_info("C", 13)
    assert info.label == "13C"
    assert dataclasses.asdict(info)["label"] == "13C"
    with pytest.raises(dataclasses.FrozenInstanceError):
        info.mass_number = 12
    assert isotope_info("H", 3).natural_fraction == 0.0


@pytest.mark.parametrize(
    ("call", "message"),
    [
        (lambda: isotope_mass_amu("c", 13), "did you mean 'C'"),
        (lambda: isotope_mass_amu("D", 2), "give symbol 'H' and mass_number 2"),
        (lambda: isotope_mass_amu("Xx", 13), "'Xx' is not an element symbol"),
        (lambda: isotope_mass_amu("C", 99), "mass_number: periodictable knows no isotope 99C"),
        (lambda: isotope_mass_amu("C", 13.0), "mass_number must be an integer"),
        (lambda: isotope_mass_amu("C", True), "mass_number must be an integer"),
        (lambda: natural_fraction("", 13), "symbol must be an element symbol"),
        (lambda: natural_fraction(6, 13), "symbol must be an element symbol"),
        (lambda: most_abundant("T"), "give symbol 'H' and mass_number 3"),
        (lambda: most_abundant("n"), "did you mean 'N'"),
        (lambda: isotopes_of("CL"), "did you mean 'Cl'"),
        (lambda: isotopes_of("C", min_fraction=-0.1), "min_fraction"),
        (lambda: isotopes_of("C", min_fraction=1.5), "min_fraction"),
        (lambda: isotopes_of("C", min_fraction=math.nan), "min_fraction"),
    ],
)
def test_bad_arguments_are_named(call, message):
    with pytest.raises(ValueError, match=message):
        call()


# --- Atoms of a formula ------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("formula", "expected"),
    [
        ("CO", [("C", 12), ("O", 16)]),
        ("C[13]O", [("C", 13), ("O", 16)]),
        ("OCS", [("O", 16), ("C", 12), ("S", 32)]),
        ("OCS[34]", [("O", 16), ("C", 12), ("S", 34)]),
        ("SO2", [("S", 32), ("O", 16), ("O", 16)]),
        ("HDO", [("H", 1), ("H", 2), ("O", 16)]),
        ("DHO", [("H", 2), ("H", 1), ("O", 16)]),
        ("D2O", [("H", 2), ("H", 2), ("O", 16)]),
        ("T2O", [("H", 3), ("H", 3), ("O", 16)]),
        ("HCO{+}", [("H", 1), ("C", 12), ("O", 16)]),
        ("HC[13]O{+}", [("H", 1), ("C", 13), ("O", 16)]),
    ],
)
def test_atoms_of_formula(formula, expected):
    assert atoms_of_formula(formula) == expected


def test_atoms_of_formula_merge_repeats_in_order_of_first_appearance():
    """periodictable merges repeated atoms, keeping the order in which each first appears (periodictable 2.x)."""
    assert atoms_of_formula("CH3CN") == [("C", 12)] * 2 + [("H", 1)] * 3 + [("N", 14)]
    assert atoms_of_formula("CH3C[13]N") == [("C", 12)] + [("H", 1)] * 3 + [("C", 13), ("N", 14)]
    assert atoms_of_formula("(CH3)2O") == [("C", 12)] * 2 + [("H", 1)] * 6 + [("O", 16)]
    assert atoms_of_formula("CH2DOH") == [("C", 12)] + [("H", 1)] * 3 + [("H", 2), ("O", 16)]


def test_atoms_of_formula_give_one_entry_per_atom():
    for formula in ("CH3CN", "(CH3)2O", "H2CO", "C6H6"):
        atoms = atoms_of_formula(formula)
        assert len(atoms) == sum(int(n) for n in periodictable.formula(formula).atoms.values())


@pytest.mark.parametrize(
    ("formula", "message"),
    [
        ("", "empty"),
        ("2CO", "starts with a count"),
        ("Xy2", "not a formula periodictable can read"),
        ("C[99]O", "not a formula periodictable can read"),
        ("H2O@1", "material"),
        ("CH0.5", "fractional"),
        ("TcO", "Tc has no natural isotope"),
    ],
)
def test_atoms_of_formula_refuses_with_a_clear_message(formula, message):
    with pytest.raises(ValueError, match=message):
        atoms_of_formula(formula)


def test_atoms_of_formula_accept_a_marked_synthetic_isotope():
    assert atoms_of_formula("Tc[99]O") == [("Tc", 99), ("O", 16)]
