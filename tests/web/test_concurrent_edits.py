"""Two editors saving one species at the same moment, each through a database connection of its own.

The store's version check and bump are one UPDATE; under PostgreSQL's row lock
the second UPDATE waits for the first transaction and then finds the version
moved, so it writes nothing and says so. The editor who was refused starts
again from the new version, and in the end both changes are in the catalogue.

These tests need a server database: SQLite's shared in-memory test database
locks whole tables between connections instead of rows. CI runs the suite a
second time on PostgreSQL (.ci/run), where they run.
"""

from __future__ import annotations

import dataclasses
import threading
import time

import pytest
from django.db import close_old_connections, connection, connections

from planner.catalogue import store
from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Constant
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import EditConflict, Stamp, create_species, update_species
from planner.engine import Species, State

pytestmark = [
    pytest.mark.django_db(transaction=True),
    pytest.mark.skipif(
        connection.vendor != "postgresql",
        reason="concurrent connections need a server database (CI runs these on PostgreSQL)",
    ),
]

ROUNDS = 6
#: Seconds the first writer lingers inside its transaction, so that the other one's UPDATE really
#: has to wait on the row lock (common practice, no source: long against a loopback round trip).
LINGER_S = 0.05

#: A linear molecule with invented constants: the values do not matter, only that each save changes them.
BASE = Species(
    name="Racer",
    formula="CO",
    rotor="linear",
    mass_amu=28.0,
    dipole_debye=(0.1, 0.0, 0.0),
    states=(State("v=0", 0.0, {"B": (50000.0, 0.01), "D": (0.15, 0.001)}),),
)


def _with_constant(species: Species, name: str, value_mhz: float) -> Species:
    ground = species.states[0]
    constants = dict(ground.constants_mhz) | {name: (value_mhz, ground.constants_mhz[name][1])}
    return dataclasses.replace(species, states=(dataclasses.replace(ground, constants_mhz=constants),))


def _save_from(version: int, name: str, value_mhz: float, barrier: threading.Barrier, outcome: dict) -> None:
    """One editor: read the species at ``version``, wait for the other, save one constant."""
    try:
        row = SpeciesRow.objects.get(name=BASE.name)
        edited = _with_constant(species_of_row(row), name, value_mhz)
        barrier.wait(timeout=10)
        try:
            update_species(row, edited, Stamp(None, f"set {name}"), expected_version=version)
            outcome[name] = "saved"
        except EditConflict as conflict:
            outcome[name] = conflict
    except Exception as error:  # reported by the main thread's assertions, not lost in the thread
        outcome[name] = error
    finally:
        connections.close_all()


def _lingering_writes(monkeypatch):
    original = store._write_states

    def slow(*args, **kwargs):
        time.sleep(LINGER_S)
        return original(*args, **kwargs)

    monkeypatch.setattr(store, "_write_states", slow)


def _race(version: int, b_mhz: float, d_mhz: float) -> dict:
    barrier, outcome = threading.Barrier(2), {}
    threads = [
        threading.Thread(target=_save_from, args=(version, "B", b_mhz, barrier, outcome)),
        threading.Thread(target=_save_from, args=(version, "D", d_mhz, barrier, outcome)),
    ]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join(timeout=30)
    close_old_connections()
    return outcome


def _constants_now() -> dict[str, float]:
    return dict(Constant.objects.filter(state__species__name=BASE.name).values_list("name", "value_mhz"))


def test_of_two_simultaneous_saves_one_is_written_whole_and_the_other_is_refused(monkeypatch):
    _lingering_writes(monkeypatch)
    create_species(BASE, Stamp(None, "start"))
    outcome = _race(1, b_mhz=50001.0, d_mhz=0.16)

    assert sorted(map(type, outcome.values()), key=str) == sorted([str, EditConflict], key=str), outcome
    (winner,) = [name for name, result in outcome.items() if result == "saved"]
    (loser,) = [result for result in outcome.values() if isinstance(result, EditConflict)]
    assert loser.current_version == 2
    row = SpeciesRow.objects.get(name=BASE.name)
    assert row.version == 2
    expected = {"B": 50000.0, "D": 0.15} | ({"B": 50001.0} if winner == "B" else {"D": 0.16})
    assert _constants_now() == expected
    # One revision for the one save that passed: the refused one left no history behind.
    assert SpeciesRow.history.filter(id=row.pk).count() == 2


def test_editors_who_start_again_after_a_refusal_lose_nothing(monkeypatch):
    _lingering_writes(monkeypatch)
    create_species(BASE, Stamp(None, "start"))
    expected = {"B": 50000.0, "D": 0.15}
    for round_number in range(1, ROUNDS + 1):
        b_mhz, d_mhz = 50000.0 + round_number, 0.15 + round_number / 100
        version = SpeciesRow.objects.get(name=BASE.name).version
        outcome = _race(version, b_mhz, d_mhz)
        refused = [name for name, result in outcome.items() if isinstance(result, EditConflict)]
        assert len(refused) == 1, outcome
        # The refused editor reloads the species (with the other's change) and saves again.
        row = SpeciesRow.objects.get(name=BASE.name)
        value = b_mhz if refused[0] == "B" else d_mhz
        update_species(row, _with_constant(species_of_row(row), refused[0], value), Stamp(None, "again"), row.version)
        expected = {"B": b_mhz, "D": d_mhz}
        assert _constants_now() == expected
    row = SpeciesRow.objects.get(name=BASE.name)
    assert row.version == 1 + 2 * ROUNDS
    assert SpeciesRow.history.filter(id=row.pk).count() == 1 + 2 * ROUNDS
