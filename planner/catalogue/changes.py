"""What differs between two versions of a species, as rows a person can read.

Used by the history page, the conflicting-edit message and the import summary.
"""

from __future__ import annotations

from dataclasses import dataclass

from planner.engine import Species, allowed_parameters

ABSENT = ""


@dataclass(frozen=True)
class Change:
    field: str  # e.g. "state v=0: B [MHz]"
    old: str  # ABSENT when the field did not exist
    new: str


def _number(value: float) -> str:
    return f"{value:.12g}"


def _spin_text(species: Species) -> str:
    weights = species.spin_weights
    if weights is None:
        return "none"
    if weights.axis == "C3":
        return f"C3 axis: K multiple of 3 → {_number(weights.even)}, other K → {_number(weights.odd)}"
    return f"C2 axis {weights.axis}: even levels → {_number(weights.even)}, odd levels → {_number(weights.odd)}"


def describe(species: Species | None) -> dict[str, str]:
    """Every field of a species as text, keyed by a readable name with its unit; {} for None."""
    if species is None:
        return {}
    fields = {
        "name": species.name,
        "formula": species.formula,
        "rotor": species.rotor,
        "reduction": species.reduction,
        "representation": species.representation,
        "mass [u]": _number(species.mass_amu),
    }
    for axis, mu in zip("abc", species.dipole_debye):
        fields[f"dipole μ{axis} [D]"] = _number(mu)
    fields["spin weights"] = _spin_text(species)
    order = allowed_parameters(species.rotor, species.reduction)
    for state in species.states:
        fields[f"state {state.label}: energy [cm⁻¹]"] = _number(state.energy_cm1)
        for name in order:
            if name in state.constants_mhz:
                value, sigma = state.constants_mhz[name]
                fields[f"state {state.label}: {name} [MHz]"] = f"{_number(value)} ± {_number(sigma)}"
        names, rows = state.covariance_names, state.covariance_mhz2
        for i in range(len(names)):
            for j in range(i + 1, len(names)):
                fields[f"state {state.label}: cov({names[i]}, {names[j]}) [MHz²]"] = _number(rows[i][j])
    fields["state order"] = ", ".join(state.label for state in species.states)
    fields["source"] = species.source
    fields["notes"] = species.notes
    fields["hazards"] = species.hazards
    return fields


def differences(old: Species | None, new: Species | None) -> list[Change]:
    """The fields that differ, in the order of the newer version (then those only the older had)."""
    before, after = describe(old), describe(new)
    keys = list(after) + [key for key in before if key not in after]
    return [
        Change(key, before.get(key, ABSENT), after.get(key, ABSENT))
        for key in keys
        if before.get(key, ABSENT) != after.get(key, ABSENT)
    ]
