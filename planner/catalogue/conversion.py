"""Between catalogue rows (current or historical) and the engine's Species.

The engine's Species is the one shape every other part uses: predictions,
the catalogue file (import/export), revisions and their differences.
"""

from __future__ import annotations

from django.db.models import Prefetch

from planner.catalogue_file.writer import geometry_entries, hyperfine_entry
from planner.engine import Atom, Quadrupole, Species, SpinWeights, State

from .models import Constant
from .models import Species as SpeciesRow
from .models import State as StateRow


def engine_species(row, states) -> Species:
    """Species from a species row and ``states`` = [(state row, [constant rows], [covariance rows]), ...].

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
        states=tuple(_state(state, constants, covariance) for state, constants, covariance in states),
        source=row.source,
        notes=row.notes,
        hazards=row.hazards,
        parent=row.parent_name,
        natural_abundance=row.natural_abundance,
        constants_route=row.constants_route,
        route_note=row.route_note,
        hyperfine=_quadrupole(row.hyperfine),
        geometry=tuple(Atom(a["element"], a.get("isotope"), tuple(a["xyz_a"])) for a in row.geometry or ()),
    )


def _quadrupole(data) -> Quadrupole | None:
    if not data:
        return None
    return Quadrupole(data["nucleus"], data["spin"], {k: tuple(v) for k, v in data["chi_mhz"].items()})


def _state(row, constants, covariance) -> State:
    names, matrix = covariance_matrix(covariance)
    values = {c.name: (c.value_mhz, c.sigma_mhz) for c in constants if c.kind != "alpha"}
    alpha = {c.name: (c.value_mhz, c.sigma_mhz) for c in constants if c.kind == "alpha"}
    return State(row.label, row.energy_cm1, values, names, matrix, row.degeneracy, alpha)


def stored_constants(state: State) -> dict[str, tuple[float, float, str]]:
    """name -> (value or α, σ, kind) [MHz] of the constant rows a state is stored as."""
    rows = {name: (value, sigma, "value") for name, (value, sigma) in state.stored_constants_mhz.items()}
    rows.update({name: (value, sigma, "alpha") for name, (value, sigma) in state.alpha_mhz.items()})
    return rows


def covariance_matrix(elements) -> tuple[tuple[str, ...], tuple[tuple[float, ...], ...]]:
    """(names, full symmetric matrix) from upper-triangle elements (row, column, first, second, value)."""
    if not elements:
        return (), ()
    size = max(e.column for e in elements) + 1
    names = [""] * size
    matrix = [[0.0] * size for _ in range(size)]
    for e in elements:
        names[e.row], names[e.column] = e.first, e.second
        matrix[e.row][e.column] = matrix[e.column][e.row] = e.value_mhz2
    return tuple(names), tuple(tuple(row) for row in matrix)


def covariance_elements(state: State) -> list[tuple[int, int, str, str, float]]:
    """The upper-triangle elements of a state's covariance, in storage order."""
    names, rows = state.covariance_names, state.covariance_mhz2
    return [(i, j, names[i], names[j], rows[i][j]) for i in range(len(names)) for j in range(i, len(names))]


def with_constants(queryset):
    """The species queryset with states, constants and covariances fetched in three more queries."""
    states = StateRow.objects.order_by("position", "id").prefetch_related(_ordered_constants(), "covariance")
    return queryset.prefetch_related(Prefetch("states", queryset=states))


def _ordered_constants():
    return Prefetch("constants", queryset=Constant.objects.order_by("id"))


def species_of_row(row: SpeciesRow) -> Species:
    """The engine Species of a current row (use :func:`with_constants` on lists to save queries)."""
    return engine_species(
        row, [(state, list(state.constants.all()), list(state.covariance.all())) for state in row.states.all()]
    )


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
        "parent_name": species.parent,
        "natural_abundance": species.natural_abundance,
        "constants_route": species.constants_route,
        "route_note": species.route_note,
        "hyperfine": hyperfine_entry(species),
        "geometry": geometry_entries(species),
    }
