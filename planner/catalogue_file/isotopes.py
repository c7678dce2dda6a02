"""Isotopes of the elements: masses [u] and natural fractions, read from the periodictable package.

No mass or abundance is typed in here: every number comes from periodictable
([1]), whose isotope masses are those of the 2020 atomic mass evaluation ([2])
and whose abundances are the centre values of the IUPAC isotopic compositions
([3], [4]).  periodictable states abundances in per cent; this module gives
them as fractions in [0, 1].

Isotope text is the mass number followed by the element symbol, as
spectroscopists write it: ``"13C"``, ``"18O"``, ``"34S"``, ``"2H"``; ``"D"``
and ``"T"`` stand for ``"2H"`` and ``"3H"``.  Element symbols keep their usual
case (``"13c"`` and ``"13CL"`` are refused, with the spelling meant).

Formulas follow periodictable's syntax, as described in
:mod:`planner.catalogue_file.masses` (``"OCS"``, ``"C[13]O"``, ``"HDO"``).

References
----------
[1] P. A. Kienzle, *periodictable* (Python package), module ``periodictable.mass``.
[2] M. Wang et al., "The AME 2020 atomic mass evaluation (II)", Chin. Phys. C
    45, 030003 (2021).
[3] CIAAW, "Isotopic compositions of the elements 2021", www.ciaaw.org.
[4] J. Meija et al., "Isotopic compositions of the elements 2013 (IUPAC
    Technical Report)", Pure Appl. Chem. 88, 293 (2016).
"""

from __future__ import annotations

import dataclasses
import math
import numbers
import re

import periodictable
from periodictable.core import Element, Ion, Isotope

from .masses import mass_from_formula

__all__ = [
    "IsotopeInfo",
    "atoms_of_formula",
    "isotope_info",
    "isotope_mass_amu",
    "isotopes_of",
    "most_abundant",
    "natural_fraction",
    "parse_isotope",
]

#: The hydrogen isotopes with a symbol of their own: symbol -> mass number.
HYDROGEN_ISOTOPE_SYMBOLS = {"D": 2, "T": 3}

_ISOTOPE_TEXT = re.compile(r"(?P<mass>\d+)(?P<symbol>[A-Za-z]{1,3})")
_SYMBOL_FIRST = re.compile(r"(?P<symbol>[A-Za-z]{1,3})-?(?P<mass>\d+)")


@dataclasses.dataclass(frozen=True)
class IsotopeInfo:
    """One isotope: element symbol, mass number, mass [u], natural fraction [0, 1], and its label.

    ``label`` is the mass number followed by the symbol (``"13C"``, ``"2H"``);
    it is derived from the other fields, not passed in.
    """

    symbol: str
    mass_number: int
    mass_amu: float
    natural_fraction: float
    label: str = dataclasses.field(init=False)

    def __post_init__(self):
        object.__setattr__(self, "label", f"{self.mass_number}{self.symbol}")


def parse_isotope(text: str) -> tuple[str, int]:
    """(element symbol, mass number) of an isotope written like ``"13C"``, ``"D"`` or ``"T"``.

    Parameters
    ----------
    text : mass number then element symbol, in the symbol's usual case
        (``"18O"``, ``"34S"``, ``"2H"``); ``"D"`` is 2H and ``"T"`` is 3H.
        Surrounding spaces are ignored.

    Returns
    -------
    (symbol, mass_number), e.g. ``("C", 13)``; ``("H", 2)`` for ``"D"``.

    Raises
    ------
    ValueError : empty or unreadable text; a symbol in the wrong case (the
        message gives the spelling meant); an unknown element; a mass number
        periodictable does not know for that element; or an isotope with
        neither a natural abundance nor a mass.  A synthetic isotope with a
        mass (``"3H"``, ``"14C"``) is accepted.
    """
    if not isinstance(text, str) or not text.strip():
        raise ValueError(f"isotope text is empty or not text ({text!r}); write it like '13C', '18O' or 'D'")
    stripped = text.strip()
    if stripped in HYDROGEN_ISOTOPE_SYMBOLS:
        return "H", HYDROGEN_ISOTOPE_SYMBOLS[stripped]
    if stripped.upper() in HYDROGEN_ISOTOPE_SYMBOLS and len(stripped) == 1:
        raise ValueError(f"isotope {text!r}: symbols are case-sensitive; did you mean {stripped.upper()!r}?")
    match = _ISOTOPE_TEXT.fullmatch(stripped)
    if match is None:
        raise ValueError(f"isotope {text!r} is not readable; {_reading_hint(stripped)}")
    symbol, mass_number = match["symbol"], int(match["mass"])
    if symbol in HYDROGEN_ISOTOPE_SYMBOLS:
        raise ValueError(f"isotope {text!r}: {symbol!r} already names a hydrogen isotope; write {symbol!r} alone")
    element = _element_or_none(symbol)
    if element is None:
        meant = _case_corrected(symbol)
        if meant is not None:
            raise ValueError(f"isotope {text!r}: symbols are case-sensitive; did you mean '{mass_number}{meant}'?")
        raise ValueError(f"isotope {text!r}: {symbol!r} is not an element symbol")
    isotope = _isotope(element, mass_number, f"isotope {text!r}")
    if not _has_mass(isotope) and not _fraction(isotope) > 0.0:
        raise ValueError(f"isotope {text!r}: periodictable gives it neither a natural abundance nor a mass")
    return element.symbol, mass_number


