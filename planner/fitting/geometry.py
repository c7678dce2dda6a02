"""An r0 structure from the catalogue: fit bond lengths (and an angle) to the moments of isotopologues.

The atoms of each formula, in the formula's order, are the builder's atoms:
a linear triatomic X–Y–Z as written (``OCS``: O, C, S), a bent triatomic with
the central atom first (``SO2``: S, O, O; ``H2S`` would need ``SH2``).
"""

from __future__ import annotations

from planner.catalogue_file.masses import atom_masses
from planner.engine.structure import (
    Isotopologue,
    fit_internal_coordinates,
    linear_triatomic_builder,
    triatomic_bent_builder,
)

#: name -> (builder, parameter names with units, rotor kind it applies to, atom count)
BUILDERS = {
    "linear-triatomic": (linear_triatomic_builder, ("r(X–Y) [Å]", "r(Y–Z) [Å]"), "linear"),
    "bent-triatomic": (triatomic_bent_builder, ("r(Y–X) [Å]", "r(Y–Z) [Å]", "angle X–Y–Z [°]"), "asymmetric"),
}


def r0_structure(kind: str, species_list, initial: list[float]) -> dict:
    """The fitted internal coordinates with 1σ and the moment residuals; ValueError with the reason."""
    if kind not in BUILDERS:
        raise ValueError(f"unknown geometry {kind!r}; choose {', '.join(BUILDERS)}")
    build, names, rotor = BUILDERS[kind]
    if len(initial) != len(names):
        raise ValueError(f"give {len(names)} starting values: {', '.join(names)}")
    isotopologues = []
    for species in species_list:
        if species.rotor != rotor:
            raise ValueError(f"{species.name} is {species.rotor}; this geometry needs {rotor} species")
        masses = atom_masses(species.formula)
        if len(masses) != 3:
            raise ValueError(f"{species.name} ({species.formula}) does not have three atoms")
        ground = species.states[0]
        constants = [ground.constants_mhz.get(n, (None, 0))[0] for n in "ABC"]
        if rotor == "linear":
            constants = [None, ground.value("B"), None]
        isotopologues.append(Isotopologue.from_constants_mhz(species.name, masses, *constants))
    fit = fit_internal_coordinates(build, initial, isotopologues, names=list(names))
    return {
        "parameters": list(zip(fit.names, fit.values, fit.sigmas)),
        "residuals": list(zip(fit.labels, fit.residuals_amu_a2)),
        "degrees_of_freedom": fit.degrees_of_freedom,
        "rms_amu_a2": fit.rms_amu_a2,
    }
