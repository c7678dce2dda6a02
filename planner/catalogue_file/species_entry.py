"""One species entry of a catalogue file -> a Species, or every problem it has.

The JSON shape (types, keys) is checked here; the physics rules are the
engine's own, reached by building Species and catching SpeciesError.  Because
the engine stops at the first broken rule, a field it rejects is reported and
then replaced by a harmless value, and the engine is asked again, so that one
bad field does not hide the next.
"""

from __future__ import annotations

import difflib
import json
import re

import periodictable

from planner.engine.species import (
    CONSTANTS_ROUTES,
    REDUCTIONS,
    REPRESENTATIONS,
    ROTOR_KINDS,
    Atom,
    Quadrupole,
    Species,
    SpeciesError,
    SpinWeights,
    State,
)

from .keys import (
    ATOM_KEYS,
    COVARIANCE_KEYS,
    DIPOLE_AXES,
    HYPERFINE_KEYS,
    REQUIRED_SPECIES_KEYS,
    REQUIRED_STATE_KEYS,
    SPECIES_KEYS,
    SPIN_WEIGHT_KEYS,
    STATE_KEYS,
)
from .masses import mass_from_formula
from .problems import Problem

_BARE_NUMBER = "must be [value, sigma] in MHz; a bare number is not accepted (give the 1σ too, 0 if unknown)"

#: Harmless stand-ins for species-level fields, used only while asking the engine.
_NEUTRAL = {
    "name": "?",
    "mass_amu": 1.0,
    "dipole_debye": (0.0, 0.0, 0.0),
    "spin_weights": None,
    "reduction": "A",
    "representation": "Ir",
    "natural_abundance": None,
    "constants_route": "entered",
    "parent": "",
    "hyperfine": None,
    "geometry": (),
}
#: Fields for which None is a real value ("not given"), not the mark of an unreadable one.
_NONE_ALLOWED = ("spin_weights", "natural_abundance", "hyperfine")


class Report:
    """Problems of one species, at most one per field (the first found is the clearest)."""

    def __init__(self, species: str):
        self.species = species
        self.problems: list[Problem] = []
        self._fields: set[str] = set()

    def add(self, field: str, message: str) -> None:
        if field not in self._fields:
            self._fields.add(field)
            self.problems.append(Problem(self.species, field, message))


def is_number(value) -> bool:
    """True for a JSON number that fits a float (bool excluded: JSON true is not 1)."""
    if isinstance(value, bool):
        return False
    return isinstance(value, float) or (isinstance(value, int) and abs(value) < 2.0**1023)


def json_type(value) -> str:
    """The JSON name of a value's type, for messages."""
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "true/false"
    if is_number(value):
        return f"the number {value!r}"
    if isinstance(value, str):
        return f"the text {value!r}"
    return "a list" if isinstance(value, (list, tuple)) else "an object"


def check_keys(report, obj: dict, allowed: tuple[str, ...], prefix: str) -> None:
    """Report keys not in ``allowed`` (typo protection) and keys the JSON object repeated."""
    for key in obj:
        if key not in allowed:
            close = difflib.get_close_matches(str(key), allowed, n=1)
            hint = f"did you mean {close[0]!r}? " if close else ""
            report.add(f"{prefix}{key}", f"unknown key; {hint}allowed here: {', '.join(allowed)}")
    for key in getattr(obj, "duplicate_keys", ()):
        report.add(f"{prefix}{key}", "is given twice in the same object; keep only one")


def parse_species(entry, label: str) -> tuple[Species | None, list[Problem]]:
    """Species from one entry of the file's ``species`` list, else (None, its problems).

    ``label`` names the species in problems (its name, or ``species[N]``).
    """
    report = Report(label)
    if not isinstance(entry, dict):
        report.add("entry", f"must be an object with the species' keys, got {json_type(entry)}")
        return None, report.problems
    check_keys(report, entry, SPECIES_KEYS, "")
    for key in REQUIRED_SPECIES_KEYS:
        if key not in entry:
            report.add(key, "is required")
    formula = _text(report, entry, "formula", None)
    texts = {key: _text(report, entry, key, "") for key in ("source", "notes", "hazards", "route_note")}
    fields = {
        "parent": _text(report, entry, "parent", ""),
        "natural_abundance": _optional_number(report, entry, "natural_abundance", "a fraction in (0, 1]"),
        "constants_route": _choice(report, entry, "constants_route", CONSTANTS_ROUTES, "entered"),
        "hyperfine": _hyperfine(report, entry["hyperfine"]) if "hyperfine" in entry else None,
        "geometry": _geometry(report, entry["geometry"]) if "geometry" in entry else (),
        "name": _text(report, entry, "name", None),
        "rotor": _choice(report, entry, "rotor", ROTOR_KINDS, None),
        "reduction": _choice(report, entry, "reduction", REDUCTIONS, "A"),
        "representation": _choice(report, entry, "representation", REPRESENTATIONS, "Ir"),
        "mass_amu": _mass(report, entry, formula),
        "dipole_debye": _dipole(report, entry["dipole_debye"]) if "dipole_debye" in entry else None,
        "spin_weights": _spin_weights(report, entry["spin_weights"]) if "spin_weights" in entry else None,
    }
    states = _states(report, entry["states"]) if "states" in entry else []
    if fields["rotor"] is not None:
        _ask_engine_about_species(report, fields)
        # the reduction picks the parameter names of an asymmetric top only
        if fields["reduction"] is not None or fields["rotor"] != "asymmetric":
            present = [state for state in states if state is not None]
            ground = min(present, key=lambda s: s.energy_cm1) if present else None
            for index, state in enumerate(states):
                if state is not None:
                    _ask_engine_about_state(report, fields, state, f"states[{index}]", ground)
    if report.problems:
        return None, report.problems
    try:
        return Species(states=tuple(states), formula=formula, **texts, **fields), []
    except SpeciesError as error:  # a rule only the whole species shows
        report.add(error.field, error.message)
        return None, report.problems


