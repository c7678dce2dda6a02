"""Molecular mass [u] from a chemical formula, with the periodictable library.

Syntax (periodictable's own, restricted to one molecule):

* elements with counts: ``CO``, ``H2CO``, ``CH3CN``, groups ``(CH3)2O``;
* an isotope in brackets *after* its element: ``C[13]O``, ``OCS[34]``,
  ``HC[13]N``; ``D`` and ``T`` stand for ``H[2]`` and ``H[3]``: ``HDO``, ``D2O``;
* a charge in braces: ``HCO{+}`` (the electron mass is taken off);
* an element without brackets has its standard atomic weight, i.e. the
  natural isotopic mixture (``CO`` -> 28.010 u, whereas 12C16O is 27.995 u);
  write every isotope (``C[12]O[16]``) when the exact isotopologue mass matters.

Refused: empty text, a leading count (``2CO``), fractional counts, densities
(``@``) and mixtures (``%``, ``//``), which describe materials, not molecules.
"""

from __future__ import annotations

import periodictable

_MATERIAL_MARKS = "@%/"


def mass_from_formula(formula: str) -> float:
    """Mass of one molecule of ``formula`` [u]; ValueError with a readable message if unreadable."""
    if not isinstance(formula, str) or not formula.strip():
        raise ValueError("is empty; give a chemical formula such as 'H2CO' or 'C[13]O'")
    text = formula.strip()
    if any(mark in text for mark in _MATERIAL_MARKS):
        raise ValueError(f"{formula!r} describes a material (density or mixture), not one molecule")
    if text[0].isdigit():
        raise ValueError(f"{formula!r} starts with a count; give the formula of one molecule")
    try:
        parsed = periodictable.formula(text)
    except Exception as error:  # periodictable raises parse, key and value errors alike
        detail = error.args[0] if isinstance(error, KeyError) and error.args else error
        raise ValueError(f"{formula!r} is not a formula periodictable can read: {detail}") from None
    if any(count != int(count) for count in parsed.atoms.values()):
        raise ValueError(f"{formula!r} has a fractional atom count")
    mass = float(parsed.mass)
    if not mass > 0:
        raise ValueError(f"{formula!r} has no mass")
    return mass


def atom_masses(formula: str) -> list[float]:
    """The mass of each atom of ``formula`` [u], one entry per atom, in periodictable's atom order.

    An element without an isotope mark gets its most abundant isotope (a
    diatomic's bond length needs the masses of the atoms in the molecule, not
    the natural mixture); ``C[13]O`` gets 13C.  ValueError if unreadable.
    """
    mass_from_formula(formula)  # the same checks and messages
    masses = []
    for atom, count in periodictable.formula(formula.strip()).atoms.items():
        if getattr(atom, "isotope", None) is None:  # an element, not an isotope: take its commonest isotope
            atom = max((atom[n] for n in atom.isotopes), key=lambda iso: iso.abundance)
        masses.extend([float(atom.mass)] * int(count))
    return masses


def diatomic_masses(formula: str) -> list[float] | None:
    """The two atom masses [u] of a diatomic formula (see :func:`atom_masses`); None for any other formula."""
    try:
        masses = atom_masses(formula)
    except ValueError:
        return None
    return masses if len(masses) == 2 else None
