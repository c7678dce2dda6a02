"""Between catalogue rows (current or historical) and the engine's Species.

The engine's Species is the one shape every other part uses: predictions,
the catalogue file (import/export), revisions and their differences.
"""

from __future__ import annotations

from django.db.models import Prefetch

from planner.engine import Species, SpinWeights, State

from .models import Constant
from .models import Species as SpeciesRow
from .models import State as StateRow


def engine_species(row, states) -> Species:
    """Species from a species row and ``states`` = [(state row, [constant rows]), ...] in order.

    Works with historical rows too: they carry the same field names.
    """
    weights = None
    if row.spin_axis:
        weights = SpinWeights(row.spin_axis, row.spin_weight_even, row.spin_weight_odd)
    return Species(
        name=row.name,
        formula=row.formula,
        rotor=row.rotor,
        reduction=row.reduction,
        representation=row.representation,
        mass_amu=row.mass_amu,
        dipole_debye=(row.dipole_a_debye, row.dipole_b_debye, row.dipole_c_debye),
        spin_weights=weights,
        states=tuple(
            State(state.label, state.energy_cm1, {c.name: (c.value_mhz, c.sigma_mhz) for c in constants})
            for state, constants in states
        ),
        source=row.source,
        notes=row.notes,
        hazards=row.hazards,
    )


def with_constants(queryset):
    """The species queryset with states and constants fetched in two more queries."""
    return queryset.prefetch_related(
        Prefetch("states", queryset=StateRow.objects.order_by("position", "id").prefetch_related(_ordered_constants()))
    )


def _ordered_constants():
    return Prefetch("constants", queryset=Constant.objects.order_by("id"))


def species_of_row(row: SpeciesRow) -> Species:
    """The engine Species of a current row (use :func:`with_constants` on lists to save queries)."""
    return engine_species(row, [(state, list(state.constants.all())) for state in row.states.all()])


def row_fields(species: Species) -> dict:
    """The Species-table fields of an engine Species (states and constants are separate rows)."""
    weights = species.spin_weights
    return {
        "name": species.name,
        "formula": species.formula,
        "rotor": species.rotor,
        "reduction": species.reduction,
        "representation": species.representation,
        "mass_amu": species.mass_amu,
        "dipole_a_debye": species.dipole_debye[0],
        "dipole_b_debye": species.dipole_debye[1],
        "dipole_c_debye": species.dipole_debye[2],
        "spin_axis": weights.axis if weights else "",
        "spin_weight_even": weights.even if weights else None,
        "spin_weight_odd": weights.odd if weights else None,
        "source": species.source,
        "notes": species.notes,
        "hazards": species.hazards,
    }