def _text(report, entry: dict, key: str, default):
    if key not in entry:
        return default
    value = entry[key]
    if not isinstance(value, str):
        report.add(key, f"must be text, got {json_type(value)}")
        return None
    return value


def _choice(report, entry: dict, key: str, choices: tuple[str, ...], default):
    value = _text(report, entry, key, default)
    if value is not None and value not in choices:
        report.add(key, f"must be one of {', '.join(choices)}; got {value!r}")
        return None
    return value


def _mass(report, entry: dict, formula: str | None) -> float | None:
    """The given mass_amu [u], else the formula's; the formula must be readable either way."""
    formula_mass = None
    if formula is not None:
        try:
            formula_mass = mass_from_formula(formula)
        except ValueError as error:
            report.add("formula", str(error))
    if "mass_amu" not in entry:
        return formula_mass
    value = entry["mass_amu"]
    if not is_number(value):
        report.add("mass_amu", f"must be a number [u], got {json_type(value)}")
        return None
    return value


def _dipole(report, value) -> tuple[float, float, float] | None:
    """(μa, μb, μc) [D]; missing components are 0."""
    if not isinstance(value, dict):
        report.add("dipole_debye", f'must be an object such as {{"a": 1.2}} [D], got {json_type(value)}')
        return None
    check_keys(report, value, DIPOLE_AXES, "dipole_debye.")
    components = [value.get(axis, 0.0) for axis in DIPOLE_AXES]
    for axis, mu in zip(DIPOLE_AXES, components):
        if not is_number(mu):
            report.add(f"dipole_debye.{axis}", f"must be a number [D], got {json_type(mu)}")
    return tuple(components) if all(is_number(mu) for mu in components) else None


def _spin_weights(report, value) -> SpinWeights | None:
    if not isinstance(value, dict):
        example = '{"axis": "b", "even": 1, "odd": 3}'
        report.add("spin_weights", f"must be an object such as {example}, got {json_type(value)}")
        return None
    if "axis" not in value:
        report.add("spin_weights.axis", "is required")
        return None
    axis = value["axis"]
    keys = SPIN_WEIGHT_KEYS.get(axis) if isinstance(axis, str) else None
    if keys is None:
        expected = "'a', 'b', 'c' (C2 axis) or 'C3' (threefold axis)"
        report.add("spin_weights.axis", f"must be {expected}, got {json_type(axis)}")
        return None
    check_keys(report, value, ("axis", *keys), "spin_weights.")
    for key in keys:
        if key not in value:
            report.add(f"spin_weights.{key}", "is required")
        elif not is_number(value[key]):
            report.add(f"spin_weights.{key}", f"must be a number >= 0, got {json_type(value[key])}")
    if not all(is_number(value.get(key)) for key in keys):
        return None
    try:
        return SpinWeights(axis, value[keys[0]], value[keys[1]])
    except SpeciesError as error:
        # the engine names its own attributes even/odd; report the file's key names
        engine_names = {"spin_weights.even": keys[0], "spin_weights.odd": keys[1]}
        field = f"spin_weights.{engine_names[error.field]}" if error.field in engine_names else error.field
        report.add(field, error.message)
        return None