def isotope_info(symbol: str, mass_number: int) -> IsotopeInfo:
    """:class:`IsotopeInfo` of one isotope, natural or synthetic (``("H", 3)`` has fraction 0).

    Parameters
    ----------
    symbol : element symbol, usual case (``"C"``, ``"Cl"``); ``"H"`` for D and T.
    mass_number : mass number A, a positive integer periodictable knows for the element.

    Raises
    ------
    ValueError : as :func:`isotope_mass_amu`.
    """
    element = _element(symbol)
    isotope = _isotope(element, mass_number, "mass_number")
    return IsotopeInfo(element.symbol, int(mass_number), _mass(isotope), _fraction(isotope))


def isotope_mass_amu(symbol: str, mass_number: int) -> float:
    """Mass of one atom of an isotope [u] (neutral atom, electrons included).

    Parameters
    ----------
    symbol : element symbol, usual case; ``"H"`` for deuterium and tritium.
    mass_number : mass number A, a positive integer periodictable knows for the element.

    Raises
    ------
    ValueError : unknown symbol (``"D"`` is answered with ``symbol='H',
        mass_number=2``), a mass number periodictable does not know, or an
        isotope periodictable has no mass for.
    """
    element = _element(symbol)
    return _mass(_isotope(element, mass_number, "mass_number"))


def natural_fraction(symbol: str, mass_number: int) -> float:
    """Natural isotopic fraction of an isotope among the atoms of its element, in [0, 1].

    Parameters
    ----------
    symbol, mass_number : as for :func:`isotope_mass_amu`.

    Returns
    -------
    x = a / 100 with a the abundance periodictable gives [%]: 0.0107 rather
    than 1.07 for 13C, and 0.0 for a synthetic isotope such as 3H or 14C.
    """
    element = _element(symbol)
    return _fraction(_isotope(element, mass_number, "mass_number"))


def most_abundant(symbol: str) -> int:
    """Mass number of the commonest natural isotope of an element (12 for ``"C"``).

    Raises
    ------
    ValueError : unknown symbol, or an element with no natural isotope in
        periodictable's table (``"Tc"``), whose isotope must then be named.
    """
    element = _element(symbol)
    natural = _natural_isotopes(element)
    if not natural:
        raise ValueError(
            f"symbol {symbol!r}: periodictable lists no naturally occurring isotope of {element.symbol}; "
            "name the isotope by its mass number"
        )
    return max(natural, key=_fraction).isotope


def isotopes_of(symbol: str, min_fraction: float = 0.0) -> list[IsotopeInfo]:
    """The naturally present isotopes of an element, lightest first (to fill a choice list).

    Parameters
    ----------
    symbol : element symbol, usual case.  ``"H"`` gives 1H and 2H (deuterium);
        3H, with no natural abundance in periodictable, is left out.
    min_fraction : keep only isotopes whose natural fraction is ≥ this, in
        [0, 1] (default 0: every isotope with a fraction > 0).  Note that 2H
        (fraction about 1.5e-4) drops out above that value.

    Returns
    -------
    list of :class:`IsotopeInfo` sorted by mass number; empty for an element
    with no natural isotope in periodictable's table (``"Tc"``).
    """
    element = _element(symbol)
    if (
        isinstance(min_fraction, bool)
        or not isinstance(min_fraction, numbers.Real)
        or not 0.0 <= min_fraction <= 1.0  # also refuses NaN
    ):
        raise ValueError(f"min_fraction must be a fraction in [0, 1], got {min_fraction!r}")
    kept = [iso for iso in _natural_isotopes(element) if _fraction(iso) >= min_fraction]
    return [
        IsotopeInfo(element.symbol, iso.isotope, _mass(iso), _fraction(iso))
        for iso in sorted(kept, key=lambda iso: iso.isotope)
    ]


