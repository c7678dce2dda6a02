"""Kraitchman substitution coordinates from two catalogue species: a parent and one singly substituted isotopologue."""

from __future__ import annotations

from planner.catalogue_file.masses import atom_masses
from planner.engine.derived import moment_of_inertia_amu_a2, moments_of_inertia_amu_a2
from planner.engine.structure import kraitchman_coordinates_a, kraitchman_linear_coordinate_a


def substitution_coordinates(parent, substituted) -> dict:
    """|a|, |b|, |c| [Å] of the atom that differs between two species, from their ground-state constants.

    Raises ValueError when the pair is not a single substitution of one molecule.
    """
    if parent.rotor != substituted.rotor:
        raise ValueError(f"{parent.name} is {parent.rotor} but {substituted.name} is {substituted.rotor}")
    if parent.rotor.startswith("symmetric"):
        raise ValueError("Kraitchman's single-substitution equations here need a linear or an asymmetric rotor")
    parent_masses, new_masses = sorted(atom_masses(parent.formula)), sorted(atom_masses(substituted.formula))
    if len(parent_masses) != len(new_masses):
        raise ValueError(f"{parent.formula} and {substituted.formula} do not have the same atoms")
    changed = [(a, b) for a, b in zip(parent_masses, new_masses) if abs(a - b) > 1e-6]
    differences = {round(b - a, 6) for a, b in zip(atom_masses(parent.formula), atom_masses(substituted.formula))}
    delta = sum(new_masses) - sum(parent_masses)
    if not changed or abs(delta) < 1e-6 or len(differences - {0.0}) > 1:
        raise ValueError(f"{substituted.formula} is not a single isotopic substitution of {parent.formula}")
    mass = sum(parent_masses)
    ground, other = parent.states[0], substituted.states[0]
    if parent.rotor == "linear":
        z, imaginary = kraitchman_linear_coordinate_a(
            moment_of_inertia_amu_a2(ground.value("B")), moment_of_inertia_amu_a2(other.value("B")), mass, delta
        )
        return {"rows": [("z", z, imaginary)], "delta_mass_amu": delta}
    result = kraitchman_coordinates_a(
        moments_of_inertia_amu_a2(*(ground.value(n) for n in "ABC")),
        moments_of_inertia_amu_a2(*(other.value(n) for n in "ABC")),
        mass,
        delta,
    )
    values = (result.a_a, result.b_a, result.c_a)
    return {"rows": list(zip("abc", values, result.imaginary)), "delta_mass_amu": delta}
