"""What the catalogue shows of each species: list rows, CSV rows, and the species page's derived values.

The numbers come from the engine (planner.engine.derived); this module only
picks and names them.  One row shape serves the list page and its CSV.
"""

from __future__ import annotations

import math

from planner.catalogue_file.masses import diatomic_masses
from planner.engine import Species
from planner.engine.constants import MHZ_PER_CM1
from planner.engine.derived import inertial_defect_amu_a2, moment_of_inertia_amu_a2, ray_kappa
from planner.engine.structure import bond_length_a

#: Columns of the catalogue table and its CSV download (key, header with unit).
CATALOGUE_COLUMNS = (
    ("name", "Name"),
    ("formula", "Formula"),
    ("rotor", "Rotor"),
    ("reduction", "Reduction"),
    ("representation", "Representation"),
    ("mass_amu", "Mass [u]"),
    ("dipole_a_debye", "μa [D]"),
    ("dipole_b_debye", "μb [D]"),
    ("dipole_c_debye", "μc [D]"),
    ("spin_statistics", "Spin statistics"),
    ("state_count", "States"),
    ("ground_a_mhz", "A [MHz]"),
    ("ground_b_mhz", "B [MHz]"),
    ("ground_c_mhz", "C [MHz]"),
    ("ray_kappa", "κ"),
    ("hazards", "Hazards"),
    ("source", "Source"),
)


def _kappa(a: float, b: float, c: float) -> float | None:
    try:
        return ray_kappa(a, b, c)
    except ValueError:  # a symmetric set A = B = C has no κ
        return None


def spin_text(species: Species) -> str:
    weights = species.spin_weights
    if weights is None:
        return ""
    if weights.axis == "C3":
        return f"C3 {weights.even:g}:{weights.odd:g}"
    return f"C2({weights.axis}) {weights.even:g}:{weights.odd:g}"


def catalogue_row(species: Species) -> dict:
    """One row of the catalogue table [units in the keys]; ground-state constants from the first state."""
    ground = species.states[0]
    a, b, c = (ground.constants_mhz.get(name, (None, None))[0] for name in "ABC")
    kappa = _kappa(a, b, c) if species.rotor == "asymmetric" else None
    return {
        "name": species.name,
        "formula": species.formula,
        "rotor": species.rotor,
        "reduction": species.reduction if species.rotor == "asymmetric" else "",
        "representation": species.representation if species.rotor == "asymmetric" else "",
        "mass_amu": species.mass_amu,
        "dipole_a_debye": species.dipole_debye[0],
        "dipole_b_debye": species.dipole_debye[1],
        "dipole_c_debye": species.dipole_debye[2],
        "spin_statistics": spin_text(species),
        "state_count": len(species.states),
        "ground_a_mhz": a,
        "ground_b_mhz": b,
        "ground_c_mhz": c,
        "ray_kappa": kappa,
        "hazards": species.hazards,
        "source": species.source,
    }


def constant_rows(state, order: tuple[str, ...]) -> list[dict]:
    """The constants of one state with σ, in MHz, GHz and cm⁻¹, in the engine's parameter order."""
    names = [n for n in order if n in state.constants_mhz]
    return [
        {
            "name": name,
            "value_mhz": state.constants_mhz[name][0],
            "sigma_mhz": state.constants_mhz[name][1],
            "value_ghz": state.constants_mhz[name][0] / 1e3,
            "sigma_ghz": state.constants_mhz[name][1] / 1e3,
            "value_cm1": state.constants_mhz[name][0] / MHZ_PER_CM1,
            "sigma_cm1": state.constants_mhz[name][1] / MHZ_PER_CM1,
        }
        for name in names
    ]


def state_derived(species: Species, state) -> list[tuple[str, float, str]]:
    """(quantity, value, unit) derived from one state's rotational constants."""
    values = {name: state.constants_mhz[name][0] for name in "ABC" if name in state.constants_mhz}
    derived = []
    masses = diatomic_masses(species.formula) if species.rotor == "linear" else None
    if masses and "B" in values:
        r, _ = bond_length_a(values["B"], *masses)
        derived.append((f"r from B of {state.label} (r0 for the ground state)", r, "Å"))
    for name in "ABC":
        if name in values:
            derived.append((f"I{name.lower()} = h/(8π²{name})", moment_of_inertia_amu_a2(values[name]), "u Å²"))
    if species.rotor == "asymmetric":
        a, b, c = values["A"], values["B"], values["C"]
        kappa = _kappa(a, b, c)
        if kappa is not None and math.isfinite(kappa):
            derived.append(("Ray's asymmetry κ = (2B − A − C)/(A − C)", kappa, ""))
        derived.append(("Inertial defect Δ = Ic − Ia − Ib", inertial_defect_amu_a2(a, b, c), "u Å²"))
    return derived
