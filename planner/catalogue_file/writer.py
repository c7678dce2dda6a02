"""Write species to a catalogue file that the reader gives back unchanged."""

from __future__ import annotations

import json
import os
import re

from planner.engine.species import QUADRUPOLE_COMPONENTS, Species, allowed_parameters

from .keys import DIPOLE_AXES, FORMAT_NAME, FORMAT_VERSION, SPIN_WEIGHT_KEYS
from .reader import parse_catalogue

# A list or object holding no list or object ([value, sigma], dipole_debye, spin_weights) goes on one line.
# Only newline-plus-indent is touched: JSON text never has a raw newline inside a string.
_LEAF = re.compile(r"([\[{])\n([^\[\]{}]*?)\n\s*([\]}])")


def catalogue_to_dict(species_list) -> dict:
    """The catalogue file's content for these species, as plain JSON-ready data (not validated)."""
    return {"format": FORMAT_NAME, "version": FORMAT_VERSION, "species": [_species_entry(s) for s in species_list]}


def dump_catalogue(species_list, path_or_file) -> None:
    """Write the species to a path or an open text file.

    The content is read back first, so a file that the reader would refuse
    (duplicate names, a formula periodictable cannot read, ...) is never
    written: CatalogueError lists why.  A path is replaced in one step, so a
    failure leaves the old file as it was.
    """
    data = catalogue_to_dict(species_list)
    parse_catalogue(json.loads(json.dumps(data)))
    text = json.dumps(data, indent=2, ensure_ascii=False)
    text = _LEAF.sub(lambda m: m[1] + re.sub(r"\n\s*", " ", m[2]).strip() + m[3], text) + "\n"
    if hasattr(path_or_file, "write"):
        path_or_file.write(text)
        return
    partial = f"{os.fspath(path_or_file)}.{os.getpid()}.partial"
    try:
        with open(partial, "w", encoding="utf-8") as file:
            file.write(text)
        os.replace(partial, path_or_file)
    finally:
        if os.path.exists(partial):
            os.unlink(partial)


def _species_entry(species: Species) -> dict:
    entry = {
        "name": species.name,
        "formula": species.formula,
        "rotor": species.rotor,
        "reduction": species.reduction,
        "representation": species.representation,
        "mass_amu": species.mass_amu,
        "dipole_debye": dict(zip(DIPOLE_AXES, species.dipole_debye)),
    }
    if species.spin_weights is not None:
        weights = species.spin_weights
        even_key, odd_key = SPIN_WEIGHT_KEYS[weights.axis]
        entry["spin_weights"] = {"axis": weights.axis, even_key: weights.even, odd_key: weights.odd}
    order = allowed_parameters(species.rotor, species.reduction)
    entry["states"] = [_state_entry(state, order) for state in species.states]
    entry["source"] = species.source
    entry["notes"] = species.notes
    entry["hazards"] = species.hazards
    if species.parent:
        entry["parent"] = species.parent
    if species.natural_abundance is not None:
        entry["natural_abundance"] = species.natural_abundance
    if species.constants_route != "entered":
        entry["constants_route"] = species.constants_route
    if species.route_note:
        entry["route_note"] = species.route_note
    if species.hyperfine is not None:
        entry["hyperfine"] = hyperfine_entry(species)
    if species.geometry:
        entry["geometry"] = geometry_entries(species)
    return entry


def hyperfine_entry(species: Species) -> dict | None:
    """The species' quadrupole nucleus in the file's form, None for none."""
    quad = species.hyperfine
    if quad is None:
        return None
    return {
        "nucleus": quad.nucleus,
        "spin": quad.spin,
        "chi_mhz": {c: list(quad.chi_mhz[c]) for c in QUADRUPOLE_COMPONENTS},
    }


def geometry_entries(species: Species) -> list[dict]:
    """The stored geometry in the file's form ([] for none)."""
    entries = []
    for atom in species.geometry:
        entry = {"element": atom.element}
        if atom.mass_number is not None:
            entry["isotope"] = atom.mass_number
        entry["xyz_a"] = list(atom.xyz_a)
        entries.append(entry)
    return entries


def _state_entry(state, order) -> dict:
    entry = {"label": state.label, "energy_cm1": state.energy_cm1}
    if state.degeneracy != 1:
        entry["degeneracy"] = state.degeneracy
    stored = state.stored_constants_mhz
    entry["constants_mhz"] = {name: list(stored[name]) for name in order if name in stored}
    if state.alpha_mhz:
        entry["alpha_mhz"] = {name: list(state.alpha_mhz[name]) for name in order if name in state.alpha_mhz}
    if state.covariance_names:
        entry["covariance_mhz2"] = {
            "names": list(state.covariance_names),
            "matrix": [list(row) for row in state.covariance_mhz2],
        }
    return entry