def _states(report, value) -> list[State | None]:
    """The states of the entry, None for an item that is not even an object.

    A state with problems is still returned, with stand-ins for its bad parts,
    so that the engine can check what is left of it; its problems are reported.
    """
    if not isinstance(value, list):
        report.add("states", f"must be a list of states, got {json_type(value)}")
        return []
    if not value:
        report.add("states", "at least one state is needed")
    states = [_state(report, item, f"states[{index}]") for index, item in enumerate(value)]
    first_use: dict[str, int] = {}
    for index, item in enumerate(value):
        label = item.get("label") if isinstance(item, dict) else None
        if isinstance(label, str) and label in first_use:
            report.add(f"states[{index}].label", f"label {label!r} is already used by states[{first_use[label]}]")
        elif isinstance(label, str):
            first_use[label] = index
    return states


def _state(report, item, where: str) -> State | None:
    if not isinstance(item, dict):
        report.add(where, f"must be an object with label, energy_cm1 and constants_mhz, got {json_type(item)}")
        return None
    check_keys(report, item, STATE_KEYS, f"{where}.")
    for key in REQUIRED_STATE_KEYS:
        if key not in item:
            report.add(f"{where}.{key}", "is required")
    label = item.get("label", "?")
    if not isinstance(label, str):
        report.add(f"{where}.label", f"must be text, got {json_type(label)}")
        label = "?"
    energy = item.get("energy_cm1", 0.0)
    if not is_number(energy):
        report.add(f"{where}.energy_cm1", f"must be a number [cm^-1], got {json_type(energy)}")
        energy = 0.0
    if "constants_mhz" not in item and "alpha_mhz" not in item:
        report.add(f"{where}.constants_mhz", "is required (or alpha_mhz, differences from the ground state)")
    constants = _constants(report, item.get("constants_mhz", {}), f"{where}.constants_mhz")
    alpha = _constants(report, item.get("alpha_mhz", {}), f"{where}.alpha_mhz")
    names, matrix = _covariance(report, item.get("covariance_mhz2"), f"{where}.covariance_mhz2")
    degeneracy = item.get("degeneracy", 1)
    if isinstance(degeneracy, bool) or not isinstance(degeneracy, int) or degeneracy < 1:
        report.add(f"{where}.degeneracy", f"must be a whole number >= 1, got {json_type(degeneracy)}")
        degeneracy = 1
    return State(label, energy, constants, names, matrix, degeneracy, alpha)


def _optional_number(report, entry: dict, key: str, meaning: str):
    """A number or null (absent: None); the engine checks its range."""
    value = entry.get(key)
    if value is None or is_number(value):
        return value
    report.add(key, f"must be a number ({meaning}) or null, got {json_type(value)}")
    return None


def _hyperfine(report, value) -> Quadrupole | None:
    """{"nucleus": "14N", "spin": 1, "chi_mhz": {"aa": [value, sigma], ...}} -> Quadrupole."""
    if not isinstance(value, dict):
        example = '{"nucleus": "14N", "spin": 1, "chi_mhz": {"aa": [-4.7, 0.01]}}'
        report.add("hyperfine", f"must be an object such as {example}, got {json_type(value)}")
        return None
    check_keys(report, value, HYPERFINE_KEYS, "hyperfine.")
    missing = [key for key in HYPERFINE_KEYS if key not in value]
    for key in missing:
        report.add(f"hyperfine.{key}", "is required")
    nucleus, spin = value.get("nucleus"), value.get("spin")
    if "nucleus" in value and not isinstance(nucleus, str):
        report.add("hyperfine.nucleus", f"must be text such as '14N', got {json_type(nucleus)}")
    if "spin" in value and not is_number(spin):
        report.add("hyperfine.spin", f"must be a number (I, e.g. 1 or 1.5), got {json_type(spin)}")
    chi = _constants(report, value.get("chi_mhz", {}), "hyperfine.chi_mhz")
    if missing or not isinstance(nucleus, str) or not is_number(spin):
        return None
    return Quadrupole(nucleus, spin, chi)


def _geometry(report, value) -> tuple[Atom, ...]:
    """[{"element": "O", "isotope": 16, "xyz_a": [x, y, z]}, ...] -> atoms; elements and isotopes from periodictable."""
    if not isinstance(value, list):
        report.add("geometry", 'must be a list of atoms such as {"element": "C", "xyz_a": [0, 0, 1.16]}')
        return ()
    atoms = []
    for index, item in enumerate(value):
        where = f"geometry[{index}]"
        if not isinstance(item, dict):
            report.add(where, f"must be an object with element and xyz_a, got {json_type(item)}")
            continue
        check_keys(report, item, ATOM_KEYS, f"{where}.")
        element, isotope, xyz = item.get("element"), item.get("isotope"), item.get("xyz_a")
        known = isinstance(element, str) and hasattr(periodictable, element) and re.fullmatch(r"[A-Z][a-z]?", element)
        if not known:
            report.add(f"{where}.element", f"must be an element symbol such as 'C' or 'Cl', got {json_type(element)}")
            continue
        if isotope is not None:
            if (
                isinstance(isotope, bool)
                or not isinstance(isotope, int)
                or isotope not in getattr(periodictable, element).isotopes
            ):
                report.add(f"{where}.isotope", f"{json_type(isotope)} is not a known mass number of {element}")
                continue
        if not (isinstance(xyz, list) and len(xyz) == 3 and all(is_number(v) for v in xyz)):
            report.add(f"{where}.xyz_a", "must be three numbers [Å]")
            continue
        atoms.append(Atom(element, isotope, tuple(xyz)))
    return tuple(atoms) if len(atoms) == len(value) else ()


