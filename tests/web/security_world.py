"""Real objects for the security tests: a species with its history, an instrument, a saved plan, a fit run.

Built from the demo catalogue's CO entry (any name or text can be swapped in), so that every page
of the site has something true to show; the pages' own tests check the numbers.
"""

from __future__ import annotations

import json

from django.contrib.auth import get_user_model
from django.contrib.sessions.models import Session

from planner.catalogue.conversion import species_of_row
from planner.catalogue.models import Species as SpeciesRow
from planner.catalogue.store import Stamp, import_species
from planner.catalogue_file import DEMO_CATALOGUE_PATH, parse_catalogue
from planner.engine.fitting import fit_constants
from planner.fitting.lines_file import read_lines
from planner.fitting.models import FitRun
from planner.fitting.report import fit_document
from planner.planning.compute import compute_plan
from planner.planning.forms import PlanForm
from planner.planning.models import Instrument, SavedPlan
from tests.fitting.test_fit_command import CO_LINES
from tests.web.conftest import catalogue_document

#: A plan window around CO J=1-0 (115 GHz, from memory): small, so the plan is quick.
PLAN_WINDOW_GHZ = ("100", "120")


def demo_entry(name: str) -> dict:
    """A copy of one entry of the demo catalogue file."""
    document = json.loads(DEMO_CATALOGUE_PATH.read_text(encoding="utf-8"))
    return next(entry for entry in document["species"] if entry["name"] == name)


class World:
    """The objects every URL of the site needs, made on first use."""

    def __init__(
        self,
        entry: dict | None = None,
        instrument_name: str = "W-band cell",
        plan_name: str = "run 1",
        line_note: str = "from memory",
    ):
        self.entry = entry or demo_entry("CO")
        self.instrument_name = instrument_name
        self.plan_name = plan_name
        self.line_note = line_note
        self._cache: dict = {}

    def _once(self, key, make):
        if key not in self._cache:
            self._cache[key] = make()
        return self._cache[key]

    @property
    def species(self) -> SpeciesRow:
        def make():
            import_species(parse_catalogue(catalogue_document(self.entry)), Stamp(None, "security test"))
            return SpeciesRow.objects.get(name=self.entry["name"])

        return self._once("species", make)

    @property
    def history_id(self) -> int:
        return self._once("history", lambda: self.species.history.earliest("history_date").history_id)

    @property
    def instrument(self) -> Instrument:
        return self._once(
            "instrument",
            lambda: Instrument.objects.create(
                name=self.instrument_name,
                fmin_mhz=75_000.0,
                fmax_mhz=130_000.0,
                setting_width_mhz=1000.0,
                channel_width_mhz=0.1,
                model_kind="relative",
                detection_floor_1s=1e-6,
                notes=self.instrument_name,
            ),
        )

    def plan_query(self) -> dict:
        row = self.species
        return {
            "instrument": "",
            "frequency_unit": "GHz",
            "fmin": PLAN_WINDOW_GHZ[0],
            "fmax": PLAN_WINDOW_GHZ[1],
            "temperature_k": "300",
            "slot_minutes": "60",
            "snr": "5",
            "k_sigma": "3",
            "margin_mhz": "0",
            f"amount_{row.pk}": "1",
        }

    @property
    def saved_plan(self) -> SavedPlan:
        def make():
            row = self.species
            form = PlanForm(self.plan_query(), species=[(row.pk, row.name, None)])
            assert form.is_valid(), form.errors
            document = compute_plan(form.inputs())
            return SavedPlan.objects.create(
                name=self.plan_name,
                inputs=document["inputs"],
                result={key: document[key] for key in ("result", "temperature_curve", "hazards", "computed_at")},
                catalogue_versions=document["catalogue_versions"],
            )

        return self._once("plan", make)

    @property
    def fit_run(self) -> FitRun:
        def make():
            row = self.species
            species = species_of_row(row)
            lines_csv = CO_LINES.replace("from memory", self.line_note.replace(",", " "))
            result = fit_constants(species, read_lines(lines_csv), ["B", "D"])
            return FitRun.objects.create(
                species=row,
                species_name=row.name,
                species_version=row.version,
                lines_csv=lines_csv,
                vary=["B", "D"],
                result=fit_document(result, species),
            )

        return self._once("fit", make)


def snapshot() -> tuple:
    """Everything a changing view could write, to compare before and after a refused request."""
    return (
        sorted(SpeciesRow.objects.values_list("pk", "name", "version")),
        SpeciesRow.history.count(),
        sorted(Instrument.objects.values_list("pk", "name", "fmin_mhz", "fmax_mhz", "notes")),
        Instrument.history.count(),
        SavedPlan.objects.count(),
        sorted(FitRun.objects.values_list("pk", "saved_as_version")),
        get_user_model().objects.count(),
        Session.objects.count(),
    )
