"""The catalogue's write path: one edit is one revision, stale edits are refused, limits are checked first."""

import dataclasses

import pytest

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Constant, State
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.revisions import Timeline
from planner.catalogue.store import EditConflict, Stamp, create_species, import_species, update_species
from planner.catalogue_file import CatalogueError
from planner.engine import State as EngineState


def _with_b(species, b_mhz):
    ground = species.states[0]
    constants = dict(ground.constants_mhz) | {"B": (b_mhz, ground.constants_mhz["B"][1])}
    states = (EngineState(ground.label, ground.energy_cm1, constants), *species.states[1:])
    return dataclasses.replace(species, states=states)


def test_one_edit_stamps_every_row_with_one_date(demo_in_db):
    row = SpeciesRow.objects.get(name="CO")  # demo data: two states
    update_species(row, _with_b(species_of_row(row), 57636.0), Stamp(None, "test"), expected_version=1)
    species_record = SpeciesRow.history.filter(id=row.pk).latest("history_date")
    state_ids = State.objects.filter(species=row).values("id")
    b_record = Constant.history.filter(name="B", state_id__in=state_ids).latest("history_date")
    assert b_record.history_date == species_record.history_date
    assert b_record.history_change_reason == species_record.history_change_reason == "test"


def test_a_stale_version_is_refused_and_nothing_is_written(demo_in_db):
    row = SpeciesRow.objects.get(name="HCN")
    species = species_of_row(row)
    update_species(row, _with_b(species, 44316.0), Stamp(None, "first"), expected_version=1)
    history_before = Constant.history.count()
    with pytest.raises(EditConflict) as raised:
        update_species(row, _with_b(species, 44317.0), Stamp(None, "second"), expected_version=1)
    assert raised.value.current_version == 2
    assert [c.field for c in raised.value.changes] == ["state v=0: B [MHz]"]
    assert raised.value.editors == ["command line"]
    assert Constant.objects.get(state__species=row, name="B").value_mhz == 44316.0
    assert Constant.history.count() == history_before


def test_snapshots_follow_every_revision(demo_in_db):
    row = SpeciesRow.objects.get(name="HCN")
    first = species_of_row(row)
    update_species(row, _with_b(first, 44316.0), Stamp(None, "a"), expected_version=1)
    update_species(row, _with_b(first, 44318.0), Stamp(None, "b"), expected_version=2)
    revisions = Timeline(row.pk).revisions()
    b_values = [r.species.states[0].constants_mhz["B"][0] for r in revisions]
    assert b_values == [44318.0, 44316.0, first.states[0].constants_mhz["B"][0]]
    assert [r.version for r in revisions] == [3, 2, 1]


def test_too_long_texts_are_problems_before_any_write(demo_in_db, demo_species):
    too_long = dataclasses.replace(demo_species[0], name="X" * 101)
    count = SpeciesRow.objects.count()
    with pytest.raises(CatalogueError) as raised:
        import_species([demo_species[1], too_long], Stamp(None, "test"))
    assert [(p.species, p.field) for p in raised.value.problems] == [("X" * 101, "name")]
    assert SpeciesRow.objects.count() == count


def test_create_refuses_a_taken_name(demo_in_db, demo_species):
    from planner.catalogue.store import StoreError

    with pytest.raises(StoreError, match="already called"):
        create_species(demo_species[0], Stamp(None, "again"))