def atoms_of_formula(formula: str) -> list[tuple[str, int]]:
    """One (element symbol, mass number) per atom of a molecular formula.

    Parameters
    ----------
    formula : one molecule in periodictable syntax (see
        :mod:`planner.catalogue_file.masses`): ``"OCS"``, ``"C[13]O"``,
        ``"HDO"``, ``"D2O"``, ``"(CH3)2O"``, ``"HCO{+}"``.

    Returns
    -------
    list of (symbol, mass_number), as many entries as the molecule has atoms.
    An atom with no isotope mark gets its element's commonest isotope
    (:func:`most_abundant`); ``D`` and ``T`` give ``("H", 2)`` and ``("H", 3)``;
    a charge does not change the isotope.

    Order: periodictable merges repeated atoms, so the list holds each
    distinct atom (element, marked isotope, or charged form) as many times as
    it occurs, the distinct atoms in the order of their *first appearance* in
    the text.  That is not the order of the atoms along the molecule:
    ``"CH3CN"`` gives C, C, H, H, H, N; ``"CH3C[13]N"`` gives C, H, H, H, 13C,
    N; ``"OCS"`` gives O, C, S.  Match atoms to coordinates by element, not by
    position.

    Raises
    ------
    ValueError : anything :func:`~planner.catalogue_file.masses.mass_from_formula`
        refuses, or an unmarked element with no natural isotope (``"TcO4{-}"``).
    """
    mass_from_formula(formula)  # the same checks and messages as for masses
    atoms = []
    for atom, count in periodictable.formula(formula.strip()).atoms.items():
        while isinstance(atom, Ion):  # a charge leaves the nucleus alone
            atom = atom.element
        if isinstance(atom, Isotope):
            entry = (atom.element.symbol, int(atom.isotope))
        else:
            try:
                entry = (atom.symbol, most_abundant(atom.symbol))
            except ValueError:
                raise ValueError(
                    f"formula {formula!r}: {atom.symbol} has no natural isotope; mark the one meant in brackets, "
                    f"like '{atom.symbol}[A]' with A its mass number"
                ) from None
        atoms.extend([entry] * int(count))
    return atoms


# --- Helpers -------------------------------------------------------------------------------------


def _element_or_none(symbol: str) -> Element | None:
    """The periodictable element of ``symbol`` (exact case), or None; D, T and the neutron 'n' are not elements."""
    try:
        found = periodictable.elements.symbol(symbol)
    except ValueError:
        return None
    if not isinstance(found, Element) or found.number < 1:
        return None
    return found


def _case_corrected(symbol: str) -> str | None:
    """The symbol meant by a wrong-case spelling ('c' -> 'C', 'CL' -> 'Cl'), or None."""
    meant = symbol.capitalize()
    return meant if meant != symbol and _element_or_none(meant) is not None else None


def _element(symbol) -> Element:
    """The element of ``symbol``, or ValueError naming the argument and the likely spelling."""
    if not isinstance(symbol, str) or not symbol.strip():
        raise ValueError(f"symbol must be an element symbol such as 'C' or 'Cl', got {symbol!r}")
    element = _element_or_none(symbol.strip())
    if element is not None:
        return element
    if symbol.strip() in HYDROGEN_ISOTOPE_SYMBOLS:
        number = HYDROGEN_ISOTOPE_SYMBOLS[symbol.strip()]
        raise ValueError(f"symbol {symbol!r} is an isotope of hydrogen; give symbol 'H' and mass_number {number}")
    meant = _case_corrected(symbol.strip())
    if meant is not None:
        raise ValueError(f"symbol {symbol!r}: element symbols are case-sensitive; did you mean {meant!r}?")
    raise ValueError(f"symbol {symbol!r} is not an element symbol")


def _isotope(element: Element, mass_number, argument: str) -> Isotope:
    """Isotope A of ``element``, or ValueError naming ``argument`` and the mass numbers known."""
    if isinstance(mass_number, bool) or not isinstance(mass_number, numbers.Integral):
        raise ValueError(f"{argument} must be an integer mass number, got {mass_number!r}")
    known = element.isotopes
    if mass_number not in known:
        raise ValueError(
            f"{argument}: periodictable knows no isotope {mass_number}{element.symbol}; "
            f"its mass numbers for {element.symbol} run from {known[0]} to {known[-1]}"
        )
    return element[int(mass_number)]


def _has_mass(isotope: Isotope) -> bool:
    mass = isotope.mass
    return isinstance(mass, numbers.Real) and math.isfinite(mass) and mass > 0.0


def _mass(isotope: Isotope) -> float:
    """Mass of ``isotope`` [u], or ValueError when periodictable has none."""
    if not _has_mass(isotope):
        raise ValueError(f"periodictable has no mass for {isotope.isotope}{isotope.element.symbol}")
    return float(isotope.mass)


def _fraction(isotope: Isotope) -> float:
    """Natural fraction in [0, 1] from periodictable's abundance [%]; 0 when it gives none."""
    abundance = isotope.abundance
    if not isinstance(abundance, numbers.Real) or not math.isfinite(abundance) or abundance <= 0.0:
        return 0.0
    return float(abundance) / 100.0  # per cent -> fraction


def _natural_isotopes(element: Element) -> list[Isotope]:
    return [element[number] for number in element.isotopes if _fraction(element[number]) > 0.0]


def _reading_hint(text: str) -> str:
    """What to write instead of unreadable isotope text."""
    reversed_order = _SYMBOL_FIRST.fullmatch(text)
    if reversed_order is not None:
        symbol = _case_corrected(reversed_order["symbol"]) or reversed_order["symbol"]
        return f"put the mass number first: '{int(reversed_order['mass'])}{symbol}'"
    element = _element_or_none(text)
    if element is not None:
        natural = _natural_isotopes(element)
        example = max(natural, key=_fraction).isotope if natural else element.isotopes[0]
        return f"give the mass number too, e.g. '{example}{element.symbol}'"
    return "write the mass number then the element symbol, like '13C', '18O', or 'D' for 2H"
