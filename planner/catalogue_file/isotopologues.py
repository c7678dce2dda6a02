"""A new isotopologue of a catalogue species: which atoms change, its constants, dipole and abundance.

The physics is the engine's (planner/engine/isotopologue.py); this module
adds what needs the isotope tables of periodictable (isotopes.py): the atoms
of the parent, their masses, the natural abundance of the new species, and
the bookkeeping of the new catalogue entry (name, formula, route and the
accuracy to expect, what was copied unchanged).

Routes, in the order they are tried:

* **mass-scaling** for a diatomic: B, D, H by the Dunham mass relations; B0
  through αe when the parent lists an excited state (taken as v = 1); each
  excited state's α scaled as μ^(−3/2) and its energy as μ^(−1/2).
* **geometry-ratio** for a polyatomic with a stored geometry: A, B, C scaled
  by the ratio of constants computed from the geometry with both sets of
  masses; centrifugal distortion constants and state energies are copied.
* otherwise the derivation is refused with the reason: the isotopologue's own
  constants have to be entered.

References
----------
[1] W. Gordy and R. L. Cook, *Microwave Molecular Spectra*, 3rd ed., Wiley 1984, Ch. 13.
[2] J. L. Dunham, Phys. Rev. 41, 721 (1932).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from planner.engine.equivalence import arrangement_count, equivalent_positions
from planner.engine.isotopologue import (
    DUNHAM_MASS_EXPONENTS,
    dunham_scaled_b0_mhz,
    dunham_scaled_constants_mhz,
    geometry_scaled_constants_mhz,
    natural_abundance,
    rotated_dipole_debye,
)
from planner.engine.species import Atom, Species, SpeciesError, State
from planner.engine.structure import reduced_mass_amu

from .isotopes import atoms_of_formula, isotope_mass_amu, most_abundant, natural_fraction, parse_isotope

#: 1σ given to each constant scaled through a geometry, as a fraction of its value [dimensionless]:
#: the ratio method usually lands within 0.01 % of the measured constants (common practice, no source; the
#: OCS test case is off by 17–60 ppm).
GEOMETRY_RELATIVE_SIGMA = 1e-4
#: 1σ floor of B scaled by the Dunham relations, as a fraction of B [dimensionless]: Born–Oppenheimer
#: breakdown and the neglected γe are of this order (common practice, no source; 7–8 ppm for 13CO and C18O).
DUNHAM_RELATIVE_SIGMA = 1e-5
#: A symmetric-top parent whose isotopologue's two moments differ by more than this fraction becomes
#: an asymmetric top (A-reduction) [dimensionless].
SYMMETRY_BROKEN_FRACTION = 1e-7
#: Symmetric-top distortion constants and their A-reduction names at the symmetric limit ([1] Ch. 8).
SYMMETRIC_TO_A_REDUCTION = {
    "DJ": "DeltaJ",
    "DJK": "DeltaJK",
    "DK": "DeltaK",
    "HJ": "PhiJ",
    "HJK": "PhiJK",
    "HKJ": "PhiKJ",
    "HK": "PhiK",
}

_SUBSTITUTION = re.compile(r"^\s*(?P<where>[A-Za-z]{1,3}|\d+)\s*=\s*(?P<isotope>\S+)\s*$")


class DerivationError(ValueError):
    """The isotopologue cannot be derived; the message says why and what to give instead."""


@dataclass(frozen=True)
class Derived:
    """The new species and, in words, what was done and what to watch."""

    species: Species
    substituted: tuple[int, ...]  # positions (0-based) of the atoms that changed
    notes: tuple[str, ...]


def parent_atoms(species: Species) -> list[tuple[str, int]]:
    """(element, mass number) of every atom: the stored geometry's order, else the formula's."""
    if species.geometry:
        return [(a.element, a.mass_number or most_abundant(a.element)) for a in species.geometry]
    return atoms_of_formula(species.formula)


def parse_substitutions(texts, atoms: list[tuple[str, int]]) -> dict[int, int]:
    """{position: new mass number} from texts such as "C=13C", "13C" or "2=18O" (positions from 1)."""
    if isinstance(texts, str):
        texts = [texts]
    wanted: dict[int, int] = {}
    for text in texts:
        match = _SUBSTITUTION.match(text) if isinstance(text, str) else None
        if match is None:
            try:
                element, mass = parse_isotope(text)
            except ValueError:
                raise DerivationError(
                    f"substitution {text!r}: write SYMBOL=ISOTOPE (C=13C) or POSITION=ISOTOPE (2=18O)"
                ) from None
            where = element
        else:
            where = match["where"]
            try:
                element, mass = parse_isotope(match["isotope"])
            except ValueError as error:
                raise DerivationError(f"substitution {text!r}: {error}") from None
        position = _position(where, element, atoms, text)
        if position in wanted:
            raise DerivationError(f"substitution {text!r}: atom {position + 1} is substituted twice")
        wanted[position] = mass
    if not wanted:
        raise DerivationError("give at least one substitution, e.g. C=13C")
    if all(atoms[p][1] == m for p, m in wanted.items()):
        raise DerivationError("these substitutions change no atom: the result would be the parent itself")
    return wanted


def _position(where: str, element: str, atoms, text: str) -> int:
    if where.isdigit():
        position = int(where) - 1
        if not 0 <= position < len(atoms):
            raise DerivationError(f"substitution {text!r}: the molecule has atoms 1 to {len(atoms)}")
        if atoms[position][0] != element:
            raise DerivationError(f"substitution {text!r}: atom {position + 1} is {atoms[position][0]}, not {element}")
        return position
    symbol = "H" if where in ("D", "T") else where
    places = [i for i, (e, _) in enumerate(atoms) if e == symbol]
    if symbol != element:
        raise DerivationError(f"substitution {text!r}: {element} is not an isotope of {symbol}")
    if not places:
        raise DerivationError(f"substitution {text!r}: the molecule has no {symbol} atom")
    if len(places) > 1:
        choices = ", ".join(f"{i + 1}={text.split('=')[-1].strip()}" for i in places)
        raise DerivationError(
            f"substitution {text!r}: the molecule has {len(places)} {symbol} atoms; give the position: {choices}"
        )
    return places[0]


def derive_isotopologue(parent: Species, substitutions, name: str | None = None) -> Derived:
    """The isotopologue of ``parent`` with the atoms in ``substitutions`` changed (see parse_substitutions).

    Raises DerivationError when no route applies or the input is wrong.
    """
    atoms = parent_atoms(parent)
    changes = parse_substitutions(substitutions, atoms)
    new_atoms = [(e, changes.get(i, m)) for i, (e, m) in enumerate(atoms)]
    masses_parent = [isotope_mass_amu(e, m) for e, m in atoms]
    masses_new = [isotope_mass_amu(e, m) for e, m in new_atoms]
    notes: list[str] = []
    if len(atoms) == 2 and parent.rotor == "linear":
        states, route, accuracy = _mass_scaled_states(parent, masses_parent, masses_new, notes)
        dipole = parent.dipole_debye
        rotor, reduction = parent.rotor, parent.reduction
    elif parent.geometry:
        rotor, reduction, states, dipole, accuracy = _geometry_scaled(parent, masses_parent, masses_new, notes)
        route = "geometry-ratio"
    else:
        raise DerivationError(
            f"{parent.name} has {len(atoms)} atoms and no stored geometry: its isotopologue's constants cannot be "
            "scaled. Add the geometry (Cartesian coordinates) to the parent, or enter the constants yourself."
        )
    abundance = _abundance(parent, atoms, new_atoms)
    spin_weights = parent.spin_weights
    if spin_weights is not None and _moves_substituted_atoms(parent, atoms, changes):
        spin_weights = None
        notes.append(
            "Spin weights dropped: substituting one of several equivalent atoms changes the symmetry; enter the "
            "weights of the new species if it keeps a symmetry axis."
        )
    hyperfine = parent.hyperfine
    if hyperfine is not None:
        nucleus_element = re.sub(r"\d", "", hyperfine.nucleus)
        if any(atoms[p][0] == nucleus_element for p in changes):
            hyperfine = None
            notes.append(f"Hyperfine structure dropped: the {parent.hyperfine.nucleus} nucleus itself was replaced.")
        elif route == "geometry-ratio" and rotor == "asymmetric":
            hyperfine = None
            notes.append("Hyperfine structure dropped: the principal axes moved; enter χ in the new axes.")
    formula = _formula(new_atoms, set(changes))
    new_name = name or _name(new_atoms, set(changes))
    route_note = f"{_route_words(route)} from {parent.name}. {accuracy}"
    geometry = ()
    if parent.geometry:
        geometry = tuple(Atom(a.element, new_atoms[i][1], a.xyz_a) for i, a in enumerate(parent.geometry))
    try:
        species = Species(
            name=new_name,
            rotor=rotor,
            mass_amu=sum(masses_new),
            dipole_debye=dipole,
            states=states,
            formula=formula,
            reduction=reduction,
            representation=parent.representation,
            spin_weights=spin_weights,
            source=f"Derived from {parent.name} ({route})."
            + (f" Parent's source: {parent.source}" if parent.source else ""),
            notes=" ".join(notes),
            hazards=parent.hazards,
            hyperfine=hyperfine,
            geometry=geometry,
            parent=parent.name,
            natural_abundance=abundance,
            constants_route=route,
            route_note=route_note,
        )
    except SpeciesError as error:
        raise DerivationError(f"the derived species breaks a rule: {error}") from None
    return Derived(species, tuple(sorted(changes)), tuple(notes))


def _moves_substituted_atoms(parent: Species, atoms, changes: dict[int, int]) -> bool:
    """True when a symmetry permutation of the parent moves a substituted atom.

    Then the exchange symmetry that the spin weights describe is changed (the
    atom is no longer equivalent to its partners, or they all now carry another
    nuclear spin).  Substituting atoms that every permutation leaves in place
    (S in SO2, the C atoms of CH3CN) keeps the weights.
    """
    elements = [e for e, _ in atoms]
    if parent.geometry:
        permutations = equivalent_positions(elements, [a.xyz_a for a in parent.geometry])
    else:  # without a geometry only a homonuclear diatomic has an exchange
        permutations = [(1, 0)] if len(atoms) == 2 and elements[0] == elements[1] else []
    return any(p[i] != i for p in permutations for i in changes)


def _route_words(route: str) -> str:
    return {
        "mass-scaling": "Constants scaled by the reduced mass (Dunham relations)",
        "geometry-ratio": "Constants scaled through the stored geometry (ratio of computed constants)",
    }[route]


def _mass_scaled_states(parent: Species, masses_parent, masses_new, notes) -> tuple[tuple[State, ...], str, str]:
    """States of a diatomic isotopologue by the Dunham relations ([2]; [1] Ch. 13)."""
    mu_parent = reduced_mass_amu(*masses_parent)
    mu_new = reduced_mass_amu(*masses_new)
    rho = mu_parent / mu_new
    ground = parent.ground_state
    excited = sorted((s for s in parent.states if s is not ground), key=lambda s: s.energy_cm1)
    alpha_e = None
    if excited and "B" in excited[0].constants_mhz:
        alpha_e = ground.value("B") - excited[0].value("B")  # the lowest excited state taken as v = 1
    states = []
    for state in parent.states:
        entered = state.stored_constants_mhz
        scaled = dunham_scaled_constants_mhz(
            {k: v for k, v in entered.items() if k in ("B", "D", "H")}, mu_parent, mu_new
        )
        # α of B (Y11) goes as μ^(−3/2), of D (Y12) as μ^(−5/2), of H as μ^(−7/2) ([2]).
        alpha = {
            k: (v[0] * rho ** (DUNHAM_MASS_EXPONENTS[k] + 0.5), v[1] * rho ** (DUNHAM_MASS_EXPONENTS[k] + 0.5))
            for k, v in state.alpha_mhz.items()
        }
        if "B" in entered:
            if state is ground and alpha_e is not None:
                b = dunham_scaled_b0_mhz(ground.value("B"), alpha_e, mu_parent, mu_new)
            elif state is not ground and alpha_e is not None:
                b0_new = dunham_scaled_b0_mhz(ground.value("B"), alpha_e, mu_parent, mu_new)
                b = b0_new - (ground.value("B") - state.value("B")) * rho**1.5
            else:
                b = scaled["B"][0]
            sigma = math.hypot(scaled["B"][1], DUNHAM_RELATIVE_SIGMA * b)
            scaled["B"] = (b, sigma)
        states.append(
            State(
                state.label,
                state.energy_cm1 * math.sqrt(rho),  # ωe ∝ μ^(−1/2)
                scaled,
                degeneracy=state.degeneracy,
                alpha_mhz=alpha,
            )
        )
    how = "B0 through αe from the parent's lowest excited state (taken as v = 1)" if alpha_e is not None else "B0 alone"
    if alpha_e is None:
        notes.append("The parent lists no excited state, so αe is unknown and B0 is scaled as if it were Be.")
    accuracy = (
        f"Scaled {how}; expect B within about {DUNHAM_RELATIVE_SIGMA * 1e6:g} ppm (plus ~αe·(ρ−1)/4 without αe), "
        "state energies from ωe ∝ μ^(−1/2)."
    )
    return tuple(states), "mass-scaling", accuracy


def _geometry_scaled(parent: Species, masses_parent, masses_new, notes):
    """Rotor kind, reduction, states and dipole of a polyatomic isotopologue through the stored geometry."""
    coords = [a.xyz_a for a in parent.geometry]
    rotor, reduction = parent.rotor, parent.reduction
    states = []
    for state in parent.states:
        entered = dict(state.constants_mhz)  # a state given by α gets its own constants here
        abc = _abc(parent.rotor, state)
        try:
            a, b, c = geometry_scaled_constants_mhz(abc, masses_parent, masses_new, coords)
        except ValueError as error:
            raise DerivationError(f"{parent.name} ({state.label}): {error}") from None
        new = dict(entered)
        if a is None:  # linear
            new["B"] = _scaled_pair(entered["B"], b)
        elif parent.rotor == "asymmetric":
            for name, value in zip("ABC", (a, b, c)):
                if name in entered:
                    new[name] = _scaled_pair(entered[name], value)
        else:
            unique = "A" if parent.rotor == "symmetric-prolate" else "C"
            broken = abs(b - (c if unique == "A" else a)) > SYMMETRY_BROKEN_FRACTION * b
            if broken:
                rotor, reduction = "asymmetric", "A"
                new = {SYMMETRIC_TO_A_REDUCTION.get(k, k): v for k, v in entered.items() if k not in ("A", "B", "C")}
                for name, value in zip("ABC", (a, b, c)):
                    new[name] = (value, GEOMETRY_RELATIVE_SIGMA * value)
            else:
                new[unique] = _scaled_pair(entered[unique], a if unique == "A" else c)
                new["B"] = _scaled_pair(entered["B"], b)
        states.append(State(state.label, state.energy_cm1, new, degeneracy=state.degeneracy))
    if rotor != parent.rotor:
        notes.append(
            "The substitution breaks the symmetric top: the new species is an asymmetric top (A-reduction); "
            "its distortion constants are the parent's under their A-reduction names."
        )
    dipole = _dipole(parent, masses_parent, masses_new, coords, rotor)
    accuracy = (
        f"Expect A, B, C within about 0.01 % (σ set to {GEOMETRY_RELATIVE_SIGMA * 100:g} % of each); distortion "
        "constants, state energies and α values are the parent's."
    )
    if any(s.alpha_mhz for s in parent.states):
        notes.append("States given as α from the ground state were converted to their own constants.")
    return rotor, reduction, tuple(states), dipole, accuracy


def _abc(rotor: str, state: State) -> tuple:
    if rotor == "linear":
        return (None, state.value("B"), None)
    if rotor == "symmetric-prolate":
        return (state.value("A"), state.value("B"), state.value("B"))
    if rotor == "symmetric-oblate":
        return (state.value("B"), state.value("B"), state.value("C"))
    return (state.value("A"), state.value("B"), state.value("C"))


def _scaled_pair(pair: tuple[float, float], value: float) -> tuple[float, float]:
    ratio = value / pair[0]
    return (value, math.hypot(pair[1] * ratio, GEOMETRY_RELATIVE_SIGMA * value))


def _dipole(parent: Species, masses_parent, masses_new, coords, rotor: str) -> tuple[float, float, float]:
    if rotor == parent.rotor and rotor != "asymmetric":
        return parent.dipole_debye  # the symmetry axis keeps the dipole
    try:
        return rotated_dipole_debye(parent.dipole_debye, masses_parent, masses_new, coords)
    except ValueError as error:
        raise DerivationError(f"dipole of the new species: {error}") from None


def _abundance(parent: Species, atoms, new_atoms) -> float:
    """Π of the atoms' natural isotope fractions × the number of equivalent arrangements."""
    fractions = [natural_fraction(e, m) for e, m in new_atoms]
    if not all(f > 0 for f in fractions):
        synthetic = [f"{m}{e}" for (e, m), f in zip(new_atoms, fractions) if f == 0]
        raise DerivationError(f"{', '.join(synthetic)} does not occur in nature: give an enriched fraction instead")
    elements = [e for e, _ in atoms]
    labels = [m for _, m in new_atoms]
    if parent.geometry:
        count = arrangement_count(elements, labels, [a.xyz_a for a in parent.geometry])
    elif len(atoms) == 2 and elements[0] == elements[1] and labels[0] != labels[1]:
        count = 2  # a homonuclear diatomic with two different isotopes
    else:
        count = 1
    return min(1.0, natural_abundance(fractions) * count)


def _formula(atoms, changed: set[int]) -> str:
    """periodictable formula with the changed atoms' isotopes marked, e.g. "OC[13]S"."""
    return "".join(f"{e}[{m}]" if i in changed else e for i, (e, m) in enumerate(atoms))


def _name(atoms, changed: set[int]) -> str:
    """A readable name such as "O13CS" or "13CO"; deuterium as D."""
    parts = []
    for i, (element, mass) in enumerate(atoms):
        if i in changed:
            parts.append("D" if (element, mass) == ("H", 2) else f"{mass}{element}")
        else:
            parts.append(element)
    return "".join(parts)
