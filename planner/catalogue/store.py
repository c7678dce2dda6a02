"""Every write to the catalogue goes through here: one edit, one revision.

An edit stamps every row it saves or deletes with the same history_date, user
and reason, so that revisions.py can rebuild the species as of that edit.  The
species row is saved on every edit (its version goes up by one), so each
revision has a species record.  Species are validated by the engine (they
arrive as engine Species) before anything is written.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from datetime import datetime

from django.db import transaction
from django.db.models import F
from django.utils import timezone

from planner.catalogue_file import CatalogueError, Problem
from planner.engine import Species

from .changes import Change, differences
from .conversion import covariance_elements, row_fields, species_of_row, stored_constants, with_constants
from .models import FORMULA_LENGTH, LABEL_LENGTH, NAME_LENGTH, PARAMETER_LENGTH, Constant, CovarianceElement
from .models import Species as SpeciesRow
from .models import State as StateRow
from .revisions import Timeline


class StoreError(ValueError):
    """A write the catalogue refuses (a name taken by another species, an unknown revision, ...)."""


class EditConflict(StoreError):
    """Someone saved the species after the editor opened it; nothing was written.

    ``changes`` are what the others changed since ``expected_version``; ``editors``
    who made them; ``current_version`` the version to start from again.
    """

    def __init__(self, name: str, expected_version: int, current_version: int, changes: list[Change], editors):
        self.name = name
        self.expected_version = expected_version
        self.current_version = current_version
        self.changes = changes
        self.editors = editors
        who = ", ".join(editors) or "someone"
        super().__init__(
            f"{name} was changed by {who} while you were editing it (version {expected_version} → "
            f"{current_version}); your changes were not saved."
        )


@dataclass
class Stamp:
    """Who and when of one edit, put on every row it writes."""

    user: object = None
    reason: str = ""
    date: datetime = field(default_factory=timezone.now)

    def on(self, instance):
        instance._history_date = self.date
        instance._history_user = self.user if getattr(self.user, "is_authenticated", False) else None
        instance._change_reason = self.reason[:100]
        return instance


def length_problems(species: Species) -> list[Problem]:
    """Texts longer than the catalogue's columns hold (the file format has no such limit)."""
    problems = []
    checks = [("name", species.name, NAME_LENGTH), ("formula", species.formula, FORMULA_LENGTH)]
    for index, state in enumerate(species.states):
        checks.append((f"states[{index}].label", state.label, LABEL_LENGTH))
        checks.extend((f"states[{index}].constants_mhz.{name}", name, PARAMETER_LENGTH) for name in state.constants_mhz)
    checks.append(("parent", species.parent, NAME_LENGTH))
    for path, text, limit in checks:
        if len(text) > limit:
            problems.append(Problem(species.name, path, f"is {len(text)} characters long; at most {limit} fit"))
    return problems


def _write_states(row: SpeciesRow, species: Species, stamp: Stamp) -> None:
    existing = {state.label: state for state in row.states.all()}
    for position, state in enumerate(species.states):
        state_row = existing.pop(state.label, None) or StateRow(species=row, label=state.label)
        wanted = (position, state.energy_cm1, state.degeneracy)
        if state_row.pk is None or (state_row.position, state_row.energy_cm1, state_row.degeneracy) != wanted:
            state_row.position, state_row.energy_cm1, state_row.degeneracy = wanted
            stamp.on(state_row).save()
        constants = {c.name: c for c in state_row.constants.all()}
        for name, (value, sigma, kind) in stored_constants(state).items():
            constant = constants.pop(name, None) or Constant(state=state_row, name=name, value_mhz=value)
            if constant.pk is None or (constant.value_mhz, constant.sigma_mhz, constant.kind) != (value, sigma, kind):
                constant.value_mhz, constant.sigma_mhz, constant.kind = value, sigma, kind
                stamp.on(constant).save()
        for constant in constants.values():
            stamp.on(constant).delete()
        _write_covariance(state_row, state, stamp)
    for state_row in existing.values():
        _delete_state(state_row, stamp)


def _write_covariance(state_row: StateRow, state, stamp: Stamp) -> None:
    """Make the stored covariance elements of a state equal to ``state``'s (only changed ones are written)."""
    stored = {(e.row, e.column): e for e in state_row.covariance.all()}
    for row, column, first, second, value in covariance_elements(state):
        element = stored.pop((row, column), None) or CovarianceElement(state=state_row, row=row, column=column)
        if element.pk is None or (element.first, element.second, element.value_mhz2) != (first, second, value):
            element.first, element.second, element.value_mhz2 = first, second, value
            stamp.on(element).save()
    for element in stored.values():
        stamp.on(element).delete()


def _delete_state(state_row: StateRow, stamp: Stamp) -> None:
    # One by one, so that every deleted row carries the edit's stamp in its history.
    for element in state_row.covariance.all():
        stamp.on(element).delete()
    for constant in state_row.constants.all():
        stamp.on(constant).delete()
    stamp.on(state_row).delete()