def _covariance(report, value, where: str) -> tuple[tuple[str, ...], tuple]:
    """(names, matrix) of an optional covariance block; the engine checks symmetry and the diagonal."""
    if value is None:
        return (), ()
    if not isinstance(value, dict):
        report.add(where, f'must be an object {{"names": [...], "matrix": [[...]]}} [MHz²], got {json_type(value)}')
        return (), ()
    check_keys(report, value, COVARIANCE_KEYS, f"{where}.")
    names, matrix = value.get("names"), value.get("matrix")
    if not (isinstance(names, list) and all(isinstance(n, str) for n in names)):
        report.add(f"{where}.names", "must be a list of constant names")
        return (), ()
    rows_ok = isinstance(matrix, list) and all(
        isinstance(row, list) and all(is_number(x) for x in row) for row in matrix
    )
    if not rows_ok:
        report.add(f"{where}.matrix", "must be a list of rows of numbers [MHz²]")
        return (), ()
    return tuple(names), tuple(tuple(row) for row in matrix)


def _constants(report, value, where: str) -> dict[str, tuple[float, float]]:
    """The well-formed {NAME: (value, sigma)} pairs [MHz]; the others are reported."""
    if not isinstance(value, dict):
        report.add(where, f"must be an object {{NAME: [value, sigma]}} [MHz], got {json_type(value)}")
        return {}
    for key in getattr(value, "duplicate_keys", ()):
        report.add(f"{where}.{key}", "is given twice in the same object; keep only one")
    constants = {}
    for name, pair in value.items():
        if isinstance(pair, list) and len(pair) == 2 and all(is_number(x) for x in pair):
            constants[name] = (pair[0], pair[1])
        else:
            shown = json.dumps(pair, default=str)
            shown = shown if len(shown) <= 40 else shown[:39] + "…"
            message = _BARE_NUMBER if is_number(pair) else f"must be [value, sigma], two numbers in MHz; got {shown}"
            report.add(f"{where}.{name}", message)
    return constants


def _ask_engine_about_species(report, fields: dict) -> None:
    """Every species-level rule of the engine (mass, dipole, spin weights vs rotor, ...)."""
    # a field already found unreadable (None) is stood in for; None is a real value only for spin_weights
    probe = {
        key: _NEUTRAL[key] if value is None and key not in _NONE_ALLOWED else value for key, value in fields.items()
    }
    for _ in range(len(_NEUTRAL) + 1):
        try:
            Species(**probe, states=())
        except SpeciesError as error:
            key = re.split(r"[.\[]", error.field)[0]
            if key not in _NEUTRAL:  # only "states" is left: every species-level field passed
                return
            report.add(error.field, error.message)
            probe[key] = _NEUTRAL[key]


def _ask_engine_about_state(report, fields: dict, state: State, where: str, ground: State | None) -> None:
    """Every rule of the engine about one state, with the species-level fields made harmless.

    A state given by differences from the ground state is checked with the constants they give
    (the ground state's, less α); a problem of such a constant is reported on its α.
    """
    probe = dict(_NEUTRAL, rotor=fields["rotor"], reduction=fields["reduction"] or "A")
    label, energy, constants = state.label, state.energy_cm1, dict(state.constants_mhz)
    if state.alpha_mhz and ground is not None and ground is not state:
        merged = dict(ground.constants_mhz)
        merged.update(constants)
        for name, (alpha, _) in state.alpha_mhz.items():
            if name in ground.constants_mhz and name not in constants:
                merged[name] = (ground.value(name) - alpha, 0.0)
        constants = merged
    for _ in range(len(constants) + 3):
        try:
            Species(**probe, states=(State(label, energy, constants, degeneracy=state.degeneracy),))
            return
        except SpeciesError as error:
            field = error.field
            part, _, name = field.removeprefix("states[0].").partition(".")
            if part == "constants_mhz" and name in state.alpha_mhz:
                field = f"states[0].alpha_mhz.{name}"
            report.add(where + field.removeprefix("states[0]"), error.message)
            if part == "constants_mhz" and name in constants:
                del constants[name]
            elif part == "label":
                label = "?"
            elif part == "energy_cm1":
                energy = 0.0
            else:  # a missing constant or the A >= B >= C order: nothing to take out
                return
