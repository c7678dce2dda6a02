"""A species' revisions, rebuilt from the history tables.

Every edit stamps all the rows it writes or deletes with one history_date
(store.py), so "the species as of revision r" is, per table, the latest
historical row of each id at or before r's date that is not a deletion.  Four
queries fetch a species' whole history; the snapshots are put together here.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from planner.engine import Species

from .changes import Change, differences
from .conversion import engine_species
from .models import Constant, CovarianceElement
from .models import Species as SpeciesRow
from .models import State as StateRow

KIND = {"+": "created", "~": "changed", "-": "deleted"}


@dataclass(frozen=True)
class Revision:
    history_id: int
    species_id: int
    name: str  # the species' name in this revision
    date: datetime
    user: str  # user name, or "" for a change made from the command line
    reason: str
    kind: str  # created | changed | deleted
    version: int
    species: Species | None  # as it was after this revision; None once deleted
    changes: list[Change]  # against the revision before


def _latest_per_id(records, date: datetime) -> list:
    """The newest record of each id at or before ``date``, leaving out ids whose newest is a deletion."""
    latest = {}
    for record in records:  # ordered by (history_date, history_id)
        if record.history_date > date:
            break
        latest[record.id] = record
    return [record for record in latest.values() if record.history_type != "-"]


class Timeline:
    """All historical rows of one species (4 queries), and its snapshot at any date."""

    def __init__(self, species_id: int):
        self.species_id = species_id
        order = ("history_date", "history_id")
        self.species_records = list(
            SpeciesRow.history.filter(id=species_id).order_by(*order).select_related("history_user")
        )
        self.state_records = list(StateRow.history.filter(species_id=species_id).order_by(*order))
        state_ids = {record.id for record in self.state_records}
        self.constant_records = list(Constant.history.filter(state_id__in=state_ids).order_by(*order))
        self.covariance_records = list(CovarianceElement.history.filter(state_id__in=state_ids).order_by(*order))

    def snapshot(self, date: datetime) -> Species | None:
        """The species as it was at ``date``, or None when it did not exist then."""
        current = _latest_per_id(self.species_records, date)
        if not current:
            return None
        states = sorted(_latest_per_id(self.state_records, date), key=lambda s: (s.position, s.id))
        constants: dict[int, list] = {}
        for constant in sorted(_latest_per_id(self.constant_records, date), key=lambda c: c.id):
            constants.setdefault(constant.state_id, []).append(constant)
        covariance: dict[int, list] = {}
        for element in _latest_per_id(self.covariance_records, date):
            covariance.setdefault(element.state_id, []).append(element)
        return engine_species(
            current[0],
            [(state, constants.get(state.id, []), covariance.get(state.id, [])) for state in states],
        )

    def revisions(self) -> list[Revision]:
        """Every revision, newest first, each with its changes against the one before."""
        result, previous = [], None
        for record in self.species_records:
            species = self.snapshot(record.history_date)
            user = record.history_user.get_username() if record.history_user else ""
            result.append(
                Revision(
                    history_id=record.history_id,
                    species_id=self.species_id,
                    name=record.name,
                    date=record.history_date,
                    user=user,
                    reason=record.history_change_reason or "",
                    kind=KIND[record.history_type],
                    version=record.version,
                    species=species,
                    changes=differences(previous, species),
                )
            )
            previous = species
        return result[::-1]

    def revision(self, history_id: int) -> Revision | None:
        return next((r for r in self.revisions() if r.history_id == history_id), None)

    def version_date(self, version: int) -> datetime | None:
        """Date of the newest revision that left the species at ``version``."""
        dates = [r.history_date for r in self.species_records if r.version == version and r.history_type != "-"]
        return dates[-1] if dates else None


def deleted_species() -> list[Revision]:
    """The deletion revision of every species that is deleted now, newest first."""
    live = set(SpeciesRow.objects.values_list("id", flat=True))
    deletions = SpeciesRow.history.filter(history_type="-").exclude(id__in=live).order_by("-history_date")
    seen, result = set(), []
    for record in deletions.select_related("history_user"):
        if record.id in seen:
            continue
        seen.add(record.id)
        result.append(
            Revision(
                history_id=record.history_id,
                species_id=record.id,
                name=record.name,
                date=record.history_date,
                user=record.history_user.get_username() if record.history_user else "",
                reason=record.history_change_reason or "",
                kind="deleted",
                version=record.version,
                species=None,
                changes=[],
            )
        )
    return result