def _check_name_free(name: str, species_id: int | None) -> None:
    clash = SpeciesRow.objects.filter(name=name).exclude(pk=species_id).first()
    if clash is not None:
        raise StoreError(f"another species is already called {name!r}; choose another name")


def create_species(species: Species, stamp: Stamp, species_id: int | None = None, version: int = 1) -> SpeciesRow:
    """A new species row (with ``species_id`` when a deleted species comes back) and its states."""
    problems = length_problems(species)
    if problems:
        raise CatalogueError(problems)
    with transaction.atomic():
        _check_name_free(species.name, species_id)
        row = SpeciesRow(pk=species_id, version=version, **row_fields(species))
        stamp.on(row).save()  # states need the row first
        _write_states(row, species, stamp)
        return row


def update_species(row: SpeciesRow, species: Species, stamp: Stamp, expected_version: int | None) -> SpeciesRow:
    """Replace the content of ``row`` by ``species``.

    With ``expected_version`` (the version the editor started from) the save
    is refused with :class:`EditConflict` when anyone saved in between; the
    check and the version bump are one UPDATE, so two saves cannot both pass.
    """
    problems = length_problems(species)
    if problems:
        raise CatalogueError(problems)
    with transaction.atomic():
        _check_name_free(species.name, row.pk)
        rows = SpeciesRow.objects.filter(pk=row.pk)
        if expected_version is not None:
            rows = rows.filter(version=expected_version)
        if not rows.update(version=F("version") + 1):
            raise _conflict(row.pk, expected_version)
        row = SpeciesRow.objects.get(pk=row.pk)
        for name, value in row_fields(species).items():
            setattr(row, name, value)
        _write_states(row, species, stamp)
        stamp.on(row).save()  # saved last: the species record closes the revision
        return row


def _conflict(species_id: int, expected_version: int) -> StoreError:
    current = SpeciesRow.objects.filter(pk=species_id).first()
    if current is None:
        return StoreError("this species was deleted while you were editing it; restore it from its history first")
    timeline = Timeline(species_id)
    started = timeline.version_date(expected_version)
    before = timeline.snapshot(started) if started else None
    editors = sorted(
        {
            record.history_user.get_username() if record.history_user else "command line"
            for record in timeline.species_records
            if started is None or record.history_date > started
        }
    )
    return EditConflict(
        current.name, expected_version, current.version, differences(before, species_of_row(current)), editors
    )


def delete_species(row: SpeciesRow, stamp: Stamp) -> None:
    with transaction.atomic():
        for state_row in row.states.all():
            _delete_state(state_row, stamp)
        stamp.on(row).delete()


def restore_revision(species_id: int, history_id: int, stamp: Stamp) -> SpeciesRow:
    """Bring the species back to how it was after revision ``history_id`` (also after a deletion)."""
    timeline = Timeline(species_id)
    revision = timeline.revision(history_id)
    if revision is None:
        raise StoreError(f"species {species_id} has no revision {history_id}")
    if revision.species is None:
        raise StoreError("that revision is the deletion itself; pick a revision before it")
    stamp.reason = stamp.reason or f"restored version {revision.version} of {revision.date:%Y-%m-%d %H:%M} UTC"
    row = SpeciesRow.objects.filter(pk=species_id).first()
    if row is not None:
        return update_species(row, revision.species, stamp, expected_version=None)
    last_version = max(record.version for record in timeline.species_records)
    return create_species(revision.species, stamp, species_id=species_id, version=last_version + 1)


@dataclass
class ImportSummary:
    created: list[str] = field(default_factory=list)
    updated: list[str] = field(default_factory=list)
    unchanged: list[str] = field(default_factory=list)

    def __str__(self) -> str:
        return (
            f"{len(self.created)} new, {len(self.updated)} updated, {len(self.unchanged)} unchanged "
            f"({len(self.created) + len(self.updated) + len(self.unchanged)} species in the file)"
        )


def import_species(species_list: list[Species], stamp: Stamp) -> ImportSummary:
    """Add or replace (by name) every species of a validated file, all or nothing.

    Species of the catalogue that the file does not mention are left alone.
    Raises CatalogueError listing every problem before anything is written.
    """
    problems = [problem for species in species_list for problem in length_problems(species)]
    if problems:
        raise CatalogueError(problems)
    summary = ImportSummary()
    with transaction.atomic():
        existing = {row.name: row for row in with_constants(SpeciesRow.objects.all())}
        for species in species_list:
            row = existing.get(species.name)
            if row is None:
                create_species(species, stamp)
                summary.created.append(species.name)
            elif species_of_row(row) == species:
                summary.unchanged.append(species.name)
            else:
                update_species(row, species, stamp, expected_version=None)
                summary.updated.append(species.name)
    return summary


def export_species() -> list[Species]:
    """Every species of the catalogue, by name (the order of the export file).

    Sorted here, not by the database, so that the file does not depend on the
    database's collation.
    """
    species = [species_of_row(row) for row in with_constants(SpeciesRow.objects.all())]
    return sorted(species, key=lambda s: s.name)
